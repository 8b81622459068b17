import { describe, expect, it } from "vitest";
import {
  DEFAULT_MIN_LAYER_TIME_SECONDS,
  DEFAULT_PRINT_EFFICIENCY,
  estimatePrintTime,
  extrusionSecondsForLayers,
  extrusionSecondsForVolume,
  printTimeBreakdown,
  sumPrintTimes,
  type PrinterTimeProfile,
} from "@/lib/estimate/print-time";
import { DomainInputError } from "@/lib/input-checks";

const printer: PrinterTimeProfile = {
  maxVolumetricFlowMm3PerS: 15,
  efficiency: 0.5,
  heatUpMinutes: 6,
  changeoverMinutes: 10,
  handlingMinutesPerJob: 4,
};

describe("print time", () => {
  it("uses the stated common-practice defaults", () => {
    // common practice: about half of the rated flow is averaged over a job; 5–10 s minimum layer time.
    expect(DEFAULT_PRINT_EFFICIENCY).toBeGreaterThanOrEqual(0.5);
    expect(DEFAULT_PRINT_EFFICIENCY).toBeLessThanOrEqual(0.6);
    expect(DEFAULT_MIN_LAYER_TIME_SECONDS).toBeGreaterThanOrEqual(5);
    expect(DEFAULT_MIN_LAYER_TIME_SECONDS).toBeLessThanOrEqual(10);
  });

  it("divides volume by the average flow", () => {
    // Arithmetic: 9000 mm³ ÷ (15 mm³/s × 0.55) = 9000 ÷ 8.25 = 1090.909 s.
    expect(extrusionSecondsForVolume(9000, 15, 0.55)).toBeCloseTo(1090.909, 3);
    // Arithmetic: 36 000 mm³ ÷ (20 mm³/s × 1) = 1800 s = 30 min.
    expect(extrusionSecondsForVolume(36_000, 20, 1)).toBe(1800);
  });

  it("applies the minimum layer time per layer, not to the total", () => {
    // Arithmetic at 10 mm³/s × 1: a 1 mm³ layer takes 0.1 s → floored to 8 s; a 100 mm³ layer
    // takes 10 s (above the floor); an empty layer prints nothing. Total 8 + 10 = 18 s,
    // while the un-floored total would be 10.1 s.
    expect(extrusionSecondsForLayers([1, 100, 0], 10, 1, 8)).toBeCloseTo(18, 12);
    expect(extrusionSecondsForLayers([1, 100, 0], 10, 1, 0)).toBeCloseTo(10.1, 12);
  });

  it("breaks a job into extrusion, heat-up, changeover and handling", () => {
    // Arithmetic: 27 000 mm³ ÷ (15 × 0.5) = 3600 s = 60 min of extrusion; three jobs →
    // 180 min; heat-up 3 × 6 = 18; one changeover 10; handling 3 × 4 = 12 → 220 min.
    const time = estimatePrintTime({ volumeMm3: 27_000 }, printer, { jobs: 3, changeovers: 1 });
    expect(time.extrusionMinutes).toBeCloseTo(180, 9);
    expect(time.heatUpMinutes).toBe(18);
    expect(time.changeoverMinutes).toBe(10);
    expect(time.handlingMinutes).toBe(12);
    expect(time.totalMinutes).toBeCloseTo(220, 9);
    expect(time.totalHours).toBeCloseTo(220 / 60, 9);
  });

  it("uses per-layer volumes when given", () => {
    const layers = new Float64Array(100).fill(2); // 2 mm³ per layer: 0.27 s each, floored to 8 s
    const time = estimatePrintTime({ layerVolumesMm3: layers }, { ...printer, minLayerTimeSeconds: 8 });
    expect(time.extrusionMinutes).toBeCloseTo((100 * 8) / 60, 9);
  });

  it("sums breakdowns part by part", () => {
    const a = printTimeBreakdown(600, printer, { jobs: 1 });
    const b = printTimeBreakdown(1200, printer, { jobs: 1, changeovers: 1 });
    const total = sumPrintTimes([a, b]);
    expect(total.extrusionMinutes).toBeCloseTo(30, 12);
    expect(total.totalMinutes).toBeCloseTo(a.totalMinutes + b.totalMinutes, 12);
  });

  it("rejects an efficiency outside (0, 1]", () => {
    expect(() => extrusionSecondsForVolume(100, 15, 1.2)).toThrow(DomainInputError);
    expect(() => extrusionSecondsForVolume(100, 15, 0)).toThrow(DomainInputError);
    expect(() => extrusionSecondsForLayers([1, Number.NaN], 15, 0.5)).toThrow(DomainInputError);
  });
});

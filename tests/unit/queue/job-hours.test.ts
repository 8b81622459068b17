import { describe, expect, it } from "vitest";
import { estimateTestPlan } from "@/lib/estimate/plan";
import { jobHoursOnPrinter } from "@/lib/queue/job-hours";

// A bench printer and protocol with round numbers, as in the plan tests: 12.4 g of PLA at
// 1.24 g/cm³ (PLA's density in lib/estimate/materials.ts, from a resin datasheet) is 10 000 mm³.
const printer = { maxVolumetricFlowMm3PerS: 20, efficiency: 0.5, heatUpMinutes: 5, changeoverMinutes: 15, handlingMinutesPerJob: 3 };

describe("a job's hours on a printer", () => {
  it("is extrusion at the capped flow plus one heat-up and one handling (worked arithmetic)", () => {
    // Flow min(20, 12) × 0.5 = 6 mm³/s; 10 000 mm³ ÷ 6 = 1666.67 s = 27.78 min; + 5 + 3 min = 35.78 min.
    const hours = jobHoursOnPrinter(12.4, { material: "PLA", maxFlowMm3PerS: 12 }, printer);
    expect(hours).toBeCloseTo((10_000 / 6 / 60 + 5 + 3) / 60, 9);
  });

  it("follows the printer's efficiency: a calibrated printer at 0.4 takes 0.5/0.4 as long to extrude", () => {
    const at05 = jobHoursOnPrinter(12.4, { material: "PLA", maxFlowMm3PerS: 12 }, printer);
    const at04 = jobHoursOnPrinter(12.4, { material: "PLA", maxFlowMm3PerS: 12 }, { ...printer, efficiency: 0.4 });
    const overheadHours = 8 / 60;
    expect((at04 - overheadHours) / (at05 - overheadHours)).toBeCloseTo(0.5 / 0.4, 9);
  });

  it("matches the plan estimate's job times once the plan's changeovers are taken out", () => {
    const estimate = estimateTestPlan({
      pieces: [
        { id: "a", name: "Overhang fan", filamentGrams: 12.4 },
        { id: "b", name: "Bridge strip", filamentGrams: 3.1 },
      ],
      variants: [
        { id: "stock", name: "Stock duct", role: "reference" },
        { id: "ring", name: "Ring duct", role: "under_test" },
      ],
      repeats: 2,
      protocol: { material: "PETG", layerHeightMm: 0.2, maxVolumetricFlowMm3PerS: 30, fanPercent: 50 },
      printer: { id: "p", name: "Bench printer", hourlyRateMinor: 100, ...printer },
      pricing: { currency: "USD", filamentPricePerKgMinor: { PETG: 2400 }, labourRatePerHourMinor: 3000 },
    });
    for (const job of estimate.jobs) {
      const grams = job.pieceId === "a" ? 12.4 : 3.1;
      const expected = (job.time.totalMinutes - job.time.changeoverMinutes) / 60;
      expect(jobHoursOnPrinter(grams, { material: "PETG", maxFlowMm3PerS: 30 }, printer)).toBeCloseTo(expected, 9);
    }
  });
});

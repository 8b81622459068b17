import { describe, expect, it } from "vitest";
import { fitEfficiency, MIN_CALIBRATION_RUNS } from "@/lib/schedule";

describe("calibrating a printer's efficiency from logged runs", () => {
  it("fits actual ≈ k·estimated through the origin (worked by hand)", () => {
    /*
     * Runs (estimated, actual) = (1, 1.2), (2, 2.2), (3, 3.6); current efficiency 0.8.
     *   Σea = 1·1.2 + 2·2.2 + 3·3.6 = 1.2 + 4.4 + 10.8 = 16.4
     *   Σe² = 1 + 4 + 9 = 14
     *   k = Σea / Σe² = 16.4 / 14 = 41/35 ≈ 1.1714286
     *   efficiency = 0.8 / k = 0.8 · 35/41 = 28/41 ≈ 0.6829268
     * Residuals a − k·e: 1.2 − 41/35 = 1/35, 2.2 − 82/35 = −5/35, 3.6 − 123/35 = 3/35
     *   SSres = (1 + 25 + 9) / 35² = 35/1225 = 1/35
     *   mean a = 7/3; SStot = Σa² − 3·(7/3)² = 19.24 − 49/3 = 218/75
     *   r² = 1 − (1/35)/(218/75) = 1 − 75/7630 = 1511/1526 ≈ 0.9901704
     */
    const fit = fitEfficiency(
      [
        { estimatedHours: 1, actualHours: 1.2 },
        { estimatedHours: 2, actualHours: 2.2 },
        { estimatedHours: 3, actualHours: 3.6 },
      ],
      0.8,
    );
    expect(fit.runs).toBe(3);
    expect(fit.factor).toBeCloseTo(41 / 35, 12);
    expect(fit.efficiency).toBeCloseTo(28 / 41, 12);
    expect(fit.r2).toBeCloseTo(1511 / 1526, 12);
  });

  it("leaves the efficiency alone below the minimum number of usable runs", () => {
    const runs = [
      { estimatedHours: 2, actualHours: 3 },
      { estimatedHours: 4, actualHours: 6 },
      { estimatedHours: 0, actualHours: 1 },
      { estimatedHours: 5, actualHours: Number.NaN },
    ];
    expect(MIN_CALIBRATION_RUNS).toBe(3);
    expect(fitEfficiency(runs, 0.55)).toEqual({ factor: 1, efficiency: 0.55, runs: 2, r2: null });
  });

  it("limits one fit to halving or doubling the estimates, and keeps efficiency within (0.05, 1]", () => {
    // Every run took three times the estimate: k = 3 exactly (Σea = 3·Σe²), so efficiency uses k = 2.
    const slow = [1, 2, 4].map((e) => ({ estimatedHours: e, actualHours: 3 * e }));
    const slowFit = fitEfficiency(slow, 0.6);
    expect(slowFit.factor).toBeCloseTo(3, 12);
    expect(slowFit.efficiency).toBeCloseTo(0.3, 12);
    expect(slowFit.r2).toBeCloseTo(1, 12);
    // Twice as fast as estimated from 0.9: 0.9 / 0.5 = 1.8, kept at 1.
    const fast = [1, 2, 4].map((e) => ({ estimatedHours: e, actualHours: e / 2 }));
    expect(fitEfficiency(fast, 0.9).efficiency).toBe(1);
    expect(fitEfficiency(slow, 0.06).efficiency).toBe(0.05);
  });

  it("has no r² when every actual time is the same", () => {
    const flat = [1, 2, 3].map((e) => ({ estimatedHours: e, actualHours: 2 }));
    // k = (2 + 4 + 6) / 14 = 6/7.
    expect(fitEfficiency(flat, 0.5)).toMatchObject({ factor: 6 / 7, r2: null });
  });
});

import { describe, expect, it } from "vitest";
import { calibrate, calibrationPoints } from "@/lib/run-log/calibration";

describe("calibration points", () => {
  it("restates an estimate made at another efficiency: print time goes as 1 / efficiency", () => {
    // 3 h estimated at efficiency 0.5 is 3 × 0.5 / 0.6 = 2.5 h at 0.6 (worked arithmetic).
    expect(calibrationPoints([{ estimatedHoursAtStart: 3, efficiencyAtStart: 0.5, actualHours: 2.7 }], 0.6)).toEqual([{ estimatedHours: 2.5, actualHours: 2.7 }]);
  });

  it("fits runs logged at two efficiencies as one population", () => {
    // Both printed 1.2 × what an estimate at 0.6 would have said: k = 1.2, new efficiency 0.6 / 1.2 = 0.5.
    const runs = [
      { estimatedHoursAtStart: 2, efficiencyAtStart: 0.6, actualHours: 2.4 },
      { estimatedHoursAtStart: 4, efficiencyAtStart: 0.6, actualHours: 4.8 },
      { estimatedHoursAtStart: 1.5, efficiencyAtStart: 0.8, actualHours: 2.4 }, // 1.5 × 0.8 / 0.6 = 2 h at 0.6
    ];
    const { fit } = calibrate(runs, 0.6);
    expect(fit.factor).toBeCloseTo(1.2, 10);
    expect(fit.efficiency).toBeCloseTo(0.5, 10);
    expect(fit.runs).toBe(3);
  });
});

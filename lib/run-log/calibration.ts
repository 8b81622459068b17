import { fitEfficiency } from "../schedule/calibration";
import type { EfficiencyFit } from "../schedule/types";

export type LoggedRun = { estimatedHoursAtStart: number; efficiencyAtStart: number; actualHours: number };
export type CalibrationPoint = { estimatedHours: number; actualHours: number };

/**
 * A run's estimate restated at the printer's current efficiency. Print time goes as
 * 1 / efficiency, so an estimate made at efficiency e₀ becomes est · e₀ / e now. (Heat-up and
 * handling minutes do not scale, so this slightly overstates the change; they are small beside
 * the print.) Without it, applying a fit and fitting again would move the efficiency a second time.
 */
export function calibrationPoints(runs: readonly LoggedRun[], currentEfficiency: number): CalibrationPoint[] {
  return runs.map((run) => ({
    estimatedHours: (run.estimatedHoursAtStart * run.efficiencyAtStart) / currentEfficiency,
    actualHours: run.actualHours,
  }));
}

export function calibrate(runs: readonly LoggedRun[], currentEfficiency: number): { points: CalibrationPoint[]; fit: EfficiencyFit } {
  const points = calibrationPoints(runs, currentEfficiency);
  return { points, fit: fitEfficiency(points, currentEfficiency) };
}

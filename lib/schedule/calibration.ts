import type { CalibrationRun, EfficiencyFit } from "./types";

/** Fewer logged runs than this leave the efficiency as it is: one odd print should not move it. */
export const MIN_CALIBRATION_RUNS = 3;
/** One fit may at most halve or double the time estimates. */
export const FACTOR_LIMITS = { min: 0.5, max: 2 } as const;
/** The range the printer settings accept for efficiency. */
export const EFFICIENCY_LIMITS = { min: 0.05, max: 1 } as const;

const clamp = (value: number, limits: { min: number; max: number }) => Math.min(limits.max, Math.max(limits.min, value));

/**
 * Least squares through the origin, actual ≈ k · estimated: k = Σea / Σe². Estimates scale as
 * 1 / efficiency, so the efficiency that would have predicted the actual hours is current / k.
 * Runs with a non-positive or non-finite figure are left out. Below MIN_CALIBRATION_RUNS nothing
 * is fitted (factor 1, r2 null). `factor` is the fitted k itself (the chart's line); the
 * efficiency uses k clamped to FACTOR_LIMITS, and is itself kept within EFFICIENCY_LIMITS.
 * r2 is 1 − SSres / SStot with SStot about the mean of the actual hours (null when all equal).
 */
export function fitEfficiency(runs: readonly CalibrationRun[], currentEfficiency: number): EfficiencyFit {
  const usable = runs.filter(
    (run) => Number.isFinite(run.estimatedHours) && Number.isFinite(run.actualHours) && run.estimatedHours > 0 && run.actualHours > 0,
  );
  if (usable.length < MIN_CALIBRATION_RUNS) return { factor: 1, efficiency: currentEfficiency, runs: usable.length, r2: null };
  let sumEa = 0;
  let sumEe = 0;
  let sumA = 0;
  for (const run of usable) {
    sumEa += run.estimatedHours * run.actualHours;
    sumEe += run.estimatedHours * run.estimatedHours;
    sumA += run.actualHours;
  }
  const factor = sumEa / sumEe;
  const meanA = sumA / usable.length;
  let residual = 0;
  let total = 0;
  for (const run of usable) {
    residual += (run.actualHours - factor * run.estimatedHours) ** 2;
    total += (run.actualHours - meanA) ** 2;
  }
  return {
    factor,
    efficiency: clamp(currentEfficiency / clamp(factor, FACTOR_LIMITS), EFFICIENCY_LIMITS),
    runs: usable.length,
    r2: total > 0 ? 1 - residual / total : null,
  };
}

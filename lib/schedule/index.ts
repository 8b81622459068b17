/**
 * The print queue's scheduler: pure, deterministic, free of the framework and the database.
 * Times are UTC milliseconds; durations in the inputs are hours (jobs) and minutes (changeovers).
 */
export type * from "./types";
export { buildSchedule, DEFAULT_HORIZON_DAYS, setupKey } from "./build";
export { ALWAYS_STAFFED, expandStartWindows } from "./calendar";
export { checkPlacement } from "./check-placement";
export { estimatedHours, fitsBuildVolume, ineligibility, materialKey } from "./eligibility";
export { EFFICIENCY_LIMITS, FACTOR_LIMITS, fitEfficiency, MIN_CALIBRATION_RUNS } from "./calibration";
export { lowerBound } from "./bounds";
export { comparePriority, comparePriorityClass } from "./priority";
export { resultDates } from "./result-dates";

/**
 * What a run actually cost, from the run log: the filament the jobs used at the lab's price per
 * kilogram, each job's printer hours at its printer's hourly rate, and the plan's labour hours at the
 * labour rate. Each line is rounded up to a whole minor unit (the lab never under-reports what it
 * spent); the total is the sum of the lines.
 */
export type LoggedJob = { filamentUsedGrams: number | null; actualHours: number | null; machineRatePerHourMinor: number };

export type RunCostRates = {
  filamentPricePerKgMinor: number;
  labourHours: number;
  labourRatePerHourMinor: number;
};

export type RunCost = {
  totalMinor: number;
  filamentMinor: number;
  machineMinor: number;
  labourMinor: number;
  filamentGrams: number;
  machineHours: number;
  /** Jobs with both filament and hours logged, and all jobs given. */
  loggedJobs: number;
  jobs: number;
};

/** Rounds up, but forgives floating-point noise such as 150.00000000000003. */
function ceilMinor(value: number): number {
  return Math.ceil(Math.round(value * 1e6) / 1e6);
}

/** Undefined when no job has been logged yet: the host enters the cost instead. */
export function runCostFromLog(jobs: readonly LoggedJob[], rates: RunCostRates): RunCost | undefined {
  const logged = jobs.filter(
    (job): job is LoggedJob & { filamentUsedGrams: number; actualHours: number } => job.filamentUsedGrams !== null && job.actualHours !== null,
  );
  if (logged.length === 0) return undefined;
  const filamentGrams = logged.reduce((sum, job) => sum + job.filamentUsedGrams, 0);
  const machineHours = logged.reduce((sum, job) => sum + job.actualHours, 0);
  const filamentMinor = ceilMinor((filamentGrams * rates.filamentPricePerKgMinor) / 1000);
  const machineMinor = ceilMinor(logged.reduce((sum, job) => sum + job.actualHours * job.machineRatePerHourMinor, 0));
  const labourMinor = ceilMinor(rates.labourHours * rates.labourRatePerHourMinor);
  return {
    totalMinor: filamentMinor + machineMinor + labourMinor,
    filamentMinor,
    machineMinor,
    labourMinor,
    filamentGrams,
    machineHours,
    loggedJobs: logged.length,
    jobs: jobs.length,
  };
}

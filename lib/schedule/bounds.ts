import type { DurationJob } from "./types";

const hoursOf = (job: DurationJob) => (typeof job === "number" ? job : job.hours);

/**
 * A lower bound on the makespan of independent jobs on m identical machines: no schedule beats
 * an even share of the total work, nor the longest single job.
 */
export function lowerBound(jobs: readonly DurationJob[], m: number): number {
  if (!(m >= 1)) throw new RangeError("lowerBound needs at least one machine.");
  let total = 0;
  let longest = 0;
  for (const job of jobs) {
    const hours = hoursOf(job);
    total += hours;
    longest = Math.max(longest, hours);
  }
  return Math.max(total / m, longest);
}

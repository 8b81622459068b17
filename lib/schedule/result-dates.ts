import type { Schedule, ScheduleJob } from "./types";

const HOUR = 3_600_000;

/**
 * Each campaign's estimated results date: its last job's end plus report preparation. Null when
 * any of its jobs is unplaced (or missing from the schedule), since no honest date exists then.
 */
export function resultDates(schedule: Schedule, jobs: readonly Pick<ScheduleJob, "id" | "campaignId">[], reportPrepHours: number): Record<string, number | null> {
  const ends = new Map(schedule.placements.map((placement) => [placement.jobId, placement.end]));
  const lastEnd = new Map<string, number | null>();
  for (const job of jobs) {
    const end = ends.get(job.id);
    const soFar = lastEnd.get(job.campaignId);
    if (end === undefined || soFar === null) lastEnd.set(job.campaignId, null);
    else lastEnd.set(job.campaignId, Math.max(soFar ?? end, end));
  }
  const dates: Record<string, number | null> = {};
  for (const [campaignId, end] of lastEnd) dates[campaignId] = end === null ? null : end + reportPrepHours * HOUR;
  return dates;
}

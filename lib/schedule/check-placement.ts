import { DEFAULT_HORIZON_DAYS } from "./build";
import { expandStartWindows } from "./calendar";
import { estimatedHours, ineligibility } from "./eligibility";
import { firstEndingAfter, mergeIntervals } from "./intervals";
import { earliestSlot } from "./slot";
import type { PlacementCheck, ScheduleInput } from "./types";

const MINUTE = 60_000;
const HOUR = 3_600_000;
const DAY = 86_400_000;

/**
 * Whether a host may put a job on a printer. Without `start`: the printer must be able to take
 * it and have, somewhere in the horizon, a start window followed by a maintenance-free stretch
 * long enough (other jobs aside — the recompute places it). With `start` (when work on the job
 * would begin): that instant must not be past, must lie in a start window with the printer's
 * changeover finished inside it, and changeover plus print must miss maintenance. The changeover
 * is always counted here, since the job before it is not known until the queue is recomputed.
 */
export function checkPlacement(input: ScheduleInput, jobId: string, printerId: string, start?: number): PlacementCheck {
  const job = input.jobs.find((candidate) => candidate.id === jobId);
  if (!job) return { ok: false, code: "ineligible", message: "That job is not in the queue." };
  const printer = input.printers.find((candidate) => candidate.id === printerId);
  if (!printer) return { ok: false, code: "ineligible", message: "That printer is not in the lab." };
  const why = ineligibility(job, printer);
  if (why) return { ok: false, code: "ineligible", message: why.message };

  const horizonDays = input.horizonDays ?? DEFAULT_HORIZON_DAYS;
  const horizonEnd = input.now + horizonDays * DAY;
  const windows = expandStartWindows(input.calendar, input.now, horizonEnd);
  const maintenance = mergeIntervals(printer.maintenance);
  const changeoverMs = Math.max(0, printer.changeoverMinutes) * MINUTE;
  const durationMs = (estimatedHours(job, printer.id) ?? 0) * HOUR;

  if (start === undefined) {
    if (earliestSlot(windows, maintenance, input.now, changeoverMs, durationMs) !== null) return { ok: true };
    if (earliestSlot(windows, [], input.now, changeoverMs, durationMs) !== null) {
      return { ok: false, code: "maintenance", message: `Maintenance leaves no stretch of ${formatHours(durationMs)} after a start window on this printer in the next ${horizonDays} days.` };
    }
    return { ok: false, code: "outside_window", message: `There is no start window in the next ${horizonDays} days with room for the changeover.` };
  }

  const block = maintenance[firstEndingAfter(maintenance, start)];
  if (block && block.start < start + changeoverMs + durationMs) {
    return { ok: false, code: "maintenance", message: "The job would run into a maintenance block on this printer." };
  }
  if (start < input.now) return { ok: false, code: "outside_window", message: "That start is in the past." };
  const window = windows[firstEndingAfter(windows, start)];
  if (!window || window.start > start || start + changeoverMs >= window.end) {
    return { ok: false, code: "outside_window", message: "Nobody is in the lab then to start it: pick a time inside a start window." };
  }
  return { ok: true };
}

function formatHours(ms: number): string {
  return `${Math.round((ms / HOUR) * 10) / 10} h`;
}

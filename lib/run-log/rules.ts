import { RuleViolation } from "../rule-violation";

type JobState = "planned" | "scheduled" | "running" | "done" | "failed";
type Outcome = "done" | "failed";

/**
 * Whether a job may start now. A job that is already running is not an error: the caller returns
 * its open run, so a double click or a retried request starts it once.
 */
export function checkCanStart(
  job: { state: JobState; printerId: string | null },
  printer: { status: string; name: string } | undefined,
  maintenanceNow: { reason: string } | undefined,
): "start" | "already_running" {
  if (job.state === "running") return "already_running";
  if (job.state === "done") throw new RuleViolation(409, "job_done", "This job is already done.");
  if (job.state !== "scheduled" || !job.printerId || !printer) {
    throw new RuleViolation(409, "not_scheduled", "This job is waiting for a slot; the queue has not placed it on a printer yet.", "jobId");
  }
  if (printer.status !== "available") {
    throw new RuleViolation(409, "printer_unavailable", `${printer.name} is ${printer.status === "down" ? "down" : "in maintenance"}; mark it available first.`, "jobId");
  }
  if (maintenanceNow) {
    throw new RuleViolation(409, "printer_in_maintenance", `${printer.name} is in a maintenance block now (${maintenanceNow.reason}).`, "jobId");
  }
  return "start";
}

/** What a finished run does to its job: done stays done; a failed print goes back into the queue for another attempt. */
export function jobStateAfterRun(outcome: Outcome): "done" | "planned" {
  return outcome === "done" ? "done" : "planned";
}

/** A second finish for the same run is a retry when it says the same thing, a conflict when it says something else. */
export function isSameFinish(
  stored: { outcome: Outcome | null; actualHours: number | null; filamentUsedGrams: number | null },
  input: { outcome: Outcome; actualHours: number; filamentUsedGrams: number },
): boolean {
  return stored.outcome === input.outcome && stored.actualHours === input.actualHours && stored.filamentUsedGrams === input.filamentUsedGrams;
}

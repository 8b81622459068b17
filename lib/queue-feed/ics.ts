import { createEvents, type EventAttributes } from "ics";

export type FeedJob = {
  jobId: string;
  /** Bumped when the job is tried again, so calendar apps replace the old event (RFC 5545 §3.8.7.4). */
  sequence: number;
  start: number;
  end: number;
  printerName: string;
  campaignTitle: string;
  pieceName: string;
  variantName: string;
  repeat: number;
  running: boolean;
  url?: string;
};

/** RFC 5545 §3.8.4.7: a UID must be globally unique and persistent; one per job, never per placement. */
export function feedUid(jobId: string): string {
  return `job-${jobId}@proofbay.queue`;
}

/** The host calendar feed: one VEVENT per scheduled or running job, times in UTC. */
export function buildQueueCalendar(jobs: readonly FeedJob[], options: { labName: string; now: number }): string {
  if (jobs.length === 0) {
    // `ics` refuses an empty list; an empty VCALENDAR is still a valid feed (RFC 5545 §3.4 allows zero components in practice).
    return ["BEGIN:VCALENDAR", "VERSION:2.0", "CALSCALE:GREGORIAN", "PRODID:-//Proofbay//Print queue//EN", "METHOD:PUBLISH", `X-WR-CALNAME:${escapeText(`${options.labName} print queue`)}`, "END:VCALENDAR", ""].join("\r\n");
  }
  const events: EventAttributes[] = jobs.map((job) => ({
    uid: feedUid(job.jobId),
    sequence: job.sequence,
    start: job.start,
    startInputType: "utc",
    startOutputType: "utc",
    end: job.end,
    endInputType: "utc",
    endOutputType: "utc",
    title: `${job.printerName}: ${job.pieceName} × ${job.variantName}${job.repeat > 1 ? ` #${job.repeat}` : ""}`,
    description: `${job.campaignTitle}\n${job.pieceName} × ${job.variantName}, repeat ${job.repeat}${job.running ? "\nPrinting now." : ""}`,
    location: job.printerName,
    categories: ["Print queue"],
    status: job.running ? "CONFIRMED" : "TENTATIVE",
    busyStatus: "BUSY",
    ...(job.url ? { url: job.url } : {}),
    lastModified: options.now,
  }));
  const { error, value } = createEvents(events, { productId: "-//Proofbay//Print queue//EN", method: "PUBLISH", calName: `${options.labName} print queue` });
  if (error || !value) throw error ?? new Error("Calendar feed could not be built");
  return value;
}

/** RFC 5545 §3.3.11 TEXT escaping. */
function escapeText(text: string): string {
  return text.replace(/\\/g, "\\\\").replace(/;/g, "\\;").replace(/,/g, "\\,").replace(/\n/g, "\\n");
}

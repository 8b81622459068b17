import { and, asc, eq, gt, inArray, isNull, sql } from "drizzle-orm";
import { RuleViolation } from "../../lib/rule-violation";
import { expandStartWindows } from "../../lib/schedule/calendar";
import { checkPlacement } from "../../lib/schedule/check-placement";
import { ineligibility } from "../../lib/schedule/eligibility";
import { comparePriority } from "../../lib/schedule/priority";
import type { Interval } from "../../lib/schedule/types";
import type { Db } from "../client";
import { campaigns, jobs, labClosures, labSettings, printerMaintenance, printers, testPlanPieces, testPlanVariants, type Printer } from "../schema";
import { forgetCachedLabRates } from "./pricing";
import { loadLabCalendar, loadQueueState, recomputeQueueInTx, type RecomputeOptions, type RecomputeResult } from "./queue";
import { QUEUED_CAMPAIGN_STATES } from "./queue-jobs";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

const HOUR_MS = 60 * 60 * 1000;
const DAY_MS = 24 * HOUR_MS;
/** The board shows a little of the past (what is running, what just ended) before the now-line. */
const BOARD_PAST_MS = 6 * HOUR_MS;
const BOARD_MIN_SPAN_MS = 3 * DAY_MS;
const BOARD_MAX_SPAN_MS = 60 * DAY_MS;

export type QueueBoardJob = {
  id: string;
  campaignId: string;
  pieceName: string;
  variantName: string;
  repeat: number;
  state: "planned" | "scheduled" | "running";
  printerId: string | null;
  chosenPrinterId: string | null;
  changeoverStart: number | null;
  start: number | null;
  end: number | null;
  pinned: boolean;
  position: number | null;
  estimatedHours: number;
  unplacedReason: string | null;
};

export type QueueBoard = {
  now: number;
  timeZone: string;
  range: Interval;
  printers: {
    id: string;
    name: string;
    model: string;
    status: Printer["status"];
    materials: string[];
    enclosed: boolean;
    maintenance: (Interval & { reason: string })[];
  }[];
  startWindows: Interval[];
  closures: (Interval & { reason: string })[];
  campaigns: { id: string; slug: string; title: string; state: string; estimatedResultsAt: number | null; colour: number }[];
  jobs: QueueBoardJob[];
};

function readQueuedJobs(db: Db): QueueBoardJob[] {
  const queue = db
    .select({
      id: jobs.id,
      campaignId: jobs.campaignId,
      pieceName: testPlanPieces.name,
      variantName: testPlanVariants.name,
      repeat: jobs.repeat,
      state: jobs.state,
      printerId: jobs.printerId,
      chosenPrinterId: jobs.chosenPrinterId,
      changeoverStart: jobs.scheduledChangeoverStart,
      start: jobs.scheduledStart,
      end: jobs.scheduledEnd,
      pinned: jobs.pinned,
      position: jobs.position,
      estimatedHours: jobs.estimatedHours,
      unplacedReason: jobs.unplacedReason,
    })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .innerJoin(testPlanPieces, eq(testPlanPieces.id, jobs.pieceId))
    .innerJoin(testPlanVariants, eq(testPlanVariants.id, jobs.variantId))
    .where(and(inArray(jobs.state, ["planned", "scheduled", "running"]), inArray(campaigns.state, [...QUEUED_CAMPAIGN_STATES])))
    .orderBy(asc(jobs.scheduledStart))
    .all();

  return queue.map((job) => ({
    ...job,
    state: job.state as QueueBoardJob["state"],
    changeoverStart: job.changeoverStart?.getTime() ?? null,
    start: job.start?.getTime() ?? null,
    end: job.end?.getTime() ?? null,
  }));
}

/*
 * The job list is most of the board's work and changes only when the database does. SQLite's
 * data_version moves when another connection commits, total_changes() when this one writes; while
 * both stand still the last list is still true, so the board polls cheaply.
 */
type JobsSnapshot = { version: string; jobs: QueueBoardJob[]; json: string | null };
const jobsCache = new WeakMap<Db, JobsSnapshot>();

function databaseVersion(db: Db): string {
  const dataVersion = db.$client.pragma("data_version", { simple: true });
  const changes = db.get<{ changes: number }>(sql`select total_changes() as changes`);
  return `${String(dataVersion)}:${changes.changes}`;
}

function queuedJobs(db: Db): JobsSnapshot {
  const version = databaseVersion(db);
  const cached = jobsCache.get(db);
  if (cached && cached.version === version) return cached;
  const fresh = { version, jobs: readQueuedJobs(db), json: null };
  jobsCache.set(db, fresh);
  return fresh;
}

/**
 * What the host's queue board draws, read from the stored schedule (the recompute wrote it), so
 * answering is a few indexed reads and no scheduling.
 */
export function readQueueBoard(db: Db, now: number): QueueBoard {
  const { jobs: boardJobs } = queuedJobs(db);
  return { ...boardFrame(db, now, boardJobs), jobs: boardJobs };
}

/** The board as JSON text; the job list's text is reused while the database has not changed. */
export function queueBoardJson(db: Db, now: number): string {
  const snapshot = queuedJobs(db);
  snapshot.json ??= JSON.stringify(snapshot.jobs);
  const frame = JSON.stringify(boardFrame(db, now, snapshot.jobs));
  return `${frame.slice(0, -1)},"jobs":${snapshot.json}}`;
}

function boardFrame(db: Db, now: number, boardJobs: QueueBoardJob[]): Omit<QueueBoard, "jobs"> {
  const lastEnd = boardJobs.reduce((latest, job) => Math.max(latest, job.end ?? 0), 0);
  const from = now - BOARD_PAST_MS;
  const to = Math.min(now + BOARD_MAX_SPAN_MS, Math.max(now + BOARD_MIN_SPAN_MS, lastEnd + 6 * HOUR_MS));

  const campaignRows = db
    .select({ id: campaigns.id, slug: campaigns.slug, title: campaigns.title, state: campaigns.state, estimatedResultsAt: campaigns.estimatedResultsAt, fundedAt: campaigns.fundedAt })
    .from(campaigns)
    .where(inArray(campaigns.state, [...QUEUED_CAMPAIGN_STATES]))
    .orderBy(asc(campaigns.fundedAt), asc(campaigns.id))
    .all();

  const printerRows = db.select().from(printers).orderBy(asc(printers.name)).all();
  const maintenance = db
    .select()
    .from(printerMaintenance)
    .where(gt(printerMaintenance.endsAt, new Date(from)))
    .orderBy(asc(printerMaintenance.startsAt))
    .all();
  const settings = loadQueueTimeZone(db);
  const calendar = loadLabCalendar(db, settings, now);
  const closures = db
    .select()
    .from(labClosures)
    .where(gt(labClosures.endsAt, new Date(from)))
    .orderBy(asc(labClosures.startsAt))
    .all();

  return {
    now,
    timeZone: settings,
    range: { start: from, end: to },
    printers: printerRows.map((printer) => ({
      id: printer.id,
      name: printer.name,
      model: printer.model,
      status: printer.status,
      materials: printer.materials,
      enclosed: printer.enclosed,
      maintenance: maintenance
        .filter((block) => block.printerId === printer.id && block.startsAt.getTime() < to)
        .map((block) => ({ start: block.startsAt.getTime(), end: block.endsAt.getTime(), reason: block.reason })),
    })),
    // Closures are cut out of the windows; they are drawn on their own.
    startWindows: expandStartWindows({ ...calendar, closures: [] }, from, to),
    closures: closures
      .filter((closure) => closure.startsAt.getTime() < to)
      .map((closure) => ({ start: closure.startsAt.getTime(), end: closure.endsAt.getTime(), reason: closure.reason })),
    // Colours follow funded order, so a campaign keeps its colour while the board refreshes.
    campaigns: campaignRows.map((campaign, index) => ({
      id: campaign.id,
      slug: campaign.slug,
      title: campaign.title,
      state: campaign.state,
      estimatedResultsAt: campaign.estimatedResultsAt?.getTime() ?? null,
      colour: index,
    })),
  };
}

/**
 * True when the stored schedule is behind: a job the scheduler has never looked at (no placement
 * and no reason), e.g. a funded campaign's jobs when the webhook's recompute failed. The board
 * recomputes before answering then.
 */
export function queueNeedsRecompute(db: Db): boolean {
  const neverScheduled = db
    .select({ id: jobs.id })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .where(
      and(
        eq(jobs.state, "planned"),
        isNull(jobs.scheduledStart),
        isNull(jobs.unplacedReason),
        inArray(campaigns.state, [...QUEUED_CAMPAIGN_STATES]),
      ),
    )
    .limit(1)
    .get();
  return neverScheduled !== undefined;
}

function loadQueueTimeZone(db: Db): string {
  const settings = db.select({ timeZone: labSettings.timeZone }).from(labSettings).where(eq(labSettings.id, 1)).get();
  if (!settings) throw new Error("Lab settings are missing: run `npm run db:seed` or create them as an admin.");
  return settings.timeZone;
}

/* ---------- Host commands: each one change plus a recompute, in one IMMEDIATE transaction ---------- */

export type QueueCommandOptions = Omit<RecomputeOptions, "reason"> & { now: Date };

function inQueueTransaction<T>(db: Db, options: QueueCommandOptions, change: (tx: Tx) => { value: T; reason?: string | null }) {
  return db.transaction(
    (tx) => {
      const { value, reason } = change(tx);
      const recompute: RecomputeResult = recomputeQueueInTx(tx, { ...options, reason: reason ?? null });
      return { value, recompute };
    },
    { behavior: "immediate" },
  );
}

function requireQueuedJob(tx: Tx, jobId: string) {
  const job = tx
    .select({ id: jobs.id, state: jobs.state, pinned: jobs.pinned, printerId: jobs.printerId, campaignState: campaigns.state })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .where(eq(jobs.id, jobId))
    .get();
  if (!job || !(QUEUED_CAMPAIGN_STATES as readonly string[]).includes(job.campaignState)) {
    throw new RuleViolation(404, "not_found", "No such job in the queue.");
  }
  if (job.state === "done") throw new RuleViolation(409, "job_done", "This job is done; the queue no longer moves it.");
  if (job.state === "running") throw new RuleViolation(409, "job_running", "This job is printing; finish or fail it in the run log first.");
  return job;
}

export function setJobPinned(db: Db, jobId: string, pinned: boolean, options: QueueCommandOptions) {
  return inQueueTransaction(db, options, (tx) => {
    requireQueuedJob(tx, jobId);
    tx.update(jobs).set({ pinned }).where(eq(jobs.id, jobId)).run();
    return { value: { jobId, pinned } };
  });
}

/**
 * Moves a job one place earlier or later among the jobs on its printer. The board's order becomes
 * the host's order: every waiting job gets a position by its current start (unplaced ones after,
 * in queue order), then the job and its neighbour on that printer swap positions, so the
 * scheduler takes the job before the neighbour.
 */
export function moveJob(db: Db, jobId: string, direction: "up" | "down", options: QueueCommandOptions) {
  return inQueueTransaction(db, options, (tx) => {
    const job = requireQueuedJob(tx, jobId);
    const state = loadQueueState(tx, options.now.getTime());
    const startOf = (id: string) => state.rows.get(id)?.scheduledStart ?? null;
    const waiting = state.input.jobs.filter((candidate) => !candidate.running);
    const onPrinter = waiting
      .filter((candidate) => state.rows.get(candidate.id)?.printerId === job.printerId && startOf(candidate.id) !== null)
      .sort((a, b) => (startOf(a.id) ?? 0) - (startOf(b.id) ?? 0) || comparePriority(a, b));
    const index = onPrinter.findIndex((candidate) => candidate.id === jobId);
    if (!job.printerId || index < 0) throw new RuleViolation(409, "not_placed", "This job has no place on a printer yet, so it cannot move up or down.");
    const neighbour = onPrinter[direction === "up" ? index - 1 : index + 1];
    if (!neighbour) {
      throw new RuleViolation(409, direction === "up" ? "already_first" : "already_last", `This job is already ${direction === "up" ? "first" : "last"} on its printer.`);
    }
    if (neighbour.pinned !== job.pinned) {
      throw new RuleViolation(409, "pin_order", "Pinned jobs always come before unpinned ones: pin or unpin one of the two first.");
    }

    const order = [...waiting].sort((a, b) => {
      const [startA, startB] = [startOf(a.id), startOf(b.id)];
      if (startA !== null && startB !== null && startA !== startB) return startA - startB;
      if ((startA === null) !== (startB === null)) return startA === null ? 1 : -1;
      return comparePriority(a, b);
    });
    const positions = new Map(order.map((candidate, i) => [candidate.id, i + 1]));
    const jobPosition = positions.get(jobId) ?? 0;
    positions.set(jobId, positions.get(neighbour.id) ?? 0);
    positions.set(neighbour.id, jobPosition);

    const storePosition = tx
      .update(jobs)
      .set({ position: sql`${sql.placeholder("position")}` })
      .where(eq(jobs.id, sql.placeholder("id")))
      .prepare();
    for (const candidate of waiting) {
      const position = positions.get(candidate.id) ?? null;
      if (candidate.position !== position) storePosition.run({ id: candidate.id, position });
    }
    return { value: { jobId, direction } };
  });
}

/**
 * Puts a job on the printer the host chose (null gives the choice back to the scheduler). The
 * printer must be able to print it (422, naming why) and be in use with room outside maintenance
 * and inside start windows (409).
 */
export function assignJobPrinter(db: Db, jobId: string, printerId: string | null, options: QueueCommandOptions) {
  return inQueueTransaction(db, options, (tx) => {
    requireQueuedJob(tx, jobId);
    if (printerId !== null) {
      const state = loadQueueState(tx, options.now.getTime());
      const printer = state.printers.find((candidate) => candidate.id === printerId);
      const scheduleJob = state.input.jobs.find((candidate) => candidate.id === jobId);
      const schedulePrinter = state.input.printers.find((candidate) => candidate.id === printerId);
      if (!printer || !schedulePrinter) throw new RuleViolation(422, "unknown_printer", "No such printer in the lab.", "printerId");
      if (!scheduleJob) throw new RuleViolation(404, "not_found", "No such job in the queue.");
      if (printer.status !== "available") {
        throw new RuleViolation(
          409,
          printer.status === "maintenance" ? "printer_in_maintenance" : "printer_down",
          `${printer.name} is ${printer.status === "maintenance" ? "in maintenance" : "down"}; nothing new goes on it until it is available again.`,
          "printerId",
        );
      }
      const why = ineligibility(scheduleJob, schedulePrinter);
      if (why) throw new RuleViolation(422, `ineligible_${why.code}`, `${printer.name} cannot print this job: ${why.message}`, "printerId");
      const check = checkPlacement(state.input, jobId, printerId);
      if (!check.ok) throw new RuleViolation(check.code === "ineligible" ? 422 : 409, check.code, `${printer.name}: ${check.message}`, "printerId");
    }
    tx.update(jobs).set({ chosenPrinterId: printerId }).where(eq(jobs.id, jobId)).run();
    return { value: { jobId, printerId } };
  });
}

/** The board's down/up switch; the recompute moves the printer's jobs elsewhere (or back). */
export function setPrinterAvailability(db: Db, printerId: string, status: "available" | "down", options: QueueCommandOptions) {
  const result = inQueueTransaction(db, options, (tx) => {
    const printer = tx.select({ id: printers.id, name: printers.name, status: printers.status }).from(printers).where(eq(printers.id, printerId)).get();
    if (!printer) throw new RuleViolation(404, "not_found", "No such printer.");
    if (printer.status !== status) tx.update(printers).set({ status }).where(eq(printers.id, printerId)).run();
    return {
      value: { printerId, status, changed: printer.status !== status },
      reason: status === "down" ? `${printer.name} is out of use for repair, so its prints moved to other printers or later.` : null,
    };
  });
  forgetCachedLabRates(db);
  return result;
}

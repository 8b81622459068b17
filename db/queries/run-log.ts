import { and, asc, desc, eq, gt, inArray, isNull, lte, max, sql } from "drizzle-orm";
import { checkCanStart, isSameFinish, jobStateAfterRun } from "../../lib/run-log/rules";
import { RuleViolation } from "../../lib/rule-violation";
import type { FinishRunInput } from "../../lib/validation/run-log";
import type { Db } from "../client";
import { campaigns, jobRuns, jobs, printerMaintenance, printers, testPlanPieces, testPlans, testPlanVariants, type JobRun } from "../schema";

const immediate = { behavior: "immediate" } as const;
const HOUR_MS = 3_600_000;

/** A job with what the run log page shows beside it. */
export function getRunLogJob(db: Db, jobId: string) {
  const row = db
    .select({
      job: jobs,
      campaign: { id: campaigns.id, title: campaigns.title, slug: campaigns.slug, state: campaigns.state },
      pieceName: testPlanPieces.name,
      pieceGrams: testPlanPieces.filamentGrams,
      variantName: testPlanVariants.name,
      material: testPlans.material,
      printer: printers,
    })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .innerJoin(testPlanPieces, eq(testPlanPieces.id, jobs.pieceId))
    .innerJoin(testPlanVariants, eq(testPlanVariants.id, jobs.variantId))
    .leftJoin(testPlans, eq(testPlans.campaignId, jobs.campaignId))
    .leftJoin(printers, eq(printers.id, jobs.printerId))
    .where(eq(jobs.id, jobId))
    .get();
  if (!row) return undefined;
  const runs = db
    .select({ run: jobRuns, printerName: printers.name })
    .from(jobRuns)
    .innerJoin(printers, eq(printers.id, jobRuns.printerId))
    .where(eq(jobRuns.jobId, jobId))
    .orderBy(desc(jobRuns.attempt))
    .all();
  return { ...row, runs };
}
export type RunLogJob = NonNullable<ReturnType<typeof getRunLogJob>>;

/** Running jobs and the next scheduled ones, for the run log's list. */
export function listRunLogJobs(db: Db, limit = 40) {
  return db
    .select({
      id: jobs.id,
      state: jobs.state,
      repeat: jobs.repeat,
      scheduledStart: jobs.scheduledStart,
      estimatedHours: jobs.estimatedHours,
      campaignTitle: campaigns.title,
      pieceName: testPlanPieces.name,
      variantName: testPlanVariants.name,
      printerName: printers.name,
    })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .innerJoin(testPlanPieces, eq(testPlanPieces.id, jobs.pieceId))
    .innerJoin(testPlanVariants, eq(testPlanVariants.id, jobs.variantId))
    .leftJoin(printers, eq(printers.id, jobs.printerId))
    .where(inArray(jobs.state, ["running", "scheduled", "planned"]))
    .orderBy(sql`case ${jobs.state} when 'running' then 0 else 1 end`, sql`${jobs.scheduledStart} is null`, asc(jobs.scheduledStart), asc(jobs.id))
    .limit(limit)
    .all();
}

/**
 * Starts a job on its scheduled printer. One immediate transaction: a job that is already running
 * returns its open run instead of starting a second (a double click, a retried request), and the
 * partial unique index on open runs backs that up.
 */
export function startJobRun(db: Db, args: { jobId: string; userId: string | null; now: number }): { run: JobRun; started: boolean } {
  return db.transaction((tx) => {
    const job = tx.select().from(jobs).where(eq(jobs.id, args.jobId)).get();
    if (!job) throw new RuleViolation(404, "not_found", "That job does not exist.", "jobId");
    const printer = job.printerId ? tx.select().from(printers).where(eq(printers.id, job.printerId)).get() : undefined;
    const at = new Date(args.now);
    const maintenanceNow = printer
      ? tx
          .select({ reason: printerMaintenance.reason })
          .from(printerMaintenance)
          .where(and(eq(printerMaintenance.printerId, printer.id), lte(printerMaintenance.startsAt, at), gt(printerMaintenance.endsAt, at)))
          .get()
      : undefined;
    const decision = checkCanStart(job, printer, job.state === "running" ? undefined : maintenanceNow);
    const open = tx
      .select()
      .from(jobRuns)
      .where(and(eq(jobRuns.jobId, job.id), isNull(jobRuns.outcome)))
      .get();
    if (decision === "already_running" && open) return { run: open, started: false };
    if (!printer) throw new RuleViolation(409, "not_scheduled", "This job is not placed on a printer.", "jobId");

    const last = tx.select({ attempt: max(jobRuns.attempt) }).from(jobRuns).where(eq(jobRuns.jobId, job.id)).get();
    // A job marked running before the run log existed (older data) gets its run from its scheduled start.
    const startedAt = decision === "already_running" ? (job.scheduledStart?.getTime() ?? args.now) : args.now;
    const run = tx
      .insert(jobRuns)
      .values({
        jobId: job.id,
        attempt: (last?.attempt ?? 0) + 1,
        printerId: printer.id,
        startedAt: new Date(startedAt),
        estimatedHoursAtStart: job.estimatedHours,
        efficiencyAtStart: printer.efficiency,
        startedById: args.userId,
      })
      .returning()
      .get();
    tx.update(jobs)
      .set({ state: "running", scheduledStart: new Date(startedAt), scheduledEnd: new Date(startedAt + job.estimatedHours * HOUR_MS) })
      .where(eq(jobs.id, job.id))
      .run();
    tx.update(campaigns)
      .set({ state: "printing" })
      .where(and(eq(campaigns.id, job.campaignId), inArray(campaigns.state, ["funded", "queued"])))
      .run();
    return { run, started: true };
  }, immediate);
}

/**
 * Finishes an open run. Done: the job is done with its actual hours and filament. Failed: the job
 * goes back into the queue (planned) and its next start is a new attempt. Finishing a run again
 * with the same figures is a retry and changes nothing; different figures are a 409.
 */
export function finishJobRun(db: Db, input: FinishRunInput, args: { userId: string | null; now: number }): { run: JobRun; repeated: boolean } {
  return db.transaction((tx) => {
    const run = tx.select().from(jobRuns).where(eq(jobRuns.id, input.runId)).get();
    if (!run) throw new RuleViolation(404, "not_found", "That run does not exist.", "runId");
    if (run.outcome !== null) {
      if (isSameFinish(run, input)) return { run, repeated: true };
      throw new RuleViolation(409, "already_logged", `This run was already logged as ${run.outcome} (${run.actualHours} h); start a new attempt instead.`, "runId");
    }
    const finished = tx
      .update(jobRuns)
      .set({
        finishedAt: new Date(args.now),
        actualHours: input.actualHours,
        filamentUsedGrams: input.filamentUsedGrams,
        outcome: input.outcome,
        failureReason: input.outcome === "failed" ? (input.failureReason ?? null) : null,
        notes: input.notes ?? null,
        finishedById: args.userId,
      })
      .where(and(eq(jobRuns.id, run.id), isNull(jobRuns.outcome)))
      .returning()
      .get();
    const state = jobStateAfterRun(input.outcome);
    tx.update(jobs)
      .set(
        state === "done"
          ? { state, actualHours: input.actualHours, filamentUsedGrams: input.filamentUsedGrams, notes: input.notes ?? null, scheduledEnd: new Date(args.now) }
          : { state, scheduledStart: null, scheduledEnd: null, scheduledChangeoverStart: null },
      )
      .where(eq(jobs.id, run.jobId))
      .run();
    return { run: finished, repeated: false };
  }, immediate);
}

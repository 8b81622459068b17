import { and, eq, gt, inArray, isNotNull, isNull, sql } from "drizzle-orm";
import { isMaterialId, getMaterial } from "../../lib/estimate/materials";
import { formatDate } from "../../lib/format";
import { dateNotice, type DateNotice } from "../../lib/queue/date-notices";
import { jobHoursOnPrinter } from "../../lib/queue/job-hours";
import { buildSchedule } from "../../lib/schedule/build";
import { resultDates } from "../../lib/schedule/result-dates";
import type { LabCalendar, Schedule, ScheduleInput, ScheduleJob, SchedulePrinter, WeeklyWindow } from "../../lib/schedule/types";
import type { Db } from "../client";
import {
  campaigns,
  jobRuns,
  jobs,
  labClosures,
  labSettings,
  labStartWindows,
  pledges,
  printerMaintenance,
  printers,
  testPlanPieces,
  testPlans,
  users,
  type Printer,
} from "../schema";
import { enqueueMail } from "./outbox";
import { printerProfile } from "./pricing";
import { materialiseMissingJobs, QUEUED_CAMPAIGN_STATES } from "./queue-jobs";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Jobs still to print (a failed run puts its job back to planned). */
const PENDING_JOB_STATES = ["planned", "scheduled", "running"] as const;

export type QueueSettings = { timeZone: string; reportPrepHours: number; slipNoticeDays: number };

/** A queued job with what the board and the mails need beside the scheduler's view of it. */
export type QueueJobRow = {
  id: string;
  campaignId: string;
  state: (typeof PENDING_JOB_STATES)[number];
  printerId: string | null;
  scheduledStart: number | null;
  scheduledEnd: number | null;
  scheduledChangeoverStart: number | null;
  unplacedReason: string | null;
};

export type QueueState = {
  settings: QueueSettings;
  printers: Printer[];
  input: ScheduleInput;
  rows: Map<string, QueueJobRow>;
};

function loadSettings(tx: Tx | Db): QueueSettings {
  const settings = tx
    .select({ timeZone: labSettings.timeZone, reportPrepHours: labSettings.reportPrepHours, slipNoticeDays: labSettings.slipNoticeDays })
    .from(labSettings)
    .where(eq(labSettings.id, 1))
    .get();
  if (!settings) throw new Error("Lab settings are missing: run `npm run db:seed` or create them as an admin.");
  return settings;
}

/**
 * The lab's weekly start windows and the closures that have not ended yet. (No windows at all
 * means no staffing limit: see LabCalendar in lib/schedule/types.ts.)
 */
export function loadLabCalendar(tx: Tx | Db, timeZone: string, now: number): LabCalendar {
  const startWindows = tx
    .select({ isoWeekday: labStartWindows.isoWeekday, startMinute: labStartWindows.startMinute, endMinute: labStartWindows.endMinute })
    .from(labStartWindows)
    .all() as WeeklyWindow[];
  const closures = tx
    .select({ start: labClosures.startsAt, end: labClosures.endsAt })
    .from(labClosures)
    .where(gt(labClosures.endsAt, new Date(now)))
    .all()
    .map((closure) => ({ start: closure.start.getTime(), end: closure.end.getTime() }));
  return { timeZone, startWindows, closures };
}

export function schedulePrinter(
  printer: Printer,
  maintenance: { start: number; end: number }[],
  setup: SchedulePrinter["setup"] = null,
): SchedulePrinter {
  return {
    setup,
    id: printer.id,
    available: printer.status === "available",
    materials: printer.materials,
    enclosed: printer.enclosed,
    buildMm: { x: printer.buildXmm, y: printer.buildYmm, z: printer.buildZmm },
    changeoverMinutes: printer.changeoverMinutes,
    maintenance,
  };
}

/** What each printer is set up for: the variant and material of the last run started on it. */
function loadPrinterSetups(tx: Tx | Db): Map<string, { variantKey: string; material: string }> {
  const runs = tx
    .select({ printerId: jobRuns.printerId, startedAt: jobRuns.startedAt, variantId: jobs.variantId, material: testPlans.material })
    .from(jobRuns)
    .innerJoin(jobs, eq(jobs.id, jobRuns.jobId))
    .innerJoin(testPlans, eq(testPlans.campaignId, jobs.campaignId))
    .where(
      eq(
        jobRuns.startedAt,
        sql`(select max(latest.started_at) from ${jobRuns} as latest where latest.printer_id = ${jobRuns.printerId})`,
      ),
    )
    .all();
  return new Map(runs.map((run) => [run.printerId, { variantKey: run.variantId, material: run.material }]));
}

/**
 * Everything the scheduler needs, read in one go: printers with their maintenance, the calendar,
 * and every job still to print with its hours on each printer from the estimation engine at that
 * printer's current (calibrated) efficiency.
 */
export function loadQueueState(tx: Tx | Db, now: number): QueueState {
  const settings = loadSettings(tx);
  const printerRows = tx.select().from(printers).all();
  const maintenanceByPrinter = new Map<string, { start: number; end: number }[]>();
  for (const block of tx.select().from(printerMaintenance).where(gt(printerMaintenance.endsAt, new Date(now))).all()) {
    const list = maintenanceByPrinter.get(block.printerId) ?? [];
    list.push({ start: block.startsAt.getTime(), end: block.endsAt.getTime() });
    maintenanceByPrinter.set(block.printerId, list);
  }

  const pending = tx
    .select({
      id: jobs.id,
      campaignId: jobs.campaignId,
      pieceId: jobs.pieceId,
      variantId: jobs.variantId,
      state: jobs.state,
      printerId: jobs.printerId,
      chosenPrinterId: jobs.chosenPrinterId,
      pinned: jobs.pinned,
      position: jobs.position,
      estimatedHours: jobs.estimatedHours,
      scheduledStart: jobs.scheduledStart,
      scheduledEnd: jobs.scheduledEnd,
      scheduledChangeoverStart: jobs.scheduledChangeoverStart,
      unplacedReason: jobs.unplacedReason,
      sizeXmm: jobs.sizeXmm,
      sizeYmm: jobs.sizeYmm,
      sizeZmm: jobs.sizeZmm,
      fundedAt: campaigns.fundedAt,
      openedAt: campaigns.openedAt,
      material: testPlans.material,
      maxFlowMm3PerS: testPlans.maxFlowMm3PerS,
      filamentGrams: testPlanPieces.filamentGrams,
    })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .innerJoin(testPlans, eq(testPlans.campaignId, jobs.campaignId))
    .innerJoin(testPlanPieces, eq(testPlanPieces.id, jobs.pieceId))
    .where(and(inArray(jobs.state, [...PENDING_JOB_STATES]), inArray(campaigns.state, [...QUEUED_CAMPAIGN_STATES])))
    .all();

  const openRuns = new Map(
    tx
      .select({ jobId: jobRuns.jobId, printerId: jobRuns.printerId, startedAt: jobRuns.startedAt, estimatedHours: jobRuns.estimatedHoursAtStart })
      .from(jobRuns)
      .where(isNull(jobRuns.outcome))
      .all()
      .map((run) => [run.jobId, run]),
  );

  const setups = loadPrinterSetups(tx);
  const profiles = printerRows.map((printer) => ({ id: printer.id, profile: printerProfile(printer) }));
  const hoursCache = new Map<string, Record<string, number>>();
  const hoursFor = (job: (typeof pending)[number]): Record<string, number> => {
    const key = `${job.pieceId}|${job.material}|${job.maxFlowMm3PerS}`;
    let hours = hoursCache.get(key);
    if (!hours) {
      hours = {};
      if (isMaterialId(job.material)) {
        const protocol = { material: job.material, maxFlowMm3PerS: job.maxFlowMm3PerS };
        for (const { id, profile } of profiles) hours[id] = jobHoursOnPrinter(job.filamentGrams, protocol, profile);
      }
      hoursCache.set(key, hours);
    }
    return hours;
  };

  const rows = new Map<string, QueueJobRow>();
  const scheduleJobs: ScheduleJob[] = pending.map((job) => {
    rows.set(job.id, {
      id: job.id,
      campaignId: job.campaignId,
      state: job.state as QueueJobRow["state"],
      printerId: job.printerId,
      scheduledStart: job.scheduledStart?.getTime() ?? null,
      scheduledEnd: job.scheduledEnd?.getTime() ?? null,
      scheduledChangeoverStart: job.scheduledChangeoverStart?.getTime() ?? null,
      unplacedReason: job.unplacedReason,
    });
    const run = openRuns.get(job.id);
    const runningOn = run?.printerId ?? job.printerId;
    const runningFrom = run?.startedAt.getTime() ?? job.scheduledStart?.getTime() ?? now;
    const hoursByPrinter = hoursFor(job);
    return {
      id: job.id,
      campaignId: job.campaignId,
      variantKey: job.variantId,
      material: job.material,
      needsEnclosure: isMaterialId(job.material) ? getMaterial(job.material).needsEnclosure : false,
      sizeMm: { x: job.sizeXmm ?? 0, y: job.sizeYmm ?? 0, z: job.sizeZmm ?? 0 },
      // A running job keeps the hours it was started with on its printer.
      hoursByPrinter: job.state === "running" && runningOn ? { ...hoursByPrinter, [runningOn]: run?.estimatedHours ?? job.estimatedHours } : hoursByPrinter,
      fundedAt: (job.fundedAt ?? job.openedAt).getTime(),
      pinned: job.pinned,
      position: job.position,
      printerId: job.chosenPrinterId,
      ...(job.state === "running" && runningOn ? { running: { printerId: runningOn, start: runningFrom } } : {}),
    };
  });

  return {
    settings,
    printers: printerRows,
    input: {
      now,
      calendar: loadLabCalendar(tx, settings.timeZone, now),
      printers: printerRows.map((printer) => schedulePrinter(printer, maintenanceByPrinter.get(printer.id) ?? [], setups.get(printer.id) ?? null)),
      jobs: scheduleJobs,
    },
    rows,
  };
}

export type RecomputeOptions = {
  now?: Date;
  /** Base of the links in the mails, e.g. http://localhost:3000. */
  appUrl: string;
  /** What changed, told to backers whose date slips (e.g. "Bay 2 — Wren is down for repair"). */
  reason?: string | null;
  /**
   * false: record dates as told without queueing mail — for the demo seed, whose campaigns stand
   * for a past in which backers already heard their dates.
   */
  mail?: boolean;
};

export type RecomputeResult = {
  schedule: Schedule;
  /** Jobs written for funded campaigns that had none. */
  jobsCreated: number;
  jobsUpdated: number;
  campaignsUpdated: number;
  notices: { campaignId: string; notice: DateNotice; backers: number }[];
};

const sameInstant = (a: number | null, b: number | null) => a === b;

/**
 * Recomputes the whole queue inside the caller's transaction: writes jobs for funded campaigns
 * that have none, runs the scheduler, stores each job's placement (or why it has none) and each
 * campaign's estimated results date, and queues the backers' date mails. Mails are queued in the
 * same transaction as the date they announce, with dedupe keys, so a retried recompute never
 * mails twice.
 */
export function recomputeQueueInTx(tx: Tx, options: RecomputeOptions): RecomputeResult {
  const now = options.now ?? new Date();
  const jobsCreated = materialiseMissingJobs(tx);
  const state = loadQueueState(tx, now.getTime());
  const schedule = buildSchedule(state.input);

  // A printer going down can move every job: one prepared statement, not a query built per row.
  // Wrapped placeholders take driver values as they are (milliseconds for the timestamps).
  const storePlacement = tx
    .update(jobs)
    .set({
      state: sql`${sql.placeholder("state")}`,
      printerId: sql`${sql.placeholder("printerId")}`,
      scheduledStart: sql`${sql.placeholder("start")}`,
      scheduledEnd: sql`${sql.placeholder("end")}`,
      scheduledChangeoverStart: sql`${sql.placeholder("changeoverStart")}`,
      unplacedReason: sql`${sql.placeholder("unplacedReason")}`,
    })
    .where(eq(jobs.id, sql.placeholder("id")))
    .prepare();

  let jobsUpdated = 0;
  for (const exact of schedule.placements) {
    // Timestamps are stored as whole milliseconds.
    const placement = { ...exact, start: Math.round(exact.start), end: Math.round(exact.end), changeoverStart: Math.round(exact.changeoverStart) };
    const row = state.rows.get(placement.jobId);
    if (!row) continue;
    const nextState = row.state === "running" ? "running" : "scheduled";
    if (
      row.state === nextState &&
      row.printerId === placement.printerId &&
      sameInstant(row.scheduledStart, placement.start) &&
      sameInstant(row.scheduledEnd, placement.end) &&
      sameInstant(row.scheduledChangeoverStart, placement.changeoverStart) &&
      row.unplacedReason === null
    ) {
      continue;
    }
    storePlacement.run({
      id: placement.jobId,
      state: nextState,
      printerId: placement.printerId,
      start: placement.start,
      end: placement.end,
      changeoverStart: placement.changeoverStart,
      unplacedReason: null,
    });
    jobsUpdated++;
  }
  for (const unplaced of schedule.unplaced) {
    const row = state.rows.get(unplaced.jobId);
    if (!row || row.state === "running") continue;
    if (row.state === "planned" && row.scheduledStart === null && row.unplacedReason === unplaced.message) continue;
    storePlacement.run({ id: unplaced.jobId, state: "planned", printerId: row.printerId, start: null, end: null, changeoverStart: null, unplacedReason: unplaced.message });
    jobsUpdated++;
  }

  const dates = new Map(Object.entries(resultDates(schedule, state.input.jobs, state.settings.reportPrepHours)));
  for (const [campaignId, date] of printedCampaignDates(tx, state.settings.reportPrepHours)) if (!dates.has(campaignId)) dates.set(campaignId, date);
  const campaignRows = dates.size
    ? tx
        .select({
          id: campaigns.id,
          slug: campaigns.slug,
          title: campaigns.title,
          estimatedResultsAt: campaigns.estimatedResultsAt,
          scheduledNotifiedAt: campaigns.scheduledNotifiedAt,
          lastNotifiedResultsAt: campaigns.lastNotifiedResultsAt,
        })
        .from(campaigns)
        .where(inArray(campaigns.id, [...dates.keys()]))
        .all()
    : [];

  let campaignsUpdated = 0;
  const notices: RecomputeResult["notices"] = [];
  for (const campaign of campaignRows) {
    const exactDate = dates.get(campaign.id);
    const resultsAt = exactDate === undefined || exactDate === null ? null : Math.round(exactDate);
    const notice = dateNotice(
      {
        estimatedResultsAt: resultsAt,
        scheduledNotifiedAt: campaign.scheduledNotifiedAt?.getTime() ?? null,
        lastNotifiedResultsAt: campaign.lastNotifiedResultsAt?.getTime() ?? null,
      },
      state.settings.slipNoticeDays,
    );
    const dateChanged = (campaign.estimatedResultsAt?.getTime() ?? null) !== resultsAt;
    if (!dateChanged && !notice) continue;

    tx.update(campaigns)
      .set({
        estimatedResultsAt: resultsAt === null ? null : new Date(resultsAt),
        ...(notice ? { lastNotifiedResultsAt: new Date(notice.resultsAt) } : {}),
        ...(notice?.kind === "scheduled" ? { scheduledNotifiedAt: now } : {}),
      })
      .where(eq(campaigns.id, campaign.id))
      .run();
    campaignsUpdated++;
    if (notice && options.mail !== false) {
      const backers = mailBackers(tx, campaign, notice, { ...options, now, timeZone: state.settings.timeZone, jobs: countJobs(state.input, campaign.id) });
      notices.push({ campaignId: campaign.id, notice, backers });
    }
  }
  // A funded campaign whose every job has a place on a printer is queued; its first run moves it to printing.
  tx.update(campaigns)
    .set({ state: "queued" })
    .where(and(eq(campaigns.state, "funded"), isNotNull(campaigns.estimatedResultsAt)))
    .run();
  return { schedule, jobsCreated, jobsUpdated, campaignsUpdated, notices };
}

function countJobs(input: ScheduleInput, campaignId: string): number {
  let count = 0;
  for (const job of input.jobs) if (job.campaignId === campaignId) count++;
  return count;
}

/** Campaigns whose every job is printed: the last run's finish plus report preparation. */
function printedCampaignDates(tx: Tx, reportPrepHours: number): Map<string, number> {
  const rows = tx
    .select({ campaignId: jobs.campaignId, lastFinish: sql<number | null>`max(${jobRuns.finishedAt})` })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .leftJoin(jobRuns, and(eq(jobRuns.jobId, jobs.id), eq(jobRuns.outcome, "done")))
    .where(inArray(campaigns.state, [...QUEUED_CAMPAIGN_STATES]))
    .groupBy(jobs.campaignId)
    .having(sql`sum(case when ${jobs.state} = 'done' then 0 else 1 end) = 0`)
    .all();
  const dates = new Map<string, number>();
  for (const row of rows) if (row.lastFinish !== null) dates.set(row.campaignId, Number(row.lastFinish) + reportPrepHours * 3_600_000);
  return dates;
}

/** Dedupe keys: one "scheduled" mail per backer per campaign, one "slipped" mail per backer per announced date. */
export const queueMailKeys = {
  scheduled: (campaignId: string, userId: string) => `campaign-scheduled:${campaignId}:${userId}`,
  slipped: (campaignId: string, resultsAt: number, userId: string) => `campaign-date-slipped:${campaignId}:${resultsAt}:${userId}`,
};

function mailBackers(
  tx: Tx,
  campaign: { id: string; slug: string; title: string },
  notice: DateNotice,
  context: { appUrl: string; reason?: string | null; now: Date; timeZone: string; jobs: number },
): number {
  const backers = tx
    .selectDistinct({ id: users.id, email: users.email, name: users.name })
    .from(pledges)
    .innerJoin(users, eq(users.id, pledges.supporterId))
    .where(and(eq(pledges.campaignId, campaign.id), eq(pledges.state, "paid")))
    .all();
  const campaignUrl = `${context.appUrl}/campaigns/${campaign.slug}`;
  const resultsOn = formatDate(new Date(notice.resultsAt), context.timeZone);
  let mailed = 0;
  for (const backer of backers) {
    if (!backer.email) continue;
    if (notice.kind === "scheduled") {
      enqueueMail(
        tx,
        {
          dedupeKey: queueMailKeys.scheduled(campaign.id, backer.id),
          toAddress: backer.email,
          userId: backer.id,
          template: "campaign-scheduled",
          subject: `“${campaign.title}”: results expected ${resultsOn}`,
          payload: { name: backer.name, campaignTitle: campaign.title, resultsOn, timeZone: context.timeZone, jobs: context.jobs, campaignUrl },
        },
        context.now,
      );
    } else {
      enqueueMail(
        tx,
        {
          dedupeKey: queueMailKeys.slipped(campaign.id, notice.resultsAt, backer.id),
          toAddress: backer.email,
          userId: backer.id,
          template: "campaign-date-slipped",
          subject: `“${campaign.title}”: results now expected ${resultsOn}`,
          payload: {
            name: backer.name,
            campaignTitle: campaign.title,
            previousDate: formatDate(new Date(notice.previous), context.timeZone),
            newDate: resultsOn,
            timeZone: context.timeZone,
            reason: context.reason ?? null,
            campaignUrl,
          },
        },
        context.now,
      );
    }
    mailed++;
  }
  return mailed;
}

/** `recomputeQueueInTx` in its own IMMEDIATE transaction, so two recomputes never interleave. */
export function recomputeQueue(db: Db, options: RecomputeOptions): RecomputeResult {
  return db.transaction((tx) => recomputeQueueInTx(tx, options), { behavior: "immediate" });
}

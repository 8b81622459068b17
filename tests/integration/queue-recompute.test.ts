import { and, eq, inArray, like } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { assignJobPrinter, moveJob, readQueueBoard, setPrinterAvailability } from "@/db/queries/queue-board";
import { fundIfGoalReached } from "@/db/queries/pledges";
import { jobIdFor, materialiseJobs } from "@/db/queries/queue-jobs";
import { loadQueueState, recomputeQueue } from "@/db/queries/queue";
import { campaigns, jobRuns, jobs, outbox, pledges, printerMaintenance, printers, testPlanPieces, testPlans, testPlanVariants } from "@/db/schema";
import { seedDemo, seedId } from "@/db/seed";
import { RuleViolation } from "@/lib/rule-violation";
import { buildSchedule } from "@/lib/schedule/build";
import { createTempDb } from "../helpers/temp-db";

const NOW = new Date("2026-03-10T15:00:00Z");
const DAY = 86_400_000;
const appUrl = "http://localhost:3000";

const temp = createTempDb();
afterAll(() => temp.cleanup());
const db = temp.db;
seedDemo(db, { now: NOW });

// db/seed-data.ts: "matte-pla" is funded (PLA on the Wren), "asa-warp" queued (ASA on the Heron, the
// only enclosed printer), "petg-bridging" printing on the Kestrel.
const mattePla = db.select().from(campaigns).where(like(campaigns.slug, "matte-pla%")).get()!;
const asaWarp = db.select().from(campaigns).where(like(campaigns.slug, "asa-corner%")).get()!;
const kestrel = seedId("printer", "kestrel");
const wren = seedId("printer", "wren");
const heron = seedId("printer", "heron");

function expectedJobCount(campaignId: string): number {
  const plan = db.select().from(testPlans).where(eq(testPlans.campaignId, campaignId)).get()!;
  const pieces = db.select().from(testPlanPieces).where(eq(testPlanPieces.testPlanId, plan.id)).all().length;
  const variants = db.select().from(testPlanVariants).where(eq(testPlanVariants.testPlanId, plan.id)).all().length;
  return pieces * variants * plan.repeats;
}

function campaignJobs(campaignId: string) {
  return db.select().from(jobs).where(eq(jobs.campaignId, campaignId)).all();
}

function backerIds(campaignId: string): string[] {
  return db
    .selectDistinct({ id: pledges.supporterId })
    .from(pledges)
    .where(and(eq(pledges.campaignId, campaignId), eq(pledges.state, "paid")))
    .all()
    .map((row) => row.id);
}

function mails(template: string, campaignId: string) {
  return db.select().from(outbox).where(and(eq(outbox.template, template), like(outbox.dedupeKey, `${template}:${campaignId}:%`))).all();
}

describe("job materialisation", () => {
  it("gave the seeded funded campaign one job per piece × variant × repeat, and a second call adds none", () => {
    const before = campaignJobs(mattePla.id);
    expect(before).toHaveLength(expectedJobCount(mattePla.id));
    expect(new Set(before.map((job) => `${job.pieceId}|${job.variantId}|${job.repeat}`)).size).toBe(before.length);
    expect(db.transaction((tx) => materialiseJobs(tx, mattePla.id))).toBe(0);
    expect(materialiseJobs(db, mattePla.id)).toBe(0);
    const after = campaignJobs(mattePla.id);
    expect(after.map((job) => job.id).sort()).toEqual(before.map((job) => job.id).sort());
    for (const job of after) expect(job.id).toBe(jobIdFor(job.campaignId, job.pieceId, job.variantId, job.repeat));
  });

  it("writes the jobs in the transaction that funds a campaign, once", () => {
    const open = db.select().from(campaigns).where(eq(campaigns.slug, "twin-inlet-ring-duct-vs-stock")).get()!;
    expect(open.state).toBe("open");
    expect(campaignJobs(open.id)).toHaveLength(0);
    db.insert(pledges)
      .values({ campaignId: open.id, supporterId: seedId("user", "supporter"), amountMinor: open.goalMinor, currency: open.currency, state: "paid", paidAt: NOW, createdAt: NOW })
      .run();
    const fund = () => db.transaction((tx) => fundIfGoalReached(tx, db.select().from(campaigns).where(eq(campaigns.id, open.id)).get()!, { campaignUrl: "", now: NOW }));
    expect(fund()).toBe(true);
    expect(fund()).toBe(false);
    expect(campaignJobs(open.id)).toHaveLength(expectedJobCount(open.id));
    expect(materialiseJobs(db, open.id)).toBe(0);
  });

  it("estimates each job on the plan's printer (positive hours, the same for the same piece)", () => {
    const byPiece = new Map<string, Set<number>>();
    for (const job of campaignJobs(mattePla.id)) {
      expect(job.estimatedHours).toBeGreaterThan(0);
      byPiece.set(job.pieceId, (byPiece.get(job.pieceId) ?? new Set()).add(job.estimatedHours));
    }
    for (const hours of byPiece.values()) expect(hours.size).toBe(1);
  });
});

describe("recomputing the queue", () => {
  beforeEach(() => {
    db.delete(printerMaintenance).where(inArray(printerMaintenance.printerId, [kestrel, wren, heron])).run();
    db.update(printers).set({ status: "available" }).where(inArray(printers.id, [kestrel, wren, heron])).run();
  });

  it("moves a funded campaign to queued once every job has a place, and leaves an open one alone", () => {
    db.update(campaigns).set({ state: "funded" }).where(eq(campaigns.id, mattePla.id)).run();
    recomputeQueue(db, { appUrl, now: NOW, mail: false });
    const after = db.select({ state: campaigns.state, resultsAt: campaigns.estimatedResultsAt }).from(campaigns).where(eq(campaigns.id, mattePla.id)).get()!;
    expect(after.resultsAt).not.toBeNull();
    expect(after.state).toBe("queued");
    const open = db.select({ state: campaigns.state }).from(campaigns).where(eq(campaigns.state, "open")).all();
    expect(open.length).toBeGreaterThan(0);
  });

  it("stores exactly the placements buildSchedule computes from the same input", () => {
    const now = new Date(NOW.getTime() + 60_000);
    const result = recomputeQueue(db, { now, appUrl, mail: false });
    const expected = buildSchedule(loadQueueState(db, now.getTime()).input);
    expect(result.schedule).toEqual(expected);
    expect(expected.placements.length).toBeGreaterThan(0);
    for (const placement of expected.placements) {
      const job = db.select().from(jobs).where(eq(jobs.id, placement.jobId)).get()!;
      expect(job.printerId).toBe(placement.printerId);
      // Stored as whole milliseconds.
      expect(job.scheduledStart?.getTime()).toBe(Math.round(placement.start));
      expect(job.scheduledEnd?.getTime()).toBe(Math.round(placement.end));
      expect(job.scheduledChangeoverStart?.getTime()).toBe(Math.round(placement.changeoverStart));
      expect(["scheduled", "running"]).toContain(job.state);
    }
    // ASA needs an enclosure: every ASA job is on the Heron.
    for (const job of campaignJobs(asaWarp.id)) expect(job.printerId).toBe(heron);
    // Results date = last job's end + the lab's 24 h of report preparation (seed-data LAB.reportPrepHours).
    const lastEnd = Math.max(...campaignJobs(mattePla.id).map((job) => job.scheduledEnd!.getTime()));
    const stored = db.select().from(campaigns).where(eq(campaigns.id, mattePla.id)).get()!;
    expect(Math.abs(stored.estimatedResultsAt!.getTime() - (lastEnd + 24 * 3_600_000))).toBeLessThanOrEqual(1);
  });

  it("mails the first date once per backer, and a slip past the threshold once per backer, none below it", () => {
    db.update(campaigns).set({ scheduledNotifiedAt: null, lastNotifiedResultsAt: null }).where(eq(campaigns.id, mattePla.id)).run();
    const backers = backerIds(mattePla.id);
    expect(backers.length).toBeGreaterThan(1);

    recomputeQueue(db, { now: NOW, appUrl });
    recomputeQueue(db, { now: NOW, appUrl });
    const scheduled = mails("campaign-scheduled", mattePla.id);
    expect(scheduled.map((mail) => mail.userId).sort()).toEqual([...backers].sort());
    const told = db.select().from(campaigns).where(eq(campaigns.id, mattePla.id)).get()!.lastNotifiedResultsAt!.getTime();

    // Every printer out for one day from now: the date moves about a day, under the 2-day threshold (lab_settings default).
    const block = (days: number) =>
      db
        .insert(printerMaintenance)
        .values([kestrel, wren, heron].map((printerId) => ({ printerId, startsAt: NOW, endsAt: new Date(NOW.getTime() + days * DAY), reason: "Test block" })))
        .run();
    block(1);
    recomputeQueue(db, { now: NOW, appUrl, reason: "Belts replaced on every printer" });
    const afterSmall = db.select().from(campaigns).where(eq(campaigns.id, mattePla.id)).get()!;
    expect(afterSmall.estimatedResultsAt!.getTime()).toBeGreaterThan(told);
    expect(afterSmall.estimatedResultsAt!.getTime() - told).toBeLessThanOrEqual(2 * DAY);
    expect(mails("campaign-date-slipped", mattePla.id)).toHaveLength(0);

    db.delete(printerMaintenance).where(eq(printerMaintenance.reason, "Test block")).run();
    block(5);
    recomputeQueue(db, { now: NOW, appUrl, reason: "Belts replaced on every printer" });
    recomputeQueue(db, { now: NOW, appUrl, reason: "Belts replaced on every printer" });
    const slipped = mails("campaign-date-slipped", mattePla.id);
    expect(slipped.map((mail) => mail.userId).sort()).toEqual([...backers].sort());
    expect(slipped[0]?.payload).toMatchObject({ reason: "Belts replaced on every printer", campaignTitle: mattePla.title });
    const afterBig = db.select().from(campaigns).where(eq(campaigns.id, mattePla.id)).get()!;
    expect(afterBig.estimatedResultsAt!.getTime() - told).toBeGreaterThan(2 * DAY);
    expect(afterBig.lastNotifiedResultsAt?.getTime()).toBe(afterBig.estimatedResultsAt?.getTime());
  });

  it("moves a down printer's jobs elsewhere and says so on the board", () => {
    recomputeQueue(db, { now: NOW, appUrl, mail: false });
    const onWren = campaignJobs(mattePla.id).filter((job) => job.printerId === wren && job.state === "scheduled");
    expect(onWren.length).toBeGreaterThan(0);
    setPrinterAvailability(db, wren, "down", { now: NOW, appUrl });
    const board = readQueueBoard(db, NOW.getTime());
    for (const job of board.jobs.filter((job) => job.state !== "running")) expect(job.printerId === wren && job.start !== null).toBe(false);
    expect(board.printers.find((printer) => printer.id === wren)?.status).toBe("down");
    // PLA also prints on the Kestrel and the Heron (seed-data PRINTERS), so nothing is left unplaced.
    expect(campaignJobs(mattePla.id).every((job) => job.scheduledStart !== null)).toBe(true);
  });
});

describe("moving a job to another printer", () => {
  beforeEach(() => {
    db.delete(printerMaintenance).where(inArray(printerMaintenance.printerId, [kestrel, wren, heron])).run();
    db.update(printers).set({ status: "available" }).where(inArray(printers.id, [kestrel, wren, heron])).run();
  });
  const anAsaJob = () => campaignJobs(asaWarp.id).find((job) => job.state === "scheduled")!;
  const aPlaJob = () => campaignJobs(mattePla.id).find((job) => job.state === "scheduled")!;

  function refusal(run: () => unknown): RuleViolation {
    try {
      run();
    } catch (error) {
      if (error instanceof RuleViolation) return error;
      throw error;
    }
    throw new Error("expected a refusal");
  }

  it("refuses a printer that cannot print the material (422 naming printerId)", () => {
    const error = refusal(() => assignJobPrinter(db, anAsaJob().id, kestrel, { now: NOW, appUrl }));
    expect(error.status).toBe(422);
    expect(error.code).toBe("ineligible_material");
    expect(error.field).toBe("printerId");
    expect(error.message).toMatch(/ASA/);
  });

  it("refuses a printer in maintenance status, and one whose maintenance leaves no room (409)", () => {
    db.update(printers).set({ status: "maintenance" }).where(eq(printers.id, kestrel)).run();
    const status = refusal(() => assignJobPrinter(db, aPlaJob().id, kestrel, { now: NOW, appUrl }));
    expect(status.status).toBe(409);
    expect(status.code).toBe("printer_in_maintenance");

    db.update(printers).set({ status: "available" }).where(eq(printers.id, kestrel)).run();
    db.insert(printerMaintenance).values({ printerId: kestrel, startsAt: NOW, endsAt: new Date(NOW.getTime() + 400 * DAY), reason: "Rebuild" }).run();
    const block = refusal(() => assignJobPrinter(db, aPlaJob().id, kestrel, { now: NOW, appUrl }));
    expect(block.status).toBe(409);
    expect(block.code).toBe("maintenance");
  });

  it("moves a job earlier on its printer, and refuses to move the first one further up (409)", () => {
    recomputeQueue(db, { now: NOW, appUrl, mail: false });
    const lane = db
      .select()
      .from(jobs)
      .where(and(eq(jobs.printerId, heron), eq(jobs.state, "scheduled")))
      .all()
      .sort((a, b) => a.scheduledStart!.getTime() - b.scheduledStart!.getTime());
    expect(lane.length).toBeGreaterThanOrEqual(3);
    const moving = lane[2]!;
    moveJob(db, moving.id, "up", { now: NOW, appUrl });
    const after = db.select().from(jobs).where(eq(jobs.id, moving.id)).get()!;
    expect(after.scheduledStart!.getTime()).toBeLessThan(moving.scheduledStart!.getTime());
    expect(after.position).not.toBeNull();

    const first = db
      .select()
      .from(jobs)
      .where(and(eq(jobs.printerId, heron), eq(jobs.state, "scheduled")))
      .all()
      .sort((a, b) => a.scheduledStart!.getTime() - b.scheduledStart!.getTime())[0]!;
    const error = refusal(() => moveJob(db, first.id, "up", { now: NOW, appUrl }));
    expect(error.status).toBe(409);
    expect(error.code).toBe("already_first");
  });

  it("keeps the host's choice of an eligible printer", () => {
    const job = aPlaJob();
    const target = job.printerId === heron ? wren : heron;
    assignJobPrinter(db, job.id, target, { now: NOW, appUrl });
    const after = db.select().from(jobs).where(eq(jobs.id, job.id)).get()!;
    expect(after.chosenPrinterId).toBe(target);
    expect(after.printerId).toBe(target);
  });
});

describe("a campaign whose every job is printed", () => {
  it("dates its results from the last finished run plus report preparation", () => {
    const printed = campaignJobs(asaWarp.id);
    const finishes = printed.map((_, i) => NOW.getTime() - (i + 1) * 3_600_000);
    printed.forEach((job, i) => {
      db.update(jobs).set({ state: "done" }).where(eq(jobs.id, job.id)).run();
      db.insert(jobRuns)
        .values({ jobId: job.id, attempt: 1, printerId: heron, startedAt: new Date(finishes[i]! - 3_600_000), finishedAt: new Date(finishes[i]!), estimatedHoursAtStart: 1, efficiencyAtStart: 0.5, actualHours: 1, filamentUsedGrams: 10, outcome: "done" })
        .run();
    });
    recomputeQueue(db, { now: NOW, appUrl, mail: false });
    const stored = db.select().from(campaigns).where(eq(campaigns.id, asaWarp.id)).get()!;
    // The first job finished last (an hour before NOW); seed-data LAB.reportPrepHours = 24.
    expect(stored.estimatedResultsAt?.getTime()).toBe(Math.max(...finishes) + 24 * 3_600_000);
  });
});

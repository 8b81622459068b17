import { createHash } from "node:crypto";
import { and, inArray, ne, eq, sql, type InferInsertModel } from "drizzle-orm";
import type { SQLiteInsertValue, SQLiteTable } from "drizzle-orm/sqlite-core";
import { estimateTestPlan, type PlanPrinter } from "../lib/estimate/plan";
import type { Db } from "./client";
import { labPricing, testPlanInput } from "./queries/pricing";
import { recomputeQueueInTx } from "./queries/queue";
import * as s from "./schema";
import { seedReportExtras } from "./seed-reports";
import {
  BACKERS,
  CAMPAIGNS,
  DEMO_USERS,
  FILAMENT_PRICES,
  TEST_PIECES,
  LAB,
  MEMBERSHIPS,
  PLANS,
  PRINTERS,
  PROPOSALS,
  SEED_CURRENCY,
  type SeedCampaign,
  type SeedMembership,
  type SeedPrinter,
  type SeedUser,
} from "./seed-data";
import { mulberry32 } from "../lib/seeded-random";

/*
 * The demo seed: writes the invented "Harbor Street Print Lab" in one transaction. Every row has
 * a fixed id (a name-based UUID, see seedId) or a fixed natural key, and every insert skips rows
 * that already exist, so seeding twice leaves exactly one copy. "Random" variety comes from a
 * seeded PRNG, so the same data comes out on every run; only timestamps follow `now`.
 */

export const seedTables = [
  "lab_settings",
  "filament_price",
  "printer",
  "lab_start_window",
  "membership_plan",
  "user",
  "membership",
  "proposal",
  "proposal_vote",
  "proposal_follower",
  "test_piece",
  "campaign",
  "test_plan",
  "test_plan_piece",
  "test_plan_variant",
  "job",
  "job_run",
  "pledge",
  "ledger_entry",
  "report",
] as const;
export type SeedTable = (typeof seedTables)[number];

export interface SeedSummary {
  /** Rows the demo data set holds per table (all present after seeding). */
  counts: Record<SeedTable, number>;
  /** Rows this run actually wrote (all zero when the demo was already seeded). */
  inserted: Record<SeedTable, number>;
}

export const DEMO_EMAILS = {
  admin: "owner@harbor-street.example",
  host: "host@harbor-street.example",
  member: "member@harbor-street.example",
  supporter: "supporter@harbor-street.example",
} as const;

/* ---------- Deterministic helpers ---------- */

const SEED_NAMESPACE = "5b0c7a52-8d3e-4f61-a9c4-2e7f1d6b3a90";

/** A name-based (version 5) UUID: the same kind and key always give the same id. */
export function seedId(kind: string, key: string): string {
  const namespace = Buffer.from(SEED_NAMESPACE.replace(/-/g, ""), "hex");
  const bytes = createHash("sha1").update(namespace).update(`${kind}:${key}`).digest().subarray(0, 16);
  bytes[6] = ((bytes[6] ?? 0) & 0x0f) | 0x50;
  bytes[8] = ((bytes[8] ?? 0) & 0x3f) | 0x80;
  const hex = bytes.toString("hex");
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}

/** A short deterministic token for fake processor ids (cs_seed_…, pi_seed_…). */
function token(id: string): string {
  return id.replace(/-/g, "").slice(0, 20);
}

function hashString(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}


function rngFor(label: string): () => number {
  return mulberry32(hashString(label));
}

function shuffled<T>(items: readonly T[], rng: () => number): T[] {
  const out = [...items];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(rng() * (i + 1));
    const a = out[i] as T;
    out[i] = out[j] as T;
    out[j] = a;
  }
  return out;
}

function pick<T>(items: readonly T[], rng: () => number): T {
  const item = items[Math.floor(rng() * items.length)];
  if (item === undefined) throw new Error("pick from an empty list");
  return item;
}

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

/** Calendar months in UTC, clamped to the month's last day (Jan 31 + 1 month = Feb 28/29). */
function addMonths(date: Date, months: number): Date {
  const y = date.getUTCFullYear();
  const m = date.getUTCMonth() + months;
  const lastDay = new Date(Date.UTC(y, m + 1, 0)).getUTCDate();
  const d = new Date(date.getTime());
  d.setUTCFullYear(y, m, Math.min(date.getUTCDate(), lastDay));
  return d;
}

function round(value: number, places: number): number {
  const f = 10 ** places;
  return Math.round(value * f) / f;
}

function required<T>(value: T | null | undefined, what: string): T {
  if (value === undefined || value === null) throw new Error(`Seed data is inconsistent: ${what}`);
  return value;
}

/* ---------- Goals and job hours from the estimation engine, at the seeded rates ---------- */

interface PlanEstimate {
  hoursPerPiece: number[];
  totalHours: number;
  goalMinor: number;
}

const seedPricing = labPricing(LAB, [...FILAMENT_PRICES]);

function seedPrinterProfile(printer: SeedPrinter): PlanPrinter {
  return {
    id: printer.key,
    name: printer.name,
    maxVolumetricFlowMm3PerS: printer.maxFlowMm3PerS,
    efficiency: printer.efficiency,
    heatUpMinutes: printer.heatUpMinutes,
    changeoverMinutes: printer.changeoverMinutes,
    handlingMinutesPerJob: printer.handlingMinutesPerJob,
    hourlyRateMinor: printer.hourlyRateMinor,
  };
}

/** The goal is exactly what the campaign page's breakdown computes from the stored plan. */
function estimatePlan(c: SeedCampaign, printer: SeedPrinter): PlanEstimate {
  const pieces = c.plan.pieces.map((p, i) => ({ id: `piece-${i}`, name: p.name, filamentGrams: p.filamentGrams }));
  const variants = c.plan.variants.map((name, i) => ({ id: `variant-${i}`, name, isReference: i === 0 }));
  const estimate = estimateTestPlan(testPlanInput(c.plan, pieces, variants, seedPrinterProfile(printer), seedPricing));
  const hoursPerPiece = pieces.map((piece) => {
    const job = required(
      estimate.jobs.find((j) => j.pieceId === piece.id && j.variantId === "variant-0" && j.repeat === 1),
      "reference job",
    );
    return round(job.time.totalMinutes / 60, 2);
  });
  return { hoursPerPiece, totalHours: round(estimate.time.totalMinutes / 60, 1), goalMinor: estimate.cost.totalMinor };
}

/* ---------- Insert helper ---------- */

/** vote_count is derived from proposal_vote; recomputing it keeps reseeding idempotent. */
function recountVotes(tx: Tx): void {
  tx.run(sql.raw("update proposal set vote_count = (select count(*) from proposal_vote where proposal_vote.proposal_id = proposal.id)"));
}

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

function insertRows<T extends SQLiteTable>(tx: Tx, table: T, rows: readonly InferInsertModel<T>[]): number {
  let changes = 0;
  for (let i = 0; i < rows.length; i += 200) {
    const chunk = rows.slice(i, i + 200) as SQLiteInsertValue<T>[];
    if (chunk.length === 0) continue;
    changes += tx.insert(table).values(chunk).onConflictDoNothing().run().changes;
  }
  return changes;
}

/* ---------- The seed ---------- */

type Rows = {
  [K in SeedTable]: InferInsertModel<(typeof tableOf)[K]>[];
};

const tableOf = {
  lab_settings: s.labSettings,
  filament_price: s.filamentPrices,
  printer: s.printers,
  lab_start_window: s.labStartWindows,
  membership_plan: s.membershipPlans,
  user: s.users,
  membership: s.memberships,
  proposal: s.proposals,
  proposal_vote: s.proposalVotes,
  proposal_follower: s.proposalFollowers,
  test_piece: s.testPieces,
  campaign: s.campaigns,
  test_plan: s.testPlans,
  test_plan_piece: s.testPlanPieces,
  test_plan_variant: s.testPlanVariants,
  job: s.jobs,
  job_run: s.jobRuns,
  pledge: s.pledges,
  ledger_entry: s.ledgerEntries,
  report: s.reports,
} as const;

const PLEDGE_AMOUNTS = [500, 1000, 1000, 1500, 2000, 2000, 2500, 3000, 4000, 5000] as const;

const JOB_NOTES = [
  "Light stringing between the towers; left as is.",
  "First layer re-checked after the duct swap.",
  "Bed re-levelled before this run.",
  "Small blob at the layer change; does not touch a scored surface.",
];

/** Builds every row except users, which are inserted first so their real ids can be looked up. */
function buildRows(now: Date, userId: (key: string) => string): Omit<Rows, "user"> {
  const t = now.getTime();
  const daysAgo = (days: number) => new Date(t - days * DAY);
  const allUsers: readonly SeedUser[] = [...DEMO_USERS, ...BACKERS];
  const userByKey = new Map(allUsers.map((u) => [u.key, u]));
  const printerByKey = new Map(PRINTERS.map((p) => [p.key, p]));
  const planByCode = new Map(PLANS.map((p) => [p.code, p]));

  const rows: Omit<Rows, "user"> = {
    lab_settings: [{ id: 1, ...LAB, updatedAt: daysAgo(500) }],
    filament_price: FILAMENT_PRICES.map((price) => ({ ...price, updatedAt: daysAgo(30) })),
    printer: PRINTERS.map((p, i) => ({
      id: seedId("printer", p.key),
      slug: p.slug,
      name: p.name,
      model: p.model,
      motionType: p.motionType,
      buildXmm: p.buildXmm,
      buildYmm: p.buildYmm,
      buildZmm: p.buildZmm,
      nozzleMm: p.nozzleMm,
      maxFlowMm3PerS: p.maxFlowMm3PerS,
      efficiency: p.efficiency,
      enclosed: p.enclosed,
      materials: p.materials,
      hourlyRateMinor: p.hourlyRateMinor,
      heatUpMinutes: p.heatUpMinutes,
      changeoverMinutes: p.changeoverMinutes,
      handlingMinutesPerJob: p.handlingMinutesPerJob,
      status: "available",
      createdAt: daysAgo(520 - i * 60),
    })),
    membership_plan: PLANS.map((p) => ({
      code: p.code,
      name: p.name,
      monthlyMinor: p.monthlyMinor,
      currency: SEED_CURRENCY,
      monthlyVotes: p.monthlyVotes,
      earlyBlindPairs: p.earlyBlindPairs,
      stripePriceId: null,
      position: p.position,
    })),
    membership: [],
    proposal: [],
    proposal_vote: [],
    proposal_follower: [],
    test_piece: TEST_PIECES.map((piece, i) => ({ id: seedId("test_piece", piece.slug), ...piece, position: i + 1, createdAt: daysAgo(400) })),
    campaign: [],
    test_plan: [],
    test_plan_piece: [],
    test_plan_variant: [],
    job: [],
    job_run: [],
    lab_start_window: [1, 2, 3, 4, 5, 6, 7].map((isoWeekday) => ({
      id: seedId("start-window", String(isoWeekday)),
      isoWeekday,
      startMinute: STAFFED_FROM_HOUR * 60,
      endMinute: STAFFED_UNTIL_HOUR * 60,
      createdAt: daysAgo(500),
    })),
    pledge: [],
    ledger_entry: [],
    report: [],
  };

  /* Memberships and their monthly payments. */
  const memberStart = new Map<string, number>(); // userKey → nominal start (ms), for vote windows
  for (const m of MEMBERSHIPS) {
    const plan = required(planByCode.get(m.plan), `plan ${m.plan}`);
    const membershipId = seedId("membership", m.key);
    const { startedAt, currentPeriodEnd, canceledAt, paymentDates, nominalStartDaysAgo } = membershipTimes(m, now);
    rows.membership.push({
      id: membershipId,
      userId: userId(m.userKey),
      planCode: m.plan,
      status: m.status,
      subscriptionId: `sub_seed_${token(membershipId)}`,
      currentPeriodEnd,
      startedAt,
      canceledAt,
    });
    paymentDates.forEach((occurredAt, n) => {
      rows.ledger_entry.push({
        id: seedId("ledger", `membership:${m.key}:${n + 1}`),
        kind: "membership_payment",
        amountMinor: plan.monthlyMinor,
        currency: SEED_CURRENCY,
        membershipId,
        externalRef: `seed:membership:${membershipId}:period:${n + 1}`,
        memo: `Filament Club ${plan.name}, month ${n + 1}`,
        occurredAt,
      });
    });
    if (m.status === "active") memberStart.set(m.userKey, t - nominalStartDaysAgo * DAY);
  }

  /* Proposals. Accepted ones become campaigns; their acceptance time is just before opening. */
  const campaignByProposal = new Map(CAMPAIGNS.filter((c) => c.proposalKey).map((c) => [c.proposalKey, c]));
  const proposalTimes = new Map<string, { submittedAt: number | null; votesUntil: number }>();
  for (const p of PROPOSALS) {
    const createdAt = t - p.createdDaysAgo * DAY;
    const submittedAt = p.submittedAfterDays === undefined ? null : createdAt + p.submittedAfterDays * DAY + 2 * HOUR;
    const campaign = campaignByProposal.get(p.key);
    let updatedAt: number;
    if (p.state === "accepted") {
      const opened = t - required(campaign, `campaign for accepted proposal ${p.key}`).openedDaysAgo * DAY;
      updatedAt = opened - 3 * HOUR;
    } else if (p.state === "declined" || p.state === "merged") {
      updatedAt = required(submittedAt, `submittedAt of ${p.key}`) + 3 * DAY;
    } else {
      updatedAt = submittedAt ?? createdAt + HOUR;
    }
    if (p.mergedIntoKey && !PROPOSALS.some((q) => q.key === p.mergedIntoKey)) {
      throw new Error(`Seed data is inconsistent: ${p.key} merged into unknown ${p.mergedIntoKey}`);
    }
    rows.proposal.push({
      id: seedId("proposal", p.key),
      slug: p.slug,
      title: p.title,
      kind: p.kind,
      printerType: p.printerType,
      why: p.why,
      descriptionMd: p.descriptionMd,
      state: p.state,
      proposerId: userId(p.proposerKey),
      mergedIntoId: p.mergedIntoKey ? seedId("proposal", p.mergedIntoKey) : null,
      declineReason: p.declineReason ?? null,
      material: p.material ?? null,
      safetyNote: p.safetyNote ?? null,
      reviewStartedAt: p.state === "draft" || p.state === "submitted" ? null : new Date(updatedAt - DAY),
      decidedAt: p.state === "accepted" || p.state === "declined" || p.state === "merged" ? new Date(updatedAt) : null,
      submittedAt: submittedAt === null ? null : new Date(submittedAt),
      createdAt: new Date(createdAt),
      updatedAt: new Date(updatedAt),
    });
    rows.proposal_follower.push({ proposalId: seedId("proposal", p.key), userId: userId(p.proposerKey), createdAt: new Date(createdAt) });
    if (p.state === "submitted" || p.state === "accepted") {
      proposalTimes.set(p.key, { submittedAt, votesUntil: p.state === "accepted" ? updatedAt : t - 10 * MINUTE });
    }
  }

  /* Votes: each active member votes on up to their plan's monthly votes, on proposals open to votes while they were members. */
  for (const m of MEMBERSHIPS) {
    const start = memberStart.get(m.userKey);
    if (start === undefined) continue;
    const plan = required(planByCode.get(m.plan), `plan ${m.plan}`);
    const rng = rngFor(`votes:${m.key}`);
    const budget = Math.min(plan.monthlyVotes, 2 + Math.floor(rng() * 5));
    let cast = 0;
    for (const key of shuffled([...proposalTimes.keys()], rng)) {
      if (cast >= budget) break;
      const times = required(proposalTimes.get(key), `times of ${key}`);
      const from = Math.max(times.submittedAt ?? 0, start + 5 * DAY) + HOUR;
      const until = times.votesUntil - HOUR;
      if (until <= from) continue;
      rows.proposal_vote.push({
        proposalId: seedId("proposal", key),
        userId: userId(m.userKey),
        createdAt: new Date(from + Math.floor(rng() * (until - from))),
      });
      cast++;
    }
  }

  /* Campaigns, test plans, pledges, jobs, reports. */
  const hostId = userId("host");
  const randomBackers = BACKERS.map((b) => b.key);
  for (const c of CAMPAIGNS) {
    const campaignId = seedId("campaign", c.key);
    const printer = required(printerByKey.get(c.plan.printerKey), `printer ${c.plan.printerKey}`);
    const estimate = estimatePlan(c, printer);
    const goal = estimate.goalMinor;
    const openedAt = t - c.openedDaysAgo * DAY;
    const deadline = t + c.deadlineInDays * DAY;
    const fundedState = c.state === "funded" || c.state === "queued" || c.state === "printing" || c.state === "reported";
    if (fundedState !== c.raiseShare >= 1) throw new Error(`Seed data is inconsistent: raiseShare of ${c.key}`);

    /* Pledges: forced ones (demo accounts) plus shuffled backers until the target share is raised. */
    const rng = rngFor(`pledges:${c.key}`);
    const pool = shuffled(randomBackers, rng);
    const target = Math.round(goal * c.raiseShare);
    const drafts: { userKey: string; amount: number; publicName: string | null }[] = c.forcedPledges.map((f) => ({
      userKey: f.userKey,
      amount: f.amountMinor,
      publicName: f.publicName ?? null,
    }));
    let sum = drafts.reduce((a, d) => a + d.amount, 0);
    const nextBacker = () => required(pool.shift(), `not enough backers for ${c.key}`);
    for (;;) {
      if (fundedState && sum >= target) break;
      let amount: number = pick(PLEDGE_AMOUNTS, rng);
      if (!fundedState && sum + amount > target) {
        amount = Math.floor((target - sum) / 500) * 500;
        if (amount < 500) break;
      }
      const key = nextBacker();
      const user = required(userByKey.get(key), `backer ${key}`);
      const roll = rng();
      const [first = "", ...rest] = user.name.split(" ");
      const publicName = roll < 0.15 ? user.name : roll < 0.3 ? `${first} ${(rest.at(-1) ?? "").charAt(0)}.` : null;
      drafts.push({ userKey: key, amount, publicName });
      sum += amount;
    }
    if (fundedState ? sum < goal : sum >= goal) throw new Error(`Seed data is inconsistent: pledges of ${c.key}`);

    const ordered = shuffled(drafts, rng);
    const windowStart = openedAt + 3 * HOUR;
    const windowEnd = t - c.pledgesEndDaysAgo * DAY;
    let running = 0;
    let fundedAt: number | null = null;
    ordered.forEach((d, i) => {
      const id = seedId("pledge", `${c.key}:${i + 1}`);
      const createdAt = windowStart + ((windowEnd - windowStart) * (i + 0.2 + 0.6 * rng())) / ordered.length;
      const paidAt = createdAt + 90_000;
      const refundedAt = c.state === "lapsed" ? deadline + 10 * MINUTE + i * 7000 : null;
      running += d.amount;
      if (fundedState && fundedAt === null && running >= goal) fundedAt = paidAt;
      rows.pledge.push({
        id,
        campaignId,
        supporterId: userId(d.userKey),
        amountMinor: d.amount,
        currency: SEED_CURRENCY,
        state: refundedAt === null ? "paid" : "refunded",
        publicName: d.publicName,
        checkoutSessionId: `cs_seed_${token(id)}`,
        paymentIntentId: `pi_seed_${token(id)}`,
        refundId: refundedAt === null ? null : `re_seed_${token(id)}`,
        createdAt: new Date(createdAt),
        paidAt: new Date(paidAt),
        refundedAt: refundedAt === null ? null : new Date(refundedAt),
      });
      rows.ledger_entry.push({
        id: seedId("ledger", `pledge:${id}:payment`),
        kind: "pledge_payment",
        amountMinor: d.amount,
        currency: SEED_CURRENCY,
        campaignId,
        pledgeId: id,
        externalRef: `seed:pledge:${id}:payment`,
        memo: null,
        occurredAt: new Date(paidAt),
      });
      if (refundedAt !== null) {
        rows.ledger_entry.push({
          id: seedId("ledger", `pledge:${id}:refund`),
          kind: "pledge_refund",
          amountMinor: -d.amount,
          currency: SEED_CURRENCY,
          campaignId,
          pledgeId: id,
          externalRef: `seed:pledge:${id}:refund`,
          memo: "Goal-or-refund: deadline passed short of the goal",
          occurredAt: new Date(refundedAt),
        });
      }
    });
    // Checkouts still open (pending) and one declined card (failed): no money moved, no ledger row.
    const unpaid = [
      ...Array.from({ length: c.pendingPledges }, (_, k) => ({ state: "pending" as const, at: t - (40 + 35 * k) * MINUTE })),
      ...Array.from({ length: c.failedPledges }, () => ({ state: "failed" as const, at: t - 26 * HOUR })),
    ];
    unpaid.forEach((u, k) => {
      const id = seedId("pledge", `${c.key}:unpaid:${k + 1}`);
      rows.pledge.push({
        id,
        campaignId,
        supporterId: userId(nextBacker()),
        amountMinor: pick(PLEDGE_AMOUNTS, rng),
        currency: SEED_CURRENCY,
        state: u.state,
        publicName: null,
        checkoutSessionId: `cs_seed_${token(id)}`,
        paymentIntentId: u.state === "failed" ? `pi_seed_${token(id)}` : null,
        refundId: null,
        createdAt: new Date(u.at),
        paidAt: null,
        refundedAt: null,
      });
    });
    if (fundedState && fundedAt === null) throw new Error(`Seed data is inconsistent: ${c.key} never reached its goal`);

    rows.campaign.push({
      id: campaignId,
      slug: c.slug,
      proposalId: c.proposalKey ? seedId("proposal", c.proposalKey) : null,
      title: c.title,
      summary: c.summary,
      state: c.state,
      goalMinor: goal,
      currency: SEED_CURRENCY,
      goalOverrideReason: null,
      deadline: new Date(deadline),
      openedAt: new Date(openedAt),
      fundedAt: fundedAt === null ? null : new Date(fundedAt),
      closedAt: c.state === "lapsed" ? new Date(deadline + 5 * MINUTE) : null,
      withdrawReason: null,
      hostId,
      createdAt: new Date(openedAt - 2 * HOUR),
    });

    if (c.labFundMinor) {
      rows.ledger_entry.push({
        id: seedId("ledger", `fund-allocation:${c.key}`),
        kind: "fund_allocation",
        amountMinor: -c.labFundMinor,
        currency: SEED_CURRENCY,
        campaignId,
        externalRef: `seed:fund-allocation:${campaignId}:1`,
        memo: c.labFundMemo ?? "Lab fund allocation",
        occurredAt: new Date((fundedAt ?? openedAt) + 2 * DAY),
      });
    }

    /* Test plan. */
    const planId = seedId("test_plan", c.key);
    rows.test_plan.push({
      id: planId,
      campaignId,
      material: c.plan.material,
      layerHeightMm: c.plan.layerHeightMm,
      maxFlowMm3PerS: c.plan.maxFlowMm3PerS,
      fanPercent: c.plan.fanPercent,
      repeats: c.plan.repeats,
      printerId: seedId("printer", printer.key),
      estimatedHours: estimate.totalHours,
      notesMd: c.plan.notesMd,
    });
    const pieceIds = c.plan.pieces.map((p, i) => {
      const id = seedId("piece", `${c.key}:${i + 1}`);
      rows.test_plan_piece.push({ id, testPlanId: planId, name: p.name, filamentGrams: p.filamentGrams, position: i + 1 });
      return id;
    });
    const variantIds = c.plan.variants.map((name, i) => {
      const id = seedId("variant", `${c.key}:${i + 1}`);
      rows.test_plan_variant.push({ id, testPlanId: planId, name, isReference: i === 0, position: i + 1 });
      return id;
    });

    /* Jobs: repeat → variant → piece, so each variant block needs one changeover. */
    if (c.jobs.mode !== "none") {
      const jobRng = rngFor(`jobs:${c.key}`);
      const matrix: { pieceIndex: number; variantIndex: number; repeat: number; hours: number; changeover: boolean }[] = [];
      for (let r = 1; r <= c.plan.repeats; r++) {
        for (let v = 0; v < variantIds.length; v++) {
          for (let p = 0; p < pieceIds.length; p++) {
            const hours = required(estimate.hoursPerPiece[p], "piece hours");
            matrix.push({ pieceIndex: p, variantIndex: v, repeat: r, hours, changeover: p === 0 && matrix.length > 0 });
          }
        }
      }
      // Start times laid end to end, with a changeover gap before each variant block; a job only
      // starts while someone is in the lab (see isStaffed).
      const mode = c.jobs.mode;
      const runningIndex = Math.floor(matrix.length / 2);
      const gapBefore = (j: (typeof matrix)[number]) => (j.changeover ? Math.round((printer.changeoverMinutes / 60) * HOUR) : 0);
      const duration = (j: (typeof matrix)[number]) => Math.round(j.hours * HOUR);
      const starts: number[] = [];
      if (mode === "printing") {
        // The middle job is running now; the ones before it are done, the ones after scheduled.
        const runningJob = required(matrix[runningIndex], "running job");
        const runningStart = t - Math.round(0.4 * duration(runningJob));
        starts[runningIndex] = runningStart;
        let next = runningStart - gapBefore(runningJob);
        for (let i = runningIndex - 1; i >= 0; i--) {
          const j = required(matrix[i], "job");
          const start = staffedAtOrBefore(next - duration(j));
          starts[i] = start;
          next = start - gapBefore(j);
        }
        let cursor = runningStart + duration(runningJob);
        for (let i = runningIndex + 1; i < matrix.length; i++) {
          const j = required(matrix[i], "job");
          const start = staffedAtOrAfter(cursor + gapBefore(j));
          starts[i] = start;
          cursor = start + duration(j);
        }
      } else {
        const base = mode === "scheduled" ? t + c.jobs.startInDays * DAY : t - c.jobs.startDaysAgo * DAY;
        let cursor = Math.floor(base / HOUR) * HOUR;
        for (const j of matrix) {
          cursor = staffedAtOrAfter(cursor + gapBefore(j));
          starts.push(cursor);
          cursor += duration(j);
        }
      }
      matrix.forEach((j, i) => {
        const state = mode === "scheduled" ? "scheduled" : mode === "done" || i < runningIndex ? "done" : i === runningIndex ? "running" : "scheduled";
        const piece = required(c.plan.pieces[j.pieceIndex], "piece");
        const done = state === "done";
        rows.job.push({
          id: seedId("job", `${c.key}:${j.pieceIndex + 1}:${j.variantIndex + 1}:${j.repeat}`),
          campaignId,
          pieceId: required(pieceIds[j.pieceIndex], "piece id"),
          variantId: required(variantIds[j.variantIndex], "variant id"),
          repeat: j.repeat,
          printerId: seedId("printer", printer.key),
          state,
          estimatedHours: j.hours,
          scheduledStart: new Date(required(starts[i], "job start")),
          actualHours: done ? round(j.hours * (0.93 + 0.14 * jobRng()), 2) : null,
          filamentUsedGrams: done ? round(piece.filamentGrams * (1 + 0.04 * jobRng()), 1) : null,
          notes: done && jobRng() < 0.15 ? pick(JOB_NOTES, jobRng) : null,
        });
      });
    }

    if (c.report) {
      const publishedAt = t - c.report.publishedDaysAgo * DAY;
      rows.report.push({
        id: seedId("report", c.key),
        campaignId,
        state: "published",
        summary: c.report.summary,
        bodyMd: c.report.bodyMd,
        videoUrl: c.report.videoUrl,
        publishedAt: new Date(publishedAt),
        createdAt: new Date(publishedAt - 3 * DAY),
        updatedAt: new Date(publishedAt),
      });
    }
  }

  rows.job_run = seedJobRuns(rows.job);
  return rows;
}

/** The run log behind the seeded jobs: one finished run per done job, an open one per running job. */
function seedJobRuns(jobRows: readonly InferInsertModel<typeof s.jobs>[]): InferInsertModel<typeof s.jobRuns>[] {
  const efficiencyById = new Map(PRINTERS.map((p) => [seedId("printer", p.key), p.efficiency]));
  return jobRows.flatMap((job) => {
    if ((job.state !== "done" && job.state !== "running") || !job.printerId || !job.scheduledStart || !job.id) return [];
    const startedAt = job.scheduledStart.getTime();
    const done = job.state === "done" && job.actualHours != null;
    return [
      {
        id: seedId("job-run", job.id),
        jobId: job.id,
        attempt: 1,
        printerId: job.printerId,
        startedAt: new Date(startedAt),
        finishedAt: done ? new Date(startedAt + Math.round((job.actualHours ?? 0) * HOUR)) : null,
        estimatedHoursAtStart: job.estimatedHours,
        efficiencyAtStart: required(efficiencyById.get(job.printerId), "printer efficiency"),
        actualHours: done ? job.actualHours : null,
        filamentUsedGrams: done ? job.filamentUsedGrams : null,
        outcome: done ? "done" : null,
        notes: done ? job.notes : null,
      },
    ];
  });
}

/** Someone is in the lab to start a job from 08:00 to 20:00, lab time, every day. */
const STAFFED_FROM_HOUR = 8;
const STAFFED_UNTIL_HOUR = 20;
const QUARTER_HOUR = 15 * MINUTE;
const labHourFormat = new Intl.DateTimeFormat("en-US", { timeZone: LAB.timeZone, hour: "numeric", hourCycle: "h23" });

function isStaffed(ms: number): boolean {
  const hour = Number(labHourFormat.formatToParts(new Date(ms)).find((part) => part.type === "hour")?.value);
  return hour >= STAFFED_FROM_HOUR && hour < STAFFED_UNTIL_HOUR;
}

function staffedAtOrAfter(ms: number): number {
  let at = ms;
  while (!isStaffed(at)) at = (Math.floor(at / QUARTER_HOUR) + 1) * QUARTER_HOUR;
  return at;
}

function staffedAtOrBefore(ms: number): number {
  let at = ms;
  while (!isStaffed(at)) at = (Math.ceil(at / QUARTER_HOUR) - 1) * QUARTER_HOUR;
  return at;
}

function membershipTimes(m: SeedMembership, now: Date) {
  const t = now.getTime();
  const paymentsBefore = (anchor: Date, count: number) =>
    Array.from({ length: count }, (_, n) => addMonths(anchor, n - count));
  if (m.status === "active") {
    // The current (last paid) period started daysIntoPeriod days ago.
    const anchor = new Date(t - m.daysIntoPeriod * DAY);
    return {
      startedAt: addMonths(anchor, -(m.periods - 1)),
      currentPeriodEnd: addMonths(anchor, 1),
      canceledAt: null,
      paymentDates: [...paymentsBefore(anchor, m.periods - 1), anchor],
      nominalStartDaysAgo: (m.periods - 1) * 31 + m.daysIntoPeriod,
    };
  }
  // past_due: the renewal at `anchor` failed; canceled: the last paid period ended at `anchor`.
  const anchor = new Date(t - (m.status === "past_due" ? m.daysOverdue : m.endedDaysAgo) * DAY);
  return {
    startedAt: addMonths(anchor, -m.periods),
    currentPeriodEnd: anchor,
    canceledAt: m.status === "canceled" ? new Date(anchor.getTime() - 6 * DAY) : null,
    paymentDates: paymentsBefore(anchor, m.periods),
    nominalStartDaysAgo: m.periods * 31,
  };
}

/**
 * Writes the demo lab in one transaction; safe to run any number of times. Existing rows (same
 * id or same unique key) are left as they are, except that the four demo accounts get their
 * stored role back.
 */
export function seedDemo(db: Db, options: { now?: Date } = {}): SeedSummary {
  const now = options.now ?? new Date();
  const t = now.getTime();
  return db.transaction((tx) => {
    const seedUsers = [...DEMO_USERS, ...BACKERS];
    const userRows: InferInsertModel<typeof s.users>[] = seedUsers.map((u) => ({
      id: seedId("user", u.key),
      name: u.name,
      email: u.email,
      emailVerified: new Date(t - u.createdDaysAgo * DAY + 10 * MINUTE),
      image: null,
      role: u.role,
      createdAt: new Date(t - u.createdDaysAgo * DAY),
    }));
    const insertedUsers = insertRows(tx, s.users, userRows);
    for (const u of DEMO_USERS) {
      tx.update(s.users)
        .set({ role: u.role })
        .where(and(eq(s.users.email, u.email), ne(s.users.role, u.role)))
        .run();
    }
    // An account may already exist for a seeded e-mail (e.g. someone signed in first): use its id.
    const existing = tx
      .select({ id: s.users.id, email: s.users.email })
      .from(s.users)
      .where(
        inArray(
          s.users.email,
          seedUsers.map((u) => u.email),
        ),
      )
      .all();
    const idByEmail = new Map(existing.map((row) => [row.email, row.id]));
    const emailByKey = new Map(seedUsers.map((u) => [u.key, u.email]));
    const seededIds = new Set(
      tx
        .select({ id: s.users.id })
        .from(s.users)
        .where(inArray(s.users.id, seedUsers.map((u) => seedId("user", u.key))))
        .all()
        .map((row) => row.id),
    );
    // An older seed may have written a user under its fixed id with since-changed details: keep that row.
    const userId = (key: string) =>
      idByEmail.get(required(emailByKey.get(key), `user ${key}`)) ??
      required(seededIds.has(seedId("user", key)) ? seedId("user", key) : undefined, `id of ${key}`);

    const rows = buildRows(now, userId);
    const counts = { user: userRows.length } as Record<SeedTable, number>;
    const inserted = { user: insertedUsers } as Record<SeedTable, number>;
    for (const table of seedTables) {
      if (table === "user") continue;
      const list = rows[table];
      counts[table] = list.length;
      inserted[table] = insertRows(tx, tableOf[table] as SQLiteTable, list as InferInsertModel<SQLiteTable>[]);
    }
    recountVotes(tx);
    const extras = seedReportExtras(tx, now, seedId, userId);
    // Jobs for funded campaigns without any, placements and results dates; the seeded past already told backers their dates.
    const queue = recomputeQueueInTx(tx, { now, appUrl: "", mail: false });
    inserted.job += queue.jobsCreated;
    counts.job = tx
      .select({ id: s.jobs.id })
      .from(s.jobs)
      .where(inArray(s.jobs.campaignId, rows.campaign.map((c) => required(c.id, "campaign id"))))
      .all().length;
    counts.report += extras.reports;
    inserted.report += extras.reportsInserted;
    return { counts, inserted };
  });
}

/** One line for the CLI: "lab_settings 1 (+0), printer 3 (+0), …". */
export function formatSeedSummary(summary: SeedSummary): string {
  return seedTables.map((table) => `${table} ${summary.counts[table]} (+${summary.inserted[table]})`).join(", ");
}

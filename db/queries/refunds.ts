import { and, asc, eq, gte, inArray, isNull, lt, lte, sql } from "drizzle-orm";
import { formatDate, formatMoney } from "../../lib/format";
import { CHECKOUT_MIN_LIFETIME_MS, CLOCK_SKEW_ALLOWANCE_MS, PLEDGE_REUSE_WINDOW_MS } from "../../lib/pledges/rules";
import {
  decideRefund,
  deadlineOutcome,
  isWithdrawable,
  WITHDRAWABLE_STATES,
  OUTSIDE_PROCESSOR_MEMO,
  REFUND_LEASE_MS,
  refundFactsFromEvent,
  refundKeys,
  refundRetryDelayMs,
  type RefundDecision,
  type RefundFacts,
  type RefundReason,
} from "../../lib/pledges/refunds";
import { RuleViolation } from "../../lib/rule-violation";
import type { Db } from "../client";
import { campaigns, labSettings, ledgerEntries, pledges, refundRequests, users, type Campaign, type Pledge } from "../schema";
import { returnLabFundAllocation } from "./lab-fund";
import { enqueueMail } from "./outbox";
import { fundIfGoalReached, raisedMinor } from "./pledges";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export type RefundContext = { appUrl: string; now?: Date };

const CLOSED_STATES = ["lapsed", "withdrawn"] as const;

function reasonOf(state: Campaign["state"]): RefundReason | null {
  return state === "lapsed" || state === "withdrawn" ? state : null;
}

/* ---------- Closing a campaign ---------- */

/** One refund request per paid pledge of the campaign that has none yet. Returns how many were new. */
function requestRefunds(tx: Tx, campaignId: string, reason: RefundReason, now: Date): number {
  const paid = tx
    .select({ id: pledges.id })
    .from(pledges)
    .leftJoin(refundRequests, eq(refundRequests.pledgeId, pledges.id))
    .where(and(eq(pledges.campaignId, campaignId), eq(pledges.state, "paid"), isNull(refundRequests.pledgeId)))
    .all();
  let added = 0;
  for (const pledge of paid) {
    const result = tx
      .insert(refundRequests)
      .values({ pledgeId: pledge.id, campaignId, reason, state: "requested", attempts: 0, leaseUntil: now, requestedAt: now })
      .onConflictDoNothing({ target: refundRequests.pledgeId })
      .run();
    added += result.changes;
  }
  return added;
}

export type ClosedCampaign = { campaignId: string; slug: string; outcome: "lapsed" | "funded"; refundsRequested: number; fundReturnedMinor: number };

/**
 * Every open campaign whose deadline has passed: lapsed (refund requests for every paid pledge,
 * lab-fund money returned) or, when it did reach its goal, funded. Each campaign in its own
 * IMMEDIATE transaction with a conditional update, so two sweeps at once close it once.
 */
export function closeDueCampaigns(db: Db, context: RefundContext): ClosedCampaign[] {
  const now = context.now ?? new Date();
  const due = db
    .select({ id: campaigns.id })
    .from(campaigns)
    .where(and(eq(campaigns.state, "open"), lte(campaigns.deadline, now)))
    .all();
  const closed: ClosedCampaign[] = [];
  for (const { id } of due) {
    const outcome = db.transaction(
      (tx): ClosedCampaign | null => {
        const campaign = tx.select().from(campaigns).where(eq(campaigns.id, id)).get();
        if (!campaign) return null;
        const decision = deadlineOutcome(campaign, raisedMinor(tx, campaign.id), now);
        if (decision === "fund") {
          const funded = fundIfGoalReached(tx, campaign, { campaignUrl: `${context.appUrl}/campaigns/${campaign.slug}`, now });
          return funded ? { campaignId: id, slug: campaign.slug, outcome: "funded", refundsRequested: 0, fundReturnedMinor: 0 } : null;
        }
        if (decision !== "lapse") return null;
        const moved = tx
          .update(campaigns)
          .set({ state: "lapsed", closedAt: now })
          .where(and(eq(campaigns.id, id), eq(campaigns.state, "open")))
          .run();
        if (moved.changes !== 1) return null;
        return {
          campaignId: id,
          slug: campaign.slug,
          outcome: "lapsed",
          refundsRequested: requestRefunds(tx, id, "lapsed", now),
          fundReturnedMinor: returnLabFundAllocation(tx, campaign.id, now),
        };
      },
      { behavior: "immediate" },
    );
    if (outcome) closed.push(outcome);
  }
  return closed;
}

export type WithdrawnCampaign = { campaign: Campaign; previousState: Campaign["state"]; refundsRequested: number; fundReturnedMinor: number };

/**
 * A host withdraws an open, funded or queued campaign (409 once printing has begun or it is closed),
 * with the reason backers will read; every paid pledge gets a refund request and lab-fund money
 * returns to the fund, in one IMMEDIATE transaction. A second withdraw (a double click) is a 409.
 */
export function withdrawCampaign(db: Db, input: { campaignId: string; reason: string; hostId: string }, now = new Date()): WithdrawnCampaign {
  return db.transaction(
    (tx) => {
      const campaign = tx.select().from(campaigns).where(eq(campaigns.id, input.campaignId)).get();
      if (!campaign) throw new RuleViolation(404, "not_found", "No such campaign.");
      if (!isWithdrawable(campaign.state)) {
        throw new RuleViolation(409, "not_withdrawable", `This campaign is ${campaign.state}; only open, funded or queued campaigns can be withdrawn.`);
      }
      const moved = tx
        .update(campaigns)
        .set({ state: "withdrawn", withdrawReason: input.reason, closedAt: now })
        .where(and(eq(campaigns.id, campaign.id), inArray(campaigns.state, [...WITHDRAWABLE_STATES])))
        .returning()
        .get();
      if (!moved) throw new RuleViolation(409, "not_withdrawable", "This campaign changed state meanwhile; reload the page.");
      return {
        campaign: moved,
        previousState: campaign.state,
        refundsRequested: requestRefunds(tx, campaign.id, "withdrawn", now),
        fundReturnedMinor: returnLabFundAllocation(tx, campaign.id, now),
      };
    },
    { behavior: "immediate" },
  );
}

/**
 * Paid pledges of closed campaigns without a refund request: a Checkout Session that completed
 * after its campaign closed still gets its money back.
 */
export function requestLateRefunds(db: Db, now = new Date()): number {
  return db.transaction(
    (tx) => {
      const closed = tx.select({ id: campaigns.id, state: campaigns.state }).from(campaigns).where(inArray(campaigns.state, [...CLOSED_STATES])).all();
      let added = 0;
      for (const campaign of closed) added += requestRefunds(tx, campaign.id, reasonOf(campaign.state)!, now);
      return added;
    },
    { behavior: "immediate" },
  );
}

/** A pending pledge never got a Checkout Session and is older than any session it could have had. */
export const ORPHANED_PENDING_AFTER_MS = PLEDGE_REUSE_WINDOW_MS + CHECKOUT_MIN_LIFETIME_MS + CLOCK_SKEW_ALLOWANCE_MS;

export function failOrphanedPendingPledges(db: Db, now = new Date()): number {
  return db
    .update(pledges)
    .set({ state: "failed" })
    .where(and(eq(pledges.state, "pending"), isNull(pledges.checkoutSessionId), lt(pledges.createdAt, new Date(now.getTime() - ORPHANED_PENDING_AFTER_MS))))
    .run().changes;
}

/* ---------- Working through refund requests ---------- */

export type ClaimedRefund = {
  pledgeId: string;
  campaignId: string;
  reason: RefundReason;
  refundId: string | null;
  attempts: number;
  amountMinor: number;
  currency: string;
  paymentIntentId: string | null;
};

/**
 * Claims due refund requests for one sweep: a lease (REFUND_LEASE_MS) so a second sweep running
 * at the same time skips them. A sweep that dies holding a lease frees it when the lease runs out.
 */
export function claimRefundRequests(db: Db, options: { now: Date; limit: number; campaignId?: string }): ClaimedRefund[] {
  return db.transaction(
    (tx) => {
      const due = tx
        .select({
          pledgeId: refundRequests.pledgeId,
          campaignId: refundRequests.campaignId,
          reason: refundRequests.reason,
          refundId: refundRequests.refundId,
          attempts: refundRequests.attempts,
          amountMinor: pledges.amountMinor,
          currency: pledges.currency,
          paymentIntentId: pledges.paymentIntentId,
        })
        .from(refundRequests)
        .innerJoin(pledges, eq(pledges.id, refundRequests.pledgeId))
        .where(
          and(
            eq(refundRequests.state, "requested"),
            lte(refundRequests.leaseUntil, options.now),
            options.campaignId ? eq(refundRequests.campaignId, options.campaignId) : undefined,
          ),
        )
        .orderBy(asc(refundRequests.requestedAt), asc(refundRequests.pledgeId))
        .limit(options.limit)
        .all();
      if (due.length === 0) return [];
      tx.update(refundRequests)
        .set({ leaseUntil: new Date(options.now.getTime() + REFUND_LEASE_MS), attempts: sql`${refundRequests.attempts} + 1` })
        .where(inArray(refundRequests.pledgeId, due.map((row) => row.pledgeId)))
        .run();
      return due.map((row) => ({ ...row, attempts: row.attempts + 1 }));
    },
    { behavior: "immediate" },
  );
}

/** A transient failure: try again after the back-off, with the same idempotency key. */
export function deferRefundRequest(db: Db, pledgeId: string, attempts: number, error: string, now: Date): void {
  db.update(refundRequests)
    .set({ leaseUntil: new Date(now.getTime() + refundRetryDelayMs(attempts)), lastError: error.slice(0, 500) })
    .where(and(eq(refundRequests.pledgeId, pledgeId), eq(refundRequests.state, "requested")))
    .run();
}

/** Refused for good: shown to hosts on the lab's campaign page. */
export function flagRefundRequest(db: Db | Tx, pledgeId: string, error: string, now: Date): void {
  db.update(refundRequests)
    .set({ state: "attention", lastError: error.slice(0, 500), completedAt: now })
    .where(and(eq(refundRequests.pledgeId, pledgeId), eq(refundRequests.state, "requested")))
    .run();
}

/* ---------- Recording a refund ---------- */

export type RefundOutcome = { pledgeId: string | null; decision: RefundDecision };

function findPledgeForRefund(tx: Tx, facts: RefundFacts): Pledge | undefined {
  if (facts.pledgeId) {
    const byId = tx.select().from(pledges).where(eq(pledges.id, facts.pledgeId)).get();
    if (byId) return byId;
  }
  if (facts.paymentIntentId) return tx.select().from(pledges).where(eq(pledges.paymentIntentId, facts.paymentIntentId)).get();
  return undefined;
}

/**
 * The pledge becomes refunded (a conditional update from `paid`), with one negative ledger row
 * `pledge:<id>:refund` and one refund mail, and its request succeeded — all inside the caller's
 * transaction. Every value follows from the pledge, its campaign and the refund's own time, so
 * whichever report arrives first writes the same rows.
 */
function markRefunded(tx: Tx, pledge: Pledge, refund: { refundId: string | null; at: Date; memo: string }, context: RefundContext): boolean {
  const now = context.now ?? new Date();
  const moved = tx
    .update(pledges)
    .set({ state: "refunded", refundId: refund.refundId, refundedAt: refund.at })
    .where(and(eq(pledges.id, pledge.id), eq(pledges.state, "paid")))
    .run();
  if (moved.changes !== 1) return false;

  const campaign = tx.select().from(campaigns).where(eq(campaigns.id, pledge.campaignId)).get();
  if (!campaign) throw new Error(`Pledge ${pledge.id} names a missing campaign.`);
  const reason = reasonOf(campaign.state);
  tx.insert(ledgerEntries)
    .values({
      kind: "pledge_refund",
      amountMinor: -pledge.amountMinor,
      currency: pledge.currency,
      campaignId: pledge.campaignId,
      pledgeId: pledge.id,
      externalRef: refundKeys.ledgerRef(pledge.id),
      memo: refund.memo,
      occurredAt: refund.at,
    })
    .onConflictDoNothing({ target: ledgerEntries.externalRef })
    .run();
  tx.update(refundRequests)
    .set({ state: "succeeded", refundId: refund.refundId, completedAt: now, lastError: null })
    .where(eq(refundRequests.pledgeId, pledge.id))
    .run();

  // Refunds made for other reasons (say, from the processor's dashboard) are recorded, not mailed:
  // the two refund mails explain goal-or-refund.
  if (!reason) return true;
  const backer = tx.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, pledge.supporterId)).get();
  if (!backer?.email) return true;
  const timeZone = tx.select({ timeZone: labSettings.timeZone }).from(labSettings).where(eq(labSettings.id, 1)).get()?.timeZone ?? "UTC";
  const common = {
    name: backer.name,
    campaignTitle: campaign.title,
    amount: formatMoney(pledge.amountMinor, pledge.currency),
    refundedOn: formatDate(refund.at, timeZone),
    pledgeId: pledge.id,
    campaignUrl: `${context.appUrl}/campaigns/${campaign.slug}`,
    pledgesUrl: `${context.appUrl}/account/pledges`,
  };
  enqueueMail(
    tx,
    reason === "lapsed"
      ? {
          dedupeKey: refundKeys.mail(pledge.id),
          toAddress: backer.email,
          template: "campaign-lapsed-refund",
          subject: `Refund: “${campaign.title}” did not reach its goal`,
          payload: { ...common, goal: formatMoney(campaign.goalMinor, campaign.currency), deadline: formatDate(campaign.deadline, timeZone) },
        }
      : {
          dedupeKey: refundKeys.mail(pledge.id),
          toAddress: backer.email,
          template: "campaign-withdrawn-refund",
          subject: `Refund: the lab withdrew “${campaign.title}”`,
          payload: { ...common, reason: campaign.withdrawReason ?? "" },
        },
    now,
  );
  return true;
}

function refundMemo(refundId: string, state: Campaign["state"] | undefined): string {
  const why = state === "lapsed" ? "campaign lapsed short of its goal" : state === "withdrawn" ? "campaign withdrawn by the lab" : "refunded at the processor";
  return `Refund ${refundId}: ${why}`;
}

/**
 * A refund as the processor reports it — in the API's answer or in an event — inside the caller's
 * transaction. Reports come in any order and more than once; see lib/pledges/refunds.ts decideRefund.
 */
export function applyRefundFacts(tx: Tx, facts: RefundFacts, context: RefundContext): RefundOutcome {
  const pledge = findPledgeForRefund(tx, facts);
  const decision = decideRefund(facts, pledge);
  if (!pledge) return { pledgeId: null, decision };
  const now = context.now ?? new Date();
  if (decision.kind === "record") {
    const state = tx.select({ state: campaigns.state }).from(campaigns).where(eq(campaigns.id, pledge.campaignId)).get()?.state;
    markRefunded(tx, pledge, { refundId: facts.refundId, at: facts.createdAt, memo: refundMemo(facts.refundId, state) }, context);
  } else if (decision.kind === "pending") {
    tx.update(refundRequests)
      .set({ refundId: facts.refundId })
      .where(and(eq(refundRequests.pledgeId, pledge.id), eq(refundRequests.state, "requested")))
      .run();
  } else if (decision.kind === "failed") {
    flagRefundRequest(tx, pledge.id, `The processor reports refund ${facts.refundId} as ${decision.status}.`, now);
  }
  return { pledgeId: pledge.id, decision };
}

/** The same, in its own IMMEDIATE transaction: the sweeper records the API's answer with it. */
export function recordRefund(db: Db, facts: RefundFacts, context: RefundContext): RefundOutcome {
  return db.transaction((tx) => applyRefundFacts(tx, facts, context), { behavior: "immediate" });
}

/** The refund effects of one verified webhook event, inside the webhook's transaction. */
export function applyRefundEvent(tx: Tx, event: { type: string; data: { object: unknown } }, context: RefundContext): RefundOutcome[] {
  return refundFactsFromEvent(event).map((facts) => applyRefundFacts(tx, facts, context));
}

/**
 * A seeded demo payment the processor never took (lib/pledges/refunds.ts SEEDED_PAYMENT_PREFIX):
 * the refund is recorded with a memo that says it was made outside the processor, so the demo's
 * goal-or-refund path completes without pretending the processor refunded anything.
 */
export function recordRefundOutsideProcessor(db: Db, pledgeId: string, context: RefundContext): boolean {
  const now = context.now ?? new Date();
  return db.transaction(
    (tx) => {
      const pledge = tx.select().from(pledges).where(eq(pledges.id, pledgeId)).get();
      if (!pledge || pledge.state !== "paid") return false;
      return markRefunded(tx, pledge, { refundId: null, at: now, memo: OUTSIDE_PROCESSOR_MEMO }, context);
    },
    { behavior: "immediate" },
  );
}

/* ---------- Reads for the lab ---------- */

export type RefundProgress = { requested: number; succeeded: number; attention: { pledgeId: string; lastError: string | null }[] };

export function refundProgress(db: Db, campaignId: string): RefundProgress {
  const rows = db
    .select({ pledgeId: refundRequests.pledgeId, state: refundRequests.state, lastError: refundRequests.lastError })
    .from(refundRequests)
    .where(eq(refundRequests.campaignId, campaignId))
    .all();
  return {
    requested: rows.filter((row) => row.state === "requested").length,
    succeeded: rows.filter((row) => row.state === "succeeded").length,
    attention: rows.filter((row) => row.state === "attention").map((row) => ({ pledgeId: row.pledgeId, lastError: row.lastError })),
  };
}

/** The lab's view of one campaign's money: paid, refunded and pending pledge counts. */
export function campaignPledgeCounts(db: Db, campaignId: string): Record<Pledge["state"], number> {
  const rows = db
    .select({ state: pledges.state, count: sql<number>`count(*)` })
    .from(pledges)
    .where(eq(pledges.campaignId, campaignId))
    .groupBy(pledges.state)
    .all();
  const counts: Record<Pledge["state"], number> = { pending: 0, paid: 0, refunded: 0, failed: 0 };
  for (const row of rows) counts[row.state] = Number(row.count);
  return counts;
}

export function findCampaignSlug(db: Db, campaignId: string): string | undefined {
  return db.select({ slug: campaigns.slug }).from(campaigns).where(eq(campaigns.id, campaignId)).get()?.slug;
}

/**
 * Pending pledges of closed campaigns whose Checkout Session may still be open (younger than its
 * lifetime): the sweeper expires those sessions so nobody pays into a closed campaign.
 */
export function openCheckoutsOfClosedCampaigns(db: Db, now = new Date()): { pledgeId: string; sessionId: string }[] {
  return db
    .select({ pledgeId: pledges.id, sessionId: pledges.checkoutSessionId })
    .from(pledges)
    .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
    .where(
      and(
        eq(pledges.state, "pending"),
        inArray(campaigns.state, [...CLOSED_STATES]),
        sql`${pledges.checkoutSessionId} is not null`,
        gte(pledges.createdAt, new Date(now.getTime() - ORPHANED_PENDING_AFTER_MS)),
      ),
    )
    .all()
    .flatMap((row) => (row.sessionId ? [{ pledgeId: row.pledgeId, sessionId: row.sessionId }] : []));
}

/** A request whose pledge is already refunded (recorded by another path): nothing left to do. */
export function completeRefundRequest(db: Db, pledgeId: string, now: Date): void {
  db.update(refundRequests)
    .set({ state: "succeeded", completedAt: now, lastError: null })
    .where(and(eq(refundRequests.pledgeId, pledgeId), eq(refundRequests.state, "requested")))
    .run();
}

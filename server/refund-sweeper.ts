import "server-only";
import Stripe from "stripe";
import { asProcessorError } from "@/server/stripe";
import type { Db } from "@/db/client";
import {
  claimRefundRequests,
  closeDueCampaigns,
  completeRefundRequest,
  deferRefundRequest,
  failOrphanedPendingPledges,
  flagRefundRequest,
  openCheckoutsOfClosedCampaigns,
  recordRefund,
  recordRefundOutsideProcessor,
  requestLateRefunds,
  type ClaimedRefund,
  type ClosedCampaign,
} from "@/db/queries/refunds";
import { handleRefundRefusal, refundFactsOf, refundIdempotencyKey } from "@/lib/pledges/refunds";
import { refreshQueue } from "@/server/queue-refresh";

export type SweepOptions = {
  appUrl: string;
  now?: () => Date;
  /** Requests claimed at a time; a second sweep running meanwhile claims the next ones. */
  batchSize?: number;
  /** At most this many requests per pass; the rest wait for the next pass. */
  maxPerPass?: number;
  /** Only this campaign's requests (the withdraw action works through its own at once). */
  campaignId?: string;
  /** Test seam: runs after the processor answered and before the answer is committed. */
  afterProcessorAnswer?: (pledgeId: string) => void;
};

export type RefundPassReport = { refunded: number; deferred: number; flagged: number };
export type SweepReport = RefundPassReport & { closed: ClosedCampaign[]; lateRequests: number; orphansFailed: number; checkoutsExpired: number };

/** The refund create request for a pledge: every parameter follows from the pledge, so a retry under the same key matches. */
export function refundCreateParams(claim: ClaimedRefund & { paymentIntentId: string }): Stripe.RefundCreateParams {
  return { payment_intent: claim.paymentIntentId, metadata: { pledge_id: claim.pledgeId, campaign_id: claim.campaignId, goal_or_refund: claim.reason } };
}

/** Refunds of a payment already at the processor that cover the whole pledge (a refund made from its dashboard). */
async function findExistingRefund(stripe: Stripe, claim: ClaimedRefund & { paymentIntentId: string }): Promise<Stripe.Refund | undefined> {
  const listed = await stripe.refunds.list({ payment_intent: claim.paymentIntentId, limit: 10 });
  return listed.data.find((refund) => refund.status === "succeeded" && refund.amount === claim.amountMinor) ?? listed.data[0];
}

async function refundOne(db: Db, stripe: Stripe, claim: ClaimedRefund, options: SweepOptions, now: Date): Promise<keyof RefundPassReport> {
  const context = { appUrl: options.appUrl, now };
  const intentId = claim.paymentIntentId;
  if (!intentId) {
    flagRefundRequest(db, claim.pledgeId, "The pledge has no recorded payment to refund.", now);
    return "flagged";
  }
  const target = { ...claim, paymentIntentId: intentId };
  let refund: Stripe.Refund | undefined;
  try {
    // A refund already created but still pending is looked up; the create answer under the same
    // key would be the first answer again, with its old status.
    refund = claim.refundId
      ? await stripe.refunds.retrieve(claim.refundId)
      : await stripe.refunds.create(refundCreateParams(target), { idempotencyKey: refundIdempotencyKey(claim.pledgeId) });
  } catch (error) {
    const refused = asProcessorError(error);
    if (!refused) throw error;
    const handling = handleRefundRefusal({ statusCode: refused.statusCode ?? null, code: refused.code ?? null, type: refused.type, message: refused.message }, intentId);
    if (handling.kind === "retry") {
      deferRefundRequest(db, claim.pledgeId, claim.attempts, refused.message, now);
      return "deferred";
    }
    if (handling.kind === "outside_processor") {
      // False only when the pledge left `paid` meanwhile, and a paid pledge only ever becomes refunded.
      if (!recordRefundOutsideProcessor(db, claim.pledgeId, context)) completeRefundRequest(db, claim.pledgeId, now);
      return "refunded";
    }
    if (handling.kind === "attention") {
      flagRefundRequest(db, claim.pledgeId, handling.message, now);
      return "flagged";
    }
    refund = await findExistingRefund(stripe, target);
    if (!refund) {
      flagRefundRequest(db, claim.pledgeId, "The processor says the payment is refunded but lists no refund.", now);
      return "flagged";
    }
  }
  options.afterProcessorAnswer?.(claim.pledgeId);

  const facts = refundFactsOf(refund);
  if (!facts) {
    deferRefundRequest(db, claim.pledgeId, claim.attempts, "The processor's answer was not a refund.", now);
    return "deferred";
  }
  const { decision } = recordRefund(db, facts, context);
  if (decision.kind === "record") return "refunded";
  if (decision.kind === "pending") {
    deferRefundRequest(db, claim.pledgeId, claim.attempts, `Refund ${facts.refundId} is ${facts.status} at the processor.`, now);
    return "deferred";
  }
  if (decision.kind === "failed") return "flagged";
  // Recorded meanwhile by another path (the webhook): nothing left to do.
  if (decision.reason === "already_refunded") {
    completeRefundRequest(db, claim.pledgeId, now);
    return "refunded";
  }
  flagRefundRequest(db, claim.pledgeId, `Refund ${facts.refundId} does not match the pledge (${decision.reason}).`, now);
  return "flagged";
}

/** Works through due refund requests: claim a batch, ask the processor, record each answer. */
export async function processRefundRequests(db: Db, stripe: Stripe, options: SweepOptions): Promise<RefundPassReport> {
  const clock = options.now ?? (() => new Date());
  const report: RefundPassReport = { refunded: 0, deferred: 0, flagged: 0 };
  const max = options.maxPerPass ?? 500;
  let handled = 0;
  while (handled < max) {
    const batch = claimRefundRequests(db, { now: clock(), limit: Math.min(options.batchSize ?? 10, max - handled), campaignId: options.campaignId });
    if (batch.length === 0) break;
    for (const claim of batch) {
      report[await refundOne(db, stripe, claim, options, clock())]++;
      handled++;
    }
  }
  return report;
}

/**
 * Expires Checkout Sessions still open on closed campaigns, so nobody pays into one (a payment
 * that slips through anyway is refunded by requestLateRefunds). The session's `expired` event then
 * fails the pledge. A session that completed or expired meanwhile is refused; that is fine.
 */
export async function expireOpenCheckouts(db: Db, stripe: Stripe, now: Date): Promise<number> {
  let expired = 0;
  for (const { sessionId } of openCheckoutsOfClosedCampaigns(db, now)) {
    try {
      const session = await stripe.checkout.sessions.retrieve(sessionId);
      if (session.status !== "open") continue;
      await stripe.checkout.sessions.expire(sessionId);
      expired++;
    } catch (error) {
      if (!asProcessorError(error)) throw error;
    }
  }
  return expired;
}

/**
 * One pass of goal-or-refund: close campaigns whose deadline passed, request refunds for payments
 * that landed on closed campaigns, fail pending pledges that never got a Checkout Session, expire
 * sessions still open on closed campaigns, then refund. Safe to run twice at once: every step is a conditional update or a leased claim.
 */
export async function runMoneySweep(db: Db, stripe: Stripe, options: SweepOptions): Promise<SweepReport> {
  const now = (options.now ?? (() => new Date()))();
  const closed = closeDueCampaigns(db, { appUrl: options.appUrl, now });
  // A campaign funded at its deadline has new jobs for the print queue.
  if (closed.some((campaign) => campaign.outcome === "funded")) refreshQueue(db, null, now);
  const lateRequests = requestLateRefunds(db, now);
  const orphansFailed = failOrphanedPendingPledges(db, now);
  const checkoutsExpired = await expireOpenCheckouts(db, stripe, now);
  const refunds = await processRefundRequests(db, stripe, options);
  return { closed, lateRequests, orphansFailed, checkoutsExpired, ...refunds };
}

/** Runs the sweep in the app process every `intervalMs`; passes never overlap within the process. */
export function startRefundSweeper(db: Db, stripe: Stripe, options: { intervalMs: number; appUrl: string }): () => void {
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    runMoneySweep(db, stripe, { appUrl: options.appUrl })
      .catch((error) => console.error("goal-or-refund sweep failed", error))
      .finally(() => {
        running = false;
      });
  }, options.intervalMs);
  timer.unref();
  return () => clearInterval(timer);
}

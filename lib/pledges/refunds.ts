import type { PledgeState } from "./rules";

/*
 * Goal-or-refund, the refund half: which campaigns close, what a refund answer or event means for
 * its pledge, and how a refused refund request is handled. Pure; the database side is in
 * db/queries/refunds.ts and the processor calls in server/refund-sweeper.ts.
 */

export type RefundReason = "lapsed" | "withdrawn";

/** The idempotency key of the pledge's one refund create request: a retry gets the same refund. */
export function refundIdempotencyKey(pledgeId: string): string {
  return `pledge-refund:${pledgeId}`;
}

/** Ledger and outbox keys, fixed per pledge so a second answer or event cannot write a second row. */
export const refundKeys = {
  ledgerRef: (pledgeId: string) => `pledge:${pledgeId}:refund`,
  mail: (pledgeId: string) => `pledge-refund:${pledgeId}`,
};

/** Ids the demo seed gives its payments; the local processor has never seen them. */
export const SEEDED_PAYMENT_PREFIX = "pi_seed_";

/** The memo on a refund the processor could not make because it never took the payment. */
export const OUTSIDE_PROCESSOR_MEMO = "Seeded demo payment with no processor record: refund recorded outside the processor";

/* ---------- Which campaigns close ---------- */

export type CampaignClosing = { state: string; deadline: Date; goalMinor: number };

/**
 * At the deadline an open campaign either lapses or, when it reached its goal without the funded
 * transition having run (money that arrived by a path that did not check), is funded. Before the
 * deadline, or in any other state, nothing happens.
 */
export function deadlineOutcome(campaign: CampaignClosing, raisedMinor: number, now: Date): "lapse" | "fund" | null {
  if (campaign.state !== "open" || now.getTime() < campaign.deadline.getTime()) return null;
  return raisedMinor >= campaign.goalMinor ? "fund" : "lapse";
}

/** States from which a host may withdraw a campaign: nothing has been printed yet. */
export const WITHDRAWABLE_STATES = ["open", "funded", "queued"] as const;

export function isWithdrawable(state: string): boolean {
  return (WITHDRAWABLE_STATES as readonly string[]).includes(state);
}

/* ---------- What the processor says about a refund ---------- */

export type RefundFacts = {
  refundId: string;
  paymentIntentId: string | null;
  /** `metadata.pledge_id`, set by the sweeper when it asked for the refund. */
  pledgeId: string | null;
  amountMinor: number;
  /** Upper-case ISO 4217, as stored on the pledge. */
  currency: string;
  status: string;
  /** The refund's own creation time: the same whichever answer or event reports it first. */
  createdAt: Date;
};

type RefundLike = {
  id?: unknown;
  object?: unknown;
  amount?: unknown;
  currency?: unknown;
  status?: unknown;
  created?: unknown;
  payment_intent?: unknown;
  metadata?: unknown;
};

/** One mapper for a refund object, whether it came back from the API or inside an event. */
export function refundFactsOf(object: unknown): RefundFacts | null {
  const refund = object as RefundLike | null | undefined;
  if (!refund || refund.object !== "refund" || typeof refund.id !== "string") return null;
  if (typeof refund.amount !== "number" || typeof refund.currency !== "string" || typeof refund.created !== "number") return null;
  const intent = refund.payment_intent;
  const metadata = (refund.metadata ?? {}) as Record<string, unknown>;
  const pledgeId = typeof metadata.pledge_id === "string" && metadata.pledge_id ? metadata.pledge_id : null;
  return {
    refundId: refund.id,
    paymentIntentId: typeof intent === "string" ? intent : typeof (intent as { id?: unknown })?.id === "string" ? ((intent as { id: string }).id) : null,
    pledgeId,
    amountMinor: refund.amount,
    currency: refund.currency.toUpperCase(),
    status: typeof refund.status === "string" ? refund.status : "unknown",
    createdAt: new Date(refund.created * 1000),
  };
}

/** Event types that carry a refund; every one is mapped by refundFactsOf. */
export const REFUND_EVENT_TYPES = ["refund.created", "refund.updated", "refund.failed", "charge.refund.updated", "charge.refunded"] as const;

/**
 * The refunds an event reports. `refund.*` and `charge.refund.updated` carry the refund itself;
 * `charge.refunded` carries the charge, which lists its refunds only on older API versions — when
 * it does not, the refund's own event (or the sweeper's API answer) records it.
 */
export function refundFactsFromEvent(event: { type: string; data: { object: unknown } }): RefundFacts[] {
  if (!(REFUND_EVENT_TYPES as readonly string[]).includes(event.type)) return [];
  if (event.type !== "charge.refunded") {
    const facts = refundFactsOf(event.data.object);
    return facts ? [facts] : [];
  }
  const listed = (event.data.object as { refunds?: { data?: unknown[] } } | null)?.refunds?.data ?? [];
  return listed.map(refundFactsOf).filter((facts): facts is RefundFacts => facts !== null);
}

export type RefundablePledge = { id: string; state: PledgeState; amountMinor: number; currency: string; paymentIntentId: string | null; refundId: string | null };

export type RefundDecision =
  | { kind: "record" }
  | { kind: "pending" }
  | { kind: "failed"; status: string }
  | { kind: "ignore"; reason: string };

/**
 * What a refund report does to its pledge. Reports arrive from the API answer and from events,
 * in any order and more than once, so this is a transition from `paid`, never a blind write:
 * - a succeeded refund of the whole amount → refunded (once; the ledger and mail keys are per pledge);
 * - pending → wait for the update; failed or canceled → a host must look;
 * - another payment's refund, a partial refund or another currency → ignored.
 */
export function decideRefund(facts: RefundFacts, pledge: RefundablePledge | undefined): RefundDecision {
  if (!pledge) return { kind: "ignore", reason: "unknown_pledge" };
  if (pledge.paymentIntentId !== null && facts.paymentIntentId !== null && facts.paymentIntentId !== pledge.paymentIntentId) {
    return { kind: "ignore", reason: "other_payment" };
  }
  if (pledge.state === "refunded") return { kind: "ignore", reason: "already_refunded" };
  if (pledge.state !== "paid") return { kind: "ignore", reason: `pledge_${pledge.state}` };
  if (facts.currency !== pledge.currency || facts.amountMinor !== pledge.amountMinor) return { kind: "ignore", reason: "partial_or_other_amount" };
  if (facts.status === "succeeded") return { kind: "record" };
  if (facts.status === "pending" || facts.status === "requires_action") return { kind: "pending" };
  return { kind: "failed", status: facts.status };
}

/* ---------- When the processor refuses ---------- */

export type ProcessorErrorFacts = { statusCode?: number | null; code?: string | null; type?: string | null; message?: string };

export type RefusalHandling =
  /** Try again later with the same key (network, rate limit, the processor's own trouble, a concurrent request). */
  | { kind: "retry" }
  /** The charge is refunded already (say, from the processor's dashboard): look the refund up and record it. */
  | { kind: "find_existing" }
  /** A seeded demo payment the processor never took: record the refund as made outside it. */
  | { kind: "outside_processor" }
  /** Refused for good: a host must look. */
  | { kind: "attention"; message: string };

/**
 * Stripe's documented error handling (from memory): 409 on an idempotency key whose first request
 * is still running, 429 on rate limits and 5xx/connection errors are safe to retry with the same
 * key; other 4xx answers will be refused again.
 */
export function handleRefundRefusal(error: ProcessorErrorFacts, paymentIntentId: string): RefusalHandling {
  const status = error.statusCode ?? null;
  if (status === null || status === 409 || status === 429 || status >= 500) return { kind: "retry" };
  if (error.code === "charge_already_refunded") return { kind: "find_existing" };
  if (error.code === "resource_missing" && paymentIntentId.startsWith(SEEDED_PAYMENT_PREFIX)) return { kind: "outside_processor" };
  return { kind: "attention", message: error.message ?? `The processor refused the refund (${error.code ?? status}).` };
}

/** Back-off between refund attempts after a transient failure: 30 s, 1 min, 2 min … capped at an hour. */
export function refundRetryDelayMs(attempts: number): number {
  return Math.min(60 * 60_000, 30_000 * 2 ** Math.max(0, attempts - 1));
}

/** How long one sweep may hold a request while it waits for the processor's answer. */
export const REFUND_LEASE_MS = 2 * 60_000;

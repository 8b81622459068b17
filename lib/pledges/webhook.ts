import type Stripe from "stripe";
import type { PledgeState } from "./rules";

/** The Checkout events that move a pledge; every other event type is acknowledged and ignored. */
export const PLEDGE_EVENT_TYPES = [
  "checkout.session.completed",
  "checkout.session.async_payment_succeeded",
  "checkout.session.async_payment_failed",
  "checkout.session.expired",
] as const;
export type PledgeEventType = (typeof PLEDGE_EVENT_TYPES)[number];

/** What a pledge decision needs from a Checkout Session event. */
export type SessionFacts = {
  type: PledgeEventType;
  sessionId: string;
  /** `metadata.pledge_id`, else `client_reference_id`: both set by the server when it created the session. */
  pledgeId: string | null;
  mode: string | null;
  paymentStatus: string | null;
  paymentIntentId: string | null;
  amountTotal: number | null;
  /** Upper-case ISO 4217, as stored on the pledge. */
  currency: string | null;
  /** The event's creation time (milliseconds), used as the payment's time. */
  occurredAt: Date;
};

function isPledgeEventType(type: string): type is PledgeEventType {
  return (PLEDGE_EVENT_TYPES as readonly string[]).includes(type);
}

/** Reads the facts from a verified event; null when it is not a pledge's Checkout event. */
export function sessionFacts(event: Pick<Stripe.Event, "type" | "created" | "data">): SessionFacts | null {
  if (!isPledgeEventType(event.type)) return null;
  const session = event.data.object as Partial<Stripe.Checkout.Session> | undefined;
  if (!session || typeof session.id !== "string" || session.object !== "checkout.session") return null;
  const metadataId = session.metadata?.pledge_id;
  const intent = session.payment_intent;
  return {
    type: event.type,
    sessionId: session.id,
    pledgeId: (typeof metadataId === "string" && metadataId) || session.client_reference_id || null,
    mode: session.mode ?? null,
    paymentStatus: session.payment_status ?? null,
    paymentIntentId: typeof intent === "string" ? intent : (intent?.id ?? null),
    amountTotal: session.amount_total ?? null,
    currency: session.currency ? session.currency.toUpperCase() : null,
    occurredAt: new Date(event.created * 1000),
  };
}

export type PledgeView = {
  state: PledgeState;
  amountMinor: number;
  currency: string;
  checkoutSessionId: string | null;
};

export type PledgeDecision =
  | { kind: "mark_paid"; paymentIntentId: string | null }
  | { kind: "mark_failed" }
  | { kind: "ignore"; reason: string };

/**
 * What an event does to its pledge. Events arrive in any order and more than once, so every rule
 * is a transition from a state, never a blind write:
 * - payment confirmed (completed with payment_status `paid`, or async_payment_succeeded) → paid,
 *   from pending (or from failed: the money is there, whatever arrived before it);
 * - completed but still `unpaid` (a delayed method) → nothing yet, the async event decides;
 * - expired or async_payment_failed → failed, only from pending (a paid pledge stays paid);
 * - a session that is not ours (no pledge, another session id, another amount) → ignored.
 */
export function decidePledgeEvent(facts: SessionFacts, pledge: PledgeView | undefined): PledgeDecision {
  if (!pledge) return { kind: "ignore", reason: "unknown_session" };
  if (facts.mode !== null && facts.mode !== "payment") return { kind: "ignore", reason: "not_a_payment" };
  if (pledge.checkoutSessionId !== null && pledge.checkoutSessionId !== facts.sessionId) return { kind: "ignore", reason: "other_session" };

  const confirmsPayment =
    (facts.type === "checkout.session.completed" && facts.paymentStatus === "paid") ||
    facts.type === "checkout.session.async_payment_succeeded";
  if (confirmsPayment) {
    if (facts.amountTotal !== pledge.amountMinor || facts.currency !== pledge.currency) return { kind: "ignore", reason: "amount_mismatch" };
    if (pledge.state === "pending" || pledge.state === "failed") return { kind: "mark_paid", paymentIntentId: facts.paymentIntentId };
    return { kind: "ignore", reason: `already_${pledge.state}` };
  }
  if (facts.type === "checkout.session.completed") return { kind: "ignore", reason: "payment_not_settled" };
  // expired or async_payment_failed
  if (pledge.state === "pending") return { kind: "mark_failed" };
  return { kind: "ignore", reason: `already_${pledge.state}` };
}

/** The goal-or-refund rule's funding half: funded once the money raised reaches the goal. */
export function reachesGoal(raisedMinor: number, goalMinor: number): boolean {
  return raisedMinor >= goalMinor;
}

/** Ledger and outbox keys, fixed per pledge so a second event cannot write a second row. */
export const pledgeKeys = {
  paymentRef: (pledgeId: string) => `pledge:${pledgeId}:payment`,
  receipt: (pledgeId: string) => `pledge-receipt:${pledgeId}`,
  funded: (campaignId: string, userId: string) => `campaign-funded:${campaignId}:${userId}`,
};

import type Stripe from "stripe";
import { addCalendarMonthsUtc, type MembershipEvidence } from "./state";

/** The processor events that move a membership; every other type is acknowledged and ignored. */
export const MEMBERSHIP_EVENT_TYPES = [
  "checkout.session.completed",
  "invoice.paid",
  "invoice.payment_succeeded",
  "invoice.payment_failed",
  "customer.subscription.created",
  "customer.subscription.updated",
  "customer.subscription.deleted",
] as const;
export type MembershipEventType = (typeof MEMBERSHIP_EVENT_TYPES)[number];

/** Metadata the server puts on the session and the subscription (and so on every invoice). */
export const MEMBERSHIP_METADATA = { userId: "user_id", planCode: "plan_code" } as const;

export type InvoiceFacts = {
  invoiceId: string;
  /** The invoice's number when it has one (e.g. "9F3A1C2B-0002"). */
  number: string | null;
  amountMinor: number;
  /** Upper-case ISO 4217. */
  currency: string;
  /** The period this invoice pays for (its subscription lines' period). */
  periodStart: Date;
  periodEnd: Date;
  /** `subscription_create` for the first month, `subscription_cycle` for a renewal. */
  billingReason: string | null;
  occurredAt: Date;
  /** Failed invoices: when the processor tries the card again, if it says. */
  nextAttemptAt: Date | null;
};

export type MembershipEventFacts = {
  type: MembershipEventType;
  subscriptionId: string;
  userId: string | null;
  planCode: string | null;
  customerId: string | null;
  evidence: MembershipEvidence;
  paidInvoice?: InvoiceFacts;
  failedInvoice?: InvoiceFacts;
};

type EventLike = Pick<Stripe.Event, "type" | "created" | "data">;

function isMembershipEventType(type: string): type is MembershipEventType {
  return (MEMBERSHIP_EVENT_TYPES as readonly string[]).includes(type);
}

const idOf = (value: string | { id: string } | null | undefined): string | null => (typeof value === "string" ? value : (value?.id ?? null));
const seconds = (value: number) => new Date(value * 1000);

function metadataFacts(metadata: Stripe.Metadata | null | undefined) {
  const userId = metadata?.[MEMBERSHIP_METADATA.userId];
  const planCode = metadata?.[MEMBERSHIP_METADATA.planCode];
  return { userId: typeof userId === "string" && userId ? userId : null, planCode: typeof planCode === "string" && planCode ? planCode : null };
}

/** Reads the facts from a verified event; null when it is not about a Filament Club subscription. */
export function membershipEventFacts(event: EventLike): MembershipEventFacts | null {
  if (!isMembershipEventType(event.type)) return null;
  const object = event.data.object as { object?: string } | undefined;
  if (!object) return null;
  if (event.type === "checkout.session.completed") return object.object === "checkout.session" ? sessionFacts(object as Stripe.Checkout.Session) : null;
  if (event.type.startsWith("invoice.")) return object.object === "invoice" ? invoiceFacts(event, object as Stripe.Invoice) : null;
  return object.object === "subscription" ? subscriptionFacts(event, object as Stripe.Subscription) : null;
}

/**
 * A paid subscription-mode session: the membership exists and is paid from the session's
 * creation for a month. That is a lower bound of the real period (which starts when the card was
 * accepted, a little later); the invoice and subscription events bring the exact end.
 */
function sessionFacts(session: Partial<Stripe.Checkout.Session>): MembershipEventFacts | null {
  if (session.mode !== "subscription") return null;
  const subscriptionId = idOf(session.subscription);
  if (!subscriptionId || typeof session.created !== "number") return null;
  const createdAt = seconds(session.created);
  const paid = session.payment_status === "paid";
  return {
    type: "checkout.session.completed",
    subscriptionId,
    ...metadataFacts(session.metadata),
    customerId: idOf(session.customer),
    evidence: { startedAt: createdAt, ...(paid ? { paidThrough: addCalendarMonthsUtc(createdAt, 1) } : {}) },
  };
}

function invoiceSubscriptionId(invoice: Stripe.Invoice): string | null {
  const fromParent = invoice.parent?.subscription_details?.subscription;
  // Before API version 2025-03-31 the subscription sat on the invoice itself.
  const legacy = (invoice as unknown as { subscription?: string | { id: string } | null }).subscription;
  return idOf(fromParent ?? legacy);
}

function invoicePeriod(invoice: Stripe.Invoice): { start: Date; end: Date } {
  const lines = invoice.lines?.data ?? [];
  if (lines.length === 0) return { start: seconds(invoice.period_start), end: seconds(invoice.period_end) };
  return {
    start: seconds(Math.min(...lines.map((line) => line.period.start))),
    end: seconds(Math.max(...lines.map((line) => line.period.end))),
  };
}

function invoiceFacts(event: EventLike, invoice: Stripe.Invoice): MembershipEventFacts | null {
  const subscriptionId = invoiceSubscriptionId(invoice);
  if (!subscriptionId || typeof invoice.id !== "string") return null;
  const metadata = invoice.parent?.subscription_details?.metadata ?? invoice.lines?.data[0]?.metadata ?? null;
  const period = invoicePeriod(invoice);
  const paid = event.type !== "invoice.payment_failed";
  if (paid && invoice.status !== "paid") return null;
  const facts: InvoiceFacts = {
    invoiceId: invoice.id,
    number: invoice.number ?? null,
    amountMinor: paid ? invoice.amount_paid : invoice.amount_due,
    currency: invoice.currency.toUpperCase(),
    periodStart: period.start,
    periodEnd: period.end,
    billingReason: invoice.billing_reason ?? null,
    occurredAt: paid && invoice.status_transitions?.paid_at ? seconds(invoice.status_transitions.paid_at) : seconds(event.created),
    nextAttemptAt: invoice.next_payment_attempt ? seconds(invoice.next_payment_attempt) : null,
  };
  return {
    type: event.type as MembershipEventType,
    subscriptionId,
    ...metadataFacts(metadata),
    customerId: idOf(invoice.customer),
    evidence: paid ? { paidThrough: period.end, startedAt: period.start } : { unpaidThrough: period.end, startedAt: period.start },
    ...(paid ? { paidInvoice: facts } : { failedInvoice: facts }),
  };
}

function subscriptionPeriod(subscription: Stripe.Subscription): { start: Date; end: Date } | null {
  const item = subscription.items?.data[0];
  // Before API version 2025-03-31 the period sat on the subscription itself.
  const legacy = subscription as unknown as { current_period_start?: number; current_period_end?: number };
  const start = item?.current_period_start ?? legacy.current_period_start;
  const end = item?.current_period_end ?? legacy.current_period_end;
  return typeof start === "number" && typeof end === "number" ? { start: seconds(start), end: seconds(end) } : null;
}

/**
 * A subscription snapshot. Active: paid to the end of the current period. Past due or unpaid: paid
 * to its start, the period itself unpaid. Canceled: ended. Incomplete ones (Checkout still taking
 * the first payment) say nothing yet.
 */
function subscriptionFacts(event: EventLike, subscription: Stripe.Subscription): MembershipEventFacts | null {
  if (typeof subscription.id !== "string") return null;
  const period = subscriptionPeriod(subscription);
  const at = seconds(event.created);
  const evidence: MembershipEvidence = { startedAt: seconds(subscription.start_date ?? subscription.created) };
  const status = event.type === "customer.subscription.deleted" ? "canceled" : subscription.status;
  if (status === "canceled") {
    evidence.ended = { at: subscription.ended_at ? seconds(subscription.ended_at) : at, canceledAt: subscription.canceled_at ? seconds(subscription.canceled_at) : null };
  } else if (status === "active" || status === "trialing") {
    if (period) evidence.paidThrough = period.end;
    evidence.cancelFlag = { value: subscription.cancel_at_period_end === true, at };
  } else if (status === "past_due" || status === "unpaid") {
    if (period) {
      evidence.paidThrough = period.start;
      evidence.unpaidThrough = period.end;
    }
    evidence.cancelFlag = { value: subscription.cancel_at_period_end === true, at };
  } else {
    return null;
  }
  return { type: event.type as MembershipEventType, subscriptionId: subscription.id, ...metadataFacts(subscription.metadata), customerId: idOf(subscription.customer), evidence };
}

/** Ledger and outbox keys, fixed per invoice so a second event cannot write a second row. */
export const membershipKeys = {
  paymentRef: (invoiceId: string) => `membership-invoice:${invoiceId}:payment`,
  receipt: (invoiceId: string) => `membership-receipt:${invoiceId}`,
  renewalFailed: (invoiceId: string) => `membership-renewal-failed:${invoiceId}`,
};

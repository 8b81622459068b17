import type Stripe from "stripe";
import { addInterval } from "../clock";
import { NO_REQUEST, type Engine, type RequestContext } from "../engine";
import { StripeApiError, invalidRequest } from "../errors";
import { newId } from "../ids";
import * as build from "../objects";
import { PAGINATION_PARAMS, Params, applyMetadata, pagination, rangeFilter, type Metadata } from "../params";
import { ignoring, unsupported } from "./catalog";
import { chargeIntent, newPaymentIntent } from "./payments";

const RENEWAL_DECLINE: build.ChargeFailure = {
  code: "card_declined",
  declineCode: "generic_decline",
  message: "Your card was declined.",
  sellerMessage: "The bank did not return any further details with this decline.",
};

/**
 * What Checkout does when a subscription-mode session is paid: a subscription (created
 * `incomplete`), its first invoice (created, finalized, paid), then the subscription `active`.
 */
export function startSubscription(
  engine: Engine,
  input: { customer: Stripe.Customer; paymentMethod: Stripe.PaymentMethod; lineItems: Stripe.LineItem[]; metadata: Metadata; description: string | null },
  request: RequestContext,
): { subscription: Stripe.Subscription; invoice: Stripe.Invoice } {
  const now = engine.now();
  const id = newId("sub");
  const items = input.lineItems.map((line) => {
    const price = line.price!;
    const recurring = price.recurring!;
    return build.subscriptionItem({
      now,
      subscription: id,
      price,
      quantity: line.quantity ?? 1,
      periodStart: now,
      periodEnd: addInterval(now, recurring.interval, recurring.interval_count, 1),
      metadata: {},
    });
  });
  const subscription = build.subscription({
    now,
    id,
    customer: input.customer.id,
    currency: items[0]!.price.currency,
    items,
    defaultPaymentMethod: input.paymentMethod.id,
    description: input.description,
    metadata: input.metadata,
  });
  engine.put("subscription", subscription);
  engine.emit("customer.subscription.created", subscription, request);

  const invoice = openInvoice(engine, subscription, "subscription_create", now, now, request);
  const paid = collectInvoice(engine, invoice, subscription, input.paymentMethod, null, request);
  if (!paid) throw new Error("The first invoice of a Checkout subscription is only opened after the card was accepted");
  engine.update("subscription", subscription, "customer.subscription.updated", request, (target) => {
    target.status = "active";
    target.latest_invoice = invoice.id;
  });
  return { subscription, invoice };
}

/** Times at which something happens to this subscription by itself (renewal or a scheduled end). */
export function nextDueTime(subscription: Stripe.Subscription): number | undefined {
  if (subscription.status !== "active" && subscription.status !== "past_due" && subscription.status !== "trialing") return undefined;
  const periodEnd = currentPeriodEnd(subscription);
  const cancelAt = subscription.cancel_at ?? Infinity;
  const due = Math.min(periodEnd ?? Infinity, cancelAt);
  return Number.isFinite(due) ? due : undefined;
}

/**
 * Renews or ends every subscription that is due at the clock's current time. A renewal moves each
 * item to the next period, and bills it: paid → `invoice.paid`; failing (see `failNextRenewal`)
 * → `invoice.payment_failed` and the subscription `past_due`.
 */
export function processDueSubscriptions(engine: Engine): { renewed: string[]; failed: string[]; ended: string[] } {
  const report = { renewed: [] as string[], failed: [] as string[], ended: [] as string[] };
  const now = engine.now();
  for (const subscription of engine.store.all("subscription")) {
    const due = nextDueTime(subscription);
    if (due === undefined || due > now) continue;

    const endsNow = (subscription.cancel_at !== null && subscription.cancel_at <= now) || subscription.cancel_at_period_end;
    if (endsNow) {
      engine.update("subscription", subscription, "customer.subscription.deleted", NO_REQUEST, (target) => {
        target.status = "canceled";
        target.ended_at = due;
        target.canceled_at ??= due;
        target.cancellation_details = { ...(target.cancellation_details ?? emptyCancellationDetails()), reason: "cancellation_requested" };
      });
      report.ended.push(subscription.id);
      continue;
    }

    const before = structuredClone(subscription);
    for (const item of subscription.items.data) {
      const recurring = item.price.recurring!;
      const previousEnd = item.current_period_end;
      item.current_period_start = previousEnd;
      item.current_period_end = nextBoundary(subscription.billing_cycle_anchor, recurring.interval, recurring.interval_count, previousEnd);
    }
    engine.put("subscription", subscription);

    const previousStart = before.items.data[0]?.current_period_start ?? now;
    const invoice = openInvoice(engine, subscription, "subscription_cycle", previousStart, now, NO_REQUEST);
    const method = typeof subscription.default_payment_method === "string" ? engine.get("payment_method", subscription.default_payment_method) : undefined;
    const fails = takeRenewalFailure(engine, subscription.id) || !method;
    const paid = method ? collectInvoice(engine, invoice, subscription, method, fails ? RENEWAL_DECLINE : null, NO_REQUEST) : failWithoutMethod(engine, invoice);

    subscription.latest_invoice = invoice.id;
    subscription.status = paid ? "active" : "past_due";
    engine.put("subscription", subscription);
    engine.emit("customer.subscription.updated", subscription, NO_REQUEST, before);
    (paid ? report.renewed : report.failed).push(subscription.id);
  }
  return report;
}

/** Makes the next renewal of one subscription (or, with "*", of any) fail, `count` times. */
export function failNextRenewal(engine: Engine, subscriptionId: string, count = 1): void {
  if (subscriptionId !== "*") engine.require("subscription", subscriptionId, { param: "subscription", status: 404 });
  const failing = engine.store.extras.failingRenewals;
  failing[subscriptionId] = (failing[subscriptionId] ?? 0) + count;
  engine.store.markDirty();
}

const SUBSCRIPTION_UPDATE_UNSUPPORTED = ["items", "trial_end", "trial_from_plan", "billing_cycle_anchor", "pause_collection", "add_invoice_items", "discounts", "billing_schedules"];
const SUBSCRIPTION_UPDATE_IGNORED = [
  "application_fee_percent",
  "automatic_tax",
  "billing_thresholds",
  "collection_method",
  "days_until_due",
  "default_source",
  "default_tax_rates",
  "invoice_settings",
  "off_session",
  "on_behalf_of",
  "payment_behavior",
  "payment_settings",
  "pending_invoice_item_interval",
  "proration_behavior",
  "proration_date",
  "transfer_data",
  "trial_settings",
];

export function updateSubscription(engine: Engine, id: string, params: Params, request: RequestContext): Stripe.Subscription {
  for (const key of SUBSCRIPTION_UPDATE_UNSUPPORTED) if (params.has(key)) throw unsupported(key);
  params.allow(["cancel_at_period_end", "cancel_at", "metadata", "description", "cancellation_details", "default_payment_method", "expand"], ignoring(engine, SUBSCRIPTION_UPDATE_IGNORED));
  const subscription = engine.require("subscription", id, { param: "id", status: 404 });
  const touchesBilling = ["cancel_at_period_end", "cancel_at", "description", "default_payment_method"].some((key) => params.has(key));
  if ((subscription.status === "canceled" || subscription.status === "incomplete_expired") && touchesBilling) {
    throw invalidRequest("A canceled subscription can only update its cancellation_details and metadata.");
  }
  const cancelAtPeriodEnd = params.bool("cancel_at_period_end");
  const cancelAtRaw = params.str("cancel_at");
  const cancelAt = cancelAtRaw === undefined ? undefined : cancelAtRaw === "" ? null : params.int("cancel_at", { min: engine.now() });
  if (cancelAtPeriodEnd === true && cancelAt) {
    throw invalidRequest("You may only specify one of these parameters: cancel_at, cancel_at_period_end.", "cancel_at");
  }
  const defaultPaymentMethod = params.str("default_payment_method");
  if (defaultPaymentMethod) engine.require("payment_method", defaultPaymentMethod, { param: "default_payment_method", status: 400 });
  const details = readCancellationDetails(params);

  return engine.update("subscription", subscription, "customer.subscription.updated", request, (target) => {
    const now = engine.now();
    if (cancelAtPeriodEnd !== undefined) {
      target.cancel_at_period_end = cancelAtPeriodEnd;
      target.cancel_at = cancelAtPeriodEnd ? (currentPeriodEnd(target) ?? null) : null;
      target.canceled_at = cancelAtPeriodEnd ? now : null;
    }
    if (cancelAt !== undefined) {
      target.cancel_at = cancelAt ?? null;
      target.cancel_at_period_end = cancelAt !== null && cancelAt !== undefined && cancelAt === currentPeriodEnd(target);
      target.canceled_at = cancelAt ? now : null;
    }
    if (params.has("description")) target.description = params.str("description") || null;
    if (defaultPaymentMethod !== undefined) target.default_payment_method = defaultPaymentMethod || null;
    if (details) target.cancellation_details = { ...(target.cancellation_details ?? emptyCancellationDetails()), ...details };
    target.metadata = applyMetadata(target.metadata, params.metadata());
  });
}

export function cancelSubscription(engine: Engine, id: string, params: Params, request: RequestContext): Stripe.Subscription {
  params.allow(["cancellation_details", "expand"], ignoring(engine, ["invoice_now", "prorate"]));
  const subscription = engine.require("subscription", id, { param: "id", status: 404 });
  if (subscription.status === "canceled") {
    throw new StripeApiError(400, { message: `This subscription (${id}) has already been canceled.`, code: "resource_missing" });
  }
  const details = readCancellationDetails(params);
  return engine.update("subscription", subscription, "customer.subscription.deleted", request, (target) => {
    const now = engine.now();
    target.status = "canceled";
    target.canceled_at = now;
    target.ended_at = now;
    target.cancellation_details = { ...(target.cancellation_details ?? emptyCancellationDetails()), ...details, reason: "cancellation_requested" };
  });
}

export function listSubscriptions(engine: Engine, params: Params): Stripe.ApiList<Stripe.Subscription> {
  params.allow([...PAGINATION_PARAMS, "customer", "price", "status", "created"], ignoring(engine, ["automatic_tax", "collection_method", "current_period_end", "current_period_start", "customer_account", "plan", "test_clock"]));
  const customer = params.str("customer");
  const price = params.str("price");
  const status = params.oneOf("status", ["active", "all", "canceled", "ended", "incomplete", "incomplete_expired", "past_due", "paused", "trialing", "unpaid"] as const);
  const created = rangeFilter(params, "created");
  const items = engine.newestFirst(
    "subscription",
    (s) =>
      (customer === undefined || s.customer === customer) &&
      (price === undefined || s.items.data.some((item) => item.price.id === price)) &&
      // Without a status Stripe leaves canceled subscriptions out.
      (status === "all" ? true : status === undefined ? s.status !== "canceled" : status === "ended" ? s.status === "canceled" || s.status === "incomplete_expired" : s.status === status) &&
      (!created || created(s.created)),
  );
  return engine.list(items, pagination(params), "/v1/subscriptions");
}

export function listInvoices(engine: Engine, params: Params): Stripe.ApiList<Stripe.Invoice> {
  params.allow([...PAGINATION_PARAMS, "subscription", "customer", "status", "created"], ignoring(engine, ["collection_method", "customer_account", "due_date"]));
  const subscription = params.str("subscription");
  const customer = params.str("customer");
  const status = params.oneOf("status", ["draft", "open", "paid", "uncollectible", "void"] as const);
  const created = rangeFilter(params, "created");
  const items = engine.newestFirst(
    "invoice",
    (i) =>
      (subscription === undefined || i.parent?.subscription_details?.subscription === subscription) &&
      (customer === undefined || i.customer === customer) &&
      (status === undefined || i.status === status) &&
      (!created || created(i.created)),
  );
  return engine.list(items, pagination(params), "/v1/invoices");
}

/** `POST /v1/invoices/:id/pay`: tries the subscription's card again (a failing renewal recovers here). */
export function payInvoice(engine: Engine, id: string, params: Params, request: RequestContext): Stripe.Invoice {
  params.allow(["expand", "paid_out_of_band"], ignoring(engine, ["forgive", "mandate", "off_session", "payment_method", "source"]));
  const invoice = engine.require("invoice", id, { param: "id", status: 404 });
  if (invoice.status === "paid") throw new StripeApiError(400, { message: "Invoice is already paid", code: "invoice_already_paid" });
  if (invoice.status !== "open") throw invalidRequest(`You can only pay an invoice that is open; this one is ${invoice.status}.`, undefined, "invoice_not_editable");
  const subscriptionId = invoice.parent?.subscription_details?.subscription;
  const subscription = typeof subscriptionId === "string" ? engine.get("subscription", subscriptionId) : undefined;
  if (!subscription) throw invalidRequest("The fake only pays subscription invoices.");

  if (params.bool("paid_out_of_band")) {
    markPaid(engine, invoice, request);
  } else {
    const method = typeof subscription.default_payment_method === "string" ? engine.get("payment_method", subscription.default_payment_method) : undefined;
    if (!method) throw invalidRequest("This customer has no attached payment source or default payment method.", undefined, "invoice_no_payment_method_types");
    const fails = takeRenewalFailure(engine, subscription.id);
    const paid = collectInvoice(engine, invoice, subscription, method, fails ? RENEWAL_DECLINE : null, request);
    if (!paid) {
      throw new StripeApiError(402, {
        type: "card_error",
        message: RENEWAL_DECLINE.message,
        code: RENEWAL_DECLINE.code,
        decline_code: RENEWAL_DECLINE.declineCode,
      });
    }
  }
  if (subscription.status === "past_due" && subscription.latest_invoice === invoice.id) {
    engine.update("subscription", subscription, "customer.subscription.updated", request, (target) => {
      target.status = "active";
    });
  }
  return invoice;
}

function openInvoice(engine: Engine, subscription: Stripe.Subscription, reason: Stripe.Invoice.BillingReason, periodStart: number, periodEnd: number, request: RequestContext): Stripe.Invoice {
  const customer = engine.require("customer", subscription.customer as string, { param: "customer", status: 400 });
  const sequence = customer.next_invoice_sequence ?? 1;
  customer.next_invoice_sequence = sequence + 1;
  engine.put("customer", customer);
  const invoice = build.invoice({
    now: engine.now(),
    subscription,
    customer,
    billingReason: reason,
    number: `${customer.invoice_prefix ?? "INV"}-${String(sequence).padStart(4, "0")}`,
    periodStart,
    periodEnd,
    hostedUrlBase: engine.publicUrl(),
  });
  engine.put("invoice", invoice);
  engine.emit("invoice.created", invoice, request);
  engine.update("invoice", invoice, "invoice.finalized", request, (target) => {
    target.status = "open";
    target.effective_at = engine.now();
    target.status_transitions = { ...target.status_transitions, finalized_at: engine.now() };
  });
  return invoice;
}

/** Charges the invoice's amount to the card; true when it was paid. */
function collectInvoice(engine: Engine, invoice: Stripe.Invoice, subscription: Stripe.Subscription, method: Stripe.PaymentMethod, failure: build.ChargeFailure | null, request: RequestContext): boolean {
  const intent = newPaymentIntent(
    engine,
    {
      amount: invoice.amount_due,
      currency: invoice.currency,
      customer: typeof subscription.customer === "string" ? subscription.customer : subscription.customer.id,
      description: invoice.billing_reason === "subscription_create" ? "Subscription creation" : "Subscription update",
      metadata: {},
      receiptEmail: null,
    },
    request,
  );
  engine.store.extras.invoicePaymentIntents[invoice.id] = intent.id;
  chargeIntent(engine, intent, method, failure, request);
  if (failure) {
    engine.update("invoice", invoice, "invoice.payment_failed", request, (target) => {
      target.attempted = true;
      target.attempt_count += 1;
      // Stripe's default retry schedule tries again a few days later; the fake waits for `pay`.
      target.next_payment_attempt = engine.now() + 3 * 86_400;
    });
    return false;
  }
  markPaid(engine, invoice, request);
  return true;
}

function markPaid(engine: Engine, invoice: Stripe.Invoice, request: RequestContext): void {
  engine.update("invoice", invoice, "invoice.paid", request, (target) => {
    target.status = "paid";
    target.attempted = true;
    target.attempt_count += 1;
    target.amount_paid = target.amount_due;
    target.amount_remaining = 0;
    target.next_payment_attempt = null;
    target.status_transitions = { ...target.status_transitions, paid_at: engine.now() };
  });
  engine.emit("invoice.payment_succeeded", invoice, request);
}

function failWithoutMethod(engine: Engine, invoice: Stripe.Invoice): boolean {
  engine.update("invoice", invoice, "invoice.payment_failed", NO_REQUEST, (target) => {
    target.attempted = true;
    target.attempt_count += 1;
  });
  return false;
}

function takeRenewalFailure(engine: Engine, subscriptionId: string): boolean {
  const failing = engine.store.extras.failingRenewals;
  for (const key of [subscriptionId, "*"]) {
    const left = failing[key] ?? 0;
    if (left > 0) {
      if (left === 1) delete failing[key];
      else failing[key] = left - 1;
      engine.store.markDirty();
      return true;
    }
  }
  return false;
}

export function currentPeriodEnd(subscription: Stripe.Subscription): number | undefined {
  const ends = subscription.items.data.map((item) => item.current_period_end);
  return ends.length > 0 ? Math.min(...ends) : undefined;
}

/** The first billing boundary after `after`, counted from the anchor so a 31st stays the 31st where it can. */
function nextBoundary(anchor: number, interval: string, count: number, after: number): number {
  for (let periods = 1; periods < 10_000; periods++) {
    const boundary = addInterval(anchor, interval, count, periods);
    if (boundary > after) return boundary;
  }
  throw new Error(`No billing boundary after ${after}`);
}

function readCancellationDetails(params: Params): Partial<Stripe.Subscription.CancellationDetails> | undefined {
  const details = params.obj("cancellation_details");
  if (!details) return undefined;
  details.allow(["comment", "feedback"]);
  const feedback = details.oneOf("feedback", ["customer_service", "low_quality", "missing_features", "other", "switched_service", "too_complex", "too_expensive", "unused"] as const);
  return {
    ...(details.has("comment") ? { comment: details.str("comment") || null } : {}),
    ...(feedback !== undefined ? { feedback } : {}),
  };
}

function emptyCancellationDetails(): Stripe.Subscription.CancellationDetails {
  return { comment: null, feedback: null, feedback_option: null, reason: null };
}

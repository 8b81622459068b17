import type Stripe from "stripe";
import type { Engine, RequestContext } from "../engine";
import { StripeApiError, invalidRequest } from "../errors";
import * as build from "../objects";
import type { CardDetails, ChargeFailure } from "../objects";
import { PAGINATION_PARAMS, Params, applyMetadata, pagination, rangeFilter, type Metadata } from "../params";
import { ignoring } from "./catalog";

export function newPaymentIntent(
  engine: Engine,
  input: { amount: number; currency: string; customer: string | null; description: string | null; metadata: Metadata; receiptEmail: string | null },
  request: RequestContext,
): Stripe.PaymentIntent {
  const intent = build.paymentIntent({ now: engine.now(), ...input });
  engine.put("payment_intent", intent);
  engine.emit("payment_intent.created", intent, request);
  return intent;
}

export function newCardPaymentMethod(engine: Engine, input: { card: CardDetails; name: string | null; email: string | null; customer: string | null }): Stripe.PaymentMethod {
  return engine.put("payment_method", build.paymentMethod({ now: engine.now(), ...input }));
}

/**
 * Charges the card for the whole intent. Success: a succeeded charge and intent. Decline: a failed
 * charge, the intent back at `requires_payment_method` with `last_payment_error`, as Stripe leaves it.
 */
export function chargeIntent(
  engine: Engine,
  intent: Stripe.PaymentIntent,
  method: Stripe.PaymentMethod,
  failure: ChargeFailure | null,
  request: RequestContext,
): { intent: Stripe.PaymentIntent; charge: Stripe.Charge } {
  const charge = build.charge({ now: engine.now(), paymentIntent: intent, paymentMethod: method, failure, receiptUrlBase: engine.publicUrl() });
  engine.put("charge", charge);
  if (failure) {
    engine.emit("charge.failed", charge, request);
    engine.update("payment_intent", intent, "payment_intent.payment_failed", request, (target) => {
      target.status = "requires_payment_method";
      target.latest_charge = charge.id;
      target.payment_method = null;
      target.last_payment_error = {
        charge: charge.id,
        code: failure.code,
        decline_code: failure.declineCode,
        doc_url: `https://stripe.com/docs/error-codes/${failure.code.replace(/_/g, "-")}`,
        message: failure.message,
        payment_method: method,
        type: "card_error",
      };
    });
  } else {
    engine.emit("charge.succeeded", charge, request);
    engine.update("payment_intent", intent, "payment_intent.succeeded", request, (target) => {
      target.status = "succeeded";
      target.amount_received = target.amount;
      target.latest_charge = charge.id;
      target.payment_method = method.id;
      target.last_payment_error = null;
    });
  }
  return { intent, charge };
}

export function listPaymentIntents(engine: Engine, params: Params): Stripe.ApiList<Stripe.PaymentIntent> {
  params.allow([...PAGINATION_PARAMS, "customer", "created"], ignoring(engine, ["customer_account"]));
  const customer = params.str("customer");
  const created = rangeFilter(params, "created");
  const items = engine.newestFirst("payment_intent", (pi) => (customer === undefined || pi.customer === customer) && (!created || created(pi.created)));
  return engine.list(items, pagination(params), "/v1/payment_intents");
}

const REFUND_IGNORED = ["instructions_email", "origin", "refund_application_fee", "reverse_transfer", "currency", "customer"];

/**
 * Refunds a succeeded charge, in full by default. Asking for more than is left is refused the way
 * Stripe refuses it: `charge_already_refunded` when nothing is left, `amount_too_large` otherwise.
 */
export function createRefund(engine: Engine, params: Params, request: RequestContext): Stripe.Refund {
  params.allow(["payment_intent", "charge", "amount", "metadata", "reason", "expand"], ignoring(engine, REFUND_IGNORED));
  const intentId = params.str("payment_intent") || undefined;
  const chargeId = params.str("charge") || undefined;
  if (!intentId && !chargeId) {
    throw invalidRequest("One of the following params should be provided for this request: payment_intent or charge.");
  }

  let charge: Stripe.Charge | undefined;
  if (intentId) {
    const intent = engine.require("payment_intent", intentId, { param: "payment_intent", status: 400 });
    const latest = typeof intent.latest_charge === "string" ? engine.get("charge", intent.latest_charge) : undefined;
    if (intent.status !== "succeeded" || !latest || latest.status !== "succeeded") {
      throw new StripeApiError(400, {
        message: `This PaymentIntent (${intent.id}) does not have a successful charge to refund.`,
        param: "payment_intent",
        code: "charge_not_refundable",
      });
    }
    charge = latest;
    if (chargeId && chargeId !== charge.id) throw invalidRequest(`The charge ${chargeId} does not belong to the PaymentIntent ${intent.id}.`, "charge");
  } else {
    charge = engine.require("charge", chargeId!, { param: "charge", status: 400 });
    if (charge.status !== "succeeded") {
      throw new StripeApiError(400, { message: `Charge ${charge.id} has not succeeded and cannot be refunded.`, param: "charge", code: "charge_not_refundable" });
    }
  }

  const remaining = charge.amount - charge.amount_refunded;
  const amount = params.int("amount", { min: 1 }) ?? remaining;
  if (remaining <= 0) {
    throw new StripeApiError(400, { message: `Charge ${charge.id} has already been refunded.`, code: "charge_already_refunded" });
  }
  if (amount > remaining) {
    throw new StripeApiError(400, {
      message: `Refund amount (${formatAmount(amount, charge.currency)}) is greater than unrefunded amount on charge (${formatAmount(remaining, charge.currency)})`,
      param: "amount",
      code: "amount_too_large",
    });
  }

  const refund = build.refund({
    now: engine.now(),
    charge,
    amount,
    metadata: params.metadata()?.value ?? {},
    reason: params.oneOf("reason", ["duplicate", "fraudulent", "requested_by_customer"] as const) ?? null,
  });
  engine.put("refund", refund);
  engine.emit("refund.created", refund, request);
  engine.update("charge", charge, "charge.refunded", request, (target) => {
    target.amount_refunded += amount;
    target.refunded = target.amount_refunded >= target.amount;
  });
  return refund;
}

export function updateRefund(engine: Engine, id: string, params: Params, request: RequestContext): Stripe.Refund {
  params.allow(["metadata", "expand"]);
  const refund = engine.require("refund", id, { param: "id", status: 404 });
  const before = structuredClone(refund);
  engine.update("refund", refund, "refund.updated", request, (target) => {
    target.metadata = applyMetadata(target.metadata ?? {}, params.metadata());
  });
  engine.emit("charge.refund.updated", refund, request, before);
  return refund;
}

export function listRefunds(engine: Engine, params: Params): Stripe.ApiList<Stripe.Refund> {
  params.allow([...PAGINATION_PARAMS, "payment_intent", "charge", "created"]);
  const intent = params.str("payment_intent");
  const charge = params.str("charge");
  const created = rangeFilter(params, "created");
  const items = engine.newestFirst(
    "refund",
    (r) => (intent === undefined || r.payment_intent === intent) && (charge === undefined || r.charge === charge) && (!created || created(r.created)),
  );
  return engine.list(items, pagination(params), "/v1/refunds");
}

/** "$30.00", "NZ$30.00", "¥3000": how Stripe writes amounts into error messages. */
export function formatAmount(amount: number, currency: string): string {
  const code = currency.toUpperCase();
  const format = new Intl.NumberFormat("en-US", { style: "currency", currency: code });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(amount / 10 ** digits);
}

import type Stripe from "stripe";
import { NO_REQUEST, type Engine, type RequestContext } from "../engine";
import { StripeApiError, invalidRequest, missingParam } from "../errors";
import { newId } from "../ids";
import * as build from "../objects";
import { PAGINATION_PARAMS, Params, pagination, rangeFilter } from "../params";
import type { SessionOptions } from "../store";
import { checkCard, type CardForm } from "../test-cards";
import { startSubscription } from "./billing";
import { ignoring, inlineProduct, newCustomer, storePrice, unsupported } from "./catalog";
import { chargeIntent, formatAmount, newCardPaymentMethod, newPaymentIntent } from "./payments";

const SESSION_MODELLED = [
  "mode",
  "line_items",
  "success_url",
  "cancel_url",
  "metadata",
  "client_reference_id",
  "customer",
  "customer_email",
  "customer_creation",
  "expires_at",
  "payment_intent_data",
  "subscription_data",
  "locale",
  "submit_type",
  "payment_method_types",
  "ui_mode",
  "automatic_tax",
  "invoice_creation",
  "expand",
];
// Known to Stripe, harmless to leave out of a local stand-in (they change the page, not the money).
const SESSION_IGNORED = [
  "adaptive_pricing",
  "after_expiration",
  "allow_promotion_codes",
  "allowed_payment_method_types",
  "billing_address_collection",
  "branding_settings",
  "consent_collection",
  "currency",
  "custom_fields",
  "custom_text",
  "customer_account",
  "customer_update",
  "excluded_payment_method_types",
  "integration_identifier",
  "managed_payments",
  "name_collection",
  "origin_context",
  "payment_method_collection",
  "payment_method_configuration",
  "payment_method_data",
  "payment_method_options",
  "permissions",
  "phone_number_collection",
  "redirect_on_completion",
  "return_url",
  "saved_payment_method_options",
  "tax_id_collection",
  "wallet_options",
];
// Known to Stripe, but they change what is charged; the fake refuses rather than charge the wrong amount.
const SESSION_UNSUPPORTED = ["discounts", "optional_items", "shipping_options", "shipping_address_collection", "setup_intent_data"];

const THIRTY_MINUTES = 30 * 60;
const ONE_DAY = 24 * 60 * 60;

// Stripe's minimum charge amounts for common settlement currencies (Stripe's "Minimum and maximum
// charge amounts" table, from memory); other currencies fall back to 50 minor units.
const MINIMUM_CHARGE: Record<string, number> = { usd: 50, aud: 50, cad: 50, chf: 50, eur: 50, nzd: 50, sgd: 50, gbp: 30, jpy: 50, dkk: 250, nok: 300, sek: 300, pln: 200, hkd: 400, mxn: 1000 };

export function createSession(engine: Engine, params: Params, _request: RequestContext): Stripe.Checkout.Session {
  for (const key of SESSION_UNSUPPORTED) if (params.has(key)) throw unsupported(key);
  params.allow(SESSION_MODELLED, ignoring(engine, SESSION_IGNORED));

  const mode = params.oneOf("mode", ["payment", "setup", "subscription"] as const);
  if (!mode) throw missingParam("mode");
  if (mode === "setup") throw unsupported("mode", "`setup` mode");
  const uiMode = params.oneOf("ui_mode", ["hosted", "embedded", "custom"] as const);
  if (uiMode && uiMode !== "hosted") throw unsupported("ui_mode", `\`${uiMode}\` Checkout (only the hosted page is faked)`);
  if (params.obj("automatic_tax")?.bool("enabled")) throw unsupported("automatic_tax[enabled]", "automatic tax");
  if (params.obj("invoice_creation")?.bool("enabled")) throw unsupported("invoice_creation[enabled]", "post-payment invoices");
  const methodTypes = params.strings("payment_method_types");
  if (methodTypes.some((type) => type !== "card")) throw unsupported("payment_method_types", "payment methods other than `card`");

  const successUrl = readUrl(params, "success_url");
  const cancelUrl = readUrl(params, "cancel_url");
  const clientReferenceId = params.str("client_reference_id") || null;
  if (clientReferenceId && clientReferenceId.length > 200) throw invalidRequest("client_reference_id can be at most 200 characters.", "client_reference_id");

  const customerId = params.str("customer") || null;
  const customerEmail = params.str("customer_email") || null;
  if (customerId && customerEmail) throw invalidRequest("You may only specify one of these parameters: customer, customer_email.", "customer_email");
  if (customerId) engine.require("customer", customerId, { param: "customer", status: 400 });
  if (customerEmail && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(customerEmail)) throw invalidRequest(`Invalid email address: ${customerEmail}`, "customer_email", "email_invalid");

  const customerCreation = params.oneOf("customer_creation", ["always", "if_required"] as const) ?? null;
  if (customerCreation && mode !== "payment") throw invalidRequest("`customer_creation` can only be used in `payment` mode.", "customer_creation");

  const now = engine.now();
  const expiresAt = params.int("expires_at") ?? now + ONE_DAY;
  if (expiresAt > now + ONE_DAY) throw invalidRequest("The `expires_at` timestamp must be less than 24 hours from Checkout Session creation.", "expires_at");
  if (expiresAt < now + THIRTY_MINUTES) throw invalidRequest("The `expires_at` timestamp must be at least 30 minutes from Checkout Session creation.", "expires_at");

  const options = readSessionOptions(engine, params, mode);
  const lineItems = readLineItems(engine, params, mode);
  const currency = lineItems[0]!.currency;
  const amountTotal = lineItems.reduce((sum, item) => sum + item.amount_total, 0);
  const minimum = MINIMUM_CHARGE[currency] ?? 50;
  if (amountTotal < minimum) {
    throw invalidRequest(`The Checkout Session's total amount due must add up to at least ${formatAmount(minimum, currency)} ${currency}`, "line_items");
  }

  const id = newId("cs_test");
  const session = build.checkoutSession({
    now,
    id,
    mode,
    url: `${engine.publicUrl()}/pay/${id}`,
    currency,
    amountTotal,
    successUrl,
    cancelUrl,
    clientReferenceId,
    customer: customerId,
    customerEmail,
    customerCreation: mode === "payment" ? (customerCreation ?? "if_required") : null,
    expiresAt,
    metadata: params.metadata()?.value ?? {},
    locale: params.str("locale") || null,
    submitType: params.oneOf("submit_type", ["auto", "book", "donate", "pay", "subscribe"] as const) ?? null,
  });
  engine.store.extras.sessionLineItems[id] = lineItems;
  engine.store.extras.sessionOptions[id] = options;
  engine.put("checkout.session", session);
  return session;
}

export function listSessions(engine: Engine, params: Params): Stripe.ApiList<Stripe.Checkout.Session> {
  params.allow([...PAGINATION_PARAMS, "customer", "payment_intent", "subscription", "status", "created", "customer_details"], ignoring(engine, ["customer_account", "payment_link"]));
  const customer = params.str("customer");
  const intent = params.str("payment_intent");
  const subscription = params.str("subscription");
  const status = params.oneOf("status", ["open", "complete", "expired"] as const);
  const created = rangeFilter(params, "created");
  const email = params.obj("customer_details")?.allow(["email"]).requiredStr("email");
  const items = engine.newestFirst(
    "checkout.session",
    (s) =>
      (customer === undefined || s.customer === customer) &&
      (intent === undefined || s.payment_intent === intent) &&
      (subscription === undefined || s.subscription === subscription) &&
      (status === undefined || s.status === status) &&
      (!created || created(s.created)) &&
      (email === undefined || s.customer_details?.email === email),
  );
  return engine.list(items, pagination(params), "/v1/checkout/sessions");
}

export function listSessionLineItems(engine: Engine, id: string, params: Params): Stripe.ApiList<Stripe.LineItem> {
  params.allow([...PAGINATION_PARAMS]);
  engine.require("checkout.session", id, { param: "session", status: 404 });
  const items = engine.store.extras.sessionLineItems[id] ?? [];
  return engine.list(items, pagination(params), `/v1/checkout/sessions/${id}/line_items`);
}

/** `POST /v1/checkout/sessions/:id/expire`, and the clock sweep for sessions past `expires_at`. */
export function expireSession(engine: Engine, id: string, request: RequestContext, fromApi: boolean): Stripe.Checkout.Session {
  const session = engine.require("checkout.session", id, { param: "session", status: 404 });
  if (session.status !== "open") {
    if (!fromApi) return session;
    throw invalidRequest(`Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${session.status}".`, undefined, "checkout_session_not_open");
  }
  const intentId = typeof session.payment_intent === "string" ? session.payment_intent : null;
  const intent = intentId ? engine.get("payment_intent", intentId) : undefined;
  if (intent && intent.status !== "succeeded" && intent.status !== "canceled") {
    engine.update("payment_intent", intent, "payment_intent.canceled", request, (target) => {
      target.status = "canceled";
      target.canceled_at = engine.now();
      target.cancellation_reason = "abandoned";
    });
  }
  return engine.update("checkout.session", session, "checkout.session.expired", request, (target) => {
    target.status = "expired";
    target.url = null;
  });
}

export function expireDueSessions(engine: Engine): string[] {
  const now = engine.now();
  const due = engine.store.all("checkout.session").filter((s) => s.status === "open" && s.expires_at <= now);
  for (const session of due) expireSession(engine, session.id, NO_REQUEST, false);
  return due.map((s) => s.id);
}

export interface CheckoutSubmission {
  card: CardForm;
  email?: string;
  /**
   * Completes the session with the payment still `processing` (as a bank debit would), to be
   * settled later with `settleAsyncPayment`; cards never do this at Stripe, it is a test trigger.
   */
  delayed?: boolean;
}

export type SubmissionResult =
  | { outcome: "paid" | "processing"; session: Stripe.Checkout.Session; redirectTo: string | null }
  | { outcome: "declined"; session: Stripe.Checkout.Session; message: string; code: string; declineCode: string }
  | { outcome: "invalid"; session: Stripe.Checkout.Session; field: "number" | "expiry" | "cvc" | "email"; message: string }
  | { outcome: "unavailable"; session: Stripe.Checkout.Session | undefined; message: string };

/** What the hosted page's Pay button does (and what the control API's `complete` does without a browser). */
export function submitCheckout(engine: Engine, sessionId: string, submission: CheckoutSubmission, request: RequestContext = NO_REQUEST): SubmissionResult {
  const session = engine.get("checkout.session", sessionId);
  if (!session) return { outcome: "unavailable", session, message: "This checkout link is not valid." };
  if (session.status === "open" && session.expires_at <= engine.now()) expireSession(engine, session.id, NO_REQUEST, false);
  if (session.status === "expired") return { outcome: "unavailable", session, message: "This checkout session has expired. Go back and start again." };
  if (session.status === "complete") return { outcome: "unavailable", session, message: "This checkout session is already paid." };

  const existingCustomer = typeof session.customer === "string" ? engine.get("customer", session.customer) : undefined;
  const email = (session.customer_email ?? existingCustomer?.email ?? submission.email ?? "").trim();
  if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) return { outcome: "invalid", session, field: "email", message: "Your email address is incomplete." };
  const card = checkCard(submission.card, engine.now());
  if (!card.ok) return { outcome: "invalid", session, field: card.field, message: card.message };
  const name = submission.card.name.trim() || null;
  const options = engine.store.extras.sessionOptions[session.id] ?? { paymentIntentData: null, subscriptionData: null };
  const lineItems = engine.store.extras.sessionLineItems[session.id] ?? [];

  if (session.mode === "subscription") {
    if (card.failure) {
      const intent = newPaymentIntent(engine, { amount: session.amount_total ?? 0, currency: session.currency ?? "usd", customer: existingCustomer?.id ?? null, description: null, metadata: {}, receiptEmail: null }, request);
      const method = newCardPaymentMethod(engine, { card: card.card, name, email, customer: null });
      chargeIntent(engine, intent, method, card.failure, request);
      return { outcome: "declined", session, message: card.failure.message, code: card.failure.code, declineCode: card.failure.declineCode };
    }
    const customer = existingCustomer ?? newCustomer(engine, { email, name }, request);
    const method = newCardPaymentMethod(engine, { card: card.card, name, email, customer: customer.id });
    const { subscription, invoice } = startSubscription(
      engine,
      { customer, paymentMethod: method, lineItems, metadata: options.subscriptionData?.metadata ?? {}, description: options.subscriptionData?.description ?? null },
      request,
    );
    const completed = complete(engine, session, request, { email, name, customer: customer.id, paid: true }, (target) => {
      target.subscription = subscription.id;
      target.invoice = invoice.id;
    });
    return { outcome: "paid", session: completed, redirectTo: successRedirect(completed) };
  }

  let intent = typeof session.payment_intent === "string" ? engine.get("payment_intent", session.payment_intent) : undefined;
  let customerId = existingCustomer?.id ?? null;
  if (!card.failure && !customerId && session.customer_creation === "always") customerId = newCustomer(engine, { email, name }, request).id;
  if (!intent) {
    const data = options.paymentIntentData;
    intent = newPaymentIntent(
      engine,
      { amount: session.amount_total ?? 0, currency: session.currency ?? "usd", customer: customerId, description: data?.description ?? null, metadata: data?.metadata ?? {}, receiptEmail: data?.receiptEmail ?? null },
      request,
    );
    engine.update("checkout.session", session, null, request, (target) => {
      target.payment_intent = intent!.id;
    });
  } else if (customerId && !intent.customer) {
    engine.update("payment_intent", intent, null, request, (target) => {
      target.customer = customerId;
    });
  }
  const method = newCardPaymentMethod(engine, { card: card.card, name, email, customer: customerId });

  if (submission.delayed && !card.failure) {
    engine.update("payment_intent", intent, "payment_intent.processing", request, (target) => {
      target.status = "processing";
      target.payment_method = method.id;
    });
    engine.store.extras.pendingAsyncPayments[session.id] = { paymentMethod: method.id };
    const completed = complete(engine, session, request, { email, name, customer: customerId, paid: false });
    return { outcome: "processing", session: completed, redirectTo: successRedirect(completed) };
  }

  chargeIntent(engine, intent, method, card.failure, request);
  if (card.failure) return { outcome: "declined", session, message: card.failure.message, code: card.failure.code, declineCode: card.failure.declineCode };
  const completed = complete(engine, session, request, { email, name, customer: customerId, paid: true });
  return { outcome: "paid", session: completed, redirectTo: successRedirect(completed) };
}

/** Settles a session completed with `delayed: true`: `checkout.session.async_payment_succeeded` or `_failed`. */
export function settleAsyncPayment(engine: Engine, sessionId: string, outcome: "succeeded" | "failed"): Stripe.Checkout.Session {
  const session = engine.require("checkout.session", sessionId, { param: "session", status: 404 });
  const pending = engine.store.extras.pendingAsyncPayments[sessionId];
  const intent = typeof session.payment_intent === "string" ? engine.get("payment_intent", session.payment_intent) : undefined;
  const method = pending ? engine.get("payment_method", pending.paymentMethod) : undefined;
  if (!pending || !intent || !method || intent.status !== "processing") {
    throw invalidRequest(`Checkout Session ${sessionId} has no delayed payment waiting to settle (complete it with "delayed": true first).`);
  }
  delete engine.store.extras.pendingAsyncPayments[sessionId];
  const failure: build.ChargeFailure | null =
    outcome === "failed" ? { code: "payment_intent_payment_attempt_failed", declineCode: "generic_decline", message: "The payment failed.", sellerMessage: "The payment failed." } : null;
  chargeIntent(engine, intent, method, failure, NO_REQUEST);
  if (failure) {
    engine.emit("checkout.session.async_payment_failed", session, NO_REQUEST);
    return session;
  }
  return engine.update("checkout.session", session, "checkout.session.async_payment_succeeded", NO_REQUEST, (target) => {
    target.payment_status = "paid";
  });
}

function complete(
  engine: Engine,
  session: Stripe.Checkout.Session,
  request: RequestContext,
  input: { email: string; name: string | null; customer: string | null; paid: boolean },
  extra?: (target: Stripe.Checkout.Session) => void,
): Stripe.Checkout.Session {
  return engine.update("checkout.session", session, "checkout.session.completed", request, (target) => {
    target.status = "complete";
    target.payment_status = input.paid ? "paid" : "unpaid";
    target.customer = input.customer;
    target.customer_details = { address: null, business_name: null, email: input.email, individual_name: null, name: input.name, phone: null, tax_exempt: "none", tax_ids: [] };
    target.collected_information = { business_name: null, individual_name: null, shipping_details: null };
    // Stripe only gives a URL while the session can still be paid.
    target.url = null;
    extra?.(target);
  });
}

function successRedirect(session: Stripe.Checkout.Session): string | null {
  return session.success_url ? session.success_url.replaceAll("{CHECKOUT_SESSION_ID}", session.id) : null;
}

function readLineItems(engine: Engine, params: Params, mode: "payment" | "subscription"): Stripe.LineItem[] {
  const entries = params.objects("line_items");
  if (entries.length === 0) throw missingParam("line_items");
  if (entries.length > 100) throw invalidRequest("You can only pass up to 100 line items.", "line_items");
  const items = entries.map((entry) => {
    entry.allow(["price", "price_data", "quantity", "metadata"], ignoring(engine, ["adjustable_quantity", "tax_rates", "dynamic_tax_rates"]));
    const priceId = entry.str("price") || undefined;
    const priceData = entry.obj("price_data");
    if (priceId && priceData) throw invalidRequest("You may only specify one of these parameters: price, price_data.", entry.name("price"));
    let price: Stripe.Price;
    if (priceId) {
      price = engine.require("price", priceId, { param: entry.name("price"), status: 400 });
      if (!price.active) throw invalidRequest("The price specified is inactive. This field only accepts active prices.", entry.name("price"));
    } else if (priceData) {
      priceData.allow(["currency", "product", "product_data", "unit_amount", "unit_amount_decimal", "recurring", "tax_behavior"]);
      const productId = priceData.str("product") || undefined;
      const productData = priceData.obj("product_data");
      if (productId && productData) throw invalidRequest("You may only specify one of these parameters: product, product_data.", priceData.name("product"));
      let product: string;
      if (productId) product = engine.require("product", productId, { param: priceData.name("product"), status: 400 }).id;
      else if (productData) product = inlineProduct(engine, productData, null, false).id;
      else throw missingParam(priceData.name("product_data"));
      price = storePrice(engine, priceData, product, false, null);
    } else {
      throw invalidRequest("You must specify either `price` or `price_data` for each line item.", entry.name("price"));
    }
    const quantity = entry.int("quantity", { min: 1, max: 999_999 });
    if (quantity === undefined) throw missingParam(entry.name("quantity"));
    const productName = engine.get("product", typeof price.product === "string" ? price.product : price.product.id)?.name ?? "Item";
    return build.lineItem({ price, productName, quantity, metadata: entry.metadata()?.value ?? {} });
  });

  const currencies = new Set(items.map((item) => item.currency));
  if (currencies.size > 1) throw invalidRequest(`All line items must use the same currency; got ${[...currencies].join(", ")}.`, "line_items");
  const recurring = items.filter((item) => item.price?.recurring);
  if (mode === "payment" && recurring.length > 0) {
    throw invalidRequest("You specified `payment` mode but passed a recurring price. Either switch to `subscription` mode or use only one-time prices.", "line_items");
  }
  if (mode === "subscription") {
    if (recurring.length === 0) throw invalidRequest("You must provide at least one recurring price in `subscription` mode when using prices.", "line_items");
    if (recurring.length < items.length) throw unsupported("line_items", "one-time prices in `subscription` mode");
    const intervals = new Set(recurring.map((item) => `${item.price!.recurring!.interval}/${item.price!.recurring!.interval_count}`));
    if (intervals.size > 1) throw invalidRequest("Checkout does not support multiple prices with different billing intervals.", "line_items");
  }
  return items;
}

function readSessionOptions(engine: Engine, params: Params, mode: "payment" | "subscription"): SessionOptions {
  const intentData = params.obj("payment_intent_data");
  const subscriptionData = params.obj("subscription_data");
  if (intentData && mode !== "payment") throw invalidRequest("You can not pass `payment_intent_data` in `subscription` mode.", "payment_intent_data");
  if (subscriptionData && mode !== "subscription") throw invalidRequest("You can not pass `subscription_data` in `payment` mode.", "subscription_data");

  if (intentData) {
    if (intentData.has("capture_method") && intentData.str("capture_method") !== "automatic") throw unsupported("payment_intent_data[capture_method]", "manual capture");
    if (intentData.has("setup_future_usage")) throw unsupported("payment_intent_data[setup_future_usage]");
    intentData.allow(["metadata", "description", "receipt_email", "capture_method"], ignoring(engine, ["application_fee_amount", "on_behalf_of", "shipping", "statement_descriptor", "statement_descriptor_suffix", "transfer_data", "transfer_group"]));
  }
  if (subscriptionData) {
    for (const key of ["trial_period_days", "trial_end", "billing_cycle_anchor", "trial_settings"]) {
      if (subscriptionData.has(key)) throw unsupported(subscriptionData.name(key));
    }
    subscriptionData.allow(["metadata", "description"], ignoring(engine, ["application_fee_percent", "billing_mode", "default_tax_rates", "invoice_settings", "on_behalf_of", "proration_behavior", "transfer_data", "pending_invoice_item_interval"]));
  }
  return {
    paymentIntentData: intentData
      ? { metadata: intentData.metadata()?.value ?? {}, description: intentData.str("description") || null, receiptEmail: intentData.str("receipt_email") || null }
      : null,
    subscriptionData: subscriptionData ? { metadata: subscriptionData.metadata()?.value ?? {}, description: subscriptionData.str("description") || null } : null,
  };
}

function readUrl(params: Params, key: string): string | null {
  const value = params.str(key);
  if (value === undefined || value === "") return null;
  if (value.length > 5000) throw invalidRequest(`${key} can be at most 5000 characters.`, key);
  let url: URL;
  try {
    // The placeholder's braces are not valid in a URL path, but Stripe accepts them there.
    url = new URL(value.replaceAll("{CHECKOUT_SESSION_ID}", "x"));
  } catch {
    throw new StripeApiError(400, { message: "Not a valid URL", param: key, code: "url_invalid" });
  }
  if (url.protocol !== "http:" && url.protocol !== "https:") throw new StripeApiError(400, { message: "Not a valid URL", param: key, code: "url_invalid" });
  return value;
}

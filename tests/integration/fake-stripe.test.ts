import { createServer, type IncomingMessage, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import Stripe from "stripe";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { FakeClock, addMonthsUtc, createFakeStripe, type FakeStripeControl } from "@/fakes/stripe/index";
import { parseForm } from "@/fakes/stripe/form";
import { startFakeStripe } from "@/fakes/stripe/server";
import { signPayload } from "@/fakes/stripe/webhooks";

/*
 * Check values and where they come from:
 * - test card numbers and their outcomes: Stripe's "Testing" documentation (4242… succeeds,
 *   4000…0002 generic decline, 4000…9995 insufficient_funds);
 * - the webhook signature: verified with the official SDK's `stripe.webhooks.constructEvent`;
 * - error shapes, types and codes: Stripe's API reference "Errors" and its error-code list
 *   (resource_missing, parameter_unknown, amount_too_large, charge_already_refunded), and the
 *   SDK's own mapping of them to error classes;
 * - idempotency: Stripe's "Idempotent requests" guide (same key + same parameters replays the first
 *   result; different parameters → idempotency_error);
 * - month arithmetic: Stripe's billing-cycle documentation (an anchor on January 31 bills on
 *   February 28 in a common year, then March 31).
 */

const SECRET_KEY = "sk_test_proofbay_fake_key";
const WEBHOOK_SECRET = "whsec_test_proofbay_fake_secret";
// 2027-01-31T09:30:00Z, a month-end anchor.
const START = Date.UTC(2027, 0, 31, 9, 30, 0) / 1000;
const SUCCESS_URL = "http://proofbay.test/pledges/thanks?session={CHECKOUT_SESSION_ID}";
const CANCEL_URL = "http://proofbay.test/campaigns/duct-trial";
const FUTURE_EXPIRY = "12 / 34";

interface Received {
  body: string;
  signature: string;
  eventId: string;
  type: string;
  answeredWith: number;
}

/** The app's webhook endpoint as seen by the fake: records what arrives and answers as told. */
interface Receiver {
  url: string;
  received: Received[];
  /** Answer the next `count` deliveries with `status`. */
  failNext(count: number, status?: number): void;
  close(): Promise<void>;
}

interface Harness {
  name: string;
  /** Where the fake answers: API, hosted pages and control routes. */
  origin: string;
  /** What the app would configure to reach the fake (only the key differs for real Stripe). */
  sdkOptions: Stripe.StripeConfig;
  stripe: Stripe;
  control: FakeStripeControl;
  receiver: Receiver;
  /** Posts the hosted page's form; returns the raw response (redirects are not followed). */
  pay(url: string, card: string, extra?: Record<string, string>): Promise<Response>;
  close(): Promise<void>;
}

function answerPlan() {
  let failures: { count: number; status: number } = { count: 0, status: 500 };
  return {
    failNext(count: number, status = 500) {
      failures = { count, status };
    },
    next(): number {
      if (failures.count > 0) {
        failures.count--;
        return failures.status;
      }
      return 200;
    },
  };
}

function record(received: Received[], body: string, signature: string, status: number): void {
  const event = JSON.parse(body) as Stripe.Event;
  received.push({ body, signature, eventId: event.id, type: event.type, answeredWith: status });
}

async function httpReceiver(): Promise<Receiver> {
  const received: Received[] = [];
  const plan = answerPlan();
  const server: Server = createServer((request: IncomingMessage, response) => {
    const chunks: Buffer[] = [];
    request.on("data", (chunk: Buffer) => chunks.push(chunk));
    request.on("end", () => {
      const status = plan.next();
      record(received, Buffer.concat(chunks).toString("utf8"), String(request.headers["stripe-signature"] ?? ""), status);
      response.writeHead(status, { "content-type": "application/json" }).end(JSON.stringify({ received: status === 200 }));
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}/api/stripe/webhook`,
    received,
    failNext: plan.failNext,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

async function inProcessHarness(): Promise<Harness> {
  const received: Received[] = [];
  const plan = answerPlan();
  const receiverUrl = "http://proofbay.test/api/stripe/webhook";
  const fake = createFakeStripe({
    publicUrl: "http://fake-stripe.test",
    clock: new FakeClock({ frozenAt: START }),
    webhook: { url: receiverUrl, secret: WEBHOOK_SECRET },
    webhookRetry: { initialDelayMs: 10, maxDelayMs: 40, maxAttempts: 5 },
  });
  const server = setupServer(
    ...fake.handlers,
    http.post(receiverUrl, async ({ request }) => {
      const status = plan.next();
      record(received, await request.text(), request.headers.get("stripe-signature") ?? "", status);
      return HttpResponse.json({ received: status === 200 }, { status });
    }),
  );
  server.listen({ onUnhandledRequest: "error" });
  const sdkOptions: Stripe.StripeConfig = { host: "fake-stripe.test", port: 80, protocol: "http", telemetry: false, maxNetworkRetries: 0 };
  return {
    name: "in-process",
    origin: "http://fake-stripe.test",
    sdkOptions,
    stripe: new Stripe(SECRET_KEY, sdkOptions),
    control: fake.control,
    receiver: { url: receiverUrl, received, failNext: plan.failNext, close: async () => {} },
    pay: (url, card, extra) => postPayment(url, card, extra),
    close: async () => {
      await fake.close();
      server.close();
    },
  };
}

async function httpHarness(): Promise<Harness> {
  const receiver = await httpReceiver();
  const fake = await startFakeStripe({
    port: 0,
    quiet: true,
    frozenAt: START,
    sweepIntervalMs: 0,
    webhook: { url: receiver.url, secret: WEBHOOK_SECRET },
    webhookRetry: { initialDelayMs: 10, maxDelayMs: 40, maxAttempts: 5 },
  });
  const sdkOptions: Stripe.StripeConfig = { host: "localhost", port: fake.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 };
  return {
    name: "http",
    origin: fake.url,
    sdkOptions,
    stripe: new Stripe(SECRET_KEY, sdkOptions),
    control: fake.control,
    receiver,
    pay: (url, card, extra) => postPayment(url, card, extra),
    close: async () => {
      await fake.close();
      await receiver.close();
    },
  };
}

function postPayment(url: string, card: string, extra: Record<string, string> = {}): Promise<Response> {
  const form = new URLSearchParams({ email: "backer@proofbay.test", card_number: card, card_expiry: FUTURE_EXPIRY, card_cvc: "123", card_name: "Test Backer", ...extra });
  return fetch(url, { method: "POST", body: form, redirect: "manual", headers: { "content-type": "application/x-www-form-urlencoded" } });
}

async function createPledgePrice(stripe: Stripe) {
  const product = await stripe.products.create({ name: "Pledge: duct comparison", metadata: { campaign_id: "cmp_1" } });
  const price = await stripe.prices.create({ product: product.id, currency: "nzd", unit_amount: 2500, lookup_key: "pledge_duct" });
  return { product, price };
}

async function createPledgeSession(stripe: Stripe, priceId: string, idempotencyKey?: string) {
  return stripe.checkout.sessions.create(
    {
      mode: "payment",
      line_items: [{ price: priceId, quantity: 1 }],
      success_url: SUCCESS_URL,
      cancel_url: CANCEL_URL,
      client_reference_id: "user_42",
      customer_email: "backer@proofbay.test",
      metadata: { pledge_id: "pl_1", campaign_id: "cmp_1" },
      payment_intent_data: { metadata: { pledge_id: "pl_1" } },
    },
    idempotencyKey ? { idempotencyKey } : {},
  );
}

async function createMembershipSession(stripe: Stripe) {
  const price = await stripe.prices.create({
    currency: "nzd",
    unit_amount: 900,
    recurring: { interval: "month" },
    lookup_key: "club_spool_monthly",
    // A second membership in one test moves the key to the new price, as the app's seeding would.
    transfer_lookup_key: true,
    product_data: { name: "Filament Club — Spool" },
  });
  const session = await stripe.checkout.sessions.create({
    mode: "subscription",
    line_items: [{ price: price.id, quantity: 1 }],
    success_url: SUCCESS_URL,
    cancel_url: CANCEL_URL,
    customer_email: "member@proofbay.test",
    subscription_data: { metadata: { plan: "spool", user_id: "user_7" } },
  });
  return { price, session };
}

async function subscribe(harness: Harness) {
  const { session } = await createMembershipSession(harness.stripe);
  const response = await harness.pay(session.url!, "4242424242424242");
  expect(response.status).toBe(303);
  const completed = await harness.stripe.checkout.sessions.retrieve(session.id);
  return harness.stripe.subscriptions.retrieve(completed.subscription as string);
}

async function deliveriesSettled(control: FakeStripeControl): Promise<void> {
  await control.waitForDeliveries();
}

function typesOf(control: FakeStripeControl): string[] {
  return control.events().map((event) => event.type);
}

describe.each([
  ["in-process handlers (msw setupServer)", inProcessHarness],
  ["HTTP server (@mswjs/http-middleware)", httpHarness],
])("fake Stripe via %s", (_label, makeHarness) => {
  let harness: Harness;
  let stripe: Stripe;

  beforeEach(async () => {
    harness = await makeHarness();
    stripe = harness.stripe;
  });

  afterEach(async () => {
    await harness.close();
  });

  it("refuses requests without a secret test key, in Stripe's error shape", async () => {
    const anonymous = await fetch(`${harness.origin}/v1/customers`);
    expect(anonymous.status).toBe(401);
    const body = (await anonymous.json()) as { error: { type: string; message: string } };
    expect(body.error.type).toBe("invalid_request_error");
    expect(body.error.message).toMatch(/You did not provide an API key/);

    const wrongKey = new Stripe("pk_test_publishable", harness.sdkOptions);
    await expect(wrongKey.customers.create({ email: "x@proofbay.test" })).rejects.toMatchObject({ type: "StripeAuthenticationError", statusCode: 401 });
  });

  it("creates and finds customers, products and prices like Stripe", async () => {
    const customer = await stripe.customers.create({ email: "backer@proofbay.test", name: "Test Backer", metadata: { user_id: "user_42" } });
    expect(customer.id).toMatch(/^cus_/);
    expect(customer).toMatchObject({ object: "customer", livemode: false, created: START, metadata: { user_id: "user_42" } });
    expect((await stripe.customers.retrieve(customer.id)) as Stripe.Customer).toMatchObject({ email: "backer@proofbay.test" });

    const { product, price } = await createPledgePrice(stripe);
    expect(product.id).toMatch(/^prod_/);
    expect(price).toMatchObject({ object: "price", currency: "nzd", unit_amount: 2500, type: "one_time", product: product.id, lookup_key: "pledge_duct" });
    expect((await stripe.prices.retrieve(price.id)).id).toBe(price.id);

    await stripe.prices.create({ product: product.id, currency: "nzd", unit_amount: 5000, lookup_key: "pledge_duct_large" });
    const byKey = await stripe.prices.list({ lookup_keys: ["pledge_duct"] });
    expect(byKey.data.map((p) => p.id)).toEqual([price.id]);

    const missing = stripe.prices.retrieve("price_doesnotexist");
    await expect(missing).rejects.toMatchObject({ type: "StripeInvalidRequestError", statusCode: 404, code: "resource_missing" });
    await expect(missing).rejects.toThrow("No such price: 'price_doesnotexist'");

    // Stripe refuses parameters it does not know.
    await expect(stripe.customers.create({ emial: "typo@proofbay.test" } as Stripe.CustomerCreateParams)).rejects.toMatchObject({ code: "parameter_unknown", param: "emial" });
  });

  it("replays an idempotent create and refuses the same key with a different body", async () => {
    const { price } = await createPledgePrice(stripe);
    const first = await createPledgeSession(stripe, price.id, "pledge-pl_1");
    const retry = await createPledgeSession(stripe, price.id, "pledge-pl_1");
    expect(retry.id).toBe(first.id);
    expect(retry.lastResponse.headers["idempotent-replayed"]).toBe("true");
    expect((await stripe.checkout.sessions.list()).data).toHaveLength(1);

    const other = await stripe.prices.create({ product: price.product as string, currency: "nzd", unit_amount: 9900 });
    await expect(createPledgeSession(stripe, other.id, "pledge-pl_1")).rejects.toMatchObject({ type: "StripeIdempotencyError", statusCode: 400, rawType: "idempotency_error" });
  });

  it("creates a payment-mode session with Stripe's fields and a hosted page", async () => {
    const { price } = await createPledgePrice(stripe);
    const session = await createPledgeSession(stripe, price.id);
    expect(session.id).toMatch(/^cs_test_/);
    expect(session).toMatchObject({
      object: "checkout.session",
      mode: "payment",
      status: "open",
      payment_status: "unpaid",
      amount_total: 2500,
      currency: "nzd",
      client_reference_id: "user_42",
      customer_email: "backer@proofbay.test",
      metadata: { pledge_id: "pl_1", campaign_id: "cmp_1" },
      livemode: false,
      created: START,
      expires_at: START + 24 * 3600,
      payment_intent: null,
    });
    expect(session.url).toMatch(new RegExp(`/pay/${session.id}$`));

    const page = await fetch(session.url!);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Test payment page");
    expect(html).toContain("no real money");
    expect(html).toContain("Pledge: duct comparison");
    expect(html).toContain("NZ$25.00");
    expect(html).toContain(`href="${CANCEL_URL}"`);
    expect(html).not.toMatch(/<script/i);

    const lines = await stripe.checkout.sessions.listLineItems(session.id);
    expect(lines.data[0]).toMatchObject({ object: "item", amount_total: 2500, quantity: 1, description: "Pledge: duct comparison" });

    // expires_at outside Stripe's 30 minutes – 24 hours window is refused.
    await expect(
      stripe.checkout.sessions.create({ mode: "payment", line_items: [{ price: price.id, quantity: 1 }], success_url: SUCCESS_URL, expires_at: START + 60 }),
    ).rejects.toMatchObject({ param: "expires_at", statusCode: 400 });
  });

  it("pays with 4242 4242 4242 4242: 303 to success_url, session paid, events and a signed webhook", async () => {
    const { price } = await createPledgePrice(stripe);
    const session = await createPledgeSession(stripe, price.id);

    const response = await harness.pay(session.url!, "4242 4242 4242 4242");
    expect(response.status).toBe(303);
    expect(response.headers.get("location")).toBe(`http://proofbay.test/pledges/thanks?session=${session.id}`);

    const paid = await stripe.checkout.sessions.retrieve(session.id, { expand: ["payment_intent.latest_charge"] });
    expect(paid).toMatchObject({ status: "complete", payment_status: "paid", url: null });
    const intent = paid.payment_intent as Stripe.PaymentIntent;
    expect(intent.id).toMatch(/^pi_/);
    expect(intent).toMatchObject({ status: "succeeded", amount: 2500, amount_received: 2500, currency: "nzd", metadata: { pledge_id: "pl_1" } });
    expect((intent.latest_charge as Stripe.Charge).payment_method_details?.card?.last4).toBe("4242");
    expect((await stripe.paymentIntents.retrieve(intent.id)).status).toBe("succeeded");

    const events = await stripe.events.list({ type: "checkout.session.completed" });
    expect(events.data).toHaveLength(1);
    const completed = events.data[0]!;
    expect(completed.id).toMatch(/^evt_/);
    expect((completed.data.object as Stripe.Checkout.Session).metadata).toEqual({ pledge_id: "pl_1", campaign_id: "cmp_1" });
    expect(typesOf(harness.control)).toEqual(expect.arrayContaining(["payment_intent.created", "charge.succeeded", "payment_intent.succeeded", "checkout.session.completed"]));
    expect((await stripe.events.retrieve(completed.id)).type).toBe("checkout.session.completed");

    await deliveriesSettled(harness.control);
    const delivered = harness.receiver.received.find((r) => r.eventId === completed.id);
    expect(delivered).toBeDefined();
    expect(delivered!.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    const verified = stripe.webhooks.constructEvent(delivered!.body, delivered!.signature, WEBHOOK_SECRET);
    expect(verified.id).toBe(completed.id);
    expect(verified.type).toBe("checkout.session.completed");

    const tampered = delivered!.body.replace('"pl_1"', '"pl_2"');
    expect(tampered).not.toBe(delivered!.body);
    expect(() => stripe.webhooks.constructEvent(tampered, delivered!.signature, WEBHOOK_SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => stripe.webhooks.constructEvent(delivered!.body, delivered!.signature, "whsec_wrong")).toThrow(Stripe.errors.StripeSignatureVerificationError);

    // Once paid the page says so instead of taking a second payment.
    const again = await harness.pay(session.url!, "4242424242424242");
    expect(again.status).toBe(409);
    expect((await stripe.paymentIntents.list()).data).toHaveLength(1);
  });

  it("declines 4000 0000 0000 0002 on the page, keeps the session open and records payment_failed", async () => {
    const { price } = await createPledgePrice(stripe);
    const session = await createPledgeSession(stripe, price.id);

    const response = await harness.pay(session.url!, "4000 0000 0000 0002");
    expect(response.status).toBe(402);
    expect(await response.text()).toContain("Your card was declined.");
    const open = await stripe.checkout.sessions.retrieve(session.id, { expand: ["payment_intent"] });
    expect(open).toMatchObject({ status: "open", payment_status: "unpaid" });
    const intent = open.payment_intent as Stripe.PaymentIntent;
    expect(intent.status).toBe("requires_payment_method");
    expect(intent.last_payment_error).toMatchObject({ type: "card_error", code: "card_declined", decline_code: "generic_decline" });

    const failed = harness.control.events({ type: "payment_intent.payment_failed" });
    expect(failed).toHaveLength(1);
    expect((failed[0]!.data.object as Stripe.PaymentIntent).id).toBe(intent.id);
    expect(typesOf(harness.control)).not.toContain("checkout.session.completed");

    // The same session can still be paid, on the same payment intent.
    expect((await harness.pay(session.url!, "4242424242424242")).status).toBe(303);
    expect((await stripe.paymentIntents.retrieve(intent.id)).status).toBe("succeeded");
  });

  it("fails 4000 0000 0000 9995 for insufficient funds and refuses numbers that are not test cards", async () => {
    const { price } = await createPledgePrice(stripe);
    const session = await createPledgeSession(stripe, price.id);

    const response = await harness.pay(session.url!, "4000000000009995");
    expect(response.status).toBe(402);
    expect(await response.text()).toContain("Your card has insufficient funds.");
    const [failed] = harness.control.events({ type: "payment_intent.payment_failed" });
    expect((failed!.data.object as Stripe.PaymentIntent).last_payment_error?.decline_code).toBe("insufficient_funds");

    const intentsBefore = (await stripe.paymentIntents.list()).data.length;
    const notATestCard = await harness.pay(session.url!, "5105 1051 0510 5100");
    expect(notATestCard.status).toBe(400);
    expect(await notATestCard.text()).toContain("Use a test card number");
    expect((await stripe.paymentIntents.list()).data).toHaveLength(intentsBefore);
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe("open");
  });

  it("refunds in part and in full, and refuses to refund more than was paid", async () => {
    const { price } = await createPledgePrice(stripe);
    const session = await createPledgeSession(stripe, price.id);
    await harness.pay(session.url!, "4242424242424242");
    const intentId = (await stripe.checkout.sessions.retrieve(session.id)).payment_intent as string;

    const partial = await stripe.refunds.create({ payment_intent: intentId, amount: 1000, metadata: { reason: "campaign_lapsed" } });
    expect(partial.id).toMatch(/^re_/);
    expect(partial).toMatchObject({ object: "refund", amount: 1000, currency: "nzd", status: "succeeded", payment_intent: intentId, metadata: { reason: "campaign_lapsed" } });

    const tooMuch = stripe.refunds.create({ payment_intent: intentId, amount: 2000 });
    await expect(tooMuch).rejects.toMatchObject({ type: "StripeInvalidRequestError", statusCode: 400, code: "amount_too_large", param: "amount" });
    await expect(tooMuch).rejects.toThrow("Refund amount (NZ$20.00) is greater than unrefunded amount on charge (NZ$15.00)");

    const rest = await stripe.refunds.create({ payment_intent: intentId });
    expect(rest.amount).toBe(1500);
    expect((await stripe.refunds.retrieve(rest.id)).amount).toBe(1500);
    const charge = await stripe.charges.retrieve(rest.charge as string);
    expect(charge).toMatchObject({ amount_refunded: 2500, refunded: true });
    await expect(stripe.refunds.create({ payment_intent: intentId, amount: 1 })).rejects.toMatchObject({ statusCode: 400, code: "charge_already_refunded" });

    const refunded = harness.control.events({ type: "charge.refunded" });
    expect(refunded.map((e) => (e.data.object as Stripe.Charge).amount_refunded)).toEqual([2500, 1000]);
    expect(refunded[1]!.data.previous_attributes).toMatchObject({ amount_refunded: 0 });
    expect(harness.control.events({ type: "refund.created" })).toHaveLength(2);
  });

  it("starts a membership: customer, active subscription a calendar month long, paid invoice", async () => {
    const { session } = await createMembershipSession(stripe);
    expect(session).toMatchObject({ mode: "subscription", amount_total: 900, subscription: null });
    const response = await harness.pay(session.url!, "4242424242424242");
    expect(response.status).toBe(303);

    const completed = await stripe.checkout.sessions.retrieve(session.id, { expand: ["subscription", "customer"] });
    expect(completed).toMatchObject({ status: "complete", payment_status: "paid" });
    const customer = completed.customer as Stripe.Customer;
    expect(customer.id).toMatch(/^cus_/);
    expect(customer.email).toBe("member@proofbay.test");
    const subscription = completed.subscription as Stripe.Subscription;
    expect(subscription.id).toMatch(/^sub_/);
    expect(subscription).toMatchObject({ status: "active", customer: customer.id, metadata: { plan: "spool", user_id: "user_7" }, cancel_at_period_end: false });
    const item = subscription.items.data[0]!;
    expect(item.current_period_start).toBe(START);
    // 31 January + one month = 28 February 2027 (not a leap year), same time of day.
    expect(item.current_period_end).toBe(Date.UTC(2027, 1, 28, 9, 30, 0) / 1000);

    const invoices = await stripe.invoices.list({ subscription: subscription.id });
    expect(invoices.data).toHaveLength(1);
    const invoice = invoices.data[0]!;
    expect(invoice.id).toMatch(/^in_/);
    expect(invoice).toMatchObject({ status: "paid", amount_paid: 900, billing_reason: "subscription_create", parent: { subscription_details: { subscription: subscription.id } } });
    expect((await stripe.invoices.retrieve(invoice.id)).status).toBe("paid");

    const created = harness.control.events({ type: "customer.subscription.created" });
    expect((created[0]!.data.object as Stripe.Subscription).status).toBe("incomplete");
    const activated = harness.control.events({ type: "customer.subscription.updated" });
    expect(activated[0]!.data.previous_attributes).toMatchObject({ status: "incomplete" });
    expect(typesOf(harness.control)).toEqual(expect.arrayContaining(["customer.created", "invoice.paid", "checkout.session.completed"]));
  });

  it("renews at the period end: new paid invoice, invoice.paid and customer.subscription.updated", async () => {
    const subscription = await subscribe(harness);
    const periodEnd = subscription.items.data[0]!.current_period_end;
    const paidBefore = harness.control.events({ type: "invoice.paid" }).length;

    const report = harness.control.advanceClock(periodEnd - START + 60);
    expect(report.renewed).toEqual([subscription.id]);

    const renewed = await stripe.subscriptions.retrieve(subscription.id);
    expect(renewed.status).toBe("active");
    expect(renewed.items.data[0]!.current_period_start).toBe(periodEnd);
    expect(renewed.items.data[0]!.current_period_end).toBe(Date.UTC(2027, 2, 31, 9, 30, 0) / 1000);

    const invoices = await stripe.invoices.list({ subscription: subscription.id });
    expect(invoices.data.map((i) => [i.billing_reason, i.status, i.amount_paid])).toEqual([
      ["subscription_cycle", "paid", 900],
      ["subscription_create", "paid", 900],
    ]);
    expect(invoices.data[0]!.created).toBe(periodEnd);
    const paidEvents = harness.control.events({ type: "invoice.paid" });
    expect(paidEvents).toHaveLength(paidBefore + 1);
    expect((paidEvents[0]!.data.object as Stripe.Invoice).id).toBe(invoices.data[0]!.id);
    const updated = harness.control.events({ type: "customer.subscription.updated" })[0]!;
    expect(updated.data.previous_attributes).toMatchObject({ latest_invoice: invoices.data[1]!.id });
    expect(updated.request).toEqual({ id: null, idempotency_key: null });
  });

  it("a failing renewal leaves the subscription past_due with invoice.payment_failed; paying recovers it", async () => {
    const subscription = await subscribe(harness);
    harness.control.failNextRenewal(subscription.id);
    const report = harness.control.advanceClock(32 * 86_400);
    expect(report.failedRenewals).toEqual([subscription.id]);

    expect((await stripe.subscriptions.retrieve(subscription.id)).status).toBe("past_due");
    const failed = harness.control.events({ type: "invoice.payment_failed" });
    expect(failed).toHaveLength(1);
    const invoice = failed[0]!.data.object as Stripe.Invoice;
    expect(invoice).toMatchObject({ status: "open", amount_paid: 0, attempt_count: 1, billing_reason: "subscription_cycle" });

    const paid = await stripe.invoices.pay(invoice.id);
    expect(paid.status).toBe("paid");
    expect((await stripe.subscriptions.retrieve(subscription.id)).status).toBe("active");
  });

  it("cancels at the period end, or at once", async () => {
    const subscription = await subscribe(harness);
    const scheduled = await stripe.subscriptions.update(subscription.id, { cancel_at_period_end: true });
    expect(scheduled).toMatchObject({ status: "active", cancel_at_period_end: true, cancel_at: subscription.items.data[0]!.current_period_end, canceled_at: START });
    expect(harness.control.events({ type: "customer.subscription.updated" })[0]!.data.previous_attributes).toMatchObject({ cancel_at_period_end: false });

    const report = harness.control.advanceClock(40 * 86_400);
    expect(report.endedSubscriptions).toEqual([subscription.id]);
    expect(report.renewed).toEqual([]);
    const ended = await stripe.subscriptions.retrieve(subscription.id);
    expect(ended).toMatchObject({ status: "canceled", ended_at: subscription.items.data[0]!.current_period_end });
    expect(harness.control.events({ type: "customer.subscription.deleted" })).toHaveLength(1);

    const second = await subscribe(harness);
    const canceled = await stripe.subscriptions.cancel(second.id);
    expect(canceled.status).toBe("canceled");
    expect(harness.control.events({ type: "customer.subscription.deleted" })).toHaveLength(2);
  });

  it("retries a webhook that answers 500 twice and delivers the same event on the third attempt", async () => {
    const { price } = await createPledgePrice(stripe);
    await deliveriesSettled(harness.control);
    harness.receiver.received.length = 0;
    harness.control.setWebhook({ url: harness.receiver.url, secret: WEBHOOK_SECRET, enabledEvents: ["checkout.session.completed"] });
    harness.receiver.failNext(2, 500);

    const session = await createPledgeSession(stripe, price.id);
    await harness.pay(session.url!, "4242424242424242");
    await deliveriesSettled(harness.control);

    const attempts = harness.receiver.received;
    expect(attempts.map((a) => a.answeredWith)).toEqual([500, 500, 200]);
    expect(new Set(attempts.map((a) => a.eventId)).size).toBe(1);
    expect(attempts[0]!.type).toBe("checkout.session.completed");
    expect(stripe.webhooks.constructEvent(attempts[2]!.body, attempts[2]!.signature, WEBHOOK_SECRET).id).toBe(attempts[0]!.eventId);

    const [delivery] = harness.control.deliveries({ eventId: attempts[0]!.eventId });
    expect(delivery).toMatchObject({ state: "delivered", reason: "event" });
    expect(delivery!.attempts.map((a) => a.status)).toEqual([500, 500, 200]);
    expect(harness.control.event(attempts[0]!.eventId)!.pending_webhooks).toBe(0);
  });

  it("gives up after the configured attempts when the endpoint keeps failing or is unreachable", async () => {
    harness.control.setWebhook({ url: "http://127.0.0.1:9/unreachable", secret: WEBHOOK_SECRET });
    if (harness.name === "in-process") {
      // In-process the receiver is an msw handler; an always-failing one stands in for a dead endpoint.
      harness.control.setWebhook({ url: harness.receiver.url, secret: WEBHOOK_SECRET });
      harness.receiver.failNext(100, 503);
    }
    const customer = await stripe.customers.create({ email: "nobody@proofbay.test" });
    await deliveriesSettled(harness.control);
    const [event] = harness.control.events({ type: "customer.created" });
    expect((event!.data.object as Stripe.Customer).id).toBe(customer.id);
    const [delivery] = harness.control.deliveries({ eventId: event!.id });
    expect(delivery!.state).toBe("failed");
    expect(delivery!.attempts).toHaveLength(5);
    expect(harness.control.event(event!.id)!.pending_webhooks).toBe(1);
  });

  it("replays and duplicates an event with the same id, and delivers a set in a shuffled order", async () => {
    const { price } = await createPledgePrice(stripe);
    const session = await createPledgeSession(stripe, price.id);
    await harness.pay(session.url!, "4242424242424242");
    await deliveriesSettled(harness.control);
    const [completed] = harness.control.events({ type: "checkout.session.completed" });
    const countOf = (id: string) => harness.receiver.received.filter((r) => r.eventId === id).length;
    expect(countOf(completed!.id)).toBe(1);

    harness.control.replayEvent(completed!.id);
    await deliveriesSettled(harness.control);
    expect(countOf(completed!.id)).toBe(2);

    harness.control.duplicateEvent(completed!.id, 2);
    await deliveriesSettled(harness.control);
    expect(countOf(completed!.id)).toBe(4);
    // The same event each time: same id, same snapshot of the session (only pending_webhooks moves).
    const payloads = harness.receiver.received.filter((r) => r.eventId === completed!.id).map((r) => JSON.stringify((JSON.parse(r.body) as Stripe.Event).data));
    expect(new Set(payloads).size).toBe(1);

    harness.control.setDeliveryMode("manual");
    harness.receiver.received.length = 0;
    const refund = await stripe.refunds.create({ payment_intent: (await stripe.checkout.sessions.retrieve(session.id)).payment_intent as string, amount: 500 });
    await stripe.refunds.update(refund.id, { metadata: { note: "partial" } });
    await deliveriesSettled(harness.control);
    expect(harness.receiver.received).toHaveLength(0);

    const held = harness.control.events().slice(0, 4).map((e) => e.id);
    const { order } = await harness.control.deliverEvents(held, { order: "shuffled", seed: 7 });
    expect([...order].sort()).toEqual([...held].sort());
    expect(order).not.toEqual(held);
    expect(harness.receiver.received.map((r) => r.eventId)).toEqual(order);
  });

  it("expires sessions through the API and when the clock passes expires_at", async () => {
    const { price } = await createPledgePrice(stripe);
    const session = await createPledgeSession(stripe, price.id);
    const expired = await stripe.checkout.sessions.expire(session.id);
    expect(expired).toMatchObject({ status: "expired", url: null });
    expect(harness.control.events({ type: "checkout.session.expired" }).map((e) => (e.data.object as Stripe.Checkout.Session).id)).toEqual([session.id]);
    await expect(stripe.checkout.sessions.expire(session.id)).rejects.toMatchObject({ statusCode: 400 });
    expect((await fetch(session.url!)).status).toBe(410);

    const short = await stripe.checkout.sessions.create({
      mode: "payment",
      line_items: [{ price_data: { currency: "nzd", unit_amount: 1500, product_data: { name: "Pledge: nozzle trial" } }, quantity: 2 }],
      success_url: SUCCESS_URL,
      expires_at: START + 3600,
    });
    expect(short.amount_total).toBe(3000);
    expect(harness.control.advanceClock(3599).expiredSessions).toEqual([]);
    expect(harness.control.advanceClock(1).expiredSessions).toEqual([short.id]);
    expect((await stripe.checkout.sessions.retrieve(short.id)).status).toBe("expired");
    expect(harness.control.events({ type: "checkout.session.expired" })).toHaveLength(2);
  });

  it("answers the control API over HTTP as JSON", async () => {
    const origin = harness.origin;
    const clock = (await (await fetch(`${origin}/__control/clock`)).json()) as { now: number; iso: string };
    expect(clock).toEqual({ now: START, iso: "2027-01-31T09:30:00.000Z" });
    const advanced = await fetch(`${origin}/__control/clock/advance`, { method: "POST", body: JSON.stringify({ days: 1 }) });
    expect(((await advanced.json()) as { now: number }).now).toBe(START + 86_400);

    await stripe.customers.create({ email: "control@proofbay.test" });
    const events = (await (await fetch(`${origin}/__control/events?type=customer.*`)).json()) as Stripe.Event[];
    expect(events.map((e) => e.type)).toEqual(["customer.created"]);
    const missing = await fetch(`${origin}/__control/events/evt_missing/replay`, { method: "POST" });
    expect(missing.status).toBe(404);
  });
});

describe("fake Stripe over HTTP only", () => {
  let dir: string;

  beforeAll(async () => {
    dir = await mkdtemp(path.join(tmpdir(), "proofbay-fake-stripe-"));
  });

  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it("keeps objects, events and the clock in the store file across restarts", async () => {
    const storePath = path.join(dir, "nested", "stripe.json");
    const first = await startFakeStripe({ port: 0, quiet: true, frozenAt: START, sweepIntervalMs: 0, storePath });
    const client = new Stripe(SECRET_KEY, { host: "localhost", port: first.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
    const customer = await client.customers.create({ email: "persist@proofbay.test" });
    first.control.advanceClock(3600);
    await first.close();
    const saved = JSON.parse(await readFile(storePath, "utf8")) as { objects: { customer: { id: string }[] } };
    expect(saved.objects.customer.map((c) => c.id)).toEqual([customer.id]);

    const second = await startFakeStripe({ port: 0, quiet: true, sweepIntervalMs: 0, storePath });
    try {
      const again = new Stripe(SECRET_KEY, { host: "localhost", port: second.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
      expect(((await again.customers.retrieve(customer.id)) as Stripe.Customer).email).toBe("persist@proofbay.test");
      expect(second.control.now()).toBe(START + 3600);
      expect((await again.events.list({ type: "customer.created" })).data).toHaveLength(1);
    } finally {
      await second.close();
    }
  });

  it("answers unknown API routes with Stripe's 404 and serves a status page", async () => {
    const fake = await startFakeStripe({ port: 0, quiet: true, sweepIntervalMs: 0 });
    try {
      const response = await fetch(`${fake.url}/v1/not_a_resource`, { headers: { authorization: `Bearer ${SECRET_KEY}` } });
      expect(response.status).toBe(404);
      const body = (await response.json()) as { error: { type: string; message: string } };
      expect(body.error).toMatchObject({ type: "invalid_request_error" });
      expect(body.error.message).toMatch(/^Unrecognized request URL \(GET: \/v1\/not_a_resource\)/);
      expect(await (await fetch(fake.url)).text()).toContain("Local Stripe stand-in");
    } finally {
      await fake.close();
    }
  });
});

describe("fake Stripe building blocks", () => {
  it("decodes Stripe's form encoding into nested objects and arrays", () => {
    const body = new URLSearchParams([
      ["mode", "payment"],
      ["line_items[0][price_data][unit_amount]", "2500"],
      ["line_items[0][price_data][product_data][name]", "Pledge"],
      ["line_items[0][quantity]", "1"],
      ["line_items[1][price]", "price_123"],
      ["metadata[pledge_id]", "pl_1"],
      ["metadata[2027]", "year key"],
      ["lookup_keys[]", "a"],
      ["lookup_keys[]", "b"],
      ["expand[0]", "payment_intent"],
    ]).toString();
    expect(parseForm(body)).toEqual({
      mode: "payment",
      line_items: [{ price_data: { unit_amount: "2500", product_data: { name: "Pledge" } }, quantity: "1" }, { price: "price_123" }],
      metadata: { pledge_id: "pl_1", "2027": "year key" },
      lookup_keys: ["a", "b"],
      expand: ["payment_intent"],
    });
    expect(() => parseForm("a[b]=1&a[]=2")).toThrow(/Invalid array or hash/);
  });

  it("signs the way the SDK verifies, and the SDK's own test header verifies against the same secret", () => {
    const stripe = new Stripe(SECRET_KEY, { telemetry: false });
    const payload = JSON.stringify({ id: "evt_1", object: "event", type: "invoice.paid" });
    const timestamp = Math.floor(Date.now() / 1000);
    const ours = signPayload(payload, WEBHOOK_SECRET, timestamp);
    expect(ours).toBe(stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET, timestamp }));
    expect(stripe.webhooks.constructEvent(payload, ours, WEBHOOK_SECRET).id).toBe("evt_1");
  });

  it("adds calendar months in UTC whatever the local time zone", () => {
    // Stripe's billing-cycle documentation: anchored on January 31 → February 28 (29 in a leap year) → March 31.
    expect(addMonthsUtc(START, 1)).toBe(Date.UTC(2027, 1, 28, 9, 30) / 1000);
    expect(addMonthsUtc(START, 2)).toBe(Date.UTC(2027, 2, 31, 9, 30) / 1000);
    expect(addMonthsUtc(Date.UTC(2028, 0, 31, 23, 59) / 1000, 1)).toBe(Date.UTC(2028, 1, 29, 23, 59) / 1000);
    expect(addMonthsUtc(Date.UTC(2027, 11, 15) / 1000, 1)).toBe(Date.UTC(2028, 0, 15) / 1000);
  });
});

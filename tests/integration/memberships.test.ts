import { and, asc, eq, inArray } from "drizzle-orm";
import { setupServer } from "msw/node";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { FakeClock, createFakeStripe } from "@/fakes/stripe/index";
import { seedDemo } from "@/db/seed";
import { hasEarlyBlindPairAccess, memberPerks } from "@/db/queries/memberships";
import { hasActiveMembership } from "@/db/queries/users";
import { billingCustomers, ledgerEntries, membershipPlans, memberships, outbox, users, type Membership } from "@/db/schema";
import { planPriceLookupKey } from "@/lib/memberships/plans";
import { createTempDb } from "../helpers/temp-db";
import { seededShuffle as shuffled } from "@/lib/seeded-random";

/*
 * Filament Club memberships end to end in one process: the join and cancel server actions against
 * the local fake processor (fakes/stripe in-process through msw, the real SDK), the fake's
 * hosted-page logic for paying and its clock for renewals, and the webhook route fed the fake's
 * own events, signed as Stripe signs them.
 *
 * Check values and where they come from:
 * - test card 4242 4242 4242 4242 succeeds: Stripe's "Testing" documentation;
 * - monthly billing from an anchor on 31 January: 28 February in a common year, then 31 March —
 *   Stripe's billing-cycle documentation (from memory), the same worked example the fake's own tests use;
 * - the event types (checkout.session.completed, invoice.paid / payment_succeeded / payment_failed,
 *   customer.subscription.updated / deleted): Stripe's "Using webhooks with subscriptions" guide (from memory);
 * - amounts: the Reel plan is 12.00 USD a month (db/seed-data.ts PLANS), 1200 in minor units because
 *   USD has two decimals (ISO 4217 minor unit column); Spool 5.00 USD = 500.
 */

const signedIn = vi.hoisted(() => ({ viewer: null as null | { id: string; email: string; name: string | null; role: "supporter" | "host" | "admin" | "member" } }));
const Redirected = vi.hoisted(
  () =>
    class Redirected extends Error {
      constructor(readonly url: string) {
        super(`redirect to ${url}`);
      }
    },
);
vi.mock("@/server/auth", () => ({
  getViewer: async () => signedIn.viewer,
  auth: async () => (signedIn.viewer ? { user: signedIn.viewer } : null),
}));
vi.mock("next/navigation", () => ({
  redirect: (url: string) => {
    throw new Redirected(url);
  },
  notFound: () => {
    throw new Error("notFound");
  },
}));
vi.mock("next/cache", () => ({ revalidatePath: () => {} }));

const FAKE_ORIGIN = "http://fake-stripe.test";
const APP_URL = "http://proofbay.test";
const WEBHOOK_SECRET = "whsec_memberships_test_secret";
// 2027-01-31T09:30:00Z: a month-end anchor (seconds, the processor's unit).
const START = Date.UTC(2027, 0, 31, 9, 30, 0) / 1000;
const FEB_28 = new Date(Date.UTC(2027, 1, 28, 9, 30, 0));
const MAR_31 = new Date(Date.UTC(2027, 2, 31, 9, 30, 0));

const temp = createTempDb();
seedDemo(temp.db);
const db = temp.db;
process.env.DATABASE_PATH = temp.file;
process.env.APP_URL = APP_URL;
process.env.STRIPE_API_URL = FAKE_ORIGIN;
process.env.STRIPE_SECRET_KEY = "sk_test_proofbay_memberships";
process.env.STRIPE_WEBHOOK_SECRET = WEBHOOK_SECRET;

// No webhook endpoint: events are held and the tests deliver them in the order they choose.
const fake = createFakeStripe({ publicUrl: FAKE_ORIGIN, clock: new FakeClock({ frozenAt: START }) });
const server = setupServer(...fake.handlers);
server.listen({ onUnhandledRequest: "error" });
const control = fake.control;
const signer = new Stripe("sk_test_signer", { telemetry: false });
const sdk = new Stripe("sk_test_proofbay_memberships", { host: "fake-stripe.test", port: 80, protocol: "http", telemetry: false, maxNetworkRetries: 0 });

type Handler = (request: Request) => Promise<Response>;
let POST: Handler;
let joinClub: typeof import("@/app/(public)/club/actions").joinClub;
let cancelOwnMembership: typeof import("@/app/(account)/account/membership/actions").cancelOwnMembership;
let ensurePlanPrice: typeof import("@/server/membership-checkout").ensurePlanPrice;
beforeAll(async () => {
  ({ POST } = (await import("@/app/api/stripe/webhook/route")) as unknown as { POST: Handler });
  ({ joinClub } = await import("@/app/(public)/club/actions"));
  ({ cancelOwnMembership } = await import("@/app/(account)/account/membership/actions"));
  ({ ensurePlanPrice } = await import("@/server/membership-checkout"));
});
afterAll(async () => {
  server.close();
  await fake.close();
  temp.cleanup();
});

function account(email: string) {
  const row = db.select().from(users).where(eq(users.email, email)).get();
  if (!row?.email) throw new Error(`no seeded user ${email}`);
  return { id: row.id, email: row.email, name: row.name, role: "supporter" as const };
}
// db/seed-data.ts: the demo supporter and backer b02 have no membership; Mina is a Reel member.
const ada = account("supporter@harbor-street.example");
const tomasz = account("tomasz.lindqvist@backers.example");
const mina = account("member@harbor-street.example");

async function asViewer<T>(who: typeof ada | null, work: () => Promise<T>): Promise<{ value: T | null; url: string | null }> {
  signedIn.viewer = who;
  try {
    return { value: await work(), url: null };
  } catch (error) {
    if (error instanceof Redirected) return { value: null, url: error.url };
    throw error;
  }
}

function eventIds(): Set<string> {
  return new Set(control.events().map((event) => event.id));
}
/** Events made since `mark`, oldest first. */
function eventsSince(mark: Set<string>): Stripe.Event[] {
  return control.events().filter((event) => !mark.has(event.id)).reverse();
}
const mentions = (event: Stripe.Event, id: string) => JSON.stringify(event).includes(id);

function deliver(event: Stripe.Event | Record<string, unknown>): Promise<Response> {
  const payload = JSON.stringify(event);
  const header = signer.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
  return POST(new Request(`${APP_URL}/api/stripe/webhook`, { method: "POST", body: payload, headers: { "content-type": "application/json", "stripe-signature": header } }));
}
async function deliverAll(events: readonly (Stripe.Event | Record<string, unknown>)[]): Promise<void> {
  for (const event of events) expect((await deliver(event)).status).toBe(200);
}


const CARD_OK = { number: "4242 4242 4242 4242", expiry: "12 / 34", cvc: "123", name: "Test Member" };
const nowFake = () => new Date(control.now() * 1000);

function membershipOf(userId: string): Membership | undefined {
  return db.select().from(memberships).where(eq(memberships.userId, userId)).orderBy(asc(memberships.startedAt)).all().at(-1);
}

/** What one member's events left behind, without ids that differ between two members. */
function footprint(userId: string) {
  const membership = membershipOf(userId)!;
  const { id: _id, userId: _user, subscriptionId: _sub, ...state } = membership;
  return {
    membership: state,
    ledger: db
      .select({ kind: ledgerEntries.kind, amountMinor: ledgerEntries.amountMinor, currency: ledgerEntries.currency, occurredAt: ledgerEntries.occurredAt })
      .from(ledgerEntries)
      .where(eq(ledgerEntries.membershipId, membership.id))
      .orderBy(asc(ledgerEntries.occurredAt))
      .all(),
    mail: db
      .select()
      .from(outbox)
      .where(eq(outbox.toAddress, db.select().from(users).where(eq(users.id, userId)).get()!.email!))
      .all()
      .filter((row) => row.template.startsWith("membership-"))
      .map((row) => {
        const { name: _name, invoiceRef: _ref, ...payload } = row.payload;
        return { template: row.template, subject: row.subject, payload };
      })
      .sort((a, b) => JSON.stringify(a).localeCompare(JSON.stringify(b))),
  };
}

describe("plans at the processor", () => {
  it("a plan gets one product and one monthly price, found again by lookup key after the stored id is lost", async () => {
    const reel = db.select().from(membershipPlans).where(eq(membershipPlans.code, "reel")).get()!;
    expect(reel.stripePriceId).toBeNull();
    const first = await ensurePlanPrice(db, sdk, reel);
    expect(db.select().from(membershipPlans).where(eq(membershipPlans.code, "reel")).get()!.stripePriceId).toBe(first);
    // A restart on a fresh database: nothing stored, the processor still has the price.
    const again = await ensurePlanPrice(db, sdk, { ...reel, stripePriceId: null });
    expect(again).toBe(first);

    const lookupKey = planPriceLookupKey(reel);
    const prices = await sdk.prices.list({ lookup_keys: [lookupKey], limit: 10 });
    expect(prices.data).toHaveLength(1);
    expect(prices.data[0]).toMatchObject({ id: first, unit_amount: 1200, currency: "usd", recurring: { interval: "month", interval_count: 1 }, lookup_key: lookupKey });
    expect((await sdk.products.list({ limit: 100 })).data.filter((product) => product.metadata.plan_code === "reel")).toHaveLength(1);
  });
});

describe("joining", () => {
  it("refuses a visitor (401) and a plan that does not exist (422 naming `plan`)", async () => {
    const visitor = await asViewer(null, () => joinClub({ plan: "reel" }));
    expect(visitor.value).toMatchObject({ ok: false, status: 401 });
    const bogus = await asViewer(ada, () => joinClub({ plan: "platinum" }));
    expect(bogus.value).toMatchObject({ ok: false, status: 422 });
    expect(bogus.value!.fields?.plan).toMatch(/Spool, Reel or Workshop/);
  });

  it("refuses a second membership while one is live (409)", async () => {
    const again = await asViewer(mina, () => joinClub({ plan: "workshop" }));
    expect(again.value).toMatchObject({ ok: false, status: 409, code: "already_member" });
  });
});

describe("cancelling a membership the processor does not know", () => {
  it("a seeded member (sub_seed_…) is marked to stop at the end of the paid period; perks run until then", async () => {
    const before = membershipOf(mina.id)!;
    expect(before).toMatchObject({ status: "active", cancelAtPeriodEnd: false });
    const { value } = await asViewer(mina, () => cancelOwnMembership());
    expect(value).toMatchObject({ ok: true, data: { periodEnd: before.currentPeriodEnd.toISOString() } });
    expect(membershipOf(mina.id)).toMatchObject({ status: "active", cancelAtPeriodEnd: true });
    expect(memberPerks(db, mina.id, new Date(before.currentPeriodEnd.getTime() - 1))).not.toBeNull();
    expect(memberPerks(db, mina.id, before.currentPeriodEnd)).toBeNull();
  });
});

describe("a membership's life through webhooks", () => {
  const held = { ada: [] as Stripe.Event[], tomasz: [] as Stripe.Event[] };
  const customers = { ada: "", tomasz: "" };

  /** Events of this step, split by member (each member has their own customer). */
  function collect(mark: Set<string>): { ada: Stripe.Event[]; tomasz: Stripe.Event[] } {
    const events = eventsSince(mark);
    const mine = { ada: events.filter((event) => mentions(event, customers.ada)), tomasz: events.filter((event) => mentions(event, customers.tomasz)) };
    held.ada.push(...mine.ada);
    held.tomasz.push(...mine.tomasz);
    return mine;
  }

  it("join: a subscription-mode session with the server's price and metadata; the webhook alone makes the membership", async () => {
    const joins = [];
    for (const who of [ada, tomasz]) {
      const { url } = await asViewer(who, () => joinClub({ plan: "reel" }));
      expect(url).toMatch(new RegExp(`^${FAKE_ORIGIN}/pay/cs_test_`));
      joins.push({ who, sessionId: url!.split("/pay/")[1]! });
    }
    // A double click in the same five minutes gets the same page.
    const twice = await asViewer(ada, () => joinClub({ plan: "reel" }));
    expect(twice.url).toBe(`${FAKE_ORIGIN}/pay/${joins[0]!.sessionId}`);

    customers.ada = db.select().from(billingCustomers).where(eq(billingCustomers.userId, ada.id)).get()!.customerId;
    customers.tomasz = db.select().from(billingCustomers).where(eq(billingCustomers.userId, tomasz.id)).get()!.customerId;
    const reel = db.select().from(membershipPlans).where(eq(membershipPlans.code, "reel")).get()!;
    const session = await sdk.checkout.sessions.retrieve(joins[0]!.sessionId, { expand: ["line_items"] });
    expect(session).toMatchObject({ mode: "subscription", amount_total: 1200, currency: "usd", customer: customers.ada, metadata: { user_id: ada.id, plan_code: "reel" } });
    expect(session.line_items!.data.map((line) => line.price?.id)).toEqual([reel.stripePriceId]);
    expect((await sdk.customers.retrieve(customers.ada)) as Stripe.Customer).toMatchObject({ email: ada.email, metadata: { user_id: ada.id } });

    const mark = eventIds();
    for (const { sessionId } of joins) expect(control.completeSession(sessionId, { card: CARD_OK }).outcome).toBe("paid");
    const events = collect(mark);
    // Paid at the processor, but nothing here until the webhook arrives.
    expect(membershipOf(ada.id)).toBeUndefined();
    expect(events.ada.map((event) => event.type)).toEqual(expect.arrayContaining(["checkout.session.completed", "invoice.paid", "invoice.payment_succeeded", "customer.subscription.updated"]));

    await deliverAll(events.ada);
    const membership = membershipOf(ada.id)!;
    const subscription = (await sdk.checkout.sessions.retrieve(joins[0]!.sessionId)).subscription as string;
    expect(membership).toMatchObject({ status: "active", planCode: "reel", subscriptionId: subscription, currentPeriodEnd: FEB_28, cancelAtPeriodEnd: false, startedAt: new Date(START * 1000) });
    expect(footprint(ada.id).ledger).toEqual([{ kind: "membership_payment", amountMinor: 1200, currency: "USD", occurredAt: new Date(START * 1000) }]);
    expect(footprint(ada.id).mail.map((mail) => [mail.template, mail.payload.amount, mail.payload.renewal])).toEqual([["membership-receipt", "$12", false]]);

    // Perks follow: the member role, Reel's 8 votes and early blind pairs (db/seed-data.ts PLANS).
    expect(hasActiveMembership(db, ada.id, nowFake())).toBe(true);
    expect(memberPerks(db, ada.id, nowFake())).toMatchObject({ planCode: "reel", monthlyVotes: 8, earlyBlindPairs: true });
    expect(hasEarlyBlindPairAccess(db, ada.id, nowFake())).toBe(true);
    expect(hasEarlyBlindPairAccess(db, tomasz.id, nowFake())).toBe(false);
  });

  it("renew: the period moves to 31 March, a second ledger row and a renewal receipt", async () => {
    const mark = eventIds();
    const report = control.advanceClock(FEB_28.getTime() / 1000 - START + 60);
    expect(report.renewed).toHaveLength(2);
    await deliverAll(collect(mark).ada);
    expect(membershipOf(ada.id)).toMatchObject({ status: "active", currentPeriodEnd: MAR_31 });
    const { ledger, mail } = footprint(ada.id);
    expect(ledger.map((row) => [row.amountMinor, row.occurredAt])).toEqual([
      [1200, new Date(START * 1000)],
      [1200, FEB_28],
    ]);
    expect(mail.filter((m) => m.payload.renewal === true).map((m) => m.subject)).toEqual(["Your Filament Club Reel membership renewed"]);
  });

  it("failed renewal: past due, perks stop, one renewal-failed mail; paying the invoice makes it good", async () => {
    const subscriptionAda = membershipOf(ada.id)!.subscriptionId!;
    const subscriptionTomasz = (await sdk.subscriptions.list({ customer: customers.tomasz })).data[0]!.id;
    control.failNextRenewal(subscriptionAda);
    control.failNextRenewal(subscriptionTomasz);
    let mark = eventIds();
    const report = control.advanceClock(MAR_31.getTime() / 1000 - control.now() + 60);
    expect(report.failedRenewals.sort()).toEqual([subscriptionAda, subscriptionTomasz].sort());
    await deliverAll(collect(mark).ada);

    expect(membershipOf(ada.id)).toMatchObject({ status: "past_due", currentPeriodEnd: MAR_31 });
    expect(hasActiveMembership(db, ada.id, nowFake())).toBe(false);
    expect(memberPerks(db, ada.id, nowFake())).toBeNull();
    expect(footprint(ada.id).ledger).toHaveLength(2);
    expect(footprint(ada.id).mail.filter((m) => m.template === "membership-renewal-failed")).toHaveLength(1);

    mark = eventIds();
    for (const customer of [customers.ada, customers.tomasz]) {
      const open = (await sdk.invoices.list({ customer, status: "open" })).data[0]!;
      expect((await sdk.invoices.pay(open.id)).status).toBe("paid");
    }
    await deliverAll(collect(mark).ada);
    expect(membershipOf(ada.id)).toMatchObject({ status: "active", currentPeriodEnd: new Date(Date.UTC(2027, 3, 30, 9, 30, 0)), unpaidPeriodEnd: new Date(Date.UTC(2027, 3, 30, 9, 30, 0)) });
    expect(memberPerks(db, ada.id, nowFake())?.monthlyVotes).toBe(8);
    expect(footprint(ada.id).ledger.map((row) => row.amountMinor)).toEqual([1200, 1200, 1200]);
  });

  it("cancel: from the account page at the period end — perks until then, ended after", async () => {
    control.advanceClock(86_400);
    let mark = eventIds();
    const { value } = await asViewer(ada, () => cancelOwnMembership());
    expect(value).toMatchObject({ ok: true });
    // Tomasz's events are held back until the last test, so his membership is not here yet: cancel at the processor.
    const tomaszSubscription = (await sdk.subscriptions.list({ customer: customers.tomasz })).data[0]!.id;
    await sdk.subscriptions.update(tomaszSubscription, { cancel_at_period_end: true });
    // The processor's answer shows at once, before any webhook.
    expect(membershipOf(ada.id)).toMatchObject({ status: "active", cancelAtPeriodEnd: true });
    const subscription = await sdk.subscriptions.retrieve(membershipOf(ada.id)!.subscriptionId!);
    expect(subscription.cancel_at_period_end).toBe(true);
    // A second click sends the same request again under the same key: still one change.
    const repeat = await asViewer(ada, () => cancelOwnMembership());
    expect(repeat.value).toMatchObject({ ok: true });
    await deliverAll(collect(mark).ada);
    expect(hasActiveMembership(db, ada.id, nowFake())).toBe(true);

    mark = eventIds();
    const report = control.advanceClock(40 * 86_400);
    expect(report.endedSubscriptions).toHaveLength(2);
    expect(report.renewed).toEqual([]);
    await deliverAll(collect(mark).ada);
    const ended = membershipOf(ada.id)!;
    expect(ended).toMatchObject({ status: "canceled", cancelAtPeriodEnd: true, endedAt: new Date(Date.UTC(2027, 3, 30, 9, 30, 0)) });
    expect(hasActiveMembership(db, ada.id, nowFake())).toBe(false);
    expect(hasEarlyBlindPairAccess(db, ada.id, nowFake())).toBe(false);
    expect(footprint(ada.id).ledger).toHaveLength(3);
  });

  it("the same events three times, shuffled, with a copy under a new id, leave the same rows as once in order", async () => {
    const copies = held.tomasz
      .filter((event) => event.type === "invoice.paid" || event.type === "customer.subscription.updated")
      .map((event) => ({ ...event, id: `${event.id}_copy` }));
    const storm = shuffled([...held.tomasz, ...held.tomasz, ...held.tomasz, ...copies], 20_270_131);
    await deliverAll(storm);
    expect(footprint(tomasz.id)).toEqual(footprint(ada.id));
    // The whole history again under fresh event ids (past the event-id check), in other orders:
    // the facts only move one way, so no order can leave an older state behind.
    for (const seed of [1, 2, 3, 4, 5]) {
      await deliverAll(shuffled(held.tomasz.map((event) => ({ ...event, id: `${event.id}_again_${seed}` })), seed));
      expect(footprint(tomasz.id)).toEqual(footprint(ada.id));
    }
    // And the mail: one receipt per paid invoice, one renewal-failed mail.
    expect(footprint(tomasz.id).mail.map((mail) => mail.template)).toEqual(["membership-receipt", "membership-receipt", "membership-receipt", "membership-renewal-failed"].sort());
  });

  it("ignores subscription events that name no known person or plan", async () => {
    const before = { memberships: db.select().from(memberships).all().length, ledger: db.select().from(ledgerEntries).all().length };
    const foreign = [
      { id: "evt_foreign_sub", object: "event", type: "customer.subscription.updated", created: START, livemode: false, data: { object: { id: "sub_other_app", object: "subscription", status: "active", metadata: {}, items: { data: [] }, start_date: START, created: START } } },
      { id: "evt_foreign_user", object: "event", type: "customer.subscription.updated", created: START, livemode: false, data: { object: { id: "sub_ghost", object: "subscription", status: "active", metadata: { user_id: "nobody", plan_code: "reel" }, items: { data: [] }, start_date: START, created: START } } },
      { id: "evt_foreign_plan", object: "event", type: "customer.subscription.updated", created: START, livemode: false, data: { object: { id: "sub_gold", object: "subscription", status: "active", metadata: { user_id: ada.id, plan_code: "gold" }, items: { data: [] }, start_date: START, created: START } } },
    ];
    await deliverAll(foreign);
    expect(db.select().from(memberships).all()).toHaveLength(before.memberships);
    expect(db.select().from(ledgerEntries).all()).toHaveLength(before.ledger);
    expect(db.select().from(memberships).where(inArray(memberships.subscriptionId, ["sub_other_app", "sub_ghost", "sub_gold"])).all()).toEqual([]);
    expect(db.select().from(memberships).where(and(eq(memberships.userId, ada.id), eq(memberships.status, "active"))).all()).toEqual([]);
  });
});

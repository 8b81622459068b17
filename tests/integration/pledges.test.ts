import { and, eq, inArray, like } from "drizzle-orm";
import { setupServer } from "msw/node";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createFakeStripe } from "@/fakes/stripe/index";
import { seedDemo } from "@/db/seed";
import { campaigns, ledgerEntries, outbox, pledges, processorEvents, users, type Pledge } from "@/db/schema";
import { createTempDb } from "../helpers/temp-db";
import { seededShuffle as shuffled } from "@/lib/seeded-random";

/*
 * The pledge path end to end in one process: the server action against the local fake processor
 * (fakes/stripe, in-process through msw), the fake's hosted-page logic for paying, and the
 * webhook route fed the fake's own events, signed as Stripe signs them.
 *
 * Check values and where they come from:
 * - test cards: Stripe's "Testing" documentation (4242 4242 4242 4242 succeeds, 4000 0000 0000 0002
 *   is a generic decline);
 * - event types and the session's payment_status: Stripe's Checkout "fulfil orders" guide
 *   (checkout.session.completed, async_payment_succeeded/failed, expired) — from memory;
 * - the 30-minute minimum session lifetime: Stripe's API reference for `expires_at` (from memory);
 * - the pledge bounds: the lab's own policy in lib/pledges/amounts.ts ($5 to $1,000).
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

const FAKE_ORIGIN = "http://fake-stripe.test";
const APP_URL = "http://proofbay.test";
const WEBHOOK_SECRET = "whsec_pledges_test_secret";
const temp = createTempDb();
seedDemo(temp.db);
const db = temp.db;
process.env.DATABASE_PATH = temp.file;
process.env.APP_URL = APP_URL;
process.env.STRIPE_API_URL = FAKE_ORIGIN;
process.env.STRIPE_SECRET_KEY = "sk_test_proofbay_pledges";
process.env.STRIPE_WEBHOOK_SECRET = WEBHOOK_SECRET;

// Events are held (no webhook endpoint) and delivered by the tests themselves.
const fake = createFakeStripe({ publicUrl: FAKE_ORIGIN });
const server = setupServer(...fake.handlers);
server.listen({ onUnhandledRequest: "error" });
const control = fake.control;
const signer = new Stripe("sk_test_signer", { telemetry: false });
const sdk = new Stripe("sk_test_proofbay_pledges", { host: "fake-stripe.test", port: 80, protocol: "http", telemetry: false, maxNetworkRetries: 0 });

type Handler = (request: Request) => Promise<Response>;
let POST: Handler;
let startPledge: typeof import("@/app/(public)/campaigns/[slug]/pledge/actions").startPledge;
beforeAll(async () => {
  ({ POST } = (await import("@/app/api/stripe/webhook/route")) as unknown as { POST: Handler });
  ({ startPledge } = await import("@/app/(public)/campaigns/[slug]/pledge/actions"));
});
afterAll(async () => {
  server.close();
  await fake.close();
  temp.cleanup();
});

const OPEN_SLUG = "hardened-0-6-mm-nozzle-at-high-flow"; // db/seed-data.ts: open, 15 % raised, USD
const FUNDED_SLUG = "matte-pla-plus-stiffness-and-overhangs"; // db/seed-data.ts: funded, then queued once the seed schedules its jobs

function account(email: string) {
  const row = db.select().from(users).where(eq(users.email, email)).get();
  if (!row?.email) throw new Error(`no seeded user ${email}`);
  return { id: row.id, email: row.email, name: row.name, role: "supporter" as const };
}
const jules = account("supporter@harbor-street.example");
const mina = account("member@harbor-street.example");
const tomasz = account("tomasz.lindqvist@backers.example");

/** Runs the action as `who`; returns the redirect target, or the failure it answered with. */
async function pledgeAs(who: typeof jules | null, slug: string, values: Record<string, unknown>) {
  signedIn.viewer = who;
  try {
    const failure = await startPledge(slug, values);
    return { failure, url: null as string | null };
  } catch (error) {
    if (error instanceof Redirected) return { failure: null, url: error.url };
    throw error;
  }
}

async function startedPledge(who: typeof jules, slug: string, amount: string, publicName?: string): Promise<Pledge> {
  const { url, failure } = await pledgeAs(who, slug, { amount, publicName });
  expect(failure).toBeNull();
  const sessionId = /\/pay\/(cs_test_\w+)$/.exec(url ?? "")?.[1];
  expect(sessionId, `redirect to the hosted page, got ${url}`).toBeTruthy();
  return db.select().from(pledges).where(eq(pledges.checkoutSessionId, sessionId!)).get()!;
}

const CARD_OK = { number: "4242 4242 4242 4242", expiry: "12 / 34", cvc: "123", name: "Test Backer" };
const CARD_DECLINED = { ...CARD_OK, number: "4000 0000 0000 0002" };

/** Pays on the fake as the hosted page's form would; returns the events it produced, oldest first. */
function pay(sessionId: string, card = CARD_OK, delayed = false) {
  const before = new Set(control.events().map((event) => event.id));
  const result = control.completeSession(sessionId, { card, ...(delayed ? { delayed } : {}) });
  const produced = control.events().filter((event) => !before.has(event.id)).reverse();
  return { result, produced };
}

function deliver(event: Stripe.Event | Record<string, unknown>): Promise<Response> {
  const payload = JSON.stringify(event);
  const header = signer.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
  return POST(new Request(`${APP_URL}/api/stripe/webhook`, { method: "POST", body: payload, headers: { "content-type": "application/json", "stripe-signature": header } }));
}

async function deliverAll(events: readonly (Stripe.Event | Record<string, unknown>)[]): Promise<void> {
  for (const event of events) {
    const response = await deliver(event);
    expect(response.status).toBe(200);
  }
}


function pledgeRow(id: string) {
  return db.select().from(pledges).where(eq(pledges.id, id)).get()!;
}

/** The rows one paid pledge leaves, with its own ids replaced, so two pledges can be compared. */
function footprint(id: string) {
  const pledge = pledgeRow(id);
  const scrub = (text: string) => text.replaceAll(id, "<pledge>");
  return {
    pledge: { state: pledge.state, amountMinor: pledge.amountMinor, currency: pledge.currency, paid: pledge.paidAt !== null, intent: /^pi_/.test(pledge.paymentIntentId ?? "") },
    ledger: db
      .select()
      .from(ledgerEntries)
      .where(eq(ledgerEntries.pledgeId, id))
      .all()
      .map((row) => ({ kind: row.kind, amountMinor: row.amountMinor, currency: row.currency, externalRef: scrub(row.externalRef) })),
    outbox: db
      .select()
      .from(outbox)
      .where(like(outbox.dedupeKey, `%${id}%`))
      .all()
      .map((row) => ({ template: row.template, dedupeKey: scrub(row.dedupeKey), amount: row.payload.amount })),
  };
}

function sessionEvent(type: string, session: Record<string, unknown>, id = `evt_hand_${Math.random().toString(36).slice(2)}`) {
  return { id, object: "event", type, created: Math.floor(Date.now() / 1000), livemode: false, data: { object: { object: "checkout.session", mode: "payment", ...session } } };
}

describe("starting a pledge", () => {
  it("writes a pending pledge and a Checkout Session whose amount and metadata the server set", async () => {
    const before = Date.now();
    const { url } = await pledgeAs(jules, OPEN_SLUG, {
      amount: "25",
      publicName: "  Jules A.  ",
      // Not the browser's to choose: ignored.
      amountMinor: 1,
      supporterId: tomasz.id,
      campaignId: "someone-elses",
    });
    expect(url).toMatch(new RegExp(`^${FAKE_ORIGIN}/pay/cs_test_`));
    const sessionId = url!.split("/pay/")[1]!;
    const pledge = db.select().from(pledges).where(eq(pledges.checkoutSessionId, sessionId)).get()!;
    const campaign = db.select().from(campaigns).where(eq(campaigns.slug, OPEN_SLUG)).get()!;
    expect(pledge).toMatchObject({ state: "pending", amountMinor: 2500, currency: "USD", supporterId: jules.id, campaignId: campaign.id, publicName: "Jules A.", paidAt: null });

    const session = await sdk.checkout.sessions.retrieve(sessionId);
    expect(session).toMatchObject({
      mode: "payment",
      amount_total: 2500,
      currency: "usd",
      customer_email: jules.email,
      client_reference_id: pledge.id,
      metadata: { pledge_id: pledge.id, campaign_id: campaign.id, supporter_id: jules.id },
      success_url: `${APP_URL}/campaigns/${OPEN_SLUG}?pledge=thanks&session={CHECKOUT_SESSION_ID}`,
      cancel_url: `${APP_URL}/campaigns/${OPEN_SLUG}`,
    });
    // At least 30 minutes (Stripe's minimum), counted from the pledge's creation: 36 minutes.
    expect(session.expires_at * 1000).toBeGreaterThanOrEqual(before + 30 * 60_000);
    expect(session.expires_at).toBe(Math.floor((pledge.createdAt.getTime() + 36 * 60_000) / 1000));
  });

  it("a double click reuses the pending pledge and its one session; another amount is a new pledge", async () => {
    const first = await startedPledge(tomasz, OPEN_SLUG, "40");
    const again = await startedPledge(tomasz, OPEN_SLUG, "40.00");
    expect(again.id).toBe(first.id);
    expect(again.checkoutSessionId).toBe(first.checkoutSessionId);
    const sessions = await sdk.checkout.sessions.list({ limit: 100 });
    expect(sessions.data.filter((session) => session.metadata?.pledge_id === first.id)).toHaveLength(1);

    const other = await startedPledge(tomasz, OPEN_SLUG, "45");
    expect(other.id).not.toBe(first.id);
    expect(db.select().from(pledges).where(and(eq(pledges.supporterId, tomasz.id), eq(pledges.state, "pending"), inArray(pledges.amountMinor, [4000, 4500]))).all()).toHaveLength(2);
  });

  it("refuses an amount outside the bounds with a message on the field `amount`, writing nothing", async () => {
    const count = () => db.select().from(pledges).all().length;
    const before = count();
    const cases: [string, RegExp][] = [
      ["4.99", /^Amount must be at least \$5\.$/],
      ["1000.01", /^Amount can be at most \$1,000\.$/],
      ["twenty", /^Amount must be a number such as 25 or 25\.50/],
      ["25.555", /at most 2 decimals/],
      ["", /^Amount is required/],
    ];
    for (const [amount, message] of cases) {
      const { failure, url } = await pledgeAs(jules, OPEN_SLUG, { amount });
      expect(url).toBeNull();
      expect(failure).toMatchObject({ ok: false, status: 422, code: "invalid_amount" });
      expect(failure!.fields?.amount).toMatch(message);
    }
    expect(count()).toBe(before);
  });

  it("answers 409 on a campaign that is not open or whose deadline has passed, and 401 to a visitor", async () => {
    const funded = await pledgeAs(jules, FUNDED_SLUG, { amount: "25" });
    expect(funded.failure).toMatchObject({ ok: false, status: 409, code: "campaign_closed" });
    expect(funded.failure!.message).toMatch(/queued and no longer takes pledges/);

    db.insert(campaigns)
      .values({ slug: "deadline-passed", title: "Deadline passed", summary: "Still open, past its deadline.", goalMinor: 50_000, currency: "USD", deadline: new Date(Date.now() - 60_000), openedAt: new Date(Date.now() - 86_400_000) })
      .run();
    const late = await pledgeAs(jules, "deadline-passed", { amount: "25" });
    expect(late.failure).toMatchObject({ ok: false, status: 409, code: "campaign_closed" });

    const visitor = await pledgeAs(null, OPEN_SLUG, { amount: "25" });
    expect(visitor.failure).toMatchObject({ ok: false, status: 401 });
  });
});

describe("webhook effects", () => {
  let paidOnce: Pledge;

  it("paying with 4242 and delivering the events once marks the pledge paid, with one ledger row and one receipt", async () => {
    const pledge = await startedPledge(jules, OPEN_SLUG, "20");
    // The success redirect alone changes nothing: only the webhook fulfils.
    const { result, produced } = pay(pledge.checkoutSessionId!);
    expect(result.outcome).toBe("paid");
    expect(pledgeRow(pledge.id).state).toBe("pending");
    expect(produced.map((event) => event.type)).toContain("checkout.session.completed");

    await deliverAll(produced);
    const paid = pledgeRow(pledge.id);
    const session = await sdk.checkout.sessions.retrieve(pledge.checkoutSessionId!);
    expect(paid).toMatchObject({ state: "paid", paymentIntentId: session.payment_intent });
    expect(paid.paidAt).not.toBeNull();
    const intent = await sdk.paymentIntents.retrieve(session.payment_intent as string);
    expect(intent.metadata).toMatchObject({ pledge_id: pledge.id });

    expect(footprint(pledge.id)).toEqual({
      pledge: { state: "paid", amountMinor: 2000, currency: "USD", paid: true, intent: true },
      ledger: [{ kind: "pledge_payment", amountMinor: 2000, currency: "USD", externalRef: "pledge:<pledge>:payment" }],
      outbox: [{ template: "pledge-receipt", dedupeKey: "pledge-receipt:<pledge>", amount: "$20" }],
    });
    const receipt = db.select().from(outbox).where(eq(outbox.dedupeKey, `pledge-receipt:${pledge.id}`)).get()!;
    expect(receipt.toAddress).toBe(jules.email);
    expect(db.select().from(campaigns).where(eq(campaigns.slug, OPEN_SLUG)).get()!.state).toBe("open");
    paidOnce = pledgeRow(pledge.id);
  });

  it("every event three times in a shuffled order leaves the same rows as once in order", async () => {
    const pledge = await startedPledge(mina, OPEN_SLUG, "20");
    const { produced } = pay(pledge.checkoutSessionId!);
    const completed = produced.find((event) => event.type === "checkout.session.completed")!;
    // Besides the same event thrice, a second event id for the same payment (as a replay tool
    // or a second endpoint might produce): the state transition and unique keys hold, not only the event id.
    const copy = { ...completed, id: `${completed.id}_copy` };
    const storm = shuffled([...produced, ...produced, ...produced, copy], 20_270_131);
    await deliverAll(storm);

    expect(footprint(pledge.id)).toEqual(footprint(paidOnce.id));
    const ids = [...new Set(storm.map((event) => event.id))];
    expect(db.select().from(processorEvents).where(inArray(processorEvents.id, ids)).all()).toHaveLength(ids.length);
  });

  it("a delayed payment is paid by async_payment_succeeded, whichever of the two events comes first", async () => {
    const pledge = await startedPledge(tomasz, OPEN_SLUG, "30");
    const completed = pay(pledge.checkoutSessionId!, CARD_OK, true);
    expect(completed.result.outcome).toBe("processing");
    const before = new Set(control.events().map((event) => event.id));
    control.settleAsyncPayment(pledge.checkoutSessionId!, "succeeded");
    const settled = control.events().filter((event) => !before.has(event.id)).reverse();

    await deliverAll([...settled, ...completed.produced]);
    expect(pledgeRow(pledge.id).state).toBe("paid");
    expect(footprint(pledge.id).ledger).toHaveLength(1);

    // The other way round on another pledge: "completed, unpaid" alone is not a payment.
    const second = await startedPledge(tomasz, OPEN_SLUG, "35");
    const unpaid = pay(second.checkoutSessionId!, CARD_OK, true);
    await deliverAll(unpaid.produced);
    expect(pledgeRow(second.id).state).toBe("pending");
    const mark = new Set(control.events().map((event) => event.id));
    control.settleAsyncPayment(second.checkoutSessionId!, "failed");
    await deliverAll(control.events().filter((event) => !mark.has(event.id)).reverse());
    expect(pledgeRow(second.id).state).toBe("failed");
    expect(footprint(second.id).ledger).toEqual([]);
    expect(footprint(second.id).outbox).toEqual([]);
  });

  it("an expired session fails its pending pledge; a late expiry leaves a paid pledge paid", async () => {
    const pledge = await startedPledge(jules, OPEN_SLUG, "60");
    const before = new Set(control.events().map((event) => event.id));
    await sdk.checkout.sessions.expire(pledge.checkoutSessionId!);
    const expired = control.events().filter((event) => !before.has(event.id));
    expect(expired.map((event) => event.type)).toEqual(["checkout.session.expired"]);
    await deliverAll(expired);
    expect(pledgeRow(pledge.id).state).toBe("failed");

    const late = sessionEvent("checkout.session.expired", {
      id: paidOnce.checkoutSessionId,
      status: "expired",
      payment_status: "unpaid",
      metadata: { pledge_id: paidOnce.id },
      amount_total: paidOnce.amountMinor,
      currency: "usd",
    });
    await deliverAll([late]);
    expect(pledgeRow(paidOnce.id)).toMatchObject({ state: "paid", paidAt: paidOnce.paidAt });
  });

  it("a declined card changes nothing: the pledge waits for its session to expire", async () => {
    const pledge = await startedPledge(mina, OPEN_SLUG, "15");
    const { result, produced } = pay(pledge.checkoutSessionId!, CARD_DECLINED);
    expect(result.outcome).toBe("declined");
    await deliverAll(produced);
    expect(pledgeRow(pledge.id).state).toBe("pending");
  });

  it("acknowledges and ignores sessions that are not a pledge's", async () => {
    const rowsBefore = { pledges: db.select().from(pledges).all(), ledger: db.select().from(ledgerEntries).all().length, outbox: db.select().from(outbox).all().length };
    const seededPending = db.select().from(pledges).where(and(like(pledges.checkoutSessionId, "cs_seed_%"), eq(pledges.state, "pending"))).get()!;
    const foreign = [
      // Another app on the same account: no pledge id anywhere.
      sessionEvent("checkout.session.completed", { id: "cs_test_other_app", payment_status: "paid", amount_total: 2500, currency: "usd", metadata: { order: "A-17" } }),
      // A real pledge id on somebody else's session.
      sessionEvent("checkout.session.completed", { id: "cs_test_not_that_one", payment_status: "paid", amount_total: seededPending.amountMinor, currency: "usd", metadata: { pledge_id: seededPending.id } }),
      // The seeded session, but the amount does not match the pledge.
      sessionEvent("checkout.session.completed", { id: seededPending.checkoutSessionId, payment_status: "paid", amount_total: seededPending.amountMinor + 1, currency: "usd", metadata: {} }),
      sessionEvent("checkout.session.completed", {}),
      { id: "evt_not_checkout", object: "event", type: "customer.created", created: 1_800_000_000, livemode: false, data: { object: { id: "cus_1", object: "customer" } } },
    ];
    for (const event of foreign) {
      const response = await deliver(event);
      expect(response.status).toBe(200);
      expect(await response.json()).toEqual({ received: true, duplicate: false });
    }
    expect(db.select().from(pledges).all()).toEqual(rowsBefore.pledges);
    expect(db.select().from(ledgerEntries).all()).toHaveLength(rowsBefore.ledger);
    expect(db.select().from(outbox).all()).toHaveLength(rowsBefore.outbox);
  });
});

describe("reaching the goal", () => {
  it("two concurrent payments crossing the goal make one funded transition and one set of funded mails", async () => {
    const deadline = new Date(Date.now() + 7 * 86_400_000);
    db.insert(campaigns)
      .values({ slug: "goal-race", title: "Goal race", summary: "Two payments cross the goal at once.", goalMinor: 7_000, currency: "USD", deadline, openedAt: new Date(Date.now() - 86_400_000) })
      .run();
    const campaign = db.select().from(campaigns).where(eq(campaigns.slug, "goal-race")).get()!;
    const a = await startedPledge(jules, "goal-race", "40");
    const b = await startedPledge(tomasz, "goal-race", "40");
    const lateStarter = await startedPledge(mina, "goal-race", "10");
    const paidA = pay(a.checkoutSessionId!).produced;
    const paidB = pay(b.checkoutSessionId!).produced;
    const completedOf = (events: Stripe.Event[]) => events.find((event) => event.type === "checkout.session.completed")!;

    // Both completions, each twice, all at once.
    const responses = await Promise.all([completedOf(paidA), completedOf(paidB), completedOf(paidB), completedOf(paidA)].map(deliver));
    expect(responses.map((response) => response.status)).toEqual([200, 200, 200, 200]);

    const after = db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!;
    expect(after.state).toBe("funded");
    expect(after.fundedAt).not.toBeNull();
    const fundedMails = () => db.select().from(outbox).where(like(outbox.dedupeKey, `campaign-funded:${campaign.id}:%`)).all();
    expect(fundedMails().map((mail) => mail.toAddress).sort()).toEqual([jules.email, tomasz.email].sort());
    expect(fundedMails().every((mail) => mail.template === "campaign-funded")).toBe(true);

    // A pledge started before the goal and paid after it is still a paid pledge, but the campaign is
    // funded only once and nobody gets a second "funded" mail; new pledges are refused.
    await deliverAll(pay(lateStarter.checkoutSessionId!).produced);
    expect(pledgeRow(lateStarter.id).state).toBe("paid");
    expect(db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!.fundedAt).toEqual(after.fundedAt);
    expect(fundedMails()).toHaveLength(2);
    expect(db.select().from(ledgerEntries).where(eq(ledgerEntries.campaignId, campaign.id)).all().map((row) => row.amountMinor).sort()).toEqual([1000, 4000, 4000]);
    const refused = await pledgeAs(jules, "goal-race", { amount: "10" });
    expect(refused.failure).toMatchObject({ status: 409 });
  });
});

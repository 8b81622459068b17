import { and, eq, inArray, like } from "drizzle-orm";
import { setupServer } from "msw/node";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { openDatabase } from "@/db/client";
import { seedDemo } from "@/db/seed";
import { campaigns, ledgerEntries, outbox, pledges, refundRequests, users, type Pledge } from "@/db/schema";
import { templateElement, type TemplateProps } from "@/emails/registry";
import { renderEmail } from "@/emails/render";
import { createFakeStripe } from "@/fakes/stripe/index";
import { OUTSIDE_PROCESSOR_MEMO } from "@/lib/pledges/refunds";
import { createTempDb } from "../helpers/temp-db";
import { seededShuffle as shuffled } from "@/lib/seeded-random";

/*
 * Goal-or-refund end to end in one process: pledges paid on the local fake processor (in-process
 * through msw) and fulfilled by the webhook route, then the sweeper (server/refund-sweeper.ts) and
 * the host's withdraw action refunding them through the processor's refunds API.
 *
 * Check values and where they come from:
 * - the refunds API (`POST /v1/refunds` with `payment_intent`; a full refund by default; a repeated
 *   request under the same Idempotency-Key returns the first answer): Stripe's API reference for
 *   refunds and for idempotent requests (from memory);
 * - the events a refund produces (`refund.created`, `charge.refunded`): what fakes/stripe emits,
 *   after Stripe's event types list (from memory);
 * - the 36-minute Checkout Session lifetime: lib/pledges/rules.ts checkoutExpiresAt (5 min reuse
 *   window + Stripe's 30-minute minimum + 1 min skew);
 * - amounts: the lab's own pledge bounds ($5 to $1,000), in USD cents (ISO 4217 exponent 2).
 */

const signedIn = vi.hoisted(() => ({ viewer: null as null | { id: string; email: string; name: string | null; role: "supporter" | "host" | "admin" | "member" } }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => signedIn.viewer,
  auth: async () => (signedIn.viewer ? { user: signedIn.viewer } : null),
}));
vi.mock("next/navigation", () => ({
  redirect: (url: string) => {
    throw new Error(`redirect to ${url}`);
  },
  notFound: () => {
    throw new Error("notFound");
  },
  useRouter: () => ({ refresh: () => {}, push: () => {} }),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => {} }));

const FAKE_ORIGIN = "http://fake-stripe.test";
const APP_URL = "http://proofbay.test";
const WEBHOOK_SECRET = "whsec_refunds_test_secret";
const temp = createTempDb();
seedDemo(temp.db);
const db = temp.db;
process.env.DATABASE_PATH = temp.file;
process.env.APP_URL = APP_URL;
process.env.STRIPE_API_URL = FAKE_ORIGIN;
process.env.STRIPE_SECRET_KEY = "sk_test_proofbay_refunds";
process.env.STRIPE_WEBHOOK_SECRET = WEBHOOK_SECRET;

const fake = createFakeStripe({ publicUrl: FAKE_ORIGIN });
const server = setupServer(...fake.handlers);
server.listen({ onUnhandledRequest: "error" });
const control = fake.control;
const signer = new Stripe("sk_test_signer", { telemetry: false });
const sdk = new Stripe("sk_test_proofbay_refunds", { host: "fake-stripe.test", port: 80, protocol: "http", telemetry: false, maxNetworkRetries: 0 });

type Handler = (request: Request) => Promise<Response>;
let POST: Handler;
let sweeper: typeof import("@/server/refund-sweeper");
let checkout: typeof import("@/server/checkout");
let withdrawCampaignAction: typeof import("@/app/lab/campaigns/[id]/actions").withdrawCampaignAction;
beforeAll(async () => {
  ({ POST } = (await import("@/app/api/stripe/webhook/route")) as unknown as { POST: Handler });
  sweeper = await import("@/server/refund-sweeper");
  checkout = await import("@/server/checkout");
  ({ withdrawCampaignAction } = await import("@/app/lab/campaigns/[id]/actions"));
});
afterAll(async () => {
  server.close();
  await fake.close();
  temp.cleanup();
});

const MINUTE = 60_000;
const DAY = 24 * 60 * MINUTE;

function account(email: string) {
  const row = db.select().from(users).where(eq(users.email, email)).get();
  if (!row?.email) throw new Error(`no seeded user ${email}`);
  return { id: row.id, email: row.email, name: row.name, role: row.role };
}
const host = { ...account("host@harbor-street.example"), role: "host" as const };
const jules = { ...account("supporter@harbor-street.example"), role: "supporter" as const };
const backers = db
  .select({ id: users.id, email: users.email })
  .from(users)
  .where(like(users.email, "%@backers.example"))
  .limit(6)
  .all()
  .map((row) => ({ id: row.id, email: row.email! }));

let campaignCount = 0;
function newCampaign(goalMinor: number, deadline = new Date(Date.now() + 7 * DAY)) {
  const slug = `refund-case-${++campaignCount}`;
  return db
    .insert(campaigns)
    .values({ slug, title: `Refund case ${campaignCount}`, summary: "A campaign for the goal-or-refund tests.", goalMinor, currency: "USD", deadline, openedAt: new Date(Date.now() - DAY) })
    .returning()
    .get();
}

const CARD_OK = { number: "4242 4242 4242 4242", expiry: "12 / 34", cvc: "123", name: "Test Backer" };

function newEvents(run: () => void): Stripe.Event[] {
  const before = new Set(control.events().map((event) => event.id));
  run();
  return control.events().filter((event) => !before.has(event.id)).reverse();
}

function deliver(event: Stripe.Event | Record<string, unknown>): Promise<Response> {
  const payload = JSON.stringify(event);
  const header = signer.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
  return POST(new Request(`${APP_URL}/api/stripe/webhook`, { method: "POST", body: payload, headers: { "content-type": "application/json", "stripe-signature": header } }));
}

async function deliverAll(events: readonly Stripe.Event[]) {
  for (const event of events) expect((await deliver(event)).status).toBe(200);
}

/** A pledge started through Checkout, paid with 4242 and fulfilled by the webhook. */
async function paidPledge(slug: string, supporter: { id: string; email: string }, amount: string): Promise<Pledge> {
  const started = await checkout.startPledgeCheckout(db, sdk, { slug, supporter, amountText: amount, publicName: null, appUrl: APP_URL });
  if (started.kind !== "redirect") throw new Error(started.message);
  await deliverAll(newEvents(() => control.completeSession(started.sessionId, { card: CARD_OK })));
  const pledge = db.select().from(pledges).where(eq(pledges.id, started.pledgeId)).get()!;
  expect(pledge.state).toBe("paid");
  return pledge;
}

/** What the refunds of a campaign left behind, ids replaced, so two runs can be compared. */
function refundFootprint(campaignId: string) {
  const rows = db.select().from(pledges).where(eq(pledges.campaignId, campaignId)).all();
  const alias = new Map(rows.map((row, i) => [row.id, `<p${i}>`]));
  const scrub = (text: string) => [...alias].reduce((acc, [id, name]) => acc.replaceAll(id, name), text);
  return {
    pledges: rows.map((row) => ({ pledge: alias.get(row.id), state: row.state, refund: /^re_/.test(row.refundId ?? "") })),
    ledger: db
      .select()
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.campaignId, campaignId), inArray(ledgerEntries.kind, ["pledge_refund", "fund_release"])))
      .all()
      .map((row) => ({ kind: row.kind, amountMinor: row.amountMinor, ref: scrub(row.externalRef), memo: (row.memo ?? "").replace(/re_\w+/, "<refund>") }))
      .sort((a, b) => a.ref.localeCompare(b.ref)),
    mail: db
      .select()
      .from(outbox)
      .where(like(outbox.dedupeKey, "pledge-refund:%"))
      .all()
      .filter((row) => alias.has(row.dedupeKey.slice("pledge-refund:".length)))
      .map((row) => ({ key: scrub(row.dedupeKey), template: row.template, to: row.toAddress, amount: row.payload.amount }))
      .sort((a, b) => a.key.localeCompare(b.key)),
  };
}

async function processorRefundsFor(pledge: Pledge) {
  return (await sdk.refunds.list({ payment_intent: pledge.paymentIntentId!, limit: 100 })).data;
}


describe("lapse at the deadline", () => {
  it("refunds every paid pledge exactly once, even with two sweeps at once and another later, and returns lab-fund money", async () => {
    const campaign = newCampaign(100_000);
    const paid = [
      await paidPledge(campaign.slug, backers[0]!, "25"),
      await paidPledge(campaign.slug, backers[1]!, "40"),
      await paidPledge(campaign.slug, backers[2]!, "15.50"),
      await paidPledge(campaign.slug, backers[0]!, "10"),
    ];
    // 30 USD of lab-fund money, as the allocation side writes it (a negative fund_allocation row).
    db.insert(ledgerEntries)
      .values({ kind: "fund_allocation", amountMinor: -3_000, currency: "USD", campaignId: campaign.id, externalRef: `test-allocation:${campaign.id}`, occurredAt: new Date() })
      .run();
    // A pending pledge that never got a Checkout Session, from an hour ago: it can never be paid.
    const orphan = db
      .insert(pledges)
      .values({ campaignId: campaign.id, supporterId: backers[3]!.id, amountMinor: 2_000, currency: "USD", state: "pending", createdAt: new Date(Date.now() - 60 * MINUTE) })
      .returning()
      .get();

    // Before the deadline nothing happens.
    const early = await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL });
    expect(early.closed).toEqual([]);
    expect(db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!.state).toBe("open");

    db.update(campaigns).set({ deadline: new Date(Date.now() - MINUTE) }).where(eq(campaigns.id, campaign.id)).run();
    // Two sweeps at once on two connections (two app processes), one request at a time so they interleave.
    const second = openDatabase(temp.file);
    const [a, b] = await Promise.all([
      sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL, batchSize: 1 }),
      sweeper.runMoneySweep(second, sdk, { appUrl: APP_URL, batchSize: 1 }),
    ]);
    second.$client.close();
    expect([...a.closed, ...b.closed]).toEqual([{ campaignId: campaign.id, slug: campaign.slug, outcome: "lapsed", refundsRequested: 4, fundReturnedMinor: 3_000 }]);
    expect(a.refunded + b.refunded).toBe(4);

    const after = db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!;
    expect(after.state).toBe("lapsed");
    expect(after.closedAt).not.toBeNull();
    expect(db.select().from(pledges).where(eq(pledges.id, orphan.id)).get()!.state).toBe("failed");
    for (const pledge of paid) {
      const row = db.select().from(pledges).where(eq(pledges.id, pledge.id)).get()!;
      expect(row.state).toBe("refunded");
      const atProcessor = await processorRefundsFor(pledge);
      expect(atProcessor.map((refund) => ({ id: refund.id, amount: refund.amount, status: refund.status }))).toEqual([{ id: row.refundId, amount: pledge.amountMinor, status: "succeeded" }]);
    }

    const footprint = refundFootprint(campaign.id);
    expect(footprint.ledger.filter((row) => row.kind === "pledge_refund").map((row) => row.amountMinor).sort((x, y) => x - y)).toEqual([-4_000, -2_500, -1_550, -1_000]);
    expect(footprint.ledger.filter((row) => row.kind === "fund_release")).toEqual([{ kind: "fund_release", amountMinor: 3_000, ref: `fund-return:${campaign.id}`, memo: `Returned to the lab fund: “${campaign.title}” lapsed` }]);
    expect(footprint.mail).toHaveLength(4);
    expect(footprint.mail.every((mail) => mail.template === "campaign-lapsed-refund")).toBe(true);
    expect(footprint.mail.map((mail) => mail.amount).sort()).toEqual(["$10", "$15.50", "$25", "$40"]);

    // Later sweeps, and every refund event delivered three times shuffled, change nothing.
    const refundEvents = control.events().filter((event) => ["refund.created", "charge.refunded"].includes(event.type) && paid.some((p) => JSON.stringify(event.data.object).includes(p.paymentIntentId!)));
    expect(refundEvents.filter((event) => event.type === "refund.created")).toHaveLength(4);
    await deliverAll(shuffled([...refundEvents, ...refundEvents, ...refundEvents], 5_202_612));
    const later = await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL, now: () => new Date(Date.now() + DAY) });
    expect(later).toMatchObject({ closed: [], lateRequests: 0, refunded: 0, flagged: 0 });
    expect(refundFootprint(campaign.id)).toEqual(footprint);
    for (const pledge of paid) expect(await processorRefundsFor(pledge)).toHaveLength(1);
  });

  it("an open campaign that did reach its goal is funded at the deadline, not lapsed", async () => {
    const campaign = newCampaign(3_000);
    db.insert(ledgerEntries)
      .values({ kind: "fund_allocation", amountMinor: -3_000, currency: "USD", campaignId: campaign.id, externalRef: `test-allocation:${campaign.id}`, occurredAt: new Date() })
      .run();
    db.update(campaigns).set({ deadline: new Date(Date.now() - MINUTE) }).where(eq(campaigns.id, campaign.id)).run();
    const report = await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL });
    expect(report.closed).toEqual([{ campaignId: campaign.id, slug: campaign.slug, outcome: "funded", refundsRequested: 0, fundReturnedMinor: 0 }]);
    expect(db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!.state).toBe("funded");
  });
});

describe("crashes and event order", () => {
  it("a sweep that dies after the processor refunded but before committing is recovered by the next sweep, with the same refund", async () => {
    const campaign = newCampaign(100_000);
    const pledge = await paidPledge(campaign.slug, backers[4]!, "30");
    db.update(campaigns).set({ deadline: new Date(Date.now() - MINUTE) }).where(eq(campaigns.id, campaign.id)).run();

    const crash = sweeper.runMoneySweep(db, sdk, {
      appUrl: APP_URL,
      afterProcessorAnswer: () => {
        throw new Error("power cut");
      },
    });
    await expect(crash).rejects.toThrow("power cut");
    const atProcessor = await processorRefundsFor(pledge);
    expect(atProcessor).toHaveLength(1);
    expect(db.select().from(pledges).where(eq(pledges.id, pledge.id)).get()!.state).toBe("paid");
    expect(db.select().from(refundRequests).where(eq(refundRequests.pledgeId, pledge.id)).get()).toMatchObject({ state: "requested", attempts: 1 });

    // While the dead sweep's lease lasts, nobody else calls the processor for it.
    expect((await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL })).refunded).toBe(0);
    // After it, the same idempotency key returns the same refund, recorded once.
    const recovered = await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL, now: () => new Date(Date.now() + 3 * MINUTE) });
    expect(recovered.refunded).toBe(1);
    const row = db.select().from(pledges).where(eq(pledges.id, pledge.id)).get()!;
    expect(row).toMatchObject({ state: "refunded", refundId: atProcessor[0]!.id });
    expect(row.refundedAt!.getTime()).toBe(atProcessor[0]!.created * 1000);
    expect(await processorRefundsFor(pledge)).toHaveLength(1);
    // The one refund was created under the pledge's idempotency key (the fake records it on the event).
    const created = control.events().filter((event) => event.type === "refund.created" && (event.data.object as Stripe.Refund).payment_intent === pledge.paymentIntentId);
    expect(created.map((event) => event.request?.idempotency_key)).toEqual([`pledge-refund:${pledge.id}`]);
    expect(refundFootprint(campaign.id).ledger).toEqual([{ kind: "pledge_refund", amountMinor: -3_000, ref: "pledge:<p0>:refund", memo: "Refund <refund>: campaign lapsed short of its goal" }]);
  });

  it("refund events that arrive before the sweep commits record the refund; the sweep's answer then changes nothing", async () => {
    const campaign = newCampaign(100_000);
    const first = await paidPledge(campaign.slug, backers[5]!, "20");
    const second = await paidPledge(campaign.slug, jules, "35");
    db.update(campaigns).set({ deadline: new Date(Date.now() - MINUTE) }).where(eq(campaigns.id, campaign.id)).run();

    const mark = new Set(control.events().map((event) => event.id));
    await expect(
      sweeper.runMoneySweep(db, sdk, {
        appUrl: APP_URL,
        batchSize: 1,
        afterProcessorAnswer: (pledgeId) => {
          if (pledgeId === first.id) throw new Error("crash after the first refund");
        },
      }),
    ).rejects.toThrow("crash");
    expect(db.select().from(pledges).where(eq(pledges.id, first.id)).get()!.state).toBe("paid");
    const produced = control.events().filter((event) => !mark.has(event.id) && JSON.stringify(event.data.object).includes(first.paymentIntentId!));
    expect(produced.map((event) => event.type).sort()).toEqual(["charge.refunded", "refund.created"]);
    // The webhook gets them, duplicated and shuffled, before any sweep commits.
    await deliverAll(shuffled([...produced, ...produced], 77));
    expect(db.select().from(pledges).where(eq(pledges.id, first.id)).get()!.state).toBe("refunded");

    await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL, now: () => new Date(Date.now() + 3 * MINUTE) });
    expect(db.select().from(refundRequests).where(inArray(refundRequests.pledgeId, [first.id, second.id])).all().map((row) => row.state)).toEqual(["succeeded", "succeeded"]);
    const footprint = refundFootprint(campaign.id);
    expect(footprint.ledger.map((row) => row.amountMinor).sort((x, y) => x - y)).toEqual([-3_500, -2_000]);
    expect(footprint.mail.map((mail) => mail.to).sort()).toEqual([backers[5]!.email, jules.email].sort());
    expect(await processorRefundsFor(first)).toHaveLength(1);
    expect(await processorRefundsFor(second)).toHaveLength(1);
  });

  it("a payment whose webhook arrives after its campaign closed is refunded by the next sweep; open checkouts are expired", async () => {
    const campaign = newCampaign(100_000);
    const start = async (supporter: { id: string; email: string }, amount: string) => {
      const started = await checkout.startPledgeCheckout(db, sdk, { slug: campaign.slug, supporter, amountText: amount, publicName: null, appUrl: APP_URL });
      if (started.kind !== "redirect") throw new Error(started.message);
      return started;
    };
    const paidLate = await start(backers[1]!, "50");
    const stillOpen = await start(backers[2]!, "45");
    // Paid at the processor before the deadline; its events reach the app only after the sweep.
    const lateEvents = newEvents(() => control.completeSession(paidLate.sessionId, { card: CARD_OK }));
    db.update(campaigns).set({ deadline: new Date(Date.now() - MINUTE) }).where(eq(campaigns.id, campaign.id)).run();

    const mark = new Set(control.events().map((event) => event.id));
    const closing = await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL });
    expect(db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!.state).toBe("lapsed");
    expect(closing.checkoutsExpired).toBe(1);
    expect((await sdk.checkout.sessions.retrieve(stillOpen.sessionId)).status).toBe("expired");
    expect((await sdk.checkout.sessions.retrieve(paidLate.sessionId)).status).toBe("complete");
    await deliverAll(control.events().filter((event) => !mark.has(event.id) && event.type === "checkout.session.expired"));
    expect(db.select().from(pledges).where(eq(pledges.id, stillOpen.pledgeId)).get()!.state).toBe("failed");

    await deliverAll(lateEvents);
    expect(db.select().from(pledges).where(eq(pledges.id, paidLate.pledgeId)).get()!.state).toBe("paid");
    const report = await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL });
    expect(report).toMatchObject({ lateRequests: 1, refunded: 1, checkoutsExpired: 0 });
    expect(db.select().from(pledges).where(eq(pledges.id, paidLate.pledgeId)).get()!.state).toBe("refunded");
  });
});

describe("withdraw", () => {
  it("refuses a non-host with 403 and a missing reason with 422 naming `reason`, changing nothing", async () => {
    const campaign = newCampaign(100_000);
    signedIn.viewer = jules;
    expect(await withdrawCampaignAction(campaign.id, { reason: "The duct supplier stopped making the part." })).toMatchObject({ ok: false, status: 403 });
    signedIn.viewer = null;
    expect(await withdrawCampaignAction(campaign.id, { reason: "The duct supplier stopped making the part." })).toMatchObject({ ok: false, status: 401 });
    signedIn.viewer = host;
    const missing = await withdrawCampaignAction(campaign.id, { reason: "  " });
    expect(missing).toMatchObject({ ok: false, status: 422 });
    expect(missing.ok ? null : missing.fields?.reason).toMatch(/reason backers will read/);
    expect(await withdrawCampaignAction(campaign.id, {})).toMatchObject({ ok: false, status: 422, fields: { reason: expect.any(String) } });
    expect(db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!.state).toBe("open");

    const { renderToStaticMarkup } = await import("react-dom/server");
    const { default: LabCampaignPage } = await import("@/app/lab/campaigns/[id]/page");
    signedIn.viewer = host;
    const lab = renderToStaticMarkup(await LabCampaignPage({ params: Promise.resolve({ id: campaign.id }) }));
    expect(lab).toContain("Withdraw and refund 0 paid pledges");
    expect(lab).toContain("Reason (required");
  });

  it("a host withdraws a funded campaign: everyone is refunded once and told why; a second click is a 409", async () => {
    const campaign = newCampaign(5_000);
    const paid = [await paidPledge(campaign.slug, backers[2]!, "30"), await paidPledge(campaign.slug, backers[3]!, "25")];
    expect(db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!.state).toBe("funded");

    signedIn.viewer = host;
    const reason = "The printer this plan needs is out for repair until next season.";
    const [first, second] = await Promise.all([withdrawCampaignAction(campaign.id, { reason }), withdrawCampaignAction(campaign.id, { reason })]);
    const results = [first, second];
    expect(results.filter((result) => result.ok)).toHaveLength(1);
    expect(results.find((result) => !result.ok)).toMatchObject({ ok: false, status: 409, code: "not_withdrawable" });
    expect(results.find((result) => result.ok)).toMatchObject({ ok: true, data: { refundsRequested: 2, refunded: 2, flagged: 0 } });

    const after = db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!;
    expect(after).toMatchObject({ state: "withdrawn", withdrawReason: reason });
    const mails = db.select().from(outbox).where(inArray(outbox.dedupeKey, paid.map((p) => `pledge-refund:${p.id}`))).all();
    expect(mails.map((mail) => [mail.template, mail.payload.reason])).toEqual([
      ["campaign-withdrawn-refund", reason],
      ["campaign-withdrawn-refund", reason],
    ]);
    for (const pledge of paid) expect(await processorRefundsFor(pledge)).toHaveLength(1);
    // The queued mail renders with its plain-text part quoting the reason and the amount.
    const rendered = await renderEmail(templateElement("campaign-withdrawn-refund", mails[0]!.payload as TemplateProps["campaign-withdrawn-refund"]));
    expect(rendered.text).toContain(reason);
    expect(rendered.text).toMatch(/your pledge of \$(30|25) was refunded in full/);

    const later = await sweeper.runMoneySweep(db, sdk, { appUrl: APP_URL, now: () => new Date(Date.now() + DAY) });
    expect(later.refunded).toBe(0);
    expect(refundFootprint(campaign.id).ledger.map((row) => row.amountMinor).sort((x, y) => x - y)).toEqual([-3_000, -2_500]);
    expect(await withdrawCampaignAction(campaign.id, { reason })).toMatchObject({ ok: false, status: 409 });

    // The lab's page shows the reason and the finished refunds, without the withdraw form; the public page the reason.
    const { renderToStaticMarkup } = await import("react-dom/server");
    const { default: LabCampaignPage } = await import("@/app/lab/campaigns/[id]/page");
    const lab = renderToStaticMarkup(await LabCampaignPage({ params: Promise.resolve({ id: campaign.id }) }));
    expect(lab).toContain(reason);
    expect(lab).toContain("2 refunded · 0 in progress · 0 need a look");
    expect(lab).not.toContain("Withdraw and refund");
    signedIn.viewer = null;
    const { default: CampaignPage } = await import("@/app/(public)/campaigns/[slug]/page");
    const publicPage = renderToStaticMarkup(await CampaignPage({ params: Promise.resolve({ slug: campaign.slug }), searchParams: Promise.resolve({}) }));
    expect(publicPage).toMatch(/data-testid="campaign-closed"[^>]*>.*The lab withdrew this campaign/s);
    expect(publicPage).toContain(`The lab&#x27;s reason: ${reason}`);
  });

  it("seeded demo payments the processor never took are recorded as refunded outside it, and the backers are still mailed", async () => {
    const seeded = db.select().from(campaigns).where(eq(campaigns.slug, "twin-inlet-ring-duct-vs-stock")).get()!;
    const seededPaid = db.select().from(pledges).where(and(eq(pledges.campaignId, seeded.id), eq(pledges.state, "paid"))).all();
    expect(seededPaid.length).toBeGreaterThan(0);
    expect(seededPaid.every((pledge) => pledge.paymentIntentId?.startsWith("pi_seed_"))).toBe(true);

    signedIn.viewer = host;
    const result = await withdrawCampaignAction(seeded.id, { reason: "Two of the ducts under test were recalled by their makers." });
    expect(result).toMatchObject({ ok: true, data: { refundsRequested: seededPaid.length, refunded: seededPaid.length, flagged: 0 } });
    const refundRows = db.select().from(ledgerEntries).where(inArray(ledgerEntries.pledgeId, seededPaid.map((p) => p.id))).all().filter((row) => row.kind === "pledge_refund");
    expect(refundRows).toHaveLength(seededPaid.length);
    expect(refundRows.every((row) => row.memo === OUTSIDE_PROCESSOR_MEMO)).toBe(true);
    expect(db.select().from(pledges).where(inArray(pledges.id, seededPaid.map((p) => p.id))).all().every((p) => p.state === "refunded" && p.refundId === null)).toBe(true);
    expect(db.select().from(outbox).where(inArray(outbox.dedupeKey, seededPaid.map((p) => `pledge-refund:${p.id}`))).all()).toHaveLength(seededPaid.length);

    // Mina (db/seed-data.ts: a forced pledge on this campaign) sees it refunded, with the date and why.
    const mina = account("member@harbor-street.example");
    signedIn.viewer = { ...mina, role: "member" };
    const { renderToStaticMarkup } = await import("react-dom/server");
    const { default: MyPledgesPage } = await import("@/app/(account)/account/pledges/page");
    const html = renderToStaticMarkup(await MyPledgesPage());
    const row = html.split('data-testid="own-pledge"').find((part) => part.includes(seeded.title)) ?? "";
    expect(row).toContain('data-state="refunded"');
    expect(row).toContain("Campaign withdrawn");
  });
});

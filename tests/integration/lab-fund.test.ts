import path from "node:path";
import { Worker } from "node:worker_threads";
import { and, eq, inArray, like, sql } from "drizzle-orm";
import { afterAll, describe, expect, it, vi } from "vitest";
import { seedDemo } from "@/db/seed";
import { getCampaignBySlug } from "@/db/queries/campaigns";
import { allocateLabFund, labFundBalance, labFundTotals, listLabFundHistory, returnLabFundAllocation } from "@/db/queries/lab-fund";
import { raisedMinor } from "@/db/queries/pledges";
import { campaigns, ledgerEntries, outbox, pledges, users } from "@/db/schema";
import { openDatabase } from "@/db/client";
import { RuleViolation } from "@/lib/rule-violation";
import { createTempDb } from "../helpers/temp-db";

/*
 * The lab fund: its balance from the ledger, allocations to open campaigns (counted toward the goal
 * like a payment, able to fund the campaign), the return of an allocation, and the guarantee that
 * concurrent allocations on separate connections never take the fund below zero.
 *
 * Check values and where they come from:
 * - USD has two decimals, so "12.345" is not a whole number of cents (ISO 4217 minor unit column);
 * - the seeded lab's income: one ledger row per paid membership month at the plan's price
 *   (db/seed-data.ts MEMBERSHIPS and PLANS, Spool 5.00, Reel 12.00, Workshop 30.00 USD), less the one
 *   seeded allocation of 40.00 USD — summed here independently from MEMBERSHIPS, not read back from the code.
 */

vi.mock("next/cache", () => ({ revalidatePath: () => {} }));
const signedIn = vi.hoisted(() => ({ viewer: null as null | { id: string; email: string; name: string | null; role: "supporter" | "host" | "admin" | "member" } }));
vi.mock("@/server/auth", () => ({ getViewer: async () => signedIn.viewer, auth: async () => (signedIn.viewer ? { user: signedIn.viewer } : null) }));

const temp = createTempDb();
const NOW = new Date(Date.UTC(2026, 10, 2, 12, 0, 0));
seedDemo(temp.db, { now: NOW });
const db = temp.db;
process.env.DATABASE_PATH = temp.file;
afterAll(() => temp.cleanup());

const host = db.select().from(users).where(eq(users.role, "host")).get()!;
let sequence = 0;
function openCampaign(goalMinor: number, options: { state?: "open" | "funded" | "lapsed"; deadlineDays?: number } = {}) {
  sequence++;
  const slug = `fund-test-${sequence}`;
  db.insert(campaigns)
    .values({
      slug,
      title: `Fund test ${sequence}`,
      summary: "A campaign for lab-fund tests.",
      goalMinor,
      currency: "USD",
      state: options.state ?? "open",
      deadline: new Date(NOW.getTime() + (options.deadlineDays ?? 14) * 86_400_000),
      openedAt: new Date(NOW.getTime() - 86_400_000),
    })
    .run();
  return db.select().from(campaigns).where(eq(campaigns.slug, slug)).get()!;
}

function allocate(campaignId: string, amount: string | number, requestId: string = crypto.randomUUID()) {
  return allocateLabFund(db, { campaignId, hostId: host.id, amount: typeof amount === "string" ? { text: amount } : { minor: amount }, requestId, appUrl: "http://proofbay.test" }, NOW);
}

function refusal(work: () => unknown): RuleViolation {
  try {
    work();
  } catch (error) {
    if (error instanceof RuleViolation) return error;
    throw error;
  }
  throw new Error("expected a refusal");
}

describe("the balance", () => {
  it("is membership income minus allocations plus returns, from the ledger", async () => {
    const { MEMBERSHIPS, PLANS } = await import("@/db/seed-data");
    const price = Object.fromEntries(PLANS.map((plan) => [plan.code, plan.monthlyMinor]));
    // Active ones paid `periods` months (the current one included); past-due and canceled ones `periods` months before it ended.
    const income = MEMBERSHIPS.reduce((sum, m) => sum + m.periods * price[m.plan]!, 0);
    expect(labFundTotals(db)).toEqual({ currency: "USD", incomeMinor: income, allocatedMinor: 4_000, returnedMinor: 0 });
    expect(labFundBalance(db)).toEqual({ currency: "USD", balanceMinor: income - 4_000 });
  });
});

describe("allocating", () => {
  it("refuses amounts that are not above zero, not whole minor units, or more than the fund holds, naming `amount` (422)", () => {
    const campaign = openCampaign(10_000_000);
    const { balanceMinor } = labFundBalance(db);
    const cases: [string | number, RegExp][] = [
      ["0", /more than zero/],
      ["-5", /more than zero/],
      ["12.345", /at most 2 decimals/],
      ["twelve", /a number/],
      ["", /required/],
      [(balanceMinor + 1) / 100 + "", /more than the lab fund holds/],
      [12.5, /whole number of minor units/],
      [-100, /more than zero/],
    ];
    for (const [amount, message] of cases) {
      const error = refusal(() => allocate(campaign.id, amount));
      expect(error).toMatchObject({ status: 422, code: "invalid_amount", field: "amount" });
      expect(error.message).toMatch(message);
    }
    expect(db.select().from(ledgerEntries).where(eq(ledgerEntries.campaignId, campaign.id)).all()).toEqual([]);
  });

  it("refuses a campaign that is not open, or past its deadline (409), and more than the campaign still needs (422)", () => {
    const funded = openCampaign(50_000, { state: "funded" });
    expect(refusal(() => allocate(funded.id, "10"))).toMatchObject({ status: 409, code: "campaign_not_open" });
    const late = openCampaign(50_000, { deadlineDays: -1 });
    expect(refusal(() => allocate(late.id, "10"))).toMatchObject({ status: 409, code: "campaign_not_open" });
    const small = openCampaign(1_500);
    expect(refusal(() => allocate(small.id, "15.01")).message).toMatch(/more than the campaign still needs \(\$15\)/);
  });

  it("counts toward the goal as lab-fund support, once per request id", () => {
    const campaign = openCampaign(50_000);
    const before = labFundBalance(db).balanceMinor;
    const requestId = crypto.randomUUID();
    const first = allocate(campaign.id, "25.50", requestId);
    const again = allocate(campaign.id, "25.50", requestId);
    expect(first).toMatchObject({ amountMinor: 2_550, currency: "USD", balanceAfterMinor: before - 2_550, funded: false, repeated: false });
    expect(again).toMatchObject({ ledgerId: first.ledgerId, repeated: true });
    expect(db.select().from(ledgerEntries).where(eq(ledgerEntries.campaignId, campaign.id)).all().map((row) => [row.kind, row.amountMinor])).toEqual([["fund_allocation", -2_550]]);
    expect(labFundBalance(db).balanceMinor).toBe(before - 2_550);
    // The campaign page's figures (db/queries/campaigns.ts) and the funding rule's (raisedMinor) both see it.
    expect(getCampaignBySlug(db, campaign.slug)).toMatchObject({ labFundMinor: 2_550, pledgedMinor: 0 });
    expect(raisedMinor(db, campaign.id)).toBe(2_550);
    expect(listLabFundHistory(db)[0]).toMatchObject({ kind: "fund_allocation", amountMinor: -2_550, campaignSlug: campaign.slug });
  });

  it("reaching the goal funds the campaign exactly once, as a payment would, and mails its backers", () => {
    const campaign = openCampaign(6_000);
    const backer = db.select().from(users).where(like(users.email, "%@backers.example")).get()!;
    db.insert(pledges).values({ campaignId: campaign.id, supporterId: backer.id, amountMinor: 2_000, currency: "USD", state: "paid", paidAt: NOW }).run();
    const result = allocate(campaign.id, "40");
    expect(result.funded).toBe(true);
    const after = db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!;
    expect(after).toMatchObject({ state: "funded", fundedAt: NOW });
    expect(db.select().from(outbox).where(like(outbox.dedupeKey, `campaign-funded:${campaign.id}:%`)).all().map((mail) => mail.toAddress)).toEqual([backer.email]);
    expect(refusal(() => allocate(campaign.id, "1"))).toMatchObject({ status: 409 });
  });
});

describe("returning an allocation", () => {
  it("writes one return row for what the campaign received, however often it is called", () => {
    const campaign = openCampaign(100_000);
    allocate(campaign.id, "30");
    allocate(campaign.id, "12.25");
    const before = labFundBalance(db).balanceMinor;
    db.update(campaigns).set({ state: "lapsed", closedAt: NOW }).where(eq(campaigns.id, campaign.id)).run();
    const returned = db.transaction((tx) => returnLabFundAllocation(tx, campaign.id, NOW), { behavior: "immediate" });
    const twice = db.transaction((tx) => returnLabFundAllocation(tx, campaign.id, NOW), { behavior: "immediate" });
    expect([returned, twice]).toEqual([4_225, 0]);
    expect(labFundBalance(db).balanceMinor).toBe(before + 4_225);
    expect(db.select().from(ledgerEntries).where(and(eq(ledgerEntries.campaignId, campaign.id), eq(ledgerEntries.kind, "fund_release"))).all().map((row) => [row.amountMinor, row.externalRef])).toEqual([
      [4_225, `fund-return:${campaign.id}`],
    ]);
    expect(getCampaignBySlug(db, campaign.slug)!.labFundMinor).toBe(0);
    // A campaign that never had lab-fund money returns nothing.
    expect(returnLabFundAllocation(db, openCampaign(5_000).id, NOW)).toBe(0);
  });
});

describe("concurrent allocations", () => {
  it("four hosts on four connections racing for the fund never take it below zero", async () => {
    // A goal far above the fund, so only the fund's balance limits the race.
    const campaign = openCampaign(90_000_000, { deadlineDays: 3650 });
    const start = labFundBalance(db).balanceMinor;
    const amountMinor = 700;
    const possible = Math.floor(start / amountMinor);
    const workers = 4;
    const attempts = Math.ceil((possible * 1.5) / workers) + 5;
    const gate = new SharedArrayBuffer(4);
    const script = path.resolve(__dirname, "../helpers/lab-fund-allocator.worker.ts");
    const runner = path.resolve(__dirname, "../helpers/run-ts-worker.mjs");
    const results = Array.from(
      { length: workers },
      () =>
        new Promise<{ allocated: number; refused: number; unexpected: string[] }>((resolve, reject) => {
          const worker = new Worker(runner, { workerData: { script, file: temp.file, campaignId: campaign.id, hostId: host.id, amountMinor, attempts, gate } });
          worker.once("message", resolve);
          worker.once("error", reject);
        }),
    );
    // Let every worker open its connection and wait at the gate, then open it for all at once.
    await new Promise((resolve) => setTimeout(resolve, 1_500));
    Atomics.store(new Int32Array(gate), 0, 1);
    Atomics.notify(new Int32Array(gate), 0);
    const outcome = await Promise.all(results);

    expect(outcome.flatMap((result) => result.unexpected)).toEqual([]);
    const allocated = outcome.reduce((sum, result) => sum + result.allocated, 0);
    expect(allocated).toBe(possible);
    expect(outcome.reduce((sum, result) => sum + result.refused, 0)).toBe(workers * attempts - possible);
    // Read back on a fresh connection: the balance is what is left, never negative.
    const reader = openDatabase(temp.file);
    const { balanceMinor } = labFundBalance(reader);
    reader.$client.close();
    expect(balanceMinor).toBe(start - possible * amountMinor);
    expect(balanceMinor).toBeGreaterThanOrEqual(0);
    expect(balanceMinor).toBeLessThan(amountMinor);
    const rows = db.select({ count: sql<number>`count(*)` }).from(ledgerEntries).where(and(eq(ledgerEntries.campaignId, campaign.id), inArray(ledgerEntries.kind, ["fund_allocation"]))).get();
    expect(Number(rows?.count)).toBe(possible);
  }, 60_000);
});

describe("POST /api/lab/fund/allocations", () => {
  type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
  async function post(body: unknown, role: "host" | "supporter" = "host") {
    const { POST } = (await import("@/app/api/lab/fund/allocations/route")) as unknown as { POST: Handler };
    signedIn.viewer = role === "host" ? { id: host.id, email: host.email!, name: host.name, role: "host" } : { id: "someone", email: "someone@backers.example", name: null, role: "supporter" };
    const response = await POST(new Request("http://proofbay.test/api/lab/fund/allocations", { method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json" } }), { params: Promise.resolve({}) });
    return { status: response.status, body: (await response.json()) as { error?: { code: string; fields?: Record<string, string> }; amountMinor?: number } };
  }

  it("allocates minor units for a host; 422 names amountMinor; 409 for a campaign that is not open; 403 for a supporter", async () => {
    // The race above may have emptied the fund: one more month of income, as a paid invoice would add.
    db.insert(ledgerEntries).values({ kind: "membership_payment", amountMinor: 3_000, currency: "USD", externalRef: "test:route-top-up", occurredAt: NOW }).run();
    const campaign = openCampaign(80_000, { deadlineDays: 3650 }); // the route runs on the real clock
    const ok = await post({ campaignId: campaign.id, amountMinor: 1_250, requestId: crypto.randomUUID() });
    expect(ok).toMatchObject({ status: 200, body: { amountMinor: 1_250, currency: "USD" } });
    const fractional = await post({ campaignId: campaign.id, amountMinor: 12.5, requestId: crypto.randomUUID() });
    expect(fractional.status).toBe(422);
    expect(fractional.body.error?.fields?.amountMinor).toMatch(/whole number of minor units/);
    const zero = await post({ campaignId: campaign.id, amountMinor: 0, requestId: crypto.randomUUID() });
    expect(zero.body.error?.fields?.amountMinor).toMatch(/more than zero/);
    const missing = await post({ campaignId: campaign.id, requestId: crypto.randomUUID() });
    expect(missing.status).toBe(422);
    expect(missing.body.error?.fields?.amountMinor).toBeTruthy();
    const closed = await post({ campaignId: openCampaign(5_000, { state: "lapsed" }).id, amountMinor: 100, requestId: crypto.randomUUID() });
    expect(closed).toMatchObject({ status: 409, body: { error: { code: "campaign_not_open" } } });
    expect((await post({ campaignId: campaign.id, amountMinor: 100, requestId: crypto.randomUUID() }, "supporter")).status).toBe(403);
    expect(getCampaignBySlug(db, campaign.slug)!.labFundMinor).toBe(1_250);
  });
});

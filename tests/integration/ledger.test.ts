import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { loadLedgerView } from "@/db/queries/ledger";
import { campaigns, labSettings, ledgerEntries, pledges, users } from "@/db/schema";
import { ledgerCsv } from "@/lib/ledger/csv";
import { estimatedFeeMinor, ledgerTotals, monthKey } from "@/lib/ledger/summary";
import type { Role } from "@/lib/roles";
import { ledgerFilterSchema } from "@/lib/validation/ledger";
import { createTempDb } from "../helpers/temp-db";

/*
 * The host ledger against a hand-worked example (worked below, row by row).
 *
 * Sources of the check values:
 * - card fee 2.9 % + 30¢ per charge: the processor's published US online card pricing (from memory;
 *   lib/estimate/cost.ts STANDARD_US_ONLINE_CARD_FEE), the percentage rounded up to the cent as the
 *   cost engine does (percentOfMinor);
 * - Pacific/Auckland is UTC+13 (NZDT) until 03:00 on the first Sunday of April, 5 April 2026, then
 *   UTC+12 (NZST): the New Zealand Time Act / DIA daylight-saving dates (from memory);
 * - CSV quoting (a field with a comma or quote is quoted; a quote is doubled) and CRLF line ends: RFC 4180;
 * - USD has two decimals: ISO 4217.
 */

type TestViewer = { id: string; email: string; name: string | null; role: Role };
const signedIn = vi.hoisted(() => ({ viewer: null as TestViewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => signedIn.viewer,
  auth: async () => (signedIn.viewer ? { user: signedIn.viewer } : null),
}));

const temp = createTempDb();
const db = temp.db;
process.env.DATABASE_PATH = temp.file;
afterAll(() => temp.cleanup());

type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
let GET: Handler;
beforeAll(async () => {
  ({ GET } = (await import("@/app/api/lab/ledger.csv/route")) as unknown as { GET: Handler });
});

db.insert(labSettings)
  .values({ id: 1, labName: "Ledger test lab", currency: "USD", timeZone: "Pacific/Auckland", labourRateMinorPerHour: 3_000, feeBasisPoints: 290, feeFixedMinor: 30, contingencyPercent: 10, reportPrepHours: 2 })
  .run();
const backer = db.insert(users).values({ email: "ledger-backer@example.test", name: "Ledger Backer" }).returning().get();
const at = (iso: string) => new Date(iso);
const campaignA = db.insert(campaigns).values({ slug: "ledger-a", title: "Campaign A", summary: "A", goalMinor: 50_000, currency: "USD", deadline: at("2026-05-01T00:00:00Z"), openedAt: at("2026-03-01T00:00:00Z") }).returning().get();
const campaignB = db.insert(campaigns).values({ slug: "ledger-b", title: "Campaign B, second", summary: "B", goalMinor: 50_000, currency: "USD", deadline: at("2026-05-01T00:00:00Z"), openedAt: at("2026-02-01T00:00:00Z") }).returning().get();
const pledge = (campaignId: string, amountMinor: number) =>
  db.insert(pledges).values({ campaignId, supporterId: backer.id, amountMinor, currency: "USD", state: "paid" }).returning().get().id;
const p1 = pledge(campaignA.id, 2_500);
const p2 = pledge(campaignA.id, 4_000);
const p6 = pledge(campaignB.id, 1_550);

// The hand-worked example. Lab time is Pacific/Auckland; fee = ⌈2.9 % × amount⌉ + 30¢ on charges only.
const rows = [
  // 1. 02:00Z + 13 h = 10 Mar 15:00 → March. Fee ⌈72.5⌉ + 30 = 103¢.
  { kind: "pledge_payment", amountMinor: 2_500, campaignId: campaignA.id, pledgeId: p1, externalRef: "r1", memo: "Checkout cs_1", occurredAt: at("2026-03-10T02:00:00Z") },
  // 2. 31 Mar 11:30Z + 13 h = 1 Apr 00:30 → April, though it is still March in UTC. Fee 116 + 30 = 146¢.
  { kind: "pledge_payment", amountMinor: 4_000, campaignId: campaignA.id, pledgeId: p2, externalRef: "r2", memo: 'Checkout cs_2, "late"', occurredAt: at("2026-03-31T11:30:00Z") },
  // 3. After the change to NZST: 20 Apr 00:00Z + 12 h = 20 Apr 12:00 → April. No fee back on a refund.
  { kind: "pledge_refund", amountMinor: -2_500, campaignId: campaignA.id, pledgeId: p1, externalRef: "r3", memo: "Refund re_1", occurredAt: at("2026-04-20T00:00:00Z") },
  // 4. 2 Apr 09:00Z + 13 h = 2 Apr 22:00 → April. Fee ⌈23.2⌉ + 30 = 54¢.
  { kind: "membership_payment", amountMinor: 800, campaignId: null, pledgeId: null, externalRef: "r4", memo: null, occurredAt: at("2026-04-02T09:00:00Z") },
  // 5. 28 Feb 12:00Z + 13 h = 1 Mar 01:00 → March. No fee on a lab-fund movement.
  { kind: "fund_allocation", amountMinor: -1_000, campaignId: campaignB.id, pledgeId: null, externalRef: "r5", memo: "Lab fund", occurredAt: at("2026-02-28T12:00:00Z") },
  // 6. 15 Mar 00:00Z + 13 h = 15 Mar 13:00 → March. Fee ⌈44.95⌉ + 30 = 75¢.
  { kind: "pledge_payment", amountMinor: 1_550, campaignId: campaignB.id, pledgeId: p6, externalRef: "r6", memo: null, occurredAt: at("2026-03-15T00:00:00Z") },
] as const;
for (const row of rows) db.insert(ledgerEntries).values({ ...row, currency: "USD" }).run();

const FEE = { basisPoints: 290, fixedMinor: 30 };
const TZ = "Pacific/Auckland";

describe("ledger totals", () => {
  it("fees, months and totals match the hand-worked example", () => {
    expect([2_500, 4_000, 1_550, 800].map((amountMinor) => estimatedFeeMinor({ kind: "pledge_payment", amountMinor }, FEE))).toEqual([103, 146, 75, 54]);
    expect(estimatedFeeMinor({ kind: "pledge_refund", amountMinor: -2_500 }, FEE)).toBe(0);
    expect(monthKey(at("2026-03-31T11:30:00Z"), TZ)).toBe("2026-04");
    expect(monthKey(at("2026-03-31T10:59:00Z"), TZ)).toBe("2026-03");

    const view = loadLedgerView(db, ledgerFilterSchema.parse({}));
    expect(view.rows.map((row) => row.externalRef)).toEqual(["r3", "r4", "r2", "r6", "r1", "r5"]);
    const totals = ledgerTotals(view.rows, view.timeZone, view.fee);
    const byCampaign = Object.fromEntries(
      totals.byCampaign.map((total) => [total.campaignTitle ?? "(none)", [total.inMinor, total.outMinor, total.netMinor, total.labFundMinor, total.estimatedFeesMinor, total.movements]]),
    );
    // Cash in / out / net, then lab-fund support (allocations are transfers inside the lab, kept apart).
    expect(byCampaign).toEqual({
      "Campaign A": [6_500, -2_500, 4_000, 0, 249, 3],
      "Campaign B, second": [1_550, 0, 1_550, 1_000, 75, 2],
      "(none)": [800, 0, 800, 0, 54, 1],
    });
    expect(totals.byMonth.map((total) => [total.month, total.inMinor, total.outMinor, total.netMinor, total.labFundMinor, total.estimatedFeesMinor])).toEqual([
      ["2026-04", 4_800, -2_500, 2_300, 0, 200],
      ["2026-03", 4_050, 0, 4_050, 1_000, 178],
    ]);
    expect(totals.overall).toEqual([{ currency: "USD", inMinor: 8_850, outMinor: -2_500, netMinor: 6_350, labFundMinor: 1_000, estimatedFeesMinor: 378, movements: 6 }]);
  });

  it("filters by kind, campaign and a month range in lab time", () => {
    const april = loadLedgerView(db, ledgerFilterSchema.parse({ from: "2026-04", to: "2026-04" }));
    expect(april.rows.map((row) => row.externalRef)).toEqual(["r3", "r4", "r2"]);
    const paymentsA = loadLedgerView(db, ledgerFilterSchema.parse({ kind: "pledge_payment", campaign: campaignA.id }));
    expect(paymentsA.rows.map((row) => row.externalRef)).toEqual(["r2", "r1"]);
    expect(ledgerFilterSchema.safeParse({ from: "2026-05", to: "2026-04" }).error?.issues[0]?.path).toEqual(["to"]);
    expect(ledgerFilterSchema.safeParse({ kind: "gift" }).error?.issues[0]?.path).toEqual(["kind"]);
  });
});

describe("ledger page", () => {
  it("lists every movement signed, in lab time, with totals, the fee estimate and the money caution", async () => {
    signedIn.viewer = { id: "host", email: "host@example.test", name: "Host", role: "host" };
    const { default: LedgerPage } = await import("@/app/lab/ledger/page");
    const { renderToStaticMarkup } = await import("react-dom/server");
    const html = renderToStaticMarkup(await LedgerPage({ searchParams: Promise.resolve({ from: "2026-04", to: "2026-04" }) }));
    expect(html.match(/data-testid="ledger-row"/g)).toHaveLength(3);
    expect(html).toContain("-$25.00");
    expect(html).toContain("+$40.00");
    expect(html).toContain("Apr 1, 2026, 12:30 AM GMT+13");
    expect(html).toContain('href="/api/lab/ledger.csv?from=2026-04&amp;to=2026-04"');
    expect(html).toMatch(/estimated\s+processor fees \$2\.00/);
    expect(html).toContain("ask a licensed adviser");
  });
});

describe("CSV export", () => {
  const host: TestViewer = { id: "host", email: "host@example.test", name: "Host", role: "host" };
  const get = (query: string) => GET(new Request(`http://localhost/api/lab/ledger.csv${query}`), { params: Promise.resolve({}) });

  it("has the columns and hand-worked values, RFC 4180 quoted, with the same filters as the page", async () => {
    signedIn.viewer = host;
    const response = await get("?from=2026-04&to=2026-04");
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toBe('attachment; filename="proofbay-ledger-2026-04-2026-04.csv"');
    const text = await response.text();
    expect(text.split("\r\n")).toEqual([
      "occurred_at_lab_time,occurred_at_utc,kind,amount,currency,estimated_processor_fee,campaign,campaign_id,pledge_id,membership_id,memo,reference",
      `2026-04-20 12:00,2026-04-20T00:00:00.000Z,pledge_refund,-25.00,USD,,Campaign A,${campaignA.id},${p1},,Refund re_1,r3`,
      "2026-04-02 22:00,2026-04-02T09:00:00.000Z,membership_payment,8.00,USD,0.54,,,,,,r4",
      `2026-04-01 00:30,2026-03-31T11:30:00.000Z,pledge_payment,40.00,USD,1.46,Campaign A,${campaignA.id},${p2},,"Checkout cs_2, ""late""",r2`,
      "",
    ]);
    // The same text as the library function gives for the page's rows.
    const view = loadLedgerView(db, ledgerFilterSchema.parse({ from: "2026-04", to: "2026-04" }));
    expect(text).toBe(ledgerCsv(view.rows, view.timeZone, view.fee));

    const onlyB = await (await get(`?campaign=${encodeURIComponent(rows[4].campaignId!)}`)).text();
    expect(onlyB.split("\r\n").slice(1, -1).map((line) => line.split(",")[3])).toEqual(["15.50", "-10.00"]);
  });

  it("answers 403 to a supporter, 401 to a visitor and 422 naming the field for a bad month", async () => {
    signedIn.viewer = { id: "s", email: "s@example.test", name: null, role: "supporter" };
    expect((await get("")).status).toBe(403);
    signedIn.viewer = { id: "m", email: "m@example.test", name: null, role: "member" };
    expect((await get("")).status).toBe(403);
    signedIn.viewer = null;
    expect((await get("")).status).toBe(401);
    signedIn.viewer = host;
    const bad = await get("?from=2026-13");
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields).toHaveProperty("from");
  });
});

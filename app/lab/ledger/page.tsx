import type { Metadata } from "next";
import Link from "next/link";
import { Download, Scale } from "lucide";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { listLedgerCampaigns, loadLedgerView } from "@/db/queries/ledger";
import { estimateCampaignPlan } from "@/db/queries/pricing";
import { cn } from "@/lib/cn";
import { formatDateTime } from "@/lib/format";
import { formatMoney, isCurrencyCode } from "@/lib/money";
import { LEDGER_KINDS, ledgerKindLabels, ledgerTotals, type LedgerTotal } from "@/lib/ledger/summary";
import { ledgerFilterSchema, type LedgerFilter } from "@/lib/validation/ledger";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Ledger · Lab" };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

/** The table shows the newest this many; totals and the CSV always cover every matching movement. */
const ROWS_SHOWN = 200;

const inputClass = "rounded-lg border border-line bg-surface px-3 py-2 text-sm aria-invalid:border-rose";

function money(minor: number, currency: string): string {
  return isCurrencyCode(currency) ? formatMoney(minor, currency) : `${minor} ${currency} minor units`;
}

function queryString(filter: LedgerFilter): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(filter)) if (value) params.set(key, value);
  const text = params.toString();
  return text ? `?${text}` : "";
}

/** The payment-fee line of the campaign's estimate: what its goal set aside for card fees. */
function goalFeeLine(campaignId: string | null): number | null {
  if (!campaignId) return null;
  try {
    return estimateCampaignPlan(getDb(), campaignId)?.cost.lines.find((line) => line.kind === "payment_fee")?.amountMinor ?? null;
  } catch {
    return null;
  }
}

export default async function LedgerPage({ searchParams }: Props) {
  await requirePageRole("host", "/lab/ledger");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([key, value]) => [key, Array.isArray(value) ? value[0] : value]));
  const parsed = ledgerFilterSchema.safeParse(raw);
  const filter: LedgerFilter = parsed.success ? parsed.data : { campaign: undefined };
  const problems = parsed.success ? {} : Object.fromEntries(parsed.error.issues.map((issue) => [String(issue.path[0]), issue.message]));
  const db = getDb();
  const { rows, timeZone, fee } = loadLedgerView(db, filter);
  const totals = ledgerTotals(rows, timeZone, fee);
  const campaignsWithMoney = listLedgerCampaigns(db);
  const shown = rows.slice(0, ROWS_SHOWN);
  const feeText = `${(fee.basisPoints / 100).toLocaleString("en-US")} % + ${money(fee.fixedMinor, totals.overall[0]?.currency ?? "USD")} per charge`;

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-bold">Ledger</h1>
          <p className="max-w-3xl text-muted">
            Every money movement, once: pledge payments and refunds, membership income, lab-fund allocations and returns. Money in
            is positive, money out negative; lab-fund rows are signed from the fund&apos;s side (an allocation leaves the fund), and
            the totals keep them apart from cash as &ldquo;Lab fund&rdquo; support. Times are in the lab&apos;s time zone ({timeZone}).
          </p>
        </div>
        <Button asChild variant="secondary">
          <a href={`/api/lab/ledger.csv${queryString(filter)}`} download>
            <Icon node={Download} className="h-4 w-4" /> Download CSV
          </a>
        </Button>
      </div>

      <form method="get" className="flex flex-wrap items-end gap-3" aria-label="Filter the ledger">
        <label className="flex flex-col gap-1 text-sm font-medium">
          Kind
          <select name="kind" defaultValue={filter.kind ?? ""} className={inputClass} aria-invalid={problems.kind ? true : undefined}>
            <option value="">Any kind</option>
            {LEDGER_KINDS.map((kind) => (
              <option key={kind} value={kind}>
                {ledgerKindLabels[kind]}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          Campaign
          <select name="campaign" defaultValue={filter.campaign ?? ""} className={inputClass}>
            <option value="">Any campaign</option>
            {campaignsWithMoney.map((campaign) => (
              <option key={campaign.id} value={campaign.id}>
                {campaign.title}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          From month
          <input type="month" name="from" defaultValue={filter.from ?? ""} className={inputClass} aria-invalid={problems.from ? true : undefined} />
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          To month
          <input type="month" name="to" defaultValue={filter.to ?? ""} className={inputClass} aria-invalid={problems.to ? true : undefined} />
        </label>
        <Button type="submit" size="sm">
          Apply
        </Button>
        <Link href="/lab/ledger" className="text-sm text-teal underline">
          Clear
        </Link>
      </form>
      {Object.keys(problems).length > 0 ? (
        <p role="alert" className="text-sm font-medium text-rose">
          {Object.entries(problems)
            .map(([field, message]) => `${field}: ${message}`)
            .join(" ")}{" "}
          Showing every movement instead.
        </p>
      ) : null}

      <section aria-labelledby="totals-heading" className="grid gap-4 2xl:grid-cols-2">
        <h2 id="totals-heading" className="sr-only">
          Totals
        </h2>
        <Card className="overflow-x-auto p-0">
          <TotalsTable
            caption="Per campaign"
            firstColumn="Campaign"
            rows={totals.byCampaign.map((total) => ({
              key: `${total.campaignId ?? "none"}-${total.currency}`,
              label: total.campaignTitle ?? "No campaign (membership income)",
              total,
              goalFee: goalFeeLine(total.campaignId),
            }))}
            showGoalFee
          />
        </Card>
        <Card className="overflow-x-auto p-0">
          <TotalsTable caption="Per month (lab time)" firstColumn="Month" rows={totals.byMonth.map((total) => ({ key: `${total.month}-${total.currency}`, label: total.month, total, goalFee: null }))} />
        </Card>
      </section>

      <Card className="flex flex-col gap-2 text-sm">
        <h2 className="flex items-center gap-2 font-semibold">
          <Icon node={Scale} className="h-4 w-4 text-teal" /> Fee allowance (an estimate)
        </h2>
        <p className="text-muted">
          The ledger records what backers and members paid, not what the card processor kept. The fee column is computed at the
          lab&apos;s rate ({feeText}, from the lab settings) on every charge; fees on refunded payments are usually not returned. Each
          campaign&apos;s goal already includes a payment-fee line from its estimate, shown beside its totals. The processor&apos;s own
          statements are the record.
        </p>
        {totals.overall.map((total) => (
          <p key={total.currency}>
            All shown movements, {total.currency}: cash in {money(total.inMinor, total.currency)}, out {money(total.outMinor, total.currency)}, net{" "}
            <strong>{money(total.netMinor, total.currency)}</strong>; lab fund to campaigns {money(total.labFundMinor, total.currency)}; estimated
            processor fees {money(total.estimatedFeesMinor, total.currency)}.
          </p>
        ))}
        <p className="rounded-md bg-ember-soft/60 p-2 text-xs">
          Money caution: this page is a working record, not accounts. For tax and accounting questions ask a licensed adviser; rules
          on pledges, refunds, receipts and fundraising differ by place.
        </p>
      </Card>

      {rows.length > shown.length ? (
        <p className="text-sm text-muted">
          Showing the newest {shown.length} of {rows.length} movements; the totals above and the CSV cover all of them. Narrow the
          filters to see older ones here.
        </p>
      ) : null}
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[56rem] text-sm">
          <caption className="sr-only">Ledger movements, newest first</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">When</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Kind</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Amount</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Campaign</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Pledge / membership</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Memo</th>
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={6} className="px-4 py-6 text-center text-muted">No movements match these filters.</td>
              </tr>
            ) : (
              shown.map((row) => (
                <tr key={row.id} data-testid="ledger-row" data-kind={row.kind} className="border-b border-line last:border-0">
                  <td className="px-4 py-2.5 whitespace-nowrap text-muted">{formatDateTime(row.occurredAt, timeZone)}</td>
                  <td className="px-4 py-2.5">{ledgerKindLabels[row.kind]}</td>
                  <td className={cn("px-4 py-2.5 text-right font-mono whitespace-nowrap", row.amountMinor < 0 ? "text-rose" : "text-moss")}>
                    {row.amountMinor > 0 ? "+" : ""}
                    {money(row.amountMinor, row.currency)}
                  </td>
                  <td className="px-4 py-2.5">
                    {row.campaignId ? (
                      <Link href={`/lab/campaigns/${row.campaignId}`} className="hover:text-teal hover:underline">
                        {row.campaignTitle}
                      </Link>
                    ) : (
                      <span className="text-muted">—</span>
                    )}
                  </td>
                  <td className="px-4 py-2.5 font-mono text-xs text-muted">
                    {row.pledgeId ? `pledge ${row.pledgeId.slice(0, 8)}` : row.membershipId ? `membership ${row.membershipId.slice(0, 8)}` : "—"}
                  </td>
                  <td className="px-4 py-2.5 text-xs text-muted">{row.memo ?? ""}</td>
                </tr>
              ))
            )}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

function TotalsTable({
  caption,
  firstColumn,
  rows,
  showGoalFee = false,
}: {
  caption: string;
  firstColumn: string;
  rows: { key: string; label: string; total: LedgerTotal; goalFee: number | null }[];
  showGoalFee?: boolean;
}) {
  return (
    <table className="w-full text-sm">
      <caption className="px-4 pt-3 text-left font-semibold">{caption}</caption>
      <thead className="border-b border-line text-left text-muted">
        <tr>
          <th scope="col" className="px-4 py-2 font-medium">{firstColumn}</th>
          <th scope="col" className="px-4 py-2 text-right font-medium">In</th>
          <th scope="col" className="px-4 py-2 text-right font-medium">Out</th>
          <th scope="col" className="px-4 py-2 text-right font-medium">Net</th>
          <th scope="col" className="px-4 py-2 text-right font-medium">Lab fund</th>
          <th scope="col" className="px-4 py-2 text-right font-medium">Est. fees</th>
          {showGoalFee ? <th scope="col" className="px-4 py-2 text-right font-medium">Fee line in goal</th> : null}
        </tr>
      </thead>
      <tbody>
        {rows.length === 0 ? (
          <tr>
            <td colSpan={showGoalFee ? 7 : 6} className="px-4 py-4 text-center text-muted">Nothing yet.</td>
          </tr>
        ) : (
          rows.map(({ key, label, total, goalFee }) => (
            <tr key={key} className="border-b border-line last:border-0">
              <td className="px-4 py-2">{label}</td>
              <td className="px-4 py-2 text-right font-mono">{money(total.inMinor, total.currency)}</td>
              <td className="px-4 py-2 text-right font-mono">{money(total.outMinor, total.currency)}</td>
              <td className="px-4 py-2 text-right font-mono font-semibold">{money(total.netMinor, total.currency)}</td>
              <td className="px-4 py-2 text-right font-mono">{total.labFundMinor === 0 ? "—" : money(total.labFundMinor, total.currency)}</td>
              <td className="px-4 py-2 text-right font-mono text-muted">{money(total.estimatedFeesMinor, total.currency)}</td>
              {showGoalFee ? <td className="px-4 py-2 text-right font-mono text-muted">{goalFee === null ? "—" : money(goalFee, total.currency)}</td> : null}
            </tr>
          ))
        )}
      </tbody>
    </table>
  );
}

import { randomUUID } from "node:crypto";
import type { Metadata } from "next";
import Link from "next/link";
import { LabFundAllocateForm } from "@/components/lab/lab-fund-allocate-form";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { labFundBalance, labFundTotals, listAllocatableCampaigns, listLabFundHistory } from "@/db/queries/lab-fund";
import { cn } from "@/lib/cn";
import { formatDateTime, formatMoney } from "@/lib/format";
import { labFundKindLabels, type LabFundKind } from "@/lib/lab-fund/allocation";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Lab fund · Lab" };
export const dynamic = "force-dynamic";

const tones: Record<LabFundKind, string> = {
  membership_payment: "bg-teal-soft text-teal-strong",
  fund_allocation: "bg-ember-soft text-ember",
  fund_release: "bg-indigo-soft text-indigo",
};

export default async function LabFundPage() {
  await requirePageRole("host", "/lab/fund");
  const db = getDb();
  const now = new Date();
  const { balanceMinor, currency } = labFundBalance(db);
  const totals = labFundTotals(db);
  const history = listLabFundHistory(db);
  const campaigns = listAllocatableCampaigns(db, now).filter((campaign) => campaign.remainingMinor > 0);
  const { timeZone } = getLabSettings(db);

  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Lab fund</h1>
      <p className="max-w-3xl text-muted">
        Filament Club income collects here. Allocating it to an open campaign counts toward that campaign&apos;s goal exactly like a
        pledge (and can fund it); if the campaign lapses or is withdrawn, the allocation comes back to the fund.
      </p>
      <div className="grid gap-4 md:grid-cols-[1fr_1.3fr]">
        <Card className="flex flex-col gap-3">
          <p className="text-sm text-muted">Balance</p>
          <p className="text-3xl font-bold" data-testid="lab-fund-balance">
            {formatMoney(balanceMinor, currency)}
          </p>
          <dl className="grid grid-cols-[1fr_auto] gap-1 text-sm">
            <dt className="text-muted">Membership income</dt>
            <dd className="text-right font-mono">{formatMoney(totals.incomeMinor, currency)}</dd>
            <dt className="text-muted">Allocated to campaigns</dt>
            <dd className="text-right font-mono">−{formatMoney(totals.allocatedMinor, currency)}</dd>
            <dt className="text-muted">Returned from campaigns</dt>
            <dd className="text-right font-mono">{formatMoney(totals.returnedMinor, currency)}</dd>
          </dl>
        </Card>
        <Card>
          <h2 className="mb-3 text-lg font-semibold">Allocate to a campaign</h2>
          <LabFundAllocateForm campaigns={campaigns} balanceMinor={balanceMinor} currency={currency} initialRequestId={randomUUID()} />
        </Card>
      </div>
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[40rem] text-sm">
          <caption className="sr-only">Lab-fund movements, newest first</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">When</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Movement</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Campaign</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Note</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Amount</th>
            </tr>
          </thead>
          <tbody>
            {history.length === 0 ? (
              <tr>
                <td colSpan={5} className="px-4 py-6 text-center text-muted">Nothing has moved yet.</td>
              </tr>
            ) : (
              history.map((row) => (
                <tr key={row.id} className="border-b border-line last:border-0" data-testid="lab-fund-row" data-kind={row.kind}>
                  <td className="whitespace-nowrap px-4 py-2.5 text-muted">{formatDateTime(row.occurredAt, timeZone)}</td>
                  <td className="px-4 py-2.5">
                    <span className={cn("whitespace-nowrap rounded-md px-2 py-0.5 text-xs font-semibold", tones[row.kind as LabFundKind])}>{labFundKindLabels[row.kind as LabFundKind]}</span>
                  </td>
                  <td className="px-4 py-2.5">
                    {row.campaignSlug ? (
                      <Link href={`/campaigns/${row.campaignSlug}`} className="hover:text-teal hover:underline">
                        {row.campaignTitle}
                      </Link>
                    ) : (
                      "—"
                    )}
                  </td>
                  <td className="px-4 py-2.5 text-xs text-muted">{row.memo ?? ""}</td>
                  <td className={cn("px-4 py-2.5 text-right font-mono", row.amountMinor < 0 && "text-ember")}>{formatMoney(row.amountMinor, row.currency)}</td>
                </tr>
              ))
            )}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listSupporterPledges } from "@/db/queries/pledges";
import { formatDate, formatMoney } from "@/lib/format";
import { cn } from "@/lib/cn";
import { pledgeStateLabels } from "@/lib/pledges/rules";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "My pledges" };

const stateStyles = {
  pending: "bg-slate-soft text-muted",
  paid: "bg-teal-soft text-teal-strong",
  refunded: "bg-ember-soft text-ember",
  failed: "bg-rose-soft text-rose",
} as const;

export default async function MyPledgesPage() {
  const viewer = await requirePageRole("supporter", "/account/pledges");
  const db = getDb();
  const rows = listSupporterPledges(db, viewer.id);
  const { timeZone } = getLabSettings(db);

  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-6">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <Link href="/account" className="text-teal underline">
          Your account
        </Link>{" "}
        / My pledges
      </nav>
      <h1 className="text-2xl font-bold">My pledges</h1>
      {rows.length === 0 ? (
        <Card>
          <p>You have not pledged to a campaign yet.</p>
          <p className="mt-1 text-sm text-muted">Open campaigns on the board take pledges until their deadline.</p>
        </Card>
      ) : (
        <Card className="overflow-x-auto p-0">
          <table className="w-full text-sm">
            <caption className="sr-only">Your pledges, newest first</caption>
            <thead className="border-b border-line text-left text-muted">
              <tr>
                <th scope="col" className="px-4 py-2 font-medium">Campaign</th>
                <th scope="col" className="px-4 py-2 text-right font-medium">Amount</th>
                <th scope="col" className="px-4 py-2 font-medium">State</th>
                <th scope="col" className="px-4 py-2 font-medium">Date</th>
                <th scope="col" className="px-4 py-2 font-medium">Refunded</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((row) => (
                <tr key={row.id} data-testid="own-pledge" data-state={row.state} className="border-b border-line last:border-0">
                  <td className="px-4 py-2">
                    <Link href={`/campaigns/${row.campaignSlug}`} className="hover:text-teal hover:underline">
                      {row.campaignTitle}
                    </Link>
                  </td>
                  <td className="px-4 py-2 text-right font-mono">{formatMoney(row.amountMinor, row.currency)}</td>
                  <td className="px-4 py-2">
                    <span className={cn("rounded-md px-2 py-0.5 text-xs font-medium", stateStyles[row.state])}>{pledgeStateLabels[row.state]}</span>
                  </td>
                  <td className="px-4 py-2 text-muted">{formatDate(row.paidAt ?? row.createdAt, timeZone)}</td>
                  <td className="px-4 py-2 text-muted" data-testid="own-pledge-refund">
                    {row.refundedAt ? formatDate(row.refundedAt, timeZone) : row.state === "paid" && (row.campaignState === "lapsed" || row.campaignState === "withdrawn") ? "Refund in progress" : "—"}
                    {row.refundedAt && (row.campaignState === "lapsed" || row.campaignState === "withdrawn") ? (
                      <span className="block text-xs">{row.campaignState === "lapsed" ? "Campaign lapsed" : "Campaign withdrawn"}</span>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      )}
      <p className="text-xs text-muted">
        Paid pledges are refunded in full if a campaign misses its goal or is withdrawn (goal-or-refund). Receipts and taxes
        follow local rules — defer to local law and licensed advice.
      </p>
    </div>
  );
}

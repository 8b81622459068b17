import type { Metadata } from "next";
import Link from "next/link";
import { CampaignStateBadge } from "@/components/campaign-state-badge";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings, listBoardCampaigns } from "@/db/queries/campaigns";
import { campaignPledgeCounts, refundProgress } from "@/db/queries/refunds";
import { campaignStateOrder } from "@/lib/campaign/states";
import { formatDate, formatMoney } from "@/lib/format";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Campaigns · Lab" };

export default async function LabCampaignsPage() {
  await requirePageRole("host", "/lab/campaigns");
  const db = getDb();
  const { timeZone } = getLabSettings(db);
  const rows = listBoardCampaigns(db).sort((a, b) => campaignStateOrder[a.state] - campaignStateOrder[b.state] || a.deadline.getTime() - b.deadline.getTime());
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Campaigns</h1>
      <p className="max-w-3xl text-muted">
        Every campaign with its money. Open and funded campaigns can be withdrawn from their page; lapsed and withdrawn ones show
        how their refunds are going. Deadlines are swept every 30 seconds: an open campaign short of its goal lapses and is refunded.
      </p>
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[48rem] text-sm">
          <caption className="sr-only">Campaigns</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">Campaign</th>
              <th scope="col" className="px-4 py-2.5 font-medium">State</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Raised</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Goal</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Deadline</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Refunds</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => {
              const closed = row.state === "lapsed" || row.state === "withdrawn";
              const counts = closed ? campaignPledgeCounts(db, row.id) : null;
              const attention = closed ? refundProgress(db, row.id).attention.length : 0;
              return (
                <tr key={row.id} className="border-b border-line last:border-0">
                  <td className="px-4 py-2.5">
                    <Link href={`/lab/campaigns/${row.id}`} className="font-medium hover:text-teal hover:underline">
                      {row.title}
                    </Link>
                  </td>
                  <td className="px-4 py-2.5"><CampaignStateBadge state={row.state} /></td>
                  <td className="px-4 py-2.5 text-right font-mono">{formatMoney(row.pledgedMinor + row.labFundMinor, row.currency)}</td>
                  <td className="px-4 py-2.5 text-right font-mono">{formatMoney(row.goalMinor, row.currency)}</td>
                  <td className="px-4 py-2.5 whitespace-nowrap text-muted">{formatDate(row.deadline, timeZone)}</td>
                  <td className="px-4 py-2.5 text-xs">
                    {counts
                      ? `${counts.refunded} refunded${counts.paid ? `, ${counts.paid} in progress` : ""}${attention ? `, ${attention} need a look` : ""}`
                      : "—"}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

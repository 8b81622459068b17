import type { Metadata } from "next";
import Link from "next/link";
import { CampaignStateBadge } from "@/components/campaign-state-badge";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listReportableCampaigns } from "@/db/queries/reports";
import { formatDate } from "@/lib/format";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Reports and lab notes · Lab" };

export default async function LabReportsPage() {
  await requirePageRole("host", "/lab/reports");
  const db = getDb();
  const { timeZone } = getLabSettings(db);
  const campaigns = listReportableCampaigns(db);

  return (
    <div className="flex flex-col gap-4">
      <div>
        <h1 className="text-2xl font-bold">Reports and lab notes</h1>
        <p className="text-sm text-muted">
          Funded campaigns: post lab notes to their backers while printing, then write and publish the report.
        </p>
      </div>
      {campaigns.length === 0 ? (
        <p className="text-muted">No funded campaigns yet.</p>
      ) : (
        <Card className="p-0">
          <table className="w-full text-sm">
            <caption className="sr-only">Campaigns with reports</caption>
            <thead className="border-b border-line text-left text-muted">
              <tr>
                <th scope="col" className="px-4 py-2 font-medium">Campaign</th>
                <th scope="col" className="px-4 py-2 font-medium">State</th>
                <th scope="col" className="px-4 py-2 font-medium">Report</th>
                <th scope="col" className="px-4 py-2 font-medium"><span className="sr-only">Open</span></th>
              </tr>
            </thead>
            <tbody>
              {campaigns.map((campaign) => (
                <tr key={campaign.id} className="border-b border-line last:border-0">
                  <td className="px-4 py-2 font-medium">{campaign.title}</td>
                  <td className="px-4 py-2"><CampaignStateBadge state={campaign.state} /></td>
                  <td className="px-4 py-2 text-muted">
                    {campaign.reportState === "published" && campaign.publishedAt
                      ? `Published ${formatDate(campaign.publishedAt, timeZone)}`
                      : campaign.reportState === "draft" && campaign.reportUpdatedAt
                        ? `Draft, saved ${formatDate(campaign.reportUpdatedAt, timeZone)}`
                        : "Not started"}
                  </td>
                  <td className="px-4 py-2 text-right">
                    {campaign.reportState === "published" ? (
                      <Link href={`/reports/${campaign.slug}`} className="text-teal hover:underline">View report</Link>
                    ) : (
                      <Link href={`/lab/reports/${campaign.id}`} prefetch={false} className="text-teal hover:underline">
                        Edit report and notes
                      </Link>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      )}
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CampaignStateBadge } from "@/components/campaign-state-badge";
import { WithdrawCampaignForm } from "@/components/lab/withdraw-campaign-form";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getCampaignBySlug, getLabSettings } from "@/db/queries/campaigns";
import { campaignPledgeCounts, findCampaignSlug, refundProgress } from "@/db/queries/refunds";
import { formatDateTime, formatMoney } from "@/lib/format";
import { isWithdrawable } from "@/lib/pledges/refunds";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Campaign · Lab" };

type Props = { params: Promise<{ id: string }> };

export default async function LabCampaignPage({ params }: Props) {
  const { id } = await params;
  await requirePageRole("host", `/lab/campaigns/${encodeURIComponent(id)}`);
  const db = getDb();
  const slug = findCampaignSlug(db, id);
  const found = slug ? getCampaignBySlug(db, slug) : undefined;
  if (!found) notFound();
  const { campaign } = found;
  const { timeZone } = getLabSettings(db);
  const counts = campaignPledgeCounts(db, campaign.id);
  const refunds = refundProgress(db, campaign.id);
  const closed = campaign.state === "lapsed" || campaign.state === "withdrawn";

  return (
    <div className="flex max-w-4xl flex-col gap-6">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <Link href="/lab/campaigns" className="text-teal underline">
          Campaigns
        </Link>{" "}
        / {campaign.title}
      </nav>
      <header className="flex flex-col gap-2">
        <div>
          <CampaignStateBadge state={campaign.state} />
        </div>
        <h1 className="text-2xl font-bold">{campaign.title}</h1>
        <p className="text-sm text-muted">
          <Link href={`/campaigns/${campaign.slug}`} className="text-teal underline">
            Public page
          </Link>{" "}
          · <Link href={`/lab/ledger?campaign=${campaign.id}`} className="text-teal underline">Ledger for this campaign</Link>
        </p>
      </header>

      <Card>
        <dl className="grid grid-cols-2 gap-4 text-sm sm:grid-cols-4">
          <Fact label="Raised" value={formatMoney(found.pledgedMinor + found.labFundMinor, campaign.currency)} />
          <Fact label="Goal" value={formatMoney(campaign.goalMinor, campaign.currency)} />
          <Fact label="Of which lab fund" value={formatMoney(found.labFundMinor, campaign.currency)} />
          <Fact label="Deadline" value={formatDateTime(campaign.deadline, timeZone)} />
          <Fact label="Paid pledges" value={String(counts.paid)} />
          <Fact label="Refunded" value={String(counts.refunded)} />
          <Fact label="Awaiting payment" value={String(counts.pending)} />
          <Fact label="Closed" value={campaign.closedAt ? formatDateTime(campaign.closedAt, timeZone) : "—"} />
        </dl>
      </Card>

      {campaign.state === "withdrawn" && campaign.withdrawReason ? (
        <Card className="text-sm">
          <h2 className="mb-1 font-semibold">Reason given to backers</h2>
          <p>{campaign.withdrawReason}</p>
        </Card>
      ) : null}

      {closed ? (
        <Card className="flex flex-col gap-2 text-sm" data-testid="refund-progress">
          <h2 className="font-semibold">Refunds</h2>
          <p>
            {counts.refunded} refunded · {refunds.requested} in progress · {refunds.attention.length} need a look. The sweeper works
            through refunds every 30 seconds and retries the card processor with the same request, so nobody is refunded twice.
          </p>
          {refunds.attention.length > 0 ? (
            <ul className="list-disc pl-5 text-rose">
              {refunds.attention.map((item) => (
                <li key={item.pledgeId}>
                  Pledge <span className="font-mono">{item.pledgeId.slice(0, 8)}</span>: {item.lastError ?? "refused by the processor"} — refund it
                  from the processor&apos;s dashboard; its refund event then records it here.
                </li>
              ))}
            </ul>
          ) : null}
        </Card>
      ) : null}

      {isWithdrawable(campaign.state) ? (
        <Card className="flex flex-col gap-3 border-rose/40">
          <h2 className="text-lg font-semibold">Withdraw this campaign</h2>
          <p className="text-sm text-muted">
            Withdraw when the lab cannot run this test after all. Possible while the campaign is open or funded, before anything is
            queued for printing.
          </p>
          <WithdrawCampaignForm campaignId={campaign.id} paidPledges={counts.paid} />
          <p className="text-xs text-muted">
            Refunds are money matters: refund, receipt and fundraising rules vary by place — defer to local law and licensed advice.
          </p>
        </Card>
      ) : null}
    </div>
  );
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-xs font-medium uppercase tracking-wide text-muted">{label}</dt>
      <dd className="mt-1 font-medium">{value}</dd>
    </div>
  );
}

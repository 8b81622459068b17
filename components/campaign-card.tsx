import Link from "next/link";
import { CalendarClock, Users } from "lucide";
import { Icon } from "@/components/ui/icon";
import type { BoardCampaign } from "@/db/queries/campaigns";
import { fundingProgress, timeLeft } from "@/lib/campaign/progress";
import { formatDate, formatMoney } from "@/lib/format";
import { CampaignStateBadge } from "./campaign-state-badge";
import { Card } from "./ui/card";
import { ProgressBar } from "./ui/progress-bar";

export function CampaignCard({ campaign, now, timeZone }: { campaign: BoardCampaign; now: Date; timeZone: string }) {
  const progress = fundingProgress(campaign.pledgedMinor + campaign.labFundMinor, campaign.goalMinor);
  const isOpen = campaign.state === "open";
  return (
    <Card className="flex w-full flex-col gap-3 transition-shadow hover:shadow-md">
      <div className="flex items-center justify-between gap-2">
        <CampaignStateBadge state={campaign.state} />
        <span className="font-mono text-xs text-muted">{progress.percent} %</span>
      </div>
      <h3 className="text-base font-semibold leading-snug">
        <Link href={`/campaigns/${campaign.slug}`} className="after:absolute after:inset-0 hover:text-teal focus-visible:outline-none">
          {campaign.title}
        </Link>
      </h3>
      <p className="line-clamp-2 text-sm text-muted">{campaign.summary}</p>
      <div className="mt-auto flex flex-col gap-2 pt-2">
        <ProgressBar percent={progress.percent} label={`${campaign.title}: ${progress.percent} % funded`} />
        <p className="text-sm">
          <strong className="font-semibold">{formatMoney(progress.raisedMinor, campaign.currency)}</strong>
          <span className="text-muted"> of {formatMoney(campaign.goalMinor, campaign.currency)}</span>
        </p>
        <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-xs text-muted">
          <span className="inline-flex items-center gap-1">
            <Icon node={Users} className="h-3.5 w-3.5" /> {campaign.backerCount} backers
          </span>
          <span className="inline-flex items-center gap-1">
            <Icon node={CalendarClock} className="h-3.5 w-3.5" />
            {isOpen ? `${timeLeft(campaign.deadline, now)} · ` : "Deadline "}
            <time dateTime={campaign.deadline.toISOString()}>{formatDate(campaign.deadline, timeZone)}</time>
          </span>
        </div>
      </div>
    </Card>
  );
}

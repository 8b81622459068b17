import Link from "next/link";
import { Printer } from "lucide";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { ProgressBar } from "@/components/ui/progress-bar";
import { getDb } from "@/db";
import { campaignQueueProgress } from "@/db/queries/public-queue";
import { formatDate } from "@/lib/format";

const IN_THE_LAB = new Set(["funded", "queued", "printing", "reported"]);

/** A funded campaign's place in the print queue: prints done of total and the estimated results date. */
export function CampaignQueueProgress({ campaign, timeZone }: { campaign: { id: string; state: string; estimatedResultsAt: Date | null }; timeZone: string }) {
  if (!IN_THE_LAB.has(campaign.state)) return null;
  const { jobsDone, jobsTotal } = campaignQueueProgress(getDb(), campaign.id);
  const percent = jobsTotal > 0 ? Math.round((jobsDone / jobsTotal) * 100) : 0;
  return (
    <Card className="flex flex-col gap-2" data-testid="campaign-queue-progress">
      <h2 className="flex items-center gap-2 text-base font-semibold">
        <Icon node={Printer} className="h-4 w-4 text-teal" /> In the print queue
      </h2>
      <ProgressBar percent={percent} label={`${jobsDone} of ${jobsTotal} prints done`} />
      <p className="text-sm">
        {jobsDone} of {jobsTotal} prints done
      </p>
      {campaign.state === "reported" ? null : campaign.estimatedResultsAt ? (
        <p className="text-sm">
          Results expected{" "}
          <time dateTime={campaign.estimatedResultsAt.toISOString()} className="font-semibold">
            {formatDate(campaign.estimatedResultsAt, timeZone)}
          </time>{" "}
          <span className="text-xs text-muted">(an estimate; it moves with the queue)</span>
        </p>
      ) : (
        <p className="text-sm text-muted">Results date not set yet — waiting for a printer slot.</p>
      )}
      <Link href="/queue" className="text-xs text-teal underline">
        See the whole queue
      </Link>
    </Card>
  );
}

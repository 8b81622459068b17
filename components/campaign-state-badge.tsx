import type { CampaignState } from "@/db/schema";
import { cn } from "@/lib/cn";
import { campaignStateLabels } from "@/lib/campaign/states";

const tones: Record<CampaignState, string> = {
  open: "bg-teal-soft text-teal-strong",
  funded: "bg-moss-soft text-moss",
  lapsed: "bg-slate-soft text-muted",
  withdrawn: "bg-rose-soft text-rose",
  queued: "bg-indigo-soft text-indigo",
  printing: "bg-ember-soft text-ember",
  reported: "bg-plum-soft text-plum",
};

export function CampaignStateBadge({ state }: { state: CampaignState }) {
  return (
    <span className={cn("inline-flex items-center rounded-md px-2 py-0.5 text-xs font-semibold", tones[state])}>
      {campaignStateLabels[state]}
    </span>
  );
}

import type { ProposalState } from "@/db/schema";
import { cn } from "@/lib/cn";

const tones: Record<ProposalState, string> = {
  draft: "bg-slate-soft text-muted",
  submitted: "bg-indigo-soft text-indigo",
  accepted: "bg-moss-soft text-moss",
  declined: "bg-rose-soft text-rose",
  merged: "bg-plum-soft text-plum",
};

export function ProposalStateBadge({ state }: { state: ProposalState }) {
  return <span className={cn("inline-flex rounded-md px-2 py-0.5 text-xs font-semibold capitalize", tones[state])}>{state}</span>;
}

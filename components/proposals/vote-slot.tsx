import Link from "next/link";
import type { VoteStatus } from "@/db/queries/proposal-commands";
import type { ProposalState } from "@/db/schema";
import { formatVotes } from "./format";
import { VoteButton } from "./vote-button";

/** What the page knows about the person looking, for the vote controls. */
export type VoteViewer =
  | { kind: "visitor" }
  | { kind: "supporter" }
  | { kind: "member"; allowance: number; votesLeft: number; voted: ReadonlySet<string> };

/**
 * The vote count, and the vote island for members on submitted proposals. Everyone else sees
 * the count and why they cannot vote; only the island is client code.
 */
export function VoteSlot({
  proposal,
  viewer,
  returnTo,
}: {
  proposal: { id: string; title: string; state: ProposalState; voteCount: number };
  viewer: VoteViewer;
  returnTo: string;
}) {
  if (proposal.state === "submitted" && viewer.kind === "member") {
    const initial: VoteStatus = {
      proposalId: proposal.id,
      voteCount: proposal.voteCount,
      votedByMe: viewer.voted.has(proposal.id),
      allowance: viewer.allowance,
      votesLeft: viewer.votesLeft,
    };
    return <VoteButton initial={initial} title={proposal.title} />;
  }
  return (
    <div className="flex flex-col items-start gap-0.5">
      <span className="text-sm font-semibold" data-testid="vote-count">
        {formatVotes(proposal.voteCount)}
      </span>
      {proposal.state !== "submitted" ? (
        <span className="text-xs text-muted">Voting closed</span>
      ) : viewer.kind === "visitor" ? (
        <Link href={`/sign-in?callbackUrl=${encodeURIComponent(returnTo)}`} className="text-xs font-medium text-teal underline">
          Sign in to vote
        </Link>
      ) : (
        <span className="text-xs text-muted">Filament Club members vote</span>
      )}
    </div>
  );
}

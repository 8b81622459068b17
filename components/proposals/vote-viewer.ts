import type { Db } from "@/db/client";
import { voteAllowance } from "@/db/queries/proposal-commands";
import { votedProposalIds } from "@/db/queries/proposal-reads";
import { hasRole, type Role } from "@/lib/roles";
import type { VoteViewer } from "./vote-slot";

/** The vote controls' view of a viewer: members with an allowance get buttons, others an explanation. */
export function voteViewerFor(
  db: Db,
  viewer: { id: string; role: Role } | null,
  proposalIds: readonly string[],
  now = new Date(),
): VoteViewer {
  if (!viewer) return { kind: "visitor" };
  if (!hasRole(viewer.role, "member")) return { kind: "supporter" };
  const { allowance, votesLeft } = voteAllowance(db, viewer.id, now);
  if (allowance === 0) return { kind: "supporter" };
  return { kind: "member", allowance, votesLeft, voted: votedProposalIds(db, viewer.id, proposalIds) };
}

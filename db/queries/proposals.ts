import { desc, eq, sql } from "drizzle-orm";
import type { Db } from "../client";
import { proposals, proposalVotes, users, type ProposalState } from "../schema";

const voteCount = sql<number>`(select count(*) from ${proposalVotes} where ${proposalVotes.proposalId} = ${proposals.id})`;

/** Every proposal but drafts (which belong to their authors until submitted), newest first. */
export function listProposalsForTriage(db: Db, filter: { state?: ProposalState } = {}) {
  const query = db
    .select({
      id: proposals.id,
      slug: proposals.slug,
      title: proposals.title,
      kind: proposals.kind,
      printerType: proposals.printerType,
      state: proposals.state,
      createdAt: proposals.createdAt,
      submittedAt: proposals.submittedAt,
      proposerName: users.name,
      votes: voteCount,
    })
    .from(proposals)
    .innerJoin(users, eq(users.id, proposals.proposerId))
    .orderBy(desc(proposals.createdAt))
    .$dynamic();
  return filter.state
    ? query.where(eq(proposals.state, filter.state)).all()
    : query.where(sql`${proposals.state} <> 'draft'`).all();
}

export type TriageRow = ReturnType<typeof listProposalsForTriage>[number];

import { asc, desc, eq, sql } from "drizzle-orm";
import type { Db } from "../client";
import { campaigns, proposals, proposalVotes, uploads, users, type ProposalState } from "../schema";

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

/** Everything the host's decision page shows about one proposal; undefined when there is none (or a draft). */
export function getProposalForDecision(db: Db, id: string) {
  const row = db
    .select({ proposal: proposals, proposerName: users.name, proposerEmail: users.email })
    .from(proposals)
    .innerJoin(users, eq(users.id, proposals.proposerId))
    .where(eq(proposals.id, id))
    .get();
  if (!row || row.proposal.state === "draft") return undefined;
  const mergedInto = row.proposal.mergedIntoId
    ? db
        .select({ id: proposals.id, title: proposals.title, state: proposals.state })
        .from(proposals)
        .where(eq(proposals.id, row.proposal.mergedIntoId))
        .get()
    : undefined;
  const attachments = db
    .select({ id: uploads.id, kind: uploads.kind, originalName: uploads.originalName, sizeBytes: uploads.sizeBytes })
    .from(uploads)
    .where(eq(uploads.proposalId, id))
    .orderBy(asc(uploads.createdAt))
    .all();
  const campaign = db
    .select({ id: campaigns.id, slug: campaigns.slug, title: campaigns.title })
    .from(campaigns)
    .where(eq(campaigns.proposalId, id))
    .get();
  return { ...row, mergedInto, attachments, campaign };
}

export type ProposalForDecision = NonNullable<ReturnType<typeof getProposalForDecision>>;

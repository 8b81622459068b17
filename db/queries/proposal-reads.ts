import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import type { ModelMeasurement } from "../../lib/validation/model-analysis";
import type { Db } from "../client";
import { campaigns, proposals, proposalVotes, uploads, users, type ProposalState } from "../schema";

/*
 * Read queries for the public proposal pages and the proposer's own list. Explicit arguments
 * only: the caller passes the viewer's id where a query depends on who is looking.
 */

type ProposalKind = (typeof proposals.$inferSelect)["kind"];

export const boardSorts = ["votes", "newest"] as const;
export type BoardSort = (typeof boardSorts)[number];

/** States the public board shows: drafts belong to their proposers, declined ones leave the board. */
export const boardStates = ["submitted", "accepted", "merged"] as const satisfies readonly ProposalState[];

const survivor = alias(proposals, "survivor");

/** The newest campaign an accepted proposal became (a proposal may be relaunched as a second one). */
const campaignSlug = sql<string | null>`(select ${campaigns.slug} from ${campaigns} where ${campaigns.proposalId} = ${proposals.id} order by ${campaigns.openedAt} desc limit 1)`;

/**
 * The public board: submitted and accepted proposals, and merged ones pointing at their survivor.
 * "votes" sorts by demand (ties newest first), "newest" by when it reached the lab.
 */
export function listBoardProposals(db: Db, options: { sort: BoardSort; kind?: ProposalKind; limit?: number }) {
  const reachedLab = sql<number>`coalesce(${proposals.submittedAt}, ${proposals.createdAt})`;
  // Merged proposals carry no votes of their own any more; keep them after the live ones.
  const mergedLast = sql<number>`case when ${proposals.state} = 'merged' then 1 else 0 end`;
  const order =
    options.sort === "votes" ? [asc(mergedLast), desc(proposals.voteCount), desc(reachedLab)] : [asc(mergedLast), desc(reachedLab)];
  return db
    .select({
      id: proposals.id,
      slug: proposals.slug,
      title: proposals.title,
      kind: proposals.kind,
      printerType: proposals.printerType,
      state: proposals.state,
      voteCount: proposals.voteCount,
      submittedAt: proposals.submittedAt,
      createdAt: proposals.createdAt,
      proposerName: users.name,
      mergedInto: { slug: survivor.slug, title: survivor.title },
      campaignSlug,
    })
    .from(proposals)
    .innerJoin(users, eq(users.id, proposals.proposerId))
    .leftJoin(survivor, eq(survivor.id, proposals.mergedIntoId))
    .where(and(inArray(proposals.state, [...boardStates]), options.kind ? eq(proposals.kind, options.kind) : undefined))
    .orderBy(...order)
    .limit(options.limit ?? 200)
    .all()
    .map(({ mergedInto, ...row }) => ({ ...row, mergedInto: mergedInto?.slug ? mergedInto : null }));
}

export type BoardProposal = ReturnType<typeof listBoardProposals>[number];

/** One proposal with its proposer's name, its survivor (when merged) and its campaign's slug (when accepted). */
export function getProposalBySlug(db: Db, slug: string) {
  const row = db
    .select({
      proposal: proposals,
      proposerName: users.name,
      mergedInto: { slug: survivor.slug, title: survivor.title },
      campaignSlug,
    })
    .from(proposals)
    .innerJoin(users, eq(users.id, proposals.proposerId))
    .leftJoin(survivor, eq(survivor.id, proposals.mergedIntoId))
    .where(eq(proposals.slug, slug))
    .get();
  if (!row) return undefined;
  return { ...row, mergedInto: row.mergedInto?.slug ? row.mergedInto : null };
}

export type ProposalDetail = NonNullable<ReturnType<typeof getProposalBySlug>>;

/** Everything one supporter proposed, in every state, most recently changed first. */
export function listProposalsByProposer(db: Db, proposerId: string) {
  return db
    .select({
      id: proposals.id,
      slug: proposals.slug,
      title: proposals.title,
      kind: proposals.kind,
      printerType: proposals.printerType,
      state: proposals.state,
      voteCount: proposals.voteCount,
      reviewStartedAt: proposals.reviewStartedAt,
      declineReason: proposals.declineReason,
      proposerId: proposals.proposerId,
      submittedAt: proposals.submittedAt,
      createdAt: proposals.createdAt,
      updatedAt: proposals.updatedAt,
      mergedInto: { slug: survivor.slug, title: survivor.title },
      campaignSlug,
    })
    .from(proposals)
    .leftJoin(survivor, eq(survivor.id, proposals.mergedIntoId))
    .where(eq(proposals.proposerId, proposerId))
    .orderBy(desc(proposals.updatedAt))
    .all()
    .map(({ mergedInto, ...row }) => ({ ...row, mergedInto: mergedInto?.slug ? mergedInto : null }));
}

export type OwnProposal = ReturnType<typeof listProposalsByProposer>[number];

/** Which of these proposals the user has voted for. */
export function votedProposalIds(db: Db, userId: string, proposalIds: readonly string[]): Set<string> {
  if (proposalIds.length === 0) return new Set();
  const rows = db
    .select({ proposalId: proposalVotes.proposalId })
    .from(proposalVotes)
    .where(and(eq(proposalVotes.userId, userId), inArray(proposalVotes.proposalId, [...proposalIds])))
    .all();
  return new Set(rows.map((row) => row.proposalId));
}

/** An upload as the proposal pages and the form show it (the shape `POST /api/uploads` answers with). */
export type ProposalUploadView = {
  id: string;
  kind: "model" | "photo";
  mimeType: string;
  sizeBytes: number;
  originalName: string;
  url: string;
  thumbnailUrl?: string;
  widthPx?: number;
  heightPx?: number;
  /** Models: the mesh measurement `POST /api/uploads` stored (without its timings), with the settings it used. */
  analysis?: ModelFiguresInput;
};

export type ModelFiguresInput = Omit<ModelMeasurement, "timingsMs"> & { settings?: { layerHeightMm?: number; material?: string } };

/** The files attached to a proposal, photos first, each with the URLs `GET /api/uploads/<id>` serves. */
export function listUploadsForProposal(db: Db, proposalId: string): ProposalUploadView[] {
  return db
    .select()
    .from(uploads)
    .where(eq(uploads.proposalId, proposalId))
    .orderBy(desc(uploads.kind), asc(uploads.createdAt))
    .all()
    .map((upload) => ({
      id: upload.id,
      kind: upload.kind,
      mimeType: upload.mimeType,
      sizeBytes: upload.sizeBytes,
      originalName: upload.originalName,
      url: `/api/uploads/${upload.id}`,
      ...(upload.thumbnailSha256 ? { thumbnailUrl: `/api/uploads/${upload.id}/thumbnail` } : {}),
      ...(upload.widthPx !== null ? { widthPx: upload.widthPx } : {}),
      ...(upload.heightPx !== null ? { heightPx: upload.heightPx } : {}),
      ...(upload.analysis ? { analysis: upload.analysis as unknown as ModelFiguresInput } : {}),
    }));
}

/** The facts the form's server actions need about a proposal before they change it. */
export function getProposalFacts(db: Db, id: string) {
  return db
    .select({ id: proposals.id, slug: proposals.slug, state: proposals.state, proposerId: proposals.proposerId, reviewStartedAt: proposals.reviewStartedAt })
    .from(proposals)
    .where(eq(proposals.id, id))
    .get();
}

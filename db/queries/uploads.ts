import { and, asc, eq, inArray, isNull, or } from "drizzle-orm";
import type { Db } from "../client";
import { proposals, uploads, type ProposalState, type Upload } from "../schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
/** The app's connection or a transaction on it, so a caller can attach uploads inside its own transaction. */
type Queryable = Db | Tx;

export type NewUploadRow = Omit<typeof uploads.$inferInsert, "id" | "createdAt">;

/**
 * Inserts an upload unless the owner already has one with the same content (unique on
 * owner + sha256); then the existing row comes back with `created: false`. Racing duplicates are
 * settled by the unique index, not by a read before the write.
 */
export function insertUpload(db: Queryable, values: NewUploadRow): { upload: Upload; created: boolean } {
  const inserted = db
    .insert(uploads)
    .values(values)
    .onConflictDoNothing({ target: [uploads.ownerId, uploads.sha256] })
    .returning()
    .get();
  if (inserted) return { upload: inserted, created: true };
  const existing = findOwnUploadByHash(db, values.ownerId, values.sha256);
  if (!existing) throw new Error("upload conflict without an existing row");
  return { upload: existing, created: false };
}

export function findUpload(db: Queryable, id: string): Upload | undefined {
  return db.select().from(uploads).where(eq(uploads.id, id)).get();
}

export function findOwnUploadByHash(db: Queryable, ownerId: string, sha256: string): Upload | undefined {
  return db
    .select()
    .from(uploads)
    .where(and(eq(uploads.ownerId, ownerId), eq(uploads.sha256, sha256)))
    .get();
}

/** Any owner's model row for this content: its analysis is the same for everybody. */
export function findModelAnalysisByHash(db: Queryable, sha256: string): Pick<Upload, "mimeType" | "analysis"> | undefined {
  return db
    .select({ mimeType: uploads.mimeType, analysis: uploads.analysis })
    .from(uploads)
    .where(and(eq(uploads.sha256, sha256), eq(uploads.kind, "model")))
    .limit(1)
    .get();
}

/** An upload with what decides who may read it: its proposal's state and proposer. */
export function findUploadForServing(
  db: Queryable,
  id: string,
): { upload: Upload; proposal: { state: ProposalState; proposerId: string } | null } | undefined {
  const row = db
    .select({ upload: uploads, proposalState: proposals.state, proposerId: proposals.proposerId })
    .from(uploads)
    .leftJoin(proposals, eq(proposals.id, uploads.proposalId))
    .where(eq(uploads.id, id))
    .get();
  if (!row) return undefined;
  const proposal = row.proposalState && row.proposerId ? { state: row.proposalState, proposerId: row.proposerId } : null;
  return { upload: row.upload, proposal };
}

/** What deciding whether someone may attach files to a proposal needs (lib/proposals/rules assertCanEdit). */
export function findProposalForUpload(db: Queryable, proposalId: string) {
  return db
    .select({ id: proposals.id, state: proposals.state, proposerId: proposals.proposerId, reviewStartedAt: proposals.reviewStartedAt })
    .from(proposals)
    .where(eq(proposals.id, proposalId))
    .get();
}

/** A proposal's uploads, oldest first. */
export function listProposalUploads(db: Queryable, proposalId: string): Upload[] {
  return db
    .select()
    .from(uploads)
    .where(eq(uploads.proposalId, proposalId))
    .orderBy(asc(uploads.createdAt), asc(uploads.id))
    .all();
}

/**
 * Attaches the owner's uploads to a proposal when a draft is saved: only uploads of this owner
 * that are unattached or already on this proposal; others' ids and uploads on another proposal are
 * left alone. Returns how many rows now point at the proposal. Checking that the proposal is the
 * owner's and still editable is the caller's job.
 */
export function attachUploads(db: Queryable, ownerId: string, proposalId: string, uploadIds: readonly string[]): number {
  if (uploadIds.length === 0) return 0;
  return db
    .update(uploads)
    .set({ proposalId })
    .where(
      and(
        inArray(uploads.id, [...new Set(uploadIds)]),
        eq(uploads.ownerId, ownerId),
        or(isNull(uploads.proposalId), eq(uploads.proposalId, proposalId)),
      ),
    )
    .run().changes;
}

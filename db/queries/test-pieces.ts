import { asc, desc, eq, isNotNull, sql } from "drizzle-orm";
import { campaignSlugBase, firstFreeSlug } from "@/lib/campaign/plan-pieces";
import { RuleViolation } from "@/lib/rule-violation";
import type { TestPieceInput } from "@/lib/validation/test-plan";
import type { Db } from "../client";
import { testPieces, testPlanPieces, uploads, type TestPiece } from "../schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
const immediate = { behavior: "immediate" } as const;

/** The library in its display order; inactive pieces last, and only when asked for. */
export function listTestPieces(db: Db, options: { includeInactive?: boolean } = {}): TestPiece[] {
  const rows = db.select().from(testPieces).orderBy(desc(testPieces.active), asc(testPieces.position), asc(testPieces.name)).all();
  return options.includeInactive ? rows : rows.filter((piece) => piece.active);
}

/** How many test plans use each library piece. */
export function libraryPieceUsage(db: Db): Map<string, number> {
  const rows = db
    .select({ id: testPlanPieces.libraryPieceId, plans: sql<number>`count(distinct ${testPlanPieces.testPlanId})` })
    .from(testPlanPieces)
    .where(isNotNull(testPlanPieces.libraryPieceId))
    .groupBy(testPlanPieces.libraryPieceId)
    .all();
  return new Map(rows.flatMap((row) => (row.id ? [[row.id, row.plans] as const] : [])));
}

function loadPiece(tx: Tx, id: string): TestPiece {
  const piece = tx.select().from(testPieces).where(eq(testPieces.id, id)).get();
  if (!piece) throw new RuleViolation(404, "not_found", "No such piece in the library.");
  return piece;
}

/** A mesh id must name a model file someone uploaded; photos and unknown ids are refused. */
function checkMesh(tx: Tx, meshUploadId: string | undefined): string | null {
  if (!meshUploadId) return null;
  const upload = tx.select({ kind: uploads.kind }).from(uploads).where(eq(uploads.id, meshUploadId)).get();
  if (!upload) throw new RuleViolation(422, "unknown_upload", "No upload has this id.", "meshUploadId");
  if (upload.kind !== "model") throw new RuleViolation(422, "not_a_model", "That upload is a photo, not a model file.", "meshUploadId");
  return meshUploadId;
}

export function createTestPiece(db: Db, input: TestPieceInput, now = new Date()): TestPiece {
  return db.transaction((tx) => {
    const slug = firstFreeSlug(campaignSlugBase(input.name), (candidate) =>
      Boolean(tx.select({ id: testPieces.id }).from(testPieces).where(eq(testPieces.slug, candidate)).get()),
    );
    const last = tx.select({ position: testPieces.position }).from(testPieces).orderBy(desc(testPieces.position)).limit(1).get();
    const id = crypto.randomUUID();
    tx.insert(testPieces)
      .values({
        id,
        slug,
        name: input.name,
        description: input.description,
        filamentGrams: input.filamentGrams,
        meshUploadId: checkMesh(tx, input.meshUploadId),
        active: true,
        position: (last?.position ?? 0) + 1,
        createdAt: now,
      })
      .run();
    return loadPiece(tx, id);
  }, immediate);
}

/** Edits a piece; plans already published keep the name and grams they were priced with. */
export function updateTestPiece(db: Db, id: string, input: TestPieceInput): TestPiece {
  return db.transaction((tx) => {
    loadPiece(tx, id);
    tx.update(testPieces)
      .set({ name: input.name, description: input.description, filamentGrams: input.filamentGrams, meshUploadId: checkMesh(tx, input.meshUploadId) })
      .where(eq(testPieces.id, id))
      .run();
    return loadPiece(tx, id);
  }, immediate);
}

/** Deactivated pieces leave the plan editor's picker; published plans that use them are unchanged. */
export function setTestPieceActive(db: Db, id: string, active: boolean): TestPiece {
  return db.transaction((tx) => {
    loadPiece(tx, id);
    tx.update(testPieces).set({ active }).where(eq(testPieces.id, id)).run();
    return loadPiece(tx, id);
  }, immediate);
}

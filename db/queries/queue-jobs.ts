import { createHash } from "node:crypto";
import { and, asc, eq, inArray, notExists } from "drizzle-orm";
import { isMaterialId } from "../../lib/estimate/materials";
import { jobHoursOnPrinter } from "../../lib/queue/job-hours";
import type { Db } from "../client";
import { campaigns, jobs, printers, testPieces, testPlanPieces, testPlans, testPlanVariants, uploads } from "../schema";
import { printerProfile } from "./pricing";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Campaign states whose test plan is (or is about to be) on the lab's printers. */
export const QUEUED_CAMPAIGN_STATES = ["funded", "queued", "printing"] as const;

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places;

/**
 * A job's id follows from its identity (a name-based UUID), so materialising the same plan on two
 * databases — or twice — names the jobs the same.
 */
export function jobIdFor(campaignId: string, pieceId: string, variantId: string, repeat: number): string {
  const hex = createHash("sha1").update(`job:${campaignId}:${pieceId}:${variantId}:${repeat}`).digest("hex");
  const variantNibble = ((parseInt(hex.slice(16, 18), 16) & 0x3f) | 0x80).toString(16);
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-5${hex.slice(13, 16)}-${variantNibble}${hex.slice(18, 20)}-${hex.slice(20, 32)}`;
}

/** The bounding box stored with a measured mesh upload, when it has one. */
function meshSizeMm(analysis: Record<string, unknown> | null | undefined): [number, number, number] | null {
  const bounds = analysis?.bounds as { sizeMm?: unknown } | undefined;
  const size = bounds?.sizeMm;
  if (!Array.isArray(size) || size.length !== 3 || !size.every((v) => typeof v === "number" && Number.isFinite(v) && v >= 0)) return null;
  return size as [number, number, number];
}

/**
 * Writes the campaign's jobs — one per piece × variant × repeat — with the estimation engine's
 * hours on the plan's printer. Idempotent: the (campaign, piece, variant, repeat) unique index
 * skips jobs that exist, so calling it again (a catch-up pass, a retried webhook) adds nothing.
 * Returns how many jobs it inserted.
 */
export function materialiseJobs(tx: Tx | Db, campaignId: string): number {
  const plan = tx.select().from(testPlans).where(eq(testPlans.campaignId, campaignId)).get();
  if (!plan || !isMaterialId(plan.material)) return 0;
  const printer = plan.printerId ? tx.select().from(printers).where(eq(printers.id, plan.printerId)).get() : undefined;
  const pieces = tx
    .select({ id: testPlanPieces.id, filamentGrams: testPlanPieces.filamentGrams, analysis: uploads.analysis })
    .from(testPlanPieces)
    .leftJoin(testPieces, eq(testPieces.id, testPlanPieces.libraryPieceId))
    .leftJoin(uploads, eq(uploads.id, testPieces.meshUploadId))
    .where(eq(testPlanPieces.testPlanId, plan.id))
    .orderBy(asc(testPlanPieces.position))
    .all();
  const variants = tx
    .select({ id: testPlanVariants.id })
    .from(testPlanVariants)
    .where(eq(testPlanVariants.testPlanId, plan.id))
    .orderBy(asc(testPlanVariants.position))
    .all();
  if (pieces.length === 0 || variants.length === 0) return 0;

  const protocol = { material: plan.material, maxFlowMm3PerS: plan.maxFlowMm3PerS };
  const rows: (typeof jobs.$inferInsert)[] = [];
  for (let repeat = 1; repeat <= plan.repeats; repeat++) {
    for (const variant of variants) {
      for (const piece of pieces) {
        const size = meshSizeMm(piece.analysis);
        rows.push({
          id: jobIdFor(campaignId, piece.id, variant.id, repeat),
          campaignId,
          pieceId: piece.id,
          variantId: variant.id,
          repeat,
          state: "planned",
          // Without a plan printer the job still exists; the scheduler estimates per printer anyway.
          estimatedHours: printer ? round(jobHoursOnPrinter(piece.filamentGrams, protocol, printerProfile(printer)), 3) : 0,
          sizeXmm: size?.[0] ?? null,
          sizeYmm: size?.[1] ?? null,
          sizeZmm: size?.[2] ?? null,
        });
      }
    }
  }
  let inserted = 0;
  for (let i = 0; i < rows.length; i += 200) {
    inserted += tx
      .insert(jobs)
      .values(rows.slice(i, i + 200))
      .onConflictDoNothing({ target: [jobs.campaignId, jobs.pieceId, jobs.variantId, jobs.repeat] })
      .run().changes;
  }
  return inserted;
}

/** Catch-up: jobs for every funded campaign that has none yet (older data, a seed). */
export function materialiseMissingJobs(tx: Tx | Db): number {
  const missing = tx
    .select({ id: campaigns.id })
    .from(campaigns)
    .where(
      and(
        inArray(campaigns.state, [...QUEUED_CAMPAIGN_STATES]),
        notExists(tx.select({ id: jobs.id }).from(jobs).where(eq(jobs.campaignId, campaigns.id))),
      ),
    )
    .all();
  return missing.reduce((total, campaign) => total + materialiseJobs(tx, campaign.id), 0);
}

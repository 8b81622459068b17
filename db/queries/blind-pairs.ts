import { and, asc, eq, sql } from "drizzle-orm";
import { type Comparisons, type Outcome } from "../../lib/judging/bradley-terry";
import { candidatePairs, type BlindPair, type PairPhoto } from "../../lib/judging/pairs";
import { judgingAccess, type JudgingFacts } from "../../lib/judging/rules";
import { RuleViolation } from "../../lib/rule-violation";
import type { Db } from "../client";
import { blindPairVotes, campaigns, pledges, reportPhotos, reports, testPlanPieces, testPlans, testPlanVariants, uploads } from "../schema";
import { hasEarlyBlindPairAccess } from "./memberships";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
type Queryable = Db | Tx;

export type JudgingContext = {
  campaign: { id: string; slug: string; title: string; state: string };
  report: { id: string; state: "draft" | "published" } | null;
  photos: PairPhoto[];
  pairs: BlindPair[];
  pieceNames: Map<string, string>;
};

/** The campaign by slug with its report's photos and the blind pairs they make; undefined for no such campaign. */
export function findJudgingContext(db: Queryable, slug: string): JudgingContext | undefined {
  const campaign = db
    .select({ id: campaigns.id, slug: campaigns.slug, title: campaigns.title, state: campaigns.state })
    .from(campaigns)
    .where(eq(campaigns.slug, slug))
    .get();
  if (!campaign) return undefined;
  return judgingContextOf(db, campaign);
}

export function findJudgingContextById(db: Queryable, campaignId: string): JudgingContext | undefined {
  const campaign = db
    .select({ id: campaigns.id, slug: campaigns.slug, title: campaigns.title, state: campaigns.state })
    .from(campaigns)
    .where(eq(campaigns.id, campaignId))
    .get();
  return campaign ? judgingContextOf(db, campaign) : undefined;
}

function judgingContextOf(db: Queryable, campaign: JudgingContext["campaign"]): JudgingContext {
  const report = db.select({ id: reports.id, state: reports.state }).from(reports).where(eq(reports.campaignId, campaign.id)).get() ?? null;
  const photos = report
    ? db
        .select({ id: reportPhotos.id, pieceId: reportPhotos.pieceId, variantId: reportPhotos.variantId, lightSetKey: reportPhotos.lightSetKey })
        .from(reportPhotos)
        .innerJoin(uploads, eq(uploads.id, reportPhotos.uploadId))
        .where(and(eq(reportPhotos.reportId, report.id), eq(uploads.kind, "photo")))
        .all()
    : [];
  const pieces = db
    .select({ id: testPlanPieces.id, name: testPlanPieces.name })
    .from(testPlanPieces)
    .innerJoin(testPlans, eq(testPlans.id, testPlanPieces.testPlanId))
    .where(eq(testPlans.campaignId, campaign.id))
    .all();
  return { campaign, report, photos, pairs: candidatePairs(photos), pieceNames: new Map(pieces.map((p) => [p.id, p.name])) };
}

/** A backer: a paid pledge on the campaign (a refunded one no longer counts). */
export function isPaidBacker(db: Queryable, userId: string, campaignId: string): boolean {
  const row = db
    .select({ id: pledges.id })
    .from(pledges)
    .where(and(eq(pledges.campaignId, campaignId), eq(pledges.supporterId, userId), eq(pledges.state, "paid")))
    .limit(1)
    .get();
  return row !== undefined;
}

export function judgingFacts(db: Queryable, userId: string, context: JudgingContext, now: Date): JudgingFacts {
  return {
    campaignState: context.campaign.state,
    reportState: context.report?.state ?? null,
    pairCount: context.pairs.length,
    isBacker: isPaidBacker(db, userId, context.campaign.id),
    hasEarlyAccess: hasEarlyBlindPairAccess(db, userId, now),
  };
}

export function canJudge(db: Queryable, userId: string, context: JudgingContext, now: Date) {
  return judgingAccess(judgingFacts(db, userId, context, now));
}

/** Pair keys this person has judged on this campaign. */
export function judgedPairKeys(db: Queryable, userId: string, campaignId: string): Set<string> {
  const rows = db
    .select({ pairKey: blindPairVotes.pairKey })
    .from(blindPairVotes)
    .where(and(eq(blindPairVotes.userId, userId), eq(blindPairVotes.campaignId, campaignId)))
    .all();
  return new Set(rows.map((row) => row.pairKey));
}

export function votesPerPair(db: Queryable, campaignId: string): Map<string, number> {
  const rows = db
    .select({ pairKey: blindPairVotes.pairKey, votes: sql<number>`count(*)`.mapWith(Number) })
    .from(blindPairVotes)
    .where(eq(blindPairVotes.campaignId, campaignId))
    .groupBy(blindPairVotes.pairKey)
    .all();
  return new Map(rows.map((row) => [row.pairKey, row.votes]));
}

export type NewBlindPairVote = {
  userId: string;
  campaignId: string;
  ticketNonce: string;
  photoAId: string;
  photoBId: string;
  /** null: "can't tell". */
  winnerPhotoId: string | null;
  shownAt: Date;
};

/**
 * Records one vote in an IMMEDIATE transaction, so a double click or two tabs serialise: a spent
 * ticket is refused (409 ticket_used), the pair must still be one of the campaign's pairs (404,
 * e.g. a photo was removed meanwhile), and a second vote by the same person on the same pair is
 * refused (409 already_voted) — by the check here and, for any race past it, the unique index.
 */
export function recordBlindPairVote(db: Db, vote: NewBlindPairVote, now = new Date()): void {
  db.transaction(
    (tx) => {
      const spent = tx.select({ id: blindPairVotes.id }).from(blindPairVotes).where(eq(blindPairVotes.ticketNonce, vote.ticketNonce)).get();
      if (spent) throw new RuleViolation(409, "ticket_used", "This pair ticket was already used; judge the next pair.", "ticket");
      const context = findJudgingContextById(tx, vote.campaignId);
      const pair = context?.pairs.find((p) => p.photoAId === vote.photoAId && p.photoBId === vote.photoBId);
      if (!pair) throw new RuleViolation(404, "pair_gone", "This pair is no longer part of the report; judge the next pair.", "ticket");
      const again = tx
        .select({ id: blindPairVotes.id })
        .from(blindPairVotes)
        .where(and(eq(blindPairVotes.userId, vote.userId), eq(blindPairVotes.pairKey, pair.pairKey)))
        .get();
      if (again) throw new RuleViolation(409, "already_voted", "You already judged this pair.");
      try {
        tx.insert(blindPairVotes)
          .values({
            campaignId: vote.campaignId,
            pieceId: pair.pieceId,
            pairKey: pair.pairKey,
            photoAId: pair.photoAId,
            photoBId: pair.photoBId,
            winnerPhotoId: vote.winnerPhotoId,
            userId: vote.userId,
            ticketNonce: vote.ticketNonce,
            shownAt: vote.shownAt,
            createdAt: now,
          })
          .run();
      } catch (error) {
        if (error instanceof Error && /UNIQUE constraint failed/.test(error.message)) {
          throw new RuleViolation(409, "already_voted", "You already judged this pair.");
        }
        throw error;
      }
    },
    { behavior: "immediate" },
  );
}

/* ---------- Votes as Bradley–Terry input ---------- */

export type RankingInput = {
  variants: { id: string; name: string; isReference: boolean }[];
  comparisons: Comparisons;
  totalVotes: number;
  /** Newest vote's time (ms), 0 without votes: with the count, a key for caching the fit. */
  latestVoteAt: number;
};

/**
 * Every vote on the campaign as a comparison of the two photos' variants, as compact arrays for
 * lib/judging/bradley-terry.ts; variants in the test plan's order.
 */
export function rankingInput(db: Queryable, campaignId: string): RankingInput {
  const variants = db
    .select({ id: testPlanVariants.id, name: testPlanVariants.name, isReference: testPlanVariants.isReference })
    .from(testPlanVariants)
    .innerJoin(testPlans, eq(testPlans.id, testPlanVariants.testPlanId))
    .where(eq(testPlans.campaignId, campaignId))
    .orderBy(asc(testPlanVariants.position))
    .all();
  const index = new Map(variants.map((v, i) => [v.id, i]));
  const photoVariant = new Map(
    db
      .select({ id: reportPhotos.id, variantId: reportPhotos.variantId })
      .from(reportPhotos)
      .innerJoin(reports, eq(reports.id, reportPhotos.reportId))
      .where(eq(reports.campaignId, campaignId))
      .all()
      .map((row) => [row.id, row.variantId]),
  );
  const votes = db
    .select({ a: blindPairVotes.photoAId, b: blindPairVotes.photoBId, winner: blindPairVotes.winnerPhotoId, at: blindPairVotes.createdAt })
    .from(blindPairVotes)
    .where(eq(blindPairVotes.campaignId, campaignId))
    .all();
  const first: number[] = [];
  const second: number[] = [];
  const outcome: Outcome[] = [];
  let latestVoteAt = 0;
  for (const vote of votes) {
    latestVoteAt = Math.max(latestVoteAt, vote.at.getTime());
    const a = index.get(photoVariant.get(vote.a) ?? "");
    const b = index.get(photoVariant.get(vote.b) ?? "");
    if (a === undefined || b === undefined || a === b) continue;
    first.push(a);
    second.push(b);
    outcome.push(vote.winner === null ? 0 : vote.winner === vote.a ? 1 : -1);
  }
  return {
    variants,
    totalVotes: first.length,
    latestVoteAt,
    comparisons: { itemCount: variants.length, first: Int32Array.from(first), second: Int32Array.from(second), outcome: Int8Array.from(outcome) },
  };
}

/** The stored (already re-encoded, metadata-free) image behind a report photo, for the blind image route. */
export function findPhotoFile(db: Queryable, photoId: string) {
  return db
    .select({ sha256: uploads.sha256, mimeType: uploads.mimeType, kind: uploads.kind, reportId: reportPhotos.reportId })
    .from(reportPhotos)
    .innerJoin(uploads, eq(uploads.id, reportPhotos.uploadId))
    .where(eq(reportPhotos.id, photoId))
    .get();
}

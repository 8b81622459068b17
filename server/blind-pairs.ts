import "server-only";
import { randomBytes } from "node:crypto";
import type { Db } from "@/db/client";
import { canJudge, findJudgingContext, judgedPairKeys, recordBlindPairVote, votesPerPair, type JudgingContext } from "@/db/queries/blind-pairs";
import { env } from "@/lib/env";
import { chooseNextPair } from "@/lib/judging/pairs";
import { IMAGE_TOKEN_LIFETIME_MS, issuePairTicket, readPairTicket, sealImageToken, type TicketProblem } from "@/lib/judging/tickets";
import { RuleViolation } from "@/lib/rule-violation";
import type { BlindPairVoteInput } from "@/lib/validation/blind-pairs";
import { HttpError } from "./http-error";

/** The auth secret signs pair tickets and seals image tokens; without it nothing can be judged. */
export function judgingSecret(): string {
  if (!env.authSecret) throw new Error("AUTH_SECRET is not set: blind-pair tickets cannot be signed.");
  return env.authSecret;
}

export type ShownPair = {
  ticket: string;
  pieceName: string;
  left: { imageUrl: string };
  right: { imageUrl: string };
};

export type JudgingProgress = { judged: number; total: number };
export type NextPairResponse = { pair: ShownPair | null; progress: JudgingProgress };

/** The campaign and the viewer's right to judge it: 404, 409 no_pairs, 403 backers_only / early_access_only. */
export function requireJudging(db: Db, slug: string, userId: string, now: Date): JudgingContext {
  const context = findJudgingContext(db, slug);
  if (!context) throw new RuleViolation(404, "not_found", "No such campaign.");
  const access = canJudge(db, userId, context, now);
  if (!access.allowed) throw new RuleViolation(access.status, access.code, access.message);
  return context;
}

function randomUnit(): number {
  return randomBytes(4).readUInt32BE(0) / 0x1_0000_0000;
}

/**
 * The next pair for this judge with its single-use ticket and two opaque image URLs, the photos
 * on random sides; `pair: null` once they have judged every pair.
 */
export function showNextPair(db: Db, context: JudgingContext, userId: string, now: Date): NextPairResponse {
  const judged = judgedPairKeys(db, userId, context.campaign.id);
  // Only pairs still in the report count (a removed photo takes its pairs, and their votes, with it).
  const progress = { judged: context.pairs.filter((pair) => judged.has(pair.pairKey)).length, total: context.pairs.length };
  const next = chooseNextPair(context.pairs, judged, votesPerPair(db, context.campaign.id), randomUnit);
  if (!next) return { pair: null, progress };
  const secret = judgingSecret();
  const ticket = issuePairTicket(
    {
      userId,
      campaignId: context.campaign.id,
      photoAId: next.pair.photoAId,
      photoBId: next.pair.photoBId,
      leftPhotoId: next.leftPhotoId,
      shownAt: now.getTime(),
    },
    secret,
  );
  const imageUrl = (photoId: string) =>
    `/api/blind-pairs/images/${sealImageToken({ photoId, userId, expiresAt: now.getTime() + IMAGE_TOKEN_LIFETIME_MS }, secret)}`;
  return {
    pair: {
      ticket,
      pieceName: context.pieceNames.get(next.pair.pieceId) ?? "Test piece",
      left: { imageUrl: imageUrl(next.leftPhotoId) },
      right: { imageUrl: imageUrl(next.rightPhotoId) },
    },
    progress,
  };
}

const ticketRefusals: Record<TicketProblem, () => HttpError> = {
  forged: () => new HttpError(400, "invalid_ticket", "This pair ticket is not one we issued.", { ticket: "This pair ticket is not one we issued." }),
  expired: () => new HttpError(422, "ticket_expired", "This pair was shown too long ago; judge it again.", { ticket: "This pair was shown too long ago; judge it again." }),
  too_fast: () => new HttpError(429, "too_fast", "That was quicker than anyone can compare two photos. Look again, then vote.", {
    ticket: "Voted too soon after the pair was shown.",
  }),
  not_yours: () => new HttpError(403, "ticket_not_yours", "This pair ticket was issued to someone else.", { ticket: "This pair ticket was issued to someone else." }),
  other_campaign: () => new HttpError(422, "ticket_other_campaign", "This pair ticket belongs to another campaign.", {
    ticket: "This pair ticket belongs to another campaign.",
  }),
};

/**
 * Checks the ticket (signature, owner, campaign, age, speed), then records the vote once: 200
 * with the next pair; 400/403/422/429 for a bad ticket, 409 for a spent ticket or a second vote.
 */
export function castBlindPairVote(db: Db, context: JudgingContext, userId: string, input: BlindPairVoteInput, now: Date): NextPairResponse {
  const read = readPairTicket(input.ticket, judgingSecret(), { userId, campaignId: context.campaign.id, now: now.getTime() });
  if (!read.ok) throw ticketRefusals[read.problem]();
  const { ticket } = read;
  const rightPhotoId = ticket.leftPhotoId === ticket.photoAId ? ticket.photoBId : ticket.photoAId;
  const winnerPhotoId = input.choice === "tie" ? null : input.choice === "left" ? ticket.leftPhotoId : rightPhotoId;
  recordBlindPairVote(
    db,
    {
      userId,
      campaignId: context.campaign.id,
      ticketNonce: ticket.nonce,
      photoAId: ticket.photoAId,
      photoBId: ticket.photoBId,
      winnerPhotoId,
      shownAt: new Date(ticket.shownAt),
    },
    now,
  );
  return showNextPair(db, context, userId, now);
}

import { RuleViolation } from "../rule-violation";

/*
 * Who may judge a campaign's blind pairs:
 * - the campaign must have pairs: report photos of one piece from at least two variants;
 * - once the report is published (the campaign is reported): its backers — a paid pledge that was
 *   not refunded — and Filament Club members whose plan includes early blind pairs;
 * - before that, while the report is a draft that already has pairs: only those members (early).
 * Everyone else gets a 403 that says which of these they lack.
 */
export type JudgingFacts = {
  campaignState: string;
  reportState: "draft" | "published" | null;
  pairCount: number;
  isBacker: boolean;
  hasEarlyAccess: boolean;
};

export type JudgingAccess = "backer" | "early";

export function judgingAccess(facts: JudgingFacts): { allowed: true; as: JudgingAccess } | { allowed: false; status: 403 | 409; code: string; message: string } {
  if (facts.reportState === null || facts.pairCount === 0) {
    return { allowed: false, status: 409, code: "no_pairs", message: "This campaign has no photos to judge yet." };
  }
  const published = facts.reportState === "published" && facts.campaignState === "reported";
  if (published && facts.isBacker) return { allowed: true, as: "backer" };
  if (facts.hasEarlyAccess) return { allowed: true, as: "early" };
  if (published) {
    return { allowed: false, status: 403, code: "backers_only", message: "Blind pairs are judged by this campaign's backers (a paid pledge) and Filament Club members with early access." };
  }
  return {
    allowed: false,
    status: 403,
    code: "early_access_only",
    message: "Until the report is published, only Filament Club members with early blind pairs can judge.",
  };
}

export function assertMayJudge(facts: JudgingFacts): JudgingAccess {
  const access = judgingAccess(facts);
  if (!access.allowed) throw new RuleViolation(access.status, access.code, access.message);
  return access.as;
}

/* ---------- When the ranking is shown ---------- */

/** Fewer votes than this, or a variant in fewer comparisons, and the ranking says how many more are needed. */
export const MIN_RANKING_VOTES = 30;
export const MIN_COMPARISONS_PER_VARIANT = 5;

/**
 * Whether enough votes exist to show a ranking, and if not a lower bound on the votes still
 * needed: the shortfall in total votes, or half the variants' missing comparisons (one vote adds
 * a comparison to two variants), whichever is larger.
 */
export function rankingReadiness(totalVotes: number, comparisonsPerVariant: readonly number[]): { ready: boolean; votesNeeded: number } {
  const missingComparisons = comparisonsPerVariant.reduce((sum, n) => sum + Math.max(0, MIN_COMPARISONS_PER_VARIANT - n), 0);
  const votesNeeded = Math.max(MIN_RANKING_VOTES - totalVotes, Math.ceil(missingComparisons / 2), 0);
  return { ready: votesNeeded === 0 && comparisonsPerVariant.length >= 2, votesNeeded };
}

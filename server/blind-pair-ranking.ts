import "server-only";
import type { Db } from "@/db/client";
import { rankingInput } from "@/db/queries/blind-pairs";
import { rankVariants, seedFromId, type VariantRanking } from "@/lib/judging/ranking";

const MAX_CACHED = 64;
const cache = new Map<string, VariantRanking>();

/**
 * The report's blind-pair ranking, refitted only when the votes changed: the bootstrap costs
 * about a second per 50,000 votes, too much for every view of a public page. Keyed by campaign,
 * vote count and newest vote (votes are only ever added, or removed with their photo).
 */
export function campaignRanking(db: Db, campaignId: string): { ranking: VariantRanking; variantCount: number } {
  const input = rankingInput(db, campaignId);
  const key = `${campaignId}:${input.totalVotes}:${input.latestVoteAt}:${JSON.stringify(input.variants)}`;
  let ranking = cache.get(key);
  if (!ranking) {
    ranking = rankVariants(input.variants, input.comparisons, seedFromId(campaignId));
    if (cache.size >= MAX_CACHED) cache.delete(cache.keys().next().value as string);
    cache.set(key, ranking);
  }
  return { ranking, variantCount: input.variants.length };
}

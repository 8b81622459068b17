import { bootstrapBradleyTerry, type Comparisons } from "./bradley-terry";
import { rankingReadiness } from "./rules";

export const RANKING_BOOTSTRAP_REPLICATES = 1000;

export type RankedVariant = {
  id: string;
  name: string;
  isReference: boolean;
  /** Bradley–Terry strength, geometric mean of all variants = 1. */
  strength: number;
  /**
   * Chance, in %, that this variant's print is picked over a variant of average strength:
   * γ / (γ + 1) with the geometric mean at 1; with its bootstrap 95 % interval.
   */
  chancePercent: number;
  lowPercent: number;
  highPercent: number;
  comparisons: number;
};

export type VariantRanking =
  | { ready: false; totalVotes: number; votesNeeded: number }
  | { ready: true; totalVotes: number; replicates: number; variants: RankedVariant[] };

/** Comparisons each item took part in. */
export function comparisonsPerItem(data: Comparisons): number[] {
  const counts = new Array<number>(data.itemCount).fill(0);
  for (let k = 0; k < data.first.length; k++) {
    counts[data.first[k] as number]! += 1;
    counts[data.second[k] as number]! += 1;
  }
  return counts;
}

/** A stable seed from an id, so the same votes always give the same interval on the page. */
export function seedFromId(id: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < id.length; i++) {
    h ^= id.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** The ranking the report shows once enough votes exist (lib/judging/rules.ts), strongest first. */
export function rankVariants(
  variants: readonly { id: string; name: string; isReference: boolean }[],
  data: Comparisons,
  seed: number,
): VariantRanking {
  const totalVotes = data.first.length;
  const comparisons = comparisonsPerItem(data);
  const readiness = rankingReadiness(totalVotes, comparisons);
  if (!readiness.ready) return { ready: false, totalVotes, votesNeeded: readiness.votesNeeded };
  const result = bootstrapBradleyTerry(data, { replicates: RANKING_BOOTSTRAP_REPLICATES, seed });
  const chance = (strength: number) => (100 * strength) / (strength + 1);
  const ranked = variants.map((variant, i) => ({
    ...variant,
    strength: result.fit.strengths[i] as number,
    chancePercent: chance(result.fit.strengths[i] as number),
    lowPercent: chance(result.lower[i] as number),
    highPercent: chance(result.upper[i] as number),
    comparisons: comparisons[i] as number,
  }));
  ranked.sort((a, b) => b.strength - a.strength);
  return { ready: true, totalVotes, replicates: result.replicates, variants: ranked };
}

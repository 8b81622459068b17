/**
 * Blind-pairs budget (reports issue): a Bradley–Terry fit of 20 variants from 50,000 votes in
 * under 200 ms. Votes are seeded synthetic data from known strengths (about 10 % "can't tell");
 * the figure is the median of several fits, each from the raw compact arrays (tally + MM). The
 * bootstrap (1,000 resamples) is measured once and reported separately, without a budget.
 *   npx tsx bench/bradley-terry.ts
 */
import path from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { bootstrapBradleyTerry, fitBradleyTerry, type Comparisons } from "../lib/judging/bradley-terry";
import { mulberry32 } from "../lib/seeded-random";

const VARIANTS = 20;
const VOTES = 50_000;
const RUNS = 15;
export const BRADLEY_TERRY_BUDGET_MS = 200;

export type BradleyTerryFigures = {
  variants: number;
  votes: number;
  runs: number;
  fitMedianMs: number;
  fitMaxMs: number;
  iterations: number;
  converged: boolean;
  /** Spearman correlation of fitted and true strengths: the fit found the order that generated the votes. */
  rankCorrelation: number;
  bootstrapReplicates: number;
  bootstrapMs: number;
};

export function syntheticVotes(variants: number, votes: number, seed: number): { data: Comparisons; logTruth: number[] } {
  const rng = mulberry32(seed);
  const logTruth = Array.from({ length: variants }, () => (rng() - 0.5) * 3);
  const mean = logTruth.reduce((a, b) => a + b, 0) / variants;
  for (let i = 0; i < variants; i++) logTruth[i] = (logTruth[i] as number) - mean;
  const first = new Int32Array(votes);
  const second = new Int32Array(votes);
  const outcome = new Int8Array(votes);
  for (let k = 0; k < votes; k++) {
    const a = Math.floor(rng() * variants);
    let b = Math.floor(rng() * (variants - 1));
    if (b >= a) b++;
    first[k] = a;
    second[k] = b;
    const p = 1 / (1 + Math.exp((logTruth[b] as number) - (logTruth[a] as number)));
    outcome[k] = rng() < 0.1 ? 0 : rng() < p ? 1 : -1;
  }
  return { data: { itemCount: variants, first, second, outcome }, logTruth };
}

function spearman(a: number[], b: number[]): number {
  const ranks = (values: number[]) => {
    const order = [...values.keys()].sort((x, y) => (values[x] as number) - (values[y] as number));
    const rank = new Array<number>(values.length);
    order.forEach((index, r) => (rank[index] = r));
    return rank;
  };
  const ra = ranks(a);
  const rb = ranks(b);
  const n = a.length;
  const d2 = ra.reduce((sum, r, i) => sum + (r - (rb[i] as number)) ** 2, 0);
  return 1 - (6 * d2) / (n * (n * n - 1));
}

export function runBradleyTerryBench(): BradleyTerryFigures {
  const { data, logTruth } = syntheticVotes(VARIANTS, VOTES, 20_260_412);
  fitBradleyTerry(data); // warm-up: let the JIT compile the loops
  const samples: number[] = [];
  let last = fitBradleyTerry(data);
  for (let run = 0; run < RUNS; run++) {
    const start = performance.now();
    last = fitBradleyTerry(data);
    samples.push(performance.now() - start);
  }
  samples.sort((a, b) => a - b);
  const rankCorrelation = spearman(logTruth, [...last.logStrengths]);

  const bootstrapStart = performance.now();
  const boot = bootstrapBradleyTerry(data, { seed: 1 });
  const bootstrapMs = performance.now() - bootstrapStart;

  const round = (ms: number) => Math.round(ms * 100) / 100;
  return {
    variants: VARIANTS,
    votes: VOTES,
    runs: RUNS,
    fitMedianMs: round(samples[Math.floor(samples.length / 2)] as number),
    fitMaxMs: round(samples[samples.length - 1] as number),
    iterations: last.iterations,
    converged: last.converged,
    rankCorrelation: Math.round(rankCorrelation * 1e4) / 1e4,
    bootstrapReplicates: boot.replicates,
    bootstrapMs: Math.round(bootstrapMs),
  };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const figures = runBradleyTerryBench();
  console.table(figures);
  const pass = figures.fitMedianMs < BRADLEY_TERRY_BUDGET_MS && figures.converged && figures.rankCorrelation > 0.95;
  console.log(`Bradley–Terry fit, ${figures.variants} variants × ${figures.votes} votes: median ${figures.fitMedianMs} ms (budget < ${BRADLEY_TERRY_BUDGET_MS} ms) — ${pass ? "pass" : "MISSED"}`);
  if (!pass) process.exitCode = 1;
}

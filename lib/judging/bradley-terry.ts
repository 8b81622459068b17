import { mulberry32 } from "../seeded-random";

/*
 * Bradley–Terry ranking of variants from blind-pair votes.
 *
 * Model: P(i preferred to j) = γ_i / (γ_i + γ_j), strengths γ > 0.
 *
 * Fit: the MM algorithm of Hunter (2004), "MM algorithms for generalized Bradley–Terry models",
 * Annals of Statistics 32(1), 384–406, eq. (3):
 *     γ_i ← W_i / Σ_{j≠i} n_ij / (γ_i + γ_j)
 * where W_i is i's number of wins and n_ij the number of comparisons of i with j. Each step
 * cannot lower the likelihood, and it converges to the maximum-likelihood estimate whenever that
 * exists (Hunter's Assumption 1: the "beats" graph is strongly connected).
 *
 * Ties ("can't tell"): counted as half a win to each side. A tie between i and j adds 1 to n_ij
 * and ½ to both W_i and W_j, so the fit maximises Σ w_ij·log(γ_i / (γ_i + γ_j)) with fractional
 * w_ij. This is the same estimate as splitting every tie into one win each way on doubled data; it
 * pulls the two strengths toward each other and adds no tie parameter (unlike Rao–Kupper or
 * Davidson, whose tie parameter would only describe how often people cannot tell).
 *
 * Prior: with few votes a variant may have no wins (its MLE is 0) or the comparison graph may fall
 * apart, and the MLE does not exist. So every pair of items also gets `priorTies` virtual
 * "can't tell" votes (default 1): n_ij += a, W_i += a(K − 1)/2. The data then satisfy Hunter's
 * Assumption 1 whatever was voted, so the estimate exists and is unique, and it is shrunk a little
 * toward equal strengths (with 50 votes per pair, by about 2 %). The virtual votes are themselves
 * Bradley–Terry data, so the same MM step applies, and the fit stays free of scale (each step is
 * normalised to geometric mean 1). `priorTies: 0` gives the plain MLE and refuses data for which it
 * does not exist.
 *
 * Output strengths are normalised to geometric mean 1 (log strengths sum to 0).
 */

/** 1 = the first item was preferred, -1 = the second, 0 = "can't tell". */
export type Outcome = 1 | -1 | 0;

/** Votes as parallel compact arrays: vote k compares items first[k] and second[k] (0-based). */
export interface Comparisons {
  itemCount: number;
  first: Int32Array;
  second: Int32Array;
  outcome: Int8Array;
}

export interface FitOptions {
  /** Virtual "can't tell" votes added to every pair of items (default 1). */
  priorTies?: number;
  /** Stop when no log strength moves more than this in one step (default 1e-10). */
  tolerance?: number;
  /** Give up (converged: false) after this many MM steps (default 10,000). */
  maxIterations?: number;
  /** Starting strengths (default all 1); a bootstrap starts from the point estimate. */
  initial?: Float64Array;
}

export interface BradleyTerryFit {
  /** Strengths, geometric mean 1. */
  strengths: Float64Array;
  /** log strengths, summing to 0. */
  logStrengths: Float64Array;
  iterations: number;
  converged: boolean;
  /** Real (not virtual) comparisons each item took part in. */
  comparisons: Float64Array;
}

/** Wins (ties as ½) per item and the symmetric K×K matrix of comparison counts, row-major. */
export interface Tally {
  itemCount: number;
  wins: Float64Array;
  games: Float64Array;
}

export const DEFAULT_PRIOR_TIES = 1;
export const DEFAULT_TOLERANCE = 1e-10;
export const DEFAULT_MAX_ITERATIONS = 10_000;

export function checkComparisons(data: Comparisons): void {
  const { itemCount, first, second, outcome } = data;
  if (!Number.isInteger(itemCount) || itemCount < 2) throw new RangeError(`itemCount must be an integer ≥ 2, got ${itemCount}`);
  if (first.length !== second.length || first.length !== outcome.length) {
    throw new RangeError(`first, second and outcome must have the same length (${first.length}, ${second.length}, ${outcome.length})`);
  }
  for (let k = 0; k < first.length; k++) {
    const a = first[k] as number;
    const b = second[k] as number;
    const o = outcome[k] as number;
    if (a < 0 || a >= itemCount || b < 0 || b >= itemCount) throw new RangeError(`vote ${k}: item index out of range`);
    if (a === b) throw new RangeError(`vote ${k}: an item is compared with itself`);
    if (o !== 1 && o !== -1 && o !== 0) throw new RangeError(`vote ${k}: outcome must be 1, -1 or 0, got ${o}`);
  }
}

function emptyTally(itemCount: number): Tally {
  return { itemCount, wins: new Float64Array(itemCount), games: new Float64Array(itemCount * itemCount) };
}

function addVote(tally: Tally, a: number, b: number, o: number): void {
  const K = tally.itemCount;
  tally.games[a * K + b] = (tally.games[a * K + b] as number) + 1;
  tally.games[b * K + a] = (tally.games[b * K + a] as number) + 1;
  if (o === 1) tally.wins[a] = (tally.wins[a] as number) + 1;
  else if (o === -1) tally.wins[b] = (tally.wins[b] as number) + 1;
  else {
    tally.wins[a] = (tally.wins[a] as number) + 0.5;
    tally.wins[b] = (tally.wins[b] as number) + 0.5;
  }
}

/** One pass over the votes: the sufficient statistics of the fit. */
export function tallyComparisons(data: Comparisons): Tally {
  checkComparisons(data);
  const tally = emptyTally(data.itemCount);
  const { first, second, outcome } = data;
  for (let k = 0; k < first.length; k++) addVote(tally, first[k] as number, second[k] as number, outcome[k] as number);
  return tally;
}

/**
 * Hunter's Assumption 1: for every split of the items into two groups, some item of each group
 * was preferred to some item of the other (a tie counts both ways), i.e. the "preferred to" graph
 * is strongly connected. Exactly then the plain maximum-likelihood estimate exists.
 */
export function isStronglyConnected(data: Comparisons): boolean {
  checkComparisons(data);
  const K = data.itemCount;
  const beats = new Uint8Array(K * K);
  const { first, second, outcome } = data;
  for (let k = 0; k < first.length; k++) {
    const a = first[k] as number;
    const b = second[k] as number;
    const o = outcome[k] as number;
    if (o !== -1) beats[a * K + b] = 1;
    if (o !== 1) beats[b * K + a] = 1;
  }
  const reachesAll = (forward: boolean): boolean => {
    const seen = new Uint8Array(K);
    const stack = [0];
    seen[0] = 1;
    let count = 1;
    while (stack.length > 0) {
      const i = stack.pop() as number;
      for (let j = 0; j < K; j++) {
        if (!seen[j] && (forward ? beats[i * K + j] : beats[j * K + i])) {
          seen[j] = 1;
          count++;
          stack.push(j);
        }
      }
    }
    return count === K;
  };
  return reachesAll(true) && reachesAll(false);
}

/** Fits strengths from raw votes (see the module comment for the method). */
export function fitBradleyTerry(data: Comparisons, options: FitOptions = {}): BradleyTerryFit {
  const prior = options.priorTies ?? DEFAULT_PRIOR_TIES;
  if (prior === 0 && !isStronglyConnected(data)) {
    throw new RangeError(
      "The maximum-likelihood estimate does not exist: some variant never wins, never loses, or is not compared with the rest. Use priorTies > 0.",
    );
  }
  return fitTally(tallyComparisons(data), options);
}

/** The MM iteration on a tally (shared by the point fit and every bootstrap replicate). */
export function fitTally(tally: Tally, options: FitOptions = {}): BradleyTerryFit {
  const prior = options.priorTies ?? DEFAULT_PRIOR_TIES;
  const tolerance = options.tolerance ?? DEFAULT_TOLERANCE;
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  if (!(prior >= 0) || !Number.isFinite(prior)) throw new RangeError(`priorTies must be ≥ 0, got ${prior}`);
  if (!(tolerance > 0)) throw new RangeError(`tolerance must be > 0, got ${tolerance}`);
  const K = tally.itemCount;
  const { wins, games } = tally;

  // Each item's opponents as a compact list, so a step costs O(pairs compared), not O(K²).
  const offsets = new Int32Array(K + 1);
  for (let i = 0; i < K; i++) {
    let count = 0;
    for (let j = 0; j < K; j++) if (j !== i && (games[i * K + j] as number) + prior > 0) count++;
    offsets[i + 1] = (offsets[i] as number) + count;
  }
  const opponent = new Int32Array(offsets[K] as number);
  const count = new Float64Array(offsets[K] as number);
  const comparisons = new Float64Array(K);
  for (let i = 0, p = 0; i < K; i++) {
    for (let j = 0; j < K; j++) {
      const n = games[i * K + j] as number;
      if (j !== i && n + prior > 0) {
        opponent[p] = j;
        count[p] = n + prior;
        comparisons[i] = (comparisons[i] as number) + n;
        p++;
      }
    }
  }
  const numerator = new Float64Array(K);
  for (let i = 0; i < K; i++) numerator[i] = (wins[i] as number) + (prior * (K - 1)) / 2;

  let gamma = new Float64Array(K);
  if (options.initial) {
    if (options.initial.length !== K) throw new RangeError(`initial must have ${K} strengths`);
    for (let i = 0; i < K; i++) gamma[i] = options.initial[i] as number;
  } else gamma.fill(1);
  let next = new Float64Array(K);

  let iterations = 0;
  let converged = false;
  while (iterations < maxIterations) {
    iterations++;
    for (let i = 0; i < K; i++) {
      const gi = gamma[i] as number;
      let denominator = 0;
      for (let p = offsets[i] as number, end = offsets[i + 1] as number; p < end; p++) {
        denominator += (count[p] as number) / (gi + (gamma[opponent[p] as number] as number));
      }
      next[i] = denominator > 0 ? (numerator[i] as number) / denominator : gi;
    }
    // The likelihood ignores scale: pin it to geometric mean 1 at every step.
    normaliseInPlace(next);
    let largestStep = 0;
    for (let i = 0; i < K; i++) {
      const step = Math.abs(Math.log((next[i] as number) / (gamma[i] as number)));
      if (step > largestStep) largestStep = step;
    }
    [gamma, next] = [next, gamma];
    if (largestStep < tolerance) {
      converged = true;
      break;
    }
  }

  const logStrengths = new Float64Array(K);
  let meanLog = 0;
  for (let i = 0; i < K; i++) meanLog += Math.log(gamma[i] as number);
  meanLog /= K;
  for (let i = 0; i < K; i++) logStrengths[i] = Math.log(gamma[i] as number) - meanLog;
  const strengths = logStrengths.map(Math.exp);
  return { strengths, logStrengths, iterations, converged, comparisons };
}

function normaliseInPlace(values: Float64Array): void {
  let meanLog = 0;
  for (const v of values) meanLog += Math.log(v);
  const scale = Math.exp(meanLog / values.length);
  for (let i = 0; i < values.length; i++) values[i] = (values[i] as number) / scale;
}

/** P(i preferred to j) under the model. */
export function preferenceProbability(strengths: Float64Array, i: number, j: number): number {
  const a = strengths[i] as number;
  const b = strengths[j] as number;
  return a / (a + b);
}

/* ---------- Bootstrap intervals ---------- */

export const DEFAULT_BOOTSTRAP_REPLICATES = 1000;

export interface BootstrapOptions extends FitOptions {
  /** Resamples of the votes (default 1,000). */
  replicates?: number;
  seed?: number;
  /** Central coverage of the percentile interval (default 0.95: the 2.5th and 97.5th percentiles). */
  level?: number;
}

export interface BootstrapResult {
  fit: BradleyTerryFit;
  /** Percentile interval of each strength (same normalisation: geometric mean 1 in every replicate). */
  lower: Float64Array;
  upper: Float64Array;
  replicates: number;
  level: number;
}

/**
 * Nonparametric bootstrap: each replicate draws as many votes as there are, with replacement,
 * from the votes themselves (seeded), refits, and the interval is the percentile interval of the
 * replicates' log strengths (linear interpolation between order statistics, "type 7").
 */
export function bootstrapBradleyTerry(data: Comparisons, options: BootstrapOptions = {}): BootstrapResult {
  const replicates = options.replicates ?? DEFAULT_BOOTSTRAP_REPLICATES;
  const level = options.level ?? 0.95;
  if (!Number.isInteger(replicates) || replicates < 2) throw new RangeError(`replicates must be an integer ≥ 2, got ${replicates}`);
  if (!(level > 0 && level < 1)) throw new RangeError(`level must be in (0, 1), got ${level}`);
  const prior = options.priorTies ?? DEFAULT_PRIOR_TIES;
  if (prior <= 0) throw new RangeError("the bootstrap needs priorTies > 0: a resample may leave a variant without a win");

  const fit = fitBradleyTerry(data, options);
  const K = data.itemCount;
  const N = data.first.length;
  const rng = mulberry32(options.seed ?? 1);
  const samples = new Float64Array(replicates * K);
  const { first, second, outcome } = data;
  const tally = emptyTally(K);
  for (let r = 0; r < replicates; r++) {
    tally.wins.fill(0);
    tally.games.fill(0);
    for (let n = 0; n < N; n++) {
      const k = Math.floor(rng() * N);
      addVote(tally, first[k] as number, second[k] as number, outcome[k] as number);
    }
    const replicate = fitTally(tally, { ...options, initial: fit.strengths });
    for (let i = 0; i < K; i++) samples[i * replicates + r] = replicate.logStrengths[i] as number;
  }

  const lower = new Float64Array(K);
  const upper = new Float64Array(K);
  const tail = (1 - level) / 2;
  for (let i = 0; i < K; i++) {
    const column = samples.subarray(i * replicates, (i + 1) * replicates).sort();
    lower[i] = Math.exp(quantileSorted(column, tail));
    upper[i] = Math.exp(quantileSorted(column, 1 - tail));
  }
  return { fit, lower, upper, replicates, level };
}

/** Hyndman & Fan (1996) type 7: h = (n − 1)p, interpolate between the order statistics around h. */
export function quantileSorted(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  const a = sorted[lo] as number;
  const b = sorted[hi] as number;
  return a + (h - lo) * (b - a);
}

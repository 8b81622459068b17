import { describe, expect, it } from "vitest";
import {
  bootstrapBradleyTerry,
  fitBradleyTerry,
  isStronglyConnected,
  preferenceProbability,
  quantileSorted,
  type Comparisons,
  type Outcome,
} from "@/lib/judging/bradley-terry";
import { mulberry32 } from "@/lib/seeded-random";

/** Votes from a K×K table of wins: wins[i][j] = times i was preferred to j. */
function fromWinTable(wins: number[][], ties: number[][] = []): Comparisons {
  const first: number[] = [];
  const second: number[] = [];
  const outcome: Outcome[] = [];
  wins.forEach((row, i) =>
    row.forEach((count, j) => {
      for (let n = 0; n < count; n++) {
        first.push(i);
        second.push(j);
        outcome.push(1);
      }
    }),
  );
  ties.forEach((row, i) =>
    row.forEach((count, j) => {
      for (let n = 0; n < count; n++) {
        first.push(i);
        second.push(j);
        outcome.push(0);
      }
    }),
  );
  return { itemCount: wins.length, first: Int32Array.from(first), second: Int32Array.from(second), outcome: Int8Array.from(outcome) };
}

/** Seeded synthetic votes from known strengths; a share of near-even pairs come out "can't tell". */
function synthetic(strengths: number[], votes: number, seed: number, tieShare = 0.1): Comparisons {
  const rng = mulberry32(seed);
  const K = strengths.length;
  const first = new Int32Array(votes);
  const second = new Int32Array(votes);
  const outcome = new Int8Array(votes);
  for (let k = 0; k < votes; k++) {
    const a = Math.floor(rng() * K);
    let b = Math.floor(rng() * (K - 1));
    if (b >= a) b++;
    first[k] = a;
    second[k] = b;
    const sa = strengths[a] as number;
    const sb = strengths[b] as number;
    outcome[k] = rng() < tieShare ? 0 : rng() < sa / (sa + sb) ? 1 : -1;
  }
  return { itemCount: K, first, second, outcome };
}

/*
 * An independent fit: Newton–Raphson on the log-likelihood in log strengths θ, with the full
 * Hessian solved by Gaussian elimination. Same objective as the library's stated method (ties as
 * half a win each; `prior` virtual ties added to every pair):
 *   ∂ℓ/∂θ_i = W_i − Σ_j n_ij σ(θ_i − θ_j),  ∂²ℓ/∂θ_i∂θ_j = n_ij p_ij (1 − p_ij) (i ≠ j).
 */
function newtonFit(data: Comparisons, prior: number): number[] {
  const K = data.itemCount;
  const wins = new Array<number>(K).fill(0);
  const games = Array.from({ length: K }, () => new Array<number>(K).fill(0));
  for (let k = 0; k < data.first.length; k++) {
    const a = data.first[k] as number;
    const b = data.second[k] as number;
    const o = data.outcome[k] as number;
    (games[a] as number[])[b]! += 1;
    (games[b] as number[])[a]! += 1;
    if (o === 1) wins[a]! += 1;
    else if (o === -1) wins[b]! += 1;
    else {
      wins[a]! += 0.5;
      wins[b]! += 0.5;
    }
  }
  for (let i = 0; i < K; i++) {
    for (let j = 0; j < K; j++) if (i !== j) games[i]![j]! += prior;
    wins[i]! += (prior * (K - 1)) / 2;
  }
  const sigma = (x: number) => 1 / (1 + Math.exp(-x));
  // The likelihood ignores scale: hold θ_0 = 0 and solve for the rest.
  const free = [...Array(K).keys()].slice(1);
  const theta = new Array<number>(K).fill(0);
  for (let step = 0; step < 100; step++) {
    const gradient = new Array<number>(K).fill(0);
    const hessian = Array.from({ length: K }, () => new Array<number>(K).fill(0));
    for (let i = 0; i < K; i++) {
      gradient[i] = wins[i]!;
      for (let j = 0; j < K; j++) {
        const n = games[i]![j]!;
        if (i === j || n === 0) continue;
        const p = sigma(theta[i]! - theta[j]!);
        gradient[i]! -= n * p;
        hessian[i]![i]! -= n * p * (1 - p);
        hessian[i]![j]! += n * p * (1 - p);
      }
    }
    // Solve H·δ = −g on the free coordinates.
    const m = free.length;
    const A = free.map((i) => [...free.map((j) => hessian[i]![j]!), -gradient[i]!]);
    for (let c = 0; c < m; c++) {
      let pivot = c;
      for (let r = c + 1; r < m; r++) if (Math.abs(A[r]![c]!) > Math.abs(A[pivot]![c]!)) pivot = r;
      [A[c], A[pivot]] = [A[pivot]!, A[c]!];
      for (let r = 0; r < m; r++) {
        if (r === c) continue;
        const f = A[r]![c]! / A[c]![c]!;
        for (let k = c; k <= m; k++) A[r]![k]! -= f * A[c]![k]!;
      }
    }
    let largest = 0;
    free.forEach((i, r) => {
      const delta = A[r]![m]! / A[r]![r]!;
      theta[i]! += delta;
      largest = Math.max(largest, Math.abs(delta));
    });
    if (largest < 1e-13) break;
  }
  const mean = theta.reduce((a, b) => a + b, 0) / K;
  return theta.map((t) => t - mean);
}

describe("fitBradleyTerry: published worked examples", () => {
  it("reproduces the four-team example of Wikipedia's 'Bradley–Terry model' article", () => {
    // Source: en.wikipedia.org "Bradley–Terry model", section "Worked example of iterated procedure":
    // 4 teams, 22 games, wins in rows; the iteration converges to p = [0.640, 1.043, 0.660, 2.270]
    // (normalised to geometric mean 1). Table and result quoted from memory.
    const wins = [
      [0, 2, 0, 1],
      [3, 0, 5, 0],
      [0, 3, 0, 1],
      [4, 0, 3, 0],
    ];
    const fit = fitBradleyTerry(fromWinTable(wins), { priorTies: 0, tolerance: 1e-12 });
    expect(fit.converged).toBe(true);
    const published = [0.64, 1.043, 0.66, 2.27];
    published.forEach((p, i) => expect(fit.strengths[i]).toBeCloseTo(p, 3));
  });

  it("reproduces the journal-citation fit of Agresti (2002) / BradleyTerry2", () => {
    // Data: Agresti, "Categorical Data Analysis" (2nd ed., 2002), p. 448, from Stigler (1994): citations
    // among Biometrika, Comm Statist, JASA and JRSS-B; the cited journal "wins". Estimates: Turner & Firth,
    // "Bradley-Terry Models in R: The BradleyTerry2 Package", J. Stat. Software 48(9), 2012, §2.1 —
    // log-abilities relative to Biometrika: Comm Statist −2.9491, JASA −0.4796, JRSS-B 0.2690.
    // Counts and estimates quoted from memory; self-citations (the diagonal) carry no information.
    const cited = [
      [0, 730, 498, 221], // Biometrika cited by Comm Statist, JASA, JRSS-B
      [33, 0, 68, 17],
      [320, 813, 0, 142],
      [284, 276, 325, 0],
    ];
    const fit = fitBradleyTerry(fromWinTable(cited), { priorTies: 0, tolerance: 1e-12 });
    const relative = [...fit.logStrengths].map((l) => l - (fit.logStrengths[0] as number));
    expect(relative[1]).toBeCloseTo(-2.9491, 4);
    expect(relative[2]).toBeCloseTo(-0.4796, 4);
    expect(relative[3]).toBeCloseTo(0.269, 4);
  });
});

describe("fitBradleyTerry against an independent Newton–Raphson fit", () => {
  const truth = [0.5, 1, 1.4, 2.2, 0.8, 3.1];

  it("agrees to 1e-6 in log strength on the plain likelihood (no prior, with ties)", () => {
    const data = synthetic(truth, 3000, 11, 0.15);
    expect(isStronglyConnected(data)).toBe(true);
    const mm = fitBradleyTerry(data, { priorTies: 0, tolerance: 1e-13, maxIterations: 100_000 });
    const newton = newtonFit(data, 0);
    expect(mm.converged).toBe(true);
    newton.forEach((theta, i) => expect(Math.abs((mm.logStrengths[i] as number) - theta)).toBeLessThan(1e-6));
  });

  it("agrees to 1e-6 with the stated prior of one virtual tie per pair", () => {
    const data = synthetic(truth, 120, 5, 0.2);
    const mm = fitBradleyTerry(data, { priorTies: 1, tolerance: 1e-13, maxIterations: 100_000 });
    const newton = newtonFit(data, 1);
    newton.forEach((theta, i) => expect(Math.abs((mm.logStrengths[i] as number) - theta)).toBeLessThan(1e-6));
  });

  it("recovers known strengths from many seeded votes", () => {
    const data = synthetic(truth, 40_000, 99, 0);
    const fit = fitBradleyTerry(data);
    const meanLog = truth.reduce((a, s) => a + Math.log(s), 0) / truth.length;
    truth.forEach((s, i) => expect(Math.abs((fit.logStrengths[i] as number) - (Math.log(s) - meanLog))).toBeLessThan(0.06));
  });
});

describe("fitBradleyTerry: properties", () => {
  it("gives equal strengths for symmetric data", () => {
    // Every pair split 4–4: the score equations are solved by γ_i = 1 for all i.
    const wins = [
      [0, 4, 4, 4],
      [4, 0, 4, 4],
      [4, 4, 0, 4],
      [4, 4, 4, 0],
    ];
    const fit = fitBradleyTerry(fromWinTable(wins), { priorTies: 0 });
    fit.strengths.forEach((s) => expect(s).toBeCloseTo(1, 9));
  });

  it("orders a balanced round robin by wins", () => {
    // With the same number of comparisons for every pair, the MLE ranks by total wins
    // (Zermelo 1929; the score equation W_i = Σ_j n σ(θ_i − θ_j) is increasing in θ_i).
    const wins = [
      [0, 6, 7, 9, 8],
      [4, 0, 6, 7, 9],
      [3, 4, 0, 5, 6],
      [1, 3, 5, 0, 6],
      [2, 1, 4, 4, 0],
    ];
    const totals = wins.map((row) => row.reduce((a, b) => a + b, 0));
    const fit = fitBradleyTerry(fromWinTable(wins), { priorTies: 0 });
    const byStrength = [...fit.strengths.keys()].sort((a, b) => (fit.strengths[b] as number) - (fit.strengths[a] as number));
    const byWins = [...totals.keys()].sort((a, b) => (totals[b] as number) - (totals[a] as number));
    expect(byStrength).toEqual(byWins);
  });

  it("normalises to geometric mean 1", () => {
    const fit = fitBradleyTerry(synthetic([1, 2, 4, 8], 500, 3));
    const sumLog = fit.logStrengths.reduce((a, b) => a + b, 0);
    expect(Math.abs(sumLog)).toBeLessThan(1e-12);
    const product = fit.strengths.reduce((a, b) => a * b, 1);
    expect(product).toBeCloseTo(1, 10);
  });

  it("refuses the plain MLE when a variant never wins, and the prior keeps it finite", () => {
    const wins = [
      [0, 3, 2],
      [1, 0, 2],
      [0, 0, 0], // variant 2 never preferred: its MLE would be 0
    ];
    expect(() => fitBradleyTerry(fromWinTable(wins), { priorTies: 0 })).toThrow(/does not exist/);
    const fit = fitBradleyTerry(fromWinTable(wins));
    expect(fit.converged).toBe(true);
    expect(fit.strengths.every((s) => Number.isFinite(s) && s > 0)).toBe(true);
    expect(fit.strengths[2]).toBeLessThan(fit.strengths[1] as number);
    expect(fit.strengths[1]).toBeLessThan(fit.strengths[0] as number);
  });

  it("keeps an item compared with nobody finite and between the others under the prior", () => {
    const data = fromWinTable([
      [0, 5, 0],
      [2, 0, 0],
      [0, 0, 0],
    ]);
    expect(isStronglyConnected(data)).toBe(false);
    const fit = fitBradleyTerry(data);
    expect(fit.comparisons[2]).toBe(0);
    // Only virtual ties with both others: its score equation puts it between them.
    expect(fit.strengths[2]).toBeLessThan(fit.strengths[0] as number);
    expect(fit.strengths[2]).toBeGreaterThan(fit.strengths[1] as number);
  });

  it("refuses malformed votes", () => {
    const bad = { itemCount: 3, first: Int32Array.of(0), second: Int32Array.of(0), outcome: Int8Array.of(1) };
    expect(() => fitBradleyTerry(bad)).toThrow(/itself/);
    expect(() => fitBradleyTerry({ ...bad, second: Int32Array.of(7) })).toThrow(/out of range/);
    expect(() => fitBradleyTerry({ ...bad, second: Int32Array.of(1), outcome: Int8Array.of(2) })).toThrow(/outcome/);
  });
});

describe("ties: half a win to each side", () => {
  it("equals the fit of doubled data with every tie split into one win each way", () => {
    const wins = [
      [0, 3, 1],
      [2, 0, 4],
      [2, 1, 0],
    ];
    const ties = [
      [0, 2, 0],
      [0, 0, 0],
      [3, 1, 0],
    ];
    const withTies = fitBradleyTerry(fromWinTable(wins, ties), { priorTies: 0, tolerance: 1e-13 });
    const doubled = wins.map((row, i) => row.map((w, j) => 2 * w + (ties[i]?.[j] ?? 0) + (ties[j]?.[i] ?? 0)));
    const split = fitBradleyTerry(fromWinTable(doubled), { priorTies: 0, tolerance: 1e-13 });
    withTies.logStrengths.forEach((l, i) => expect(l).toBeCloseTo(split.logStrengths[i] as number, 9));
  });

  it("pulls two variants toward each other and leaves only-tied pairs equal", () => {
    const base = [
      [0, 6],
      [2, 0],
    ];
    const without = fitBradleyTerry(fromWinTable(base), { priorTies: 0 });
    const with10Ties = fitBradleyTerry(fromWinTable(base, [[0, 10], [0, 0]]), { priorTies: 0 });
    // Closed form for two items: γ_0/γ_1 = W_0/W_1 = 6/2 without ties, (6+5)/(2+5) with ten ties.
    expect((without.strengths[0] as number) / (without.strengths[1] as number)).toBeCloseTo(3, 9);
    expect((with10Ties.strengths[0] as number) / (with10Ties.strengths[1] as number)).toBeCloseTo(11 / 7, 9);
    const onlyTies = fitBradleyTerry(fromWinTable([[0, 0], [0, 0]], [[0, 5], [0, 0]]), { priorTies: 0 });
    expect(onlyTies.strengths[0]).toBeCloseTo(1, 12);
    expect(onlyTies.strengths[1]).toBeCloseTo(1, 12);
  });
});

describe("bootstrapBradleyTerry", () => {
  const data = synthetic([0.6, 1, 1.5, 2.5], 800, 21);

  it("gives percentile intervals that contain the point estimate", () => {
    const result = bootstrapBradleyTerry(data, { replicates: 300, seed: 7 });
    expect(result.replicates).toBe(300);
    result.fit.strengths.forEach((s, i) => {
      expect(result.lower[i]).toBeLessThan(s);
      expect(result.upper[i]).toBeGreaterThan(s);
    });
  });

  it("is reproducible from its seed and narrows with more votes", () => {
    const a = bootstrapBradleyTerry(data, { replicates: 200, seed: 3 });
    const b = bootstrapBradleyTerry(data, { replicates: 200, seed: 3 });
    expect([...a.lower]).toEqual([...b.lower]);
    expect([...a.upper]).toEqual([...b.upper]);
    const more = bootstrapBradleyTerry(synthetic([0.6, 1, 1.5, 2.5], 8000, 21), { replicates: 200, seed: 3 });
    const width = (r: typeof a, i: number) => Math.log((r.upper[i] as number) / (r.lower[i] as number));
    // The interval width shrinks roughly as 1/√n: ten times the votes, about a third of the width.
    for (let i = 0; i < 4; i++) expect(width(more, i)).toBeLessThan(0.5 * width(a, i));
  });

  it("covers the true strengths at about the stated level", () => {
    // 40 independent data sets × 4 variants: a 95 % interval should miss rarely (expected ≈ 8 of 160).
    const truth = [0.6, 1, 1.5, 2.5];
    const meanLog = truth.reduce((s, t) => s + Math.log(t), 0) / truth.length;
    let covered = 0;
    for (let set = 0; set < 40; set++) {
      const result = bootstrapBradleyTerry(synthetic(truth, 400, 1000 + set), { replicates: 200, seed: set });
      truth.forEach((t, i) => {
        const target = Math.exp(Math.log(t) - meanLog);
        if ((result.lower[i] as number) <= target && target <= (result.upper[i] as number)) covered++;
      });
    }
    expect(covered / 160).toBeGreaterThan(0.85);
  });

  it("computes the type-7 percentile", () => {
    // R: quantile(1:4, 0.25) = 1.75 and quantile(1:4, 0.975) = 3.925 (Hyndman & Fan 1996, type 7, R's default).
    expect(quantileSorted(Float64Array.of(1, 2, 3, 4), 0.25)).toBeCloseTo(1.75, 12);
    expect(quantileSorted(Float64Array.of(1, 2, 3, 4), 0.975)).toBeCloseTo(3.925, 12);
  });
});

describe("preferenceProbability", () => {
  it("is γ_i / (γ_i + γ_j)", () => {
    const strengths = Float64Array.of(3, 1);
    expect(preferenceProbability(strengths, 0, 1)).toBeCloseTo(0.75, 12);
    expect(preferenceProbability(strengths, 1, 0)).toBeCloseTo(0.25, 12);
  });
});

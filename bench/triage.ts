/**
 * Budget for the host's triage table (triage issue): with 10,000 proposals, a filtered, sorted,
 * searched page answers with p50 under 50 ms. Measured on the query function against a temp
 * database, and — given a running stack — through `GET /api/lab/proposals` over HTTP as a host.
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { performance } from "node:perf_hooks";
import { eq } from "drizzle-orm";
import { migrateDatabase, openDatabase, type Db } from "../db/client";
import { listTriagePage } from "../db/queries/triage";
import { proposals, users, type NewProposal } from "../db/schema";
import { latencyFigures, timeHostGet, type LatencyFigures } from "./host-get";
import { seedDemo } from "../db/seed";
import { mulberry32 } from "../lib/seeded-random";
import { triageQuerySchema, type TriageQueryInput } from "../lib/validation/triage";

/* ---------- A deterministic generator of invented proposals ---------- */

const SUBJECTS = {
  duct: ["ring duct", "side blower duct", "twin-outlet duct", "wide-mouth duct", "slot nozzle duct", "low-profile shroud", "split-flow duct"],
  material: ["matte PLA", "glass-filled PETG", "silk PLA", "high-speed PLA", "recycled PETG", "soft TPU", "outdoor ASA"],
  nozzle: ["hardened nozzle", "long melt-zone nozzle", "coated brass nozzle", "0.6 mm nozzle", "ruby-tip nozzle", "high-flow nozzle"],
  part: ["filament guide", "bed sheet texture", "wipe brush", "spool holder bearing", "extruder idler", "belt tensioner"],
} as const;
const QUALIFIERS = ["at high flow", "for fast CoreXY", "on a bed-slinger", "with 100 % fan", "at low fan", "in a warm enclosure", "for tall parts", "for small layers", "at 0.28 mm layers", "against stock"];
const PREFIXES = ["Revised", "Printed", "Angled", "Compact", "Quiet", "Stiffer", "Lighter", "Dual", "Open", "Sealed", "Short", "Tall"];
const WHY = [
  "Overhangs facing away from the fan curl at speed and the stock part does not fix it.",
  "Bridges sag on long spans; a different airflow might hold them flat.",
  "People argue about this on every forum; measured numbers would settle it.",
  "It is cheap to print and swap, so if it works many members would use it.",
  "Layer bonding may suffer, and nobody has measured by how much.",
];
const MATERIALS = ["PLA", "PETG", "ASA", "TPU", "PC", "PA", "ABS"] as const;
const KINDS = ["duct", "material", "nozzle", "part"] as const;
const PRINTER_TYPES = ["corexy", "bedslinger", "delta"] as const;
/** Cumulative shares: most waiting, a fair number declined or merged, few accepted. */
const STATE_SHARES = [
  ["submitted", 0.55],
  ["declined", 0.8],
  ["merged", 0.92],
  ["accepted", 1],
] as const;

const DAY = 24 * 60 * 60 * 1000;

/**
 * Inserts `count` invented proposals from the seeded supporters (seedDemo first), the same rows
 * for the same seed: titles from word lists, votes skewed low, ages over a year and a half.
 * The FTS triggers index them as they go in.
 */
export function insertGeneratedProposals(db: Db, count: number, options: { seed?: number; now?: Date } = {}): string[] {
  const rng = mulberry32(options.seed ?? 20_260_301);
  const now = (options.now ?? new Date()).getTime();
  const pick = <T>(items: readonly T[]): T => items[Math.floor(rng() * items.length)] as T;
  const proposers = db.select({ id: users.id }).from(users).where(eq(users.role, "supporter")).all();
  if (proposers.length === 0) throw new Error("Seed the database before generating proposals.");
  const ids: string[] = [];
  return db.transaction((tx) => {
    let batch: NewProposal[] = [];
    const flush = () => {
      if (batch.length) tx.insert(proposals).values(batch).run();
      batch = [];
    };
    for (let i = 0; i < count; i++) {
      const kind = pick(KINDS);
      const title = `${pick(PREFIXES)} ${pick(SUBJECTS[kind])} ${pick(QUALIFIERS)} #${i + 1}`;
      const roll = rng();
      const state = (STATE_SHARES.find(([, share]) => roll < share) ?? STATE_SHARES[0])[0];
      const createdAt = now - Math.floor(rng() * 540 * DAY);
      const submittedAt = createdAt + Math.floor(rng() * 3 * DAY);
      const material = kind === "material" ? pick(MATERIALS) : null;
      const id = crypto.randomUUID();
      ids.push(id);
      batch.push({
        id,
        slug: `generated-${i + 1}`,
        title,
        kind,
        printerType: pick(PRINTER_TYPES),
        why: `${pick(WHY)} ${pick(WHY)}`,
        descriptionMd: `## Idea\nTest the ${title.toLowerCase()}.\n\n- ${pick(WHY)}\n- Compare with the stock part.`,
        material,
        state,
        voteCount: Math.floor(rng() ** 3 * 60),
        proposerId: pick(proposers).id,
        submittedAt: new Date(submittedAt),
        reviewStartedAt: state === "submitted" && rng() < 0.3 ? new Date(submittedAt + DAY) : state === "submitted" ? null : new Date(submittedAt + DAY),
        decidedAt: state === "submitted" ? null : new Date(submittedAt + 2 * DAY),
        declineReason: state === "declined" ? "Generated: a duplicate of an earlier proposal." : null,
        createdAt: new Date(createdAt),
        updatedAt: new Date(submittedAt),
      });
      if (batch.length === 250) flush();
    }
    flush();
    return ids;
  });
}

/* ---------- Measurement ---------- */

export type { LatencyFigures };
export type TriageFigures = {
  proposals: number;
  /** The budget's case: state filter + kind + printer type + prefix search + sort + a later page. */
  filteredSortedSearched: LatencyFigures;
  byCase: Record<string, LatencyFigures>;
  /** The same request through the running app (`GET /api/lab/proposals`, signed in as a host). */
  http?: LatencyFigures;
};

export const TRIAGE_BENCH_CASES: Record<string, TriageQueryInput> = {
  "default page (submitted, most votes)": {},
  "filtered + sorted by age, page 3": { state: ["submitted"], kind: "duct", printerType: "corexy", sort: "age", dir: "desc", page: "3" },
  "all states, search 'nozzle', votes": { state: ["submitted", "accepted", "declined", "merged"], q: "nozzle" },
  "filtered + searched + sorted": { state: ["submitted", "accepted"], kind: "duct", printerType: "corexy", q: "ring du", sort: "votes", dir: "desc", page: "2", pageSize: "25" },
  "broad prefix search 'f', oldest first": { state: ["submitted", "declined"], q: "f", sort: "age", dir: "desc" },
  "deep page, 100 per page": { state: ["submitted", "declined", "merged", "accepted"], sort: "age", dir: "asc", page: "40", pageSize: "100" },
};
const BUDGET_CASE = "filtered + searched + sorted";

function measure(run: () => unknown, iterations: number): number[] {
  for (let i = 0; i < 20; i++) run(); // warm-up: statement cache, SQLite page cache
  const samples: number[] = [];
  for (let i = 0; i < iterations; i++) {
    const start = performance.now();
    run();
    samples.push(performance.now() - start);
  }
  return samples;
}

/** Query-level figures on a temp database holding the seed plus `count` generated proposals. */
export function runTriageQueryBench(count = 10_000, iterations = 300): TriageFigures {
  const dir = mkdtempSync(path.join(os.tmpdir(), "proofbay-triage-bench-"));
  const db = openDatabase(path.join(dir, "bench.db"));
  try {
    migrateDatabase(db);
    seedDemo(db);
    insertGeneratedProposals(db, count);
    const byCase: Record<string, LatencyFigures> = {};
    for (const [name, input] of Object.entries(TRIAGE_BENCH_CASES)) {
      const query = triageQuerySchema.parse(input);
      byCase[name] = latencyFigures(measure(() => listTriagePage(db, query), iterations));
    }
    const budget = byCase[BUDGET_CASE];
    if (!budget) throw new Error("missing budget case");
    return { proposals: count, filteredSortedSearched: budget, byCase };
  } finally {
    db.$client.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * The budget case through a running app: adds `count` generated proposals to its database, starts
 * a host session row and times sequential requests with that session's cookie.
 */
export async function runTriageHttpBench(appUrl: string, databasePath: string, count = 10_000, iterations = 200): Promise<LatencyFigures> {
  const db = openDatabase(databasePath);
  try {
    insertGeneratedProposals(db, count);
    const input = TRIAGE_BENCH_CASES[BUDGET_CASE] ?? {};
    const params = new URLSearchParams();
    for (const [key, value] of Object.entries(input)) {
      for (const item of Array.isArray(value) ? value : [value]) params.append(key, String(item));
    }
    return await timeHostGet(db, appUrl, `${appUrl}/api/lab/proposals?${params}`, iterations);
  } finally {
    db.$client.close();
  }
}

/** Both: the query always, the route when a stack's URL and database file are given. */
export async function runTriageBench(appUrl?: string, databasePath?: string): Promise<TriageFigures> {
  const result = runTriageQueryBench();
  if (appUrl && databasePath) result.http = await runTriageHttpBench(appUrl, databasePath);
  return result;
}

// `npx tsx bench/triage.ts` runs the query-level part on its own.
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const result = runTriageQueryBench();
  console.table(Object.entries(result.byCase).map(([name, figure]) => ({ case: name, ...figure })));
}

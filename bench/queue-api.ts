/**
 * Budget for the host's queue board (print queue issue): `GET /api/lab/queue` answers with p50
 * under 50 ms on a realistic queue — 2,000 jobs of 100 funded campaigns on 12 printers, with
 * weekly start windows and maintenance. Also measured: the recompute behind every queue change
 * (materialise, schedule, store placements and dates, queue mails) on a temp database.
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { performance } from "node:perf_hooks";
import { eq } from "drizzle-orm";
import { migrateDatabase, openDatabase, type Db } from "../db/client";
import { queueBoardJson, setPrinterAvailability } from "../db/queries/queue-board";
import { recomputeQueue } from "../db/queries/queue";
import {
  campaigns,
  labSettings,
  labStartWindows,
  printerMaintenance,
  printers,
  testPlanPieces,
  testPlans,
  testPlanVariants,
  type NewPrinter,
} from "../db/schema";
import { seedDemo } from "../db/seed";
import { mulberry32 } from "../lib/seeded-random";
import { latencyFigures as figures, timeHostGet, type LatencyFigures } from "./host-get";

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** Invented bench printers: mixed motion, materials and enclosures, so eligibility matters. */
function benchPrinters(count: number, rng: () => number): NewPrinter[] {
  const kinds = [
    { motionType: "corexy", materials: ["PLA", "PETG", "TPU"], enclosed: false, flow: 30 },
    { motionType: "bedslinger", materials: ["PLA", "PETG"], enclosed: false, flow: 18 },
    { motionType: "corexy", materials: ["PLA", "PETG", "ABS", "ASA"], enclosed: true, flow: 26 },
  ] as const;
  return Array.from({ length: count }, (_, i) => {
    const kind = kinds[i % kinds.length] ?? kinds[0];
    return {
      slug: `bench-bay-${i + 1}`,
      name: `Bench bay ${i + 1}`,
      model: `Bench model ${String.fromCharCode(65 + (i % kinds.length))}`,
      motionType: kind.motionType,
      buildXmm: 250,
      buildYmm: 250,
      buildZmm: 250,
      nozzleMm: 0.4,
      maxFlowMm3PerS: kind.flow,
      efficiency: 0.45 + 0.15 * rng(),
      enclosed: kind.enclosed,
      materials: [...kind.materials],
      hourlyRateMinor: 150,
      heatUpMinutes: 5,
      changeoverMinutes: 15,
      handlingMinutesPerJob: 4,
      status: "available",
    };
  });
}

/**
 * Adds `campaignCount` funded campaigns of 4 pieces × 5 variants × 1 repeat (20 jobs each), the
 * printers needed to reach `printerCount`, weekday 08:00–20:00 and weekend 10:00–16:00 start
 * windows, and one maintenance block per printer in the coming weeks. Deterministic for a seed.
 */
export function insertGeneratedQueue(db: Db, options: { campaignCount?: number; printerCount?: number; now?: number; seed?: number } = {}) {
  const rng = mulberry32(options.seed ?? 20_261_202);
  const now = options.now ?? Date.now();
  const campaignCount = options.campaignCount ?? 100;
  db.transaction((tx) => {
    const existing = tx.select({ id: printers.id }).from(printers).all().length;
    const extra = Math.max(0, (options.printerCount ?? 12) - existing);
    if (extra > 0) tx.insert(printers).values(benchPrinters(extra, rng)).run();
    const printerIds = tx.select({ id: printers.id }).from(printers).all().map((row) => row.id);

    if (tx.select({ id: labStartWindows.id }).from(labStartWindows).all().length === 0) {
      tx.insert(labStartWindows)
        .values(([1, 2, 3, 4, 5, 6, 7] as const).map((isoWeekday) => (isoWeekday <= 5 ? { isoWeekday, startMinute: 480, endMinute: 1200 } : { isoWeekday, startMinute: 600, endMinute: 960 })))
        .run();
    }
    tx.insert(printerMaintenance)
      .values(
        printerIds.map((printerId, i) => {
          const startsAt = now + (3 + (i % 10)) * DAY + 9 * HOUR;
          return { printerId, startsAt: new Date(startsAt), endsAt: new Date(startsAt + 6 * HOUR), reason: "Bench: nozzle and belt service" };
        }),
      )
      .run();

    const materials = ["PLA", "PLA", "PETG", "ASA"] as const;
    for (let c = 0; c < campaignCount; c++) {
      const fundedAt = now - Math.floor(rng() * 30 * DAY);
      const campaign = tx
        .insert(campaigns)
        .values({
          slug: `bench-queue-${c + 1}-${Math.floor(rng() * 1e9)}`,
          title: `Bench queue campaign ${c + 1}`,
          summary: "Generated for the queue bench.",
          state: "funded",
          goalMinor: 40_000,
          currency: "USD",
          deadline: new Date(fundedAt + 5 * DAY),
          openedAt: new Date(fundedAt - 20 * DAY),
          fundedAt: new Date(fundedAt),
        })
        .returning({ id: campaigns.id })
        .get();
      const material = materials[c % materials.length] ?? "PLA";
      const plan = tx
        .insert(testPlans)
        .values({ campaignId: campaign.id, material, layerHeightMm: 0.2, maxFlowMm3PerS: 24, fanPercent: 80, repeats: 1, printerId: printerIds[c % printerIds.length] ?? null })
        .returning({ id: testPlans.id })
        .get();
      tx.insert(testPlanPieces)
        .values(Array.from({ length: 4 }, (_, p) => ({ testPlanId: plan.id, name: `Bench piece ${p + 1}`, filamentGrams: 8 + Math.floor(rng() * 60), position: p + 1 })))
        .run();
      tx.insert(testPlanVariants)
        .values(Array.from({ length: 5 }, (_, v) => ({ testPlanId: plan.id, name: v === 0 ? "Reference" : `Variant ${v}`, isReference: v === 0, position: v + 1 })))
        .run();
    }
  });
}

export type QueueFigures = {
  jobs: number;
  printers: number;
  unplaced: number;
  /** Full recompute (the first one materialises the jobs), then median of later ones. */
  firstRecomputeMs: number;
  recomputeMedianMs: number;
  /** One printer marked down from the board: its jobs and the knock-on move (change + recompute, one transaction). */
  printerDownMs: number;
  printerDownJobsMoved: number;
  /** The board's JSON on the same database, without HTTP, while nothing changes (the usual poll). */
  boardRead: LatencyFigures;
  /** The same right after a write (the job list is read and serialised again). */
  boardReadAfterChange: LatencyFigures;
  http?: LatencyFigures;
};

/** Recompute and board read on a temp database: the seed plus the generated queue. */
export function runQueueRecomputeBench(runs = 9, reads = 200): QueueFigures {
  const dir = mkdtempSync(path.join(os.tmpdir(), "proofbay-queue-bench-"));
  const db = openDatabase(path.join(dir, "bench.db"));
  try {
    migrateDatabase(db);
    seedDemo(db);
    insertGeneratedQueue(db);
    const options = { appUrl: "http://localhost", mail: false } as const;
    let start = performance.now();
    const first = recomputeQueue(db, { ...options, now: new Date() });
    const firstRecomputeMs = performance.now() - start;
    const times: number[] = [];
    for (let i = 0; i < runs; i++) {
      start = performance.now();
      recomputeQueue(db, { ...options, now: new Date() });
      times.push(performance.now() - start);
    }
    times.sort((a, b) => a - b);
    const busiest = db.select({ id: printers.id }).from(printers).where(eq(printers.slug, "bench-bay-3")).get();
    if (!busiest) throw new Error("bench printers missing");
    start = performance.now();
    const down = setPrinterAvailability(db, busiest.id, "down", { ...options, now: new Date() });
    const printerDownMs = performance.now() - start;

    const samples: number[] = [];
    for (let i = 0; i < reads; i++) {
      start = performance.now();
      queueBoardJson(db, Date.now());
      samples.push(performance.now() - start);
    }
    const afterChange: number[] = [];
    for (let i = 0; i < reads; i++) {
      db.update(labSettings).set({ updatedAt: new Date() }).where(eq(labSettings.id, 1)).run();
      start = performance.now();
      queueBoardJson(db, Date.now());
      afterChange.push(performance.now() - start);
    }
    return {
      jobs: first.schedule.placements.length + first.schedule.unplaced.length,
      printers: db.select({ id: printers.id }).from(printers).all().length,
      unplaced: first.schedule.unplaced.length,
      firstRecomputeMs: Math.round(firstRecomputeMs * 10) / 10,
      recomputeMedianMs: Math.round((times[Math.floor(times.length / 2)] ?? 0) * 10) / 10,
      printerDownMs: Math.round(printerDownMs * 10) / 10,
      printerDownJobsMoved: down.recompute.jobsUpdated,
      boardRead: figures(samples.slice(20)),
      boardReadAfterChange: figures(afterChange.slice(20)),
    };
  } finally {
    db.$client.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

/** `GET /api/lab/queue` through a running app, after adding the generated queue to its database. */
export async function runQueueHttpBench(appUrl: string, databasePath: string, iterations = 200): Promise<LatencyFigures> {
  const db = openDatabase(databasePath);
  try {
    insertGeneratedQueue(db);
    recomputeQueue(db, { appUrl, mail: false });
    return await timeHostGet(db, appUrl, `${appUrl}/api/lab/queue`, iterations);
  } finally {
    db.$client.close();
  }
}

export async function runQueueApiBench(appUrl?: string, databasePath?: string): Promise<QueueFigures> {
  const result = runQueueRecomputeBench();
  if (appUrl && databasePath) result.http = await runQueueHttpBench(appUrl, databasePath);
  return result;
}

// `npx tsx bench/queue-api.ts` runs the part that needs no app.
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  console.log(runQueueRecomputeBench());
}

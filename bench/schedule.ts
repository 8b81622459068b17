/**
 * Scheduling budgets (print queue issue):
 * - 2,000 jobs on 12 printers, with weekly start windows, closures, maintenance and changeovers,
 *   scheduled in under 200 ms (median of several runs of buildSchedule on the same input);
 * - on random instances without windows (identical printers, no changeovers), the makespan within
 *   10 % of the lower bound max(total / m, longest job); the worst ratio over 50 seeded instances.
 * Pure computation, no app needed:  npx tsx bench/schedule.ts
 */
import path from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { ALWAYS_STAFFED, buildSchedule, lowerBound } from "../lib/schedule";
import type { Interval, LabCalendar, ScheduleInput, ScheduleJob, SchedulePrinter, WeeklyWindow } from "../lib/schedule";
import { mulberry32 as seeded } from "../lib/seeded-random";

export const SCHEDULE_BUDGET_MS = 200;
export const MAKESPAN_BUDGET_RATIO = 1.1;
const RUNS = 15;
const INSTANCES = 50;
const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const MATERIALS = ["PLA", "PETG", "ASA", "TPU"] as const;

export type ScheduleBenchFigures = {
  jobs: number;
  printers: number;
  runs: number;
  /** The first, cold run: before JIT warm-up and before the zone's offsets are memoised. */
  firstRunMs: number;
  medianMs: number;
  maxMs: number;
  placed: number;
  unplaced: number;
  changeovers: number;
  lastEndDays: number;
  makespan: {
    instances: number;
    /** One priority class: longest job first. */
    worstRatioLpt: number;
    /** Jobs in campaigns of 10–40, each campaign its own class (funded order), LPT inside. */
    worstRatioByCampaign: number;
    meanRatioLpt: number;
  };
};


/** A busy lab: 12 printers of three kinds, staffed weekdays 08:00–20:00 and Saturday mornings. */
export function busyLab(jobCount: number, seed: number): ScheduleInput {
  const random = seeded(seed);
  const now = Date.UTC(2027, 2, 1, 7);
  const weekdays: WeeklyWindow[] = ([1, 2, 3, 4, 5] as const).map((isoWeekday) => ({ isoWeekday, startMinute: 8 * 60, endMinute: 20 * 60 }));
  const closures: Interval[] = [
    { start: now + 30 * DAY, end: now + 31 * DAY },
    { start: now + 55 * DAY, end: now + 58 * DAY },
  ];
  const calendar: LabCalendar = { timeZone: "Pacific/Auckland", startWindows: [...weekdays, { isoWeekday: 6, startMinute: 9 * 60, endMinute: 13 * 60 }], closures };
  const printers: SchedulePrinter[] = Array.from({ length: 12 }, (_, i) => {
    const enclosed = i % 3 === 0;
    const maintenance: Interval[] = [];
    // A half-day service every fortnight, staggered, plus one longer repair somewhere.
    for (let day = 3 + i; day < 200; day += 14) maintenance.push({ start: now + day * DAY + 2 * HOUR, end: now + day * DAY + 6 * HOUR });
    const repair = 10 + Math.floor(random() * 80);
    maintenance.push({ start: now + repair * DAY, end: now + repair * DAY + 30 * HOUR });
    return {
      id: `printer-${String(i).padStart(2, "0")}`,
      available: true,
      materials: enclosed ? ["PLA", "PETG", "ASA"] : i % 3 === 1 ? ["PLA", "PETG", "TPU"] : ["PLA", "PETG"],
      enclosed,
      buildMm: i % 4 === 0 ? { x: 350, y: 350, z: 350 } : { x: 250, y: 250, z: 250 },
      changeoverMinutes: 20 + (i % 3) * 10,
      maintenance,
      setup: null,
    };
  });
  const jobs: ScheduleJob[] = [];
  for (let campaign = 0; jobs.length < jobCount; campaign++) {
    const material = MATERIALS[Math.floor(random() * (random() < 0.6 ? 2 : MATERIALS.length))] as string;
    const pieces = 1 + Math.floor(random() * 4);
    const variants = 2 + Math.floor(random() * 3);
    const repeats = 2 + Math.floor(random() * 4);
    const fundedAt = now - (400 - campaign) * HOUR;
    for (let piece = 0; piece < pieces; piece++) {
      const size = { x: 40 + random() * 260, y: 40 + random() * 200, z: 20 + random() * 200 };
      const baseHours = 1 + random() * 11;
      for (let variant = 0; variant < variants; variant++) {
        for (let repeat = 0; repeat < repeats && jobs.length < jobCount; repeat++) {
          const hoursByPrinter = Object.fromEntries(printers.map((p, k) => [p.id, Math.round(baseHours * (0.8 + 0.1 * (k % 4)) * 4) / 4]));
          jobs.push({
            id: `job-${String(jobs.length).padStart(5, "0")}`,
            campaignId: `campaign-${campaign}`,
            variantKey: `campaign-${campaign}/piece-${piece}/variant-${variant}`,
            material,
            needsEnclosure: material === "ASA",
            sizeMm: size,
            hoursByPrinter,
            fundedAt,
            pinned: campaign === 3,
            position: null,
            printerId: null,
          });
        }
      }
    }
  }
  // A few jobs already printing.
  for (let i = 0; i < 4; i++) {
    const job = jobs[i * 7] as ScheduleJob;
    const printer = printers.find((p) => p.materials.includes(job.material) && (!job.needsEnclosure || p.enclosed) && !jobs.some((j) => j.running?.printerId === p.id));
    if (printer) job.running = { printerId: printer.id, start: now - HOUR };
  }
  return { now, calendar, printers, jobs };
}

function identicalInstance(random: () => number, byCampaign: boolean): { input: ScheduleInput; hours: number[] } {
  const m = 2 + Math.floor(random() * 11);
  const n = 100 + Math.floor(random() * 1901);
  const printers: SchedulePrinter[] = Array.from({ length: m }, (_, i) => ({
    id: `p${String(i).padStart(2, "0")}`,
    available: true,
    materials: ["PLA"],
    enclosed: false,
    buildMm: { x: 300, y: 300, z: 300 },
    changeoverMinutes: 0,
    maintenance: [],
  }));
  const hours: number[] = [];
  const jobs: ScheduleJob[] = [];
  let campaign = 0;
  let left = 10 + Math.floor(random() * 31);
  for (let i = 0; i < n; i++) {
    if (byCampaign && left-- === 0) {
      campaign++;
      left = 10 + Math.floor(random() * 31);
    }
    const h = Math.round((0.5 + random() * 23.5) * 4) / 4;
    hours.push(h);
    jobs.push({
      id: `j${String(i).padStart(5, "0")}`,
      campaignId: `c${campaign}`,
      variantKey: "v",
      material: "PLA",
      needsEnclosure: false,
      sizeMm: { x: 10, y: 10, z: 10 },
      hoursByPrinter: Object.fromEntries(printers.map((p) => [p.id, h])),
      fundedAt: byCampaign ? campaign : 0,
      pinned: false,
      position: null,
      printerId: null,
    });
  }
  // A long horizon: 2,000 jobs on two printers run for well over a year.
  return { input: { now: 0, calendar: { timeZone: "UTC", startWindows: ALWAYS_STAFFED, closures: [] }, printers, jobs, horizonDays: 3650 }, hours };
}

function makespanRatios(seed: number, byCampaign: boolean): number[] {
  const random = seeded(seed);
  return Array.from({ length: INSTANCES }, () => {
    const { input, hours } = identicalInstance(random, byCampaign);
    const schedule = buildSchedule(input);
    if (schedule.unplaced.length) throw new Error("a job without windows went unplaced");
    const makespan = Math.max(...schedule.placements.map((p) => p.end)) / HOUR;
    return makespan / lowerBound(hours, input.printers.length);
  });
}

export function runScheduleBench(): ScheduleBenchFigures {
  const input = busyLab(2000, 20_270_301);
  const times: number[] = [];
  let schedule: ReturnType<typeof buildSchedule> | undefined;
  // The first run is timed too (cold: JIT, zone offsets not yet memoised) and reported on its own.
  for (let run = 0; run <= RUNS; run++) {
    const started = performance.now();
    schedule = buildSchedule(input);
    times.push(performance.now() - started);
  }
  if (!schedule) throw new Error("no runs");
  const firstRunMs = times.shift() as number;
  const sorted = [...times].sort((a, b) => a - b);
  const lpt = makespanRatios(1, false);
  const byCampaign = makespanRatios(2, true);
  const round = (value: number, digits = 1) => Math.round(value * 10 ** digits) / 10 ** digits;
  return {
    jobs: input.jobs.length,
    printers: input.printers.length,
    runs: RUNS,
    firstRunMs: round(firstRunMs),
    medianMs: round(sorted[Math.floor(sorted.length / 2)] as number),
    maxMs: round(sorted[sorted.length - 1] as number),
    placed: schedule.placements.length,
    unplaced: schedule.unplaced.length,
    changeovers: schedule.placements.filter((p) => p.changeover).length,
    lastEndDays: round((Math.max(...schedule.placements.map((p) => p.end)) - input.now) / DAY),
    makespan: {
      instances: INSTANCES,
      worstRatioLpt: round(Math.max(...lpt), 4),
      worstRatioByCampaign: round(Math.max(...byCampaign), 4),
      meanRatioLpt: round(lpt.reduce((a, b) => a + b, 0) / lpt.length, 4),
    },
  };
}

const invokedDirectly = process.argv[1] !== undefined && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (invokedDirectly) {
  const figures = runScheduleBench();
  console.log(JSON.stringify(figures, null, 2));
  console.log(
    `schedule ${figures.jobs} jobs / ${figures.printers} printers: median ${figures.medianMs} ms (budget < ${SCHEDULE_BUDGET_MS} ms); ` +
      `worst makespan / lower bound ${figures.makespan.worstRatioLpt} (budget ≤ ${MAKESPAN_BUDGET_RATIO})`,
  );
}

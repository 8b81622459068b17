import { ALWAYS_STAFFED } from "@/lib/schedule";
import type { LabCalendar, Schedule, ScheduleInput, ScheduleJob, SchedulePrinter } from "@/lib/schedule";
import { mulberry32 } from "@/lib/seeded-random";

export const HOUR = 3_600_000;
export const MINUTE = 60_000;

export const alwaysStaffed: LabCalendar = { timeZone: "UTC", startWindows: ALWAYS_STAFFED, closures: [] };

export function printer(id: string, overrides: Partial<SchedulePrinter> = {}): SchedulePrinter {
  return { id, available: true, materials: ["PLA", "PETG"], enclosed: false, buildMm: { x: 250, y: 250, z: 250 }, changeoverMinutes: 0, maintenance: [], ...overrides };
}

export function job(id: string, hours: number | Record<string, number>, overrides: Partial<ScheduleJob> = {}): ScheduleJob {
  return {
    id,
    campaignId: "campaign",
    variantKey: "stock",
    material: "PLA",
    needsEnclosure: false,
    sizeMm: { x: 50, y: 50, z: 50 },
    hoursByPrinter: typeof hours === "number" ? {} : hours,
    fundedAt: 0,
    pinned: false,
    position: null,
    printerId: null,
    ...overrides,
  };
}

/** Identical printers p0…p(m−1) with no changeovers, windows or maintenance: the textbook machine model. */
export function identicalInstance(durations: readonly number[], m: number, order: "one class" | "list order" = "one class"): ScheduleInput {
  const printers = Array.from({ length: m }, (_, i) => printer(`p${i}`));
  const jobs = durations.map((hours, i) =>
    job(`j${String(i).padStart(4, "0")}`, Object.fromEntries(printers.map((p) => [p.id, hours])), order === "list order" ? { position: i } : {}),
  );
  return { now: 0, calendar: alwaysStaffed, printers, jobs };
}

export function makespanHours(schedule: Schedule, now = 0): number {
  return Math.max(0, ...schedule.placements.map((placement) => placement.end - now)) / HOUR;
}

/** The least makespan over every assignment of jobs to m identical machines (m^n of them). */
export function bruteForceMakespan(durations: readonly number[], m: number): number {
  const loads = new Array<number>(m).fill(0);
  let best = Infinity;
  const visit = (index: number) => {
    if (index === durations.length) {
      best = Math.min(best, Math.max(...loads));
      return;
    }
    const hours = durations[index] as number;
    const seen = new Set<number>();
    for (let machine = 0; machine < m; machine++) {
      // Machines with equal loads are interchangeable: trying one of them is enough.
      if (seen.has(loads[machine] as number)) continue;
      seen.add(loads[machine] as number);
      loads[machine] = (loads[machine] as number) + hours;
      if (Math.max(...loads) < best) visit(index + 1);
      loads[machine] = (loads[machine] as number) - hours;
    }
  };
  visit(0);
  return best;
}

/** A small seeded generator (mulberry32) so instances are the same on every run. */
export const seededRandom = mulberry32;

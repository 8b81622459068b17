import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildSchedule, comparePriorityClass, expandStartWindows, ineligibility } from "@/lib/schedule";
import type { Interval, LabCalendar, Placement, Schedule, ScheduleInput, ScheduleJob, SchedulePrinter, WeeklyWindow } from "@/lib/schedule";
import { HOUR, MINUTE } from "../helpers/schedule-fixtures";

/*
 * Invariants of every schedule, on random labs: several time zones (with clock changes inside
 * the year), weekly windows, closures, maintenance, changeovers, printers down, host pins,
 * orders and printer choices, running jobs. The generator keeps every window at least two
 * hours long and every changeover at most 90 minutes, and puts closures and maintenance in the
 * first 40 days, so a job that some printer can take always fits inside the default horizon.
 */

const DAY = 24 * HOUR;
const ZONES = ["UTC", "Pacific/Auckland", "America/Denver"] as const;
const MATERIALS = ["PLA", "PETG", "ASA"] as const;
const VARIANTS = ["a", "b", "c"] as const;

const relativeBlocks = (maxCount: number, withinHours: number, maxHours: number) =>
  fc.array(fc.record({ afterHours: fc.integer({ min: 0, max: withinHours }), hours: fc.integer({ min: 1, max: maxHours }) }), { maxLength: maxCount });

const windowArb: fc.Arbitrary<WeeklyWindow> = fc
  .record({ isoWeekday: fc.constantFrom(1, 2, 3, 4, 5, 6, 7), startMinute: fc.integer({ min: 0, max: 1320 }), length: fc.integer({ min: 120, max: 600 }) })
  .map(({ isoWeekday, startMinute, length }) => ({ isoWeekday, startMinute, endMinute: Math.min(1440, startMinute + length) }));

const labArb = fc
  .record({
    now: fc.integer({ min: Date.UTC(2027, 0, 1) / MINUTE, max: Date.UTC(2027, 11, 31) / MINUTE }).map((minutes) => minutes * MINUTE),
    timeZone: fc.constantFrom(...ZONES),
    startWindows: fc.array(windowArb, { minLength: 1, maxLength: 8 }),
    closures: relativeBlocks(3, 30 * 24, 72),
    printers: fc.array(
      fc.record({
        down: fc.integer({ min: 0, max: 6 }).map((roll) => roll === 0),
        materials: fc.subarray([...MATERIALS], { minLength: 1 }),
        enclosed: fc.boolean(),
        build: fc.record({ x: fc.integer({ min: 150, max: 300 }), y: fc.integer({ min: 150, max: 300 }), z: fc.integer({ min: 150, max: 300 }) }),
        changeoverMinutes: fc.constantFrom(0, 10, 30, 90),
        maintenance: relativeBlocks(3, 40 * 24, 48),
        setup: fc.option(fc.record({ variantKey: fc.constantFrom(...VARIANTS), material: fc.constantFrom(...MATERIALS) }), { nil: null }),
      }),
      { minLength: 1, maxLength: 4 },
    ),
    jobs: fc.array(
      fc.record({
        campaign: fc.integer({ min: 0, max: 3 }),
        variantKey: fc.constantFrom(...VARIANTS),
        material: fc.constantFrom(...MATERIALS, "pla"),
        needsEnclosure: fc.integer({ min: 0, max: 3 }).map((roll) => roll === 0),
        size: fc.record({ x: fc.integer({ min: 20, max: 280 }), y: fc.integer({ min: 20, max: 280 }), z: fc.integer({ min: 20, max: 280 }) }),
        quarterHours: fc.array(fc.option(fc.integer({ min: 1, max: 120 }), { nil: null, freq: 8 }), { minLength: 4, maxLength: 4 }),
        fundedDay: fc.integer({ min: 0, max: 3 }),
        pinned: fc.integer({ min: 0, max: 6 }).map((roll) => roll === 0),
        position: fc.option(fc.integer({ min: 0, max: 3 }), { nil: null, freq: 2 }),
        chosenPrinter: fc.option(fc.integer({ min: 0, max: 4 }), { nil: null, freq: 6 }),
      }),
      { maxLength: 20 },
    ),
    running: fc.array(fc.record({ printer: fc.integer({ min: 0, max: 3 }), job: fc.integer({ min: 0, max: 19 }), hoursAgo: fc.integer({ min: 0, max: 12 }) }), { maxLength: 3 }),
  })
  .map((lab): ScheduleInput => {
    const printers: SchedulePrinter[] = lab.printers.map((p, i) => ({
      id: `p${i}`,
      available: !p.down,
      materials: p.materials,
      enclosed: p.enclosed,
      buildMm: p.build,
      changeoverMinutes: p.changeoverMinutes,
      maintenance: p.maintenance.map((block) => ({ start: lab.now + block.afterHours * HOUR, end: lab.now + (block.afterHours + block.hours) * HOUR })),
      setup: p.setup,
    }));
    const jobs: ScheduleJob[] = lab.jobs.map((j, i) => ({
      id: `j${String(i).padStart(2, "0")}`,
      campaignId: `c${j.campaign}`,
      variantKey: j.variantKey,
      material: j.material,
      needsEnclosure: j.needsEnclosure,
      sizeMm: j.size,
      hoursByPrinter: Object.fromEntries(printers.flatMap((p, k) => (j.quarterHours[k] ? [[p.id, (j.quarterHours[k] as number) / 4]] : []))),
      fundedAt: lab.now - (10 - j.fundedDay) * DAY,
      pinned: j.pinned,
      position: j.position,
      // Index 4 names a printer that is not in the lab.
      printerId: j.chosenPrinter === null ? null : `p${j.chosenPrinter}`,
    }));
    const busyPrinters = new Set<string>();
    for (const pick of lab.running) {
      const p = printers[pick.printer];
      const j = jobs[pick.job];
      if (!p || !j || j.running || busyPrinters.has(p.id)) continue;
      busyPrinters.add(p.id);
      j.running = { printerId: p.id, start: lab.now - pick.hoursAgo * HOUR };
      j.hoursByPrinter[p.id] ??= 3;
    }
    const closures = lab.closures.map((block) => ({ start: lab.now + block.afterHours * HOUR, end: lab.now + (block.afterHours + block.hours) * HOUR }));
    return { now: lab.now, calendar: { timeZone: lab.timeZone, startWindows: lab.startWindows, closures }, printers, jobs };
  });

const sameSetup = (a: { variantKey: string; material: string }, b: { variantKey: string; material: string }) =>
  a.variantKey === b.variantKey && a.material.trim().toUpperCase() === b.material.trim().toUpperCase();
const overlaps = (a: Interval, b: Interval) => a.start < b.end && b.start < a.end;

function checkInvariants(input: ScheduleInput, schedule: Schedule) {
  const jobs = new Map(input.jobs.map((j) => [j.id, j]));
  const printers = new Map(input.printers.map((p) => [p.id, p]));
  const windows = expandStartWindows(input.calendar, input.now, input.now + 365 * DAY);

  // Every job is accounted for exactly once.
  const seen = [...schedule.placements.map((x) => x.jobId), ...schedule.unplaced.map((x) => x.jobId)].sort();
  expect(seen).toEqual([...jobs.keys()].sort());

  for (const unplaced of schedule.unplaced) {
    const j = jobs.get(unplaced.jobId) as ScheduleJob;
    expect(unplaced.reason).not.toBe("beyond_horizon");
    if (unplaced.reason === "no_eligible_printer") {
      expect(j.printerId).toBeNull();
      for (const p of input.printers) expect(ineligibility(j, p)).not.toBeNull();
    } else {
      expect(j.printerId).not.toBeNull();
      const chosen = printers.get(j.printerId as string);
      if (chosen) expect(ineligibility(j, chosen)).not.toBeNull();
    }
  }

  const byPrinter = new Map<string, Placement[]>();
  for (const placement of schedule.placements) {
    const list = byPrinter.get(placement.printerId) ?? [];
    list.push(placement);
    byPrinter.set(placement.printerId, list);
    const j = jobs.get(placement.jobId) as ScheduleJob;
    if (j.running) {
      expect(placement.printerId).toBe(j.running.printerId);
      expect(placement.start).toBe(j.running.start);
      continue;
    }
    const p = printers.get(placement.printerId) as SchedulePrinter;
    expect(ineligibility(j, p)).toBeNull();
    if (j.printerId !== null) expect(placement.printerId).toBe(j.printerId);
    expect(placement.changeoverStart).toBeGreaterThanOrEqual(input.now);
    // Starts (changeover and print) inside one start window.
    expect(windows.some((w) => w.start <= placement.changeoverStart && placement.start < w.end)).toBe(true);
    // Never overlapping maintenance.
    for (const block of p.maintenance) expect(overlaps({ start: placement.changeoverStart, end: placement.end }, block)).toBe(false);
    expect(placement.start - placement.changeoverStart).toBe(placement.changeover ? p.changeoverMinutes * MINUTE : 0);
    expect(placement.end - placement.start).toBeCloseTo((j.hoursByPrinter[p.id] as number) * HOUR, 3);
  }

  for (const [printerId, list] of byPrinter) {
    list.sort((a, b) => a.changeoverStart - b.changeoverStart);
    const p = printers.get(printerId);
    let setup = p?.setup ?? null;
    let previousWaiting: ScheduleJob | null = null;
    list.forEach((placement, i) => {
      const j = jobs.get(placement.jobId) as ScheduleJob;
      // No overlaps on a printer.
      if (i > 0) expect((list[i - 1] as Placement).end).toBeLessThanOrEqual(placement.changeoverStart);
      if (!j.running && p) {
        // A changeover exactly when the set-up changes (or is unknown) and the printer takes time for it.
        expect(placement.changeover).toBe(p.changeoverMinutes > 0 && (setup === null || !sameSetup(setup, j)));
        // Priority: on each printer, a job never follows one of a lower priority class.
        if (previousWaiting) expect(comparePriorityClass(previousWaiting, j)).toBeLessThanOrEqual(0);
        previousWaiting = j;
      }
      setup = { variantKey: j.variantKey, material: j.material };
    });
  }
}

function shuffled<T>(items: readonly T[], seed: number): T[] {
  const copy = [...items];
  let state = seed;
  for (let i = copy.length - 1; i > 0; i--) {
    state = (state * 1_103_515_245 + 12_345) % 2_147_483_648;
    const k = state % (i + 1);
    [copy[i], copy[k]] = [copy[k] as T, copy[i] as T];
  }
  return copy;
}

describe("schedule invariants (fast-check)", () => {
  it("starts inside windows, misses maintenance, never overlaps, places every eligible job, keeps priority", () => {
    fc.assert(
      fc.property(labArb, (input) => {
        checkInvariants(input, buildSchedule(input));
      }),
      { numRuns: 250 },
    );
  });

  it("is deterministic: the same schedule again, and for the same lab listed in another order", () => {
    fc.assert(
      fc.property(labArb, fc.integer({ min: 1, max: 1_000_000 }), (input, seed) => {
        const first = buildSchedule(input);
        expect(buildSchedule(input)).toEqual(first);
        expect(buildSchedule({ ...input, jobs: shuffled(input.jobs, seed), printers: shuffled(input.printers, seed + 1) })).toEqual(first);
      }),
      { numRuns: 100 },
    );
  });
});

describe("start window expansion (fast-check)", () => {
  const formats = new Map<string, Intl.DateTimeFormat>();
  const format = (timeZone: string, options: Intl.DateTimeFormatOptions) => {
    const key = `${timeZone}|${JSON.stringify(options)}`;
    if (!formats.has(key)) formats.set(key, new Intl.DateTimeFormat("en-GB", { timeZone, ...options }));
    return formats.get(key) as Intl.DateTimeFormat;
  };
  const wall = (instant: number, timeZone: string) => {
    const parts = format(timeZone, { hourCycle: "h23", weekday: "short", hour: "numeric", minute: "numeric" }).formatToParts(new Date(instant));
    const get = (type: string) => parts.find((part) => part.type === type)?.value ?? "";
    const isoWeekday = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"].indexOf(get("weekday")) + 1;
    return { isoWeekday, minute: Number(get("hour")) * 60 + Number(get("minute")) };
  };
  const offset = (instant: number, timeZone: string) => {
    const parts = format(timeZone, { timeZoneName: "longOffset" }).formatToParts(new Date(instant));
    return parts.find((part) => part.type === "timeZoneName")?.value;
  };

  it("covers exactly the instants whose local weekday and time fall in a window and outside closures", () => {
    fc.assert(
      fc.property(
        labArb,
        fc.array(fc.integer({ min: 0, max: 60 * 24 * 60 - 1 }), { minLength: 20, maxLength: 20 }),
        (input, probes) => {
          const calendar: LabCalendar = input.calendar;
          const to = input.now + 60 * DAY;
          const windows = expandStartWindows(calendar, input.now, to);
          windows.forEach((w, i) => {
            expect(w.end).toBeGreaterThan(w.start);
            if (i > 0) expect(w.start).toBeGreaterThan((windows[i - 1] as Interval).end);
          });
          for (const minutes of probes) {
            const t = input.now + minutes * MINUTE;
            // Days with a clock change are checked by the worked DST examples instead.
            if (offset(t - DAY, calendar.timeZone) !== offset(t + DAY, calendar.timeZone)) continue;
            const local = wall(t, calendar.timeZone);
            const staffed = calendar.startWindows.some((w) => w.isoWeekday === local.isoWeekday && w.startMinute <= local.minute && local.minute < w.endMinute);
            const closed = calendar.closures.some((c) => c.start <= t && t < c.end);
            expect(windows.some((w) => w.start <= t && t < w.end)).toBe(staffed && !closed);
          }
        },
      ),
      { numRuns: 150 },
    );
  });
});

describe("grouping by set-up (fast-check)", () => {
  it("on one printer, a class of jobs needs one changeover per set-up it does not already have", () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ variantKey: fc.constantFrom(...VARIANTS), material: fc.constantFrom("PLA", "PETG"), quarterHours: fc.integer({ min: 1, max: 40 }) }), { minLength: 1, maxLength: 15 }),
        fc.option(fc.record({ variantKey: fc.constantFrom(...VARIANTS), material: fc.constantFrom("PLA", "PETG") }), { nil: null }),
        (specs, setup) => {
          const p: SchedulePrinter = { id: "p", available: true, materials: ["PLA", "PETG"], enclosed: false, buildMm: { x: 300, y: 300, z: 300 }, changeoverMinutes: 25, maintenance: [], setup };
          const jobs: ScheduleJob[] = specs.map((spec, i) => ({
            id: `j${String(i).padStart(2, "0")}`,
            campaignId: "c",
            variantKey: spec.variantKey,
            material: spec.material,
            needsEnclosure: false,
            sizeMm: { x: 10, y: 10, z: 10 },
            hoursByPrinter: { p: spec.quarterHours / 4 },
            fundedAt: 0,
            pinned: false,
            position: null,
            printerId: null,
          }));
          const schedule = buildSchedule({ now: 0, calendar: { timeZone: "UTC", startWindows: [], closures: [] }, printers: [p], jobs });
          const setups = new Set(specs.map((spec) => `${spec.variantKey}|${spec.material}`));
          const alreadySet = setup !== null && setups.has(`${setup.variantKey}|${setup.material}`);
          expect(schedule.placements.filter((x) => x.changeover)).toHaveLength(setups.size - (alreadySet ? 1 : 0));
        },
      ),
      { numRuns: 200 },
    );
  });
});

import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildSchedule, lowerBound } from "@/lib/schedule";
import { bruteForceMakespan, identicalInstance, makespanHours, seededRandom, HOUR } from "../helpers/schedule-fixtures";

/*
 * Worst-case bounds for scheduling independent jobs on m identical machines (no windows, no
 * changeovers, no maintenance), both from memory:
 *   list scheduling, any order:  C ≤ (2 − 1/m)·OPT       — R. L. Graham, "Bounds for certain
 *     multiprocessing anomalies", Bell System Technical Journal 45 (1966). Its proof gives the
 *     sharper C ≤ Σp/m + (1 − 1/m)·p_last, p_last the job that finishes last, hence also
 *     C ≤ (2 − 1/m)·max(Σp/m, p_max).
 *   longest processing time first (LPT):  C ≤ (4/3 − 1/(3m))·OPT — R. L. Graham, "Bounds on
 *     multiprocessing timing anomalies", SIAM J. Appl. Math. 17 (1969), tight for the family
 *     2m−1, 2m−1, 2m−2, 2m−2, …, m+1, m+1, m, m, m (OPT 3m, LPT 4m−1).
 * OPT on tiny instances is found by trying every assignment (bruteForceMakespan).
 */

const EPSILON = 1e-9;
const grahamList = (m: number) => 2 - 1 / m;
const grahamLpt = (m: number) => 4 / 3 - 1 / (3 * m);

const tinyInstance = fc.record({
  m: fc.integer({ min: 2, max: 3 }),
  durations: fc.array(fc.integer({ min: 1, max: 40 }), { minLength: 1, maxLength: 7 }),
});

describe("makespan against the optimum on tiny instances", () => {
  it("reaches Graham's tight LPT case exactly: m = 2 → 7 vs OPT 6, m = 3 → 11 vs OPT 9", () => {
    for (const m of [2, 3]) {
      const durations = [...Array.from({ length: m - 1 }, (_, i) => [2 * m - 1 - i, 2 * m - 1 - i]).flat(), m, m, m];
      const opt = bruteForceMakespan(durations, m);
      const lpt = makespanHours(buildSchedule(identicalInstance(durations, m)));
      expect(opt).toBe(3 * m);
      expect(lpt).toBe(4 * m - 1);
      expect(lpt / opt).toBeCloseTo(grahamLpt(m), 12);
    }
  });

  it("LPT (one priority class) stays within (4/3 − 1/(3m))·OPT", () => {
    fc.assert(
      fc.property(tinyInstance, ({ m, durations }) => {
        const opt = bruteForceMakespan(durations, m);
        const lpt = makespanHours(buildSchedule(identicalInstance(durations, m)));
        expect(lpt).toBeGreaterThanOrEqual(opt - EPSILON);
        expect(lpt).toBeLessThanOrEqual(grahamLpt(m) * opt + EPSILON);
      }),
      { numRuns: 300 },
    );
  });

  it("list scheduling in the host's order stays within (2 − 1/m)·OPT", () => {
    fc.assert(
      fc.property(tinyInstance, ({ m, durations }) => {
        const opt = bruteForceMakespan(durations, m);
        const list = makespanHours(buildSchedule(identicalInstance(durations, m, "list order")));
        expect(list).toBeGreaterThanOrEqual(opt - EPSILON);
        expect(list).toBeLessThanOrEqual(grahamList(m) * opt + EPSILON);
      }),
      { numRuns: 300 },
    );
  });

  it("a list order can be worse than LPT, but not beyond the list bound (m = 2: 1, 1, 2 → 3 vs OPT 2)", () => {
    // Worked by hand: in order, 1 and 1 take both machines, 2 follows on one: 1 + 2 = 3. LPT puts 2 alone: 2.
    const durations = [1, 1, 2];
    expect(bruteForceMakespan(durations, 2)).toBe(2);
    expect(makespanHours(buildSchedule(identicalInstance(durations, 2, "list order")))).toBe(3);
    expect(makespanHours(buildSchedule(identicalInstance(durations, 2)))).toBe(2);
    expect(3 / 2).toBeLessThanOrEqual(grahamList(2));
  });
});

describe("makespan against the lower bound on larger instances", () => {
  it("lowerBound is max(Σp/m, p_max)", () => {
    expect(lowerBound([3, 3, 2, 2, 2], 2)).toBe(6);
    expect(lowerBound([{ hours: 10 }, { hours: 1 }, { hours: 1 }], 3)).toBe(10);
    expect(lowerBound([], 4)).toBe(0);
    expect(() => lowerBound([1], 0)).toThrow(RangeError);
  });

  it("list and LPT schedules of 20–300 jobs on 2–12 printers meet Graham's inequalities", () => {
    const random = seededRandom(20_261_202);
    for (let trial = 0; trial < 40; trial++) {
      const m = 2 + Math.floor(random() * 11);
      const n = 20 + Math.floor(random() * 281);
      const durations = Array.from({ length: n }, () => Math.round((0.5 + random() * 29.5) * 4) / 4);
      const bound = lowerBound(durations, m);
      const total = durations.reduce((sum, hours) => sum + hours, 0);
      for (const order of ["one class", "list order"] as const) {
        const schedule = buildSchedule(identicalInstance(durations, m, order));
        const makespan = makespanHours(schedule);
        expect(schedule.placements).toHaveLength(n);
        expect(makespan).toBeGreaterThanOrEqual(bound - EPSILON);
        expect(makespan).toBeLessThanOrEqual(grahamList(m) * bound + EPSILON);
        const last = schedule.placements.reduce((a, b) => (b.end > a.end ? b : a));
        const lastHours = (last.end - last.start) / HOUR;
        expect(makespan).toBeLessThanOrEqual(total / m + (1 - 1 / m) * lastHours + EPSILON);
      }
    }
  });
});

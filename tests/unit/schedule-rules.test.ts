import { describe, expect, it } from "vitest";
import { buildSchedule, checkPlacement, fitsBuildVolume, ineligibility, resultDates } from "@/lib/schedule";
import type { LabCalendar, ScheduleInput, WeeklyWindow } from "@/lib/schedule";
import { alwaysStaffed, HOUR, job, MINUTE, printer } from "../helpers/schedule-fixtures";

// The expected times below are worked by hand from the rules in lib/schedule (hours after `now`).
const at = (schedule: ReturnType<typeof buildSchedule>, jobId: string) => schedule.placements.find((placement) => placement.jobId === jobId);
const hoursOf = (ms: number | undefined) => (ms === undefined ? undefined : ms / HOUR);
const hours = (value: number, ...printerIds: string[]) => Object.fromEntries(printerIds.map((id) => [id, value]));

describe("who can print what", () => {
  it("checks availability, material, enclosure, build volume and estimate, in that order", () => {
    const base = job("j", hours(2, "p"), { material: "ASA", needsEnclosure: true, sizeMm: { x: 240, y: 120, z: 100 } });
    const good = printer("p", { materials: ["pla", " asa "], enclosed: true, buildMm: { x: 150, y: 250, z: 100 } });
    expect(ineligibility(base, good)).toBeNull();
    expect(ineligibility(base, { ...good, available: false })?.code).toBe("printer_unavailable");
    expect(ineligibility(base, { ...good, materials: ["PLA"] })?.code).toBe("material");
    expect(ineligibility(base, { ...good, enclosed: false })?.code).toBe("enclosure");
    expect(ineligibility(base, { ...good, buildMm: { x: 150, y: 250, z: 99 } })?.code).toBe("build_volume");
    expect(ineligibility({ ...base, hoursByPrinter: {} }, good)?.code).toBe("no_estimate");
    expect(ineligibility({ ...base, hoursByPrinter: { p: 0 } }, good)?.code).toBe("no_estimate");
  });

  it("lets a part turn on the bed (x ↔ y) but never changes its height", () => {
    const build = { x: 200, y: 100, z: 150 };
    expect(fitsBuildVolume({ x: 100, y: 200, z: 150 }, build)).toBe(true);
    expect(fitsBuildVolume({ x: 150, y: 100, z: 200 }, build)).toBe(false);
    expect(fitsBuildVolume({ x: 201, y: 50, z: 10 }, build)).toBe(false);
  });
});

describe("changeovers and grouping", () => {
  it("adds the changeover when the variant or the material changes, before the print, and not otherwise", () => {
    const p = printer("p", { changeoverMinutes: 30, setup: { variantKey: "a", material: "PLA" } });
    const input: ScheduleInput = {
      now: 0,
      calendar: alwaysStaffed,
      printers: [p],
      jobs: [
        job("1", hours(2, "p"), { variantKey: "a", position: 1 }),
        job("2", hours(2, "p"), { variantKey: "a", position: 2 }),
        job("3", hours(2, "p"), { variantKey: "b", position: 3 }),
        job("4", hours(2, "p"), { variantKey: "b", material: "PETG", position: 4 }),
      ],
    };
    const schedule = buildSchedule(input);
    // 1: 0–2 (already set up for a), 2: 2–4, 3: changeover 4–4.5, print 4.5–6.5, 4: changeover 6.5–7, print 7–9.
    expect(schedule.placements.map((x) => [x.jobId, hoursOf(x.changeoverStart), hoursOf(x.start), hoursOf(x.end), x.changeover])).toEqual([
      ["1", 0, 0, 2, false],
      ["2", 2, 2, 4, false],
      ["3", 4, 4.5, 6.5, true],
      ["4", 6.5, 7, 9, true],
    ]);
  });

  it("counts a changeover for the first job on a printer whose set-up is unknown", () => {
    const schedule = buildSchedule({ now: 0, calendar: alwaysStaffed, printers: [printer("p", { changeoverMinutes: 15 })], jobs: [job("1", hours(1, "p"))] });
    expect(at(schedule, "1")).toMatchObject({ changeoverStart: 0, start: 15 * MINUTE, end: 15 * MINUTE + HOUR, changeover: true });
  });

  it("keeps each printer on its current variant instead of swapping parts back and forth", () => {
    // p1 is set up for a, p2 for b; two 10 h jobs of each, same priority. Keeping the set-ups gives
    // both printers 0–20 with no changeover; LPT alone would send a second a-job to p2 and swap twice.
    const printers = [
      printer("p1", { changeoverMinutes: 30, setup: { variantKey: "a", material: "PLA" } }),
      printer("p2", { changeoverMinutes: 30, setup: { variantKey: "b", material: "PLA" } }),
    ];
    const jobs = ["a1", "a2", "b1", "b2"].map((id) => job(id, hours(10, "p1", "p2"), { variantKey: id.slice(0, 1) }));
    const schedule = buildSchedule({ now: 0, calendar: alwaysStaffed, printers, jobs });
    expect(schedule.placements.every((x) => !x.changeover)).toBe(true);
    expect(schedule.placements.map((x) => [x.jobId, x.printerId, hoursOf(x.start)])).toEqual([
      ["a1", "p1", 0],
      ["b1", "p2", 0],
      ["a2", "p1", 10],
      ["b2", "p2", 10],
    ]);
  });
});

describe("priority, the host's choices and running jobs", () => {
  it("places pins first, then host order (nulls last), then funded date, then id", () => {
    const jobs = [
      job("late-funded", hours(1, "p"), { fundedAt: 200 }),
      job("early-funded-b", hours(1, "p"), { fundedAt: 100 }),
      job("early-funded-a", hours(1, "p"), { fundedAt: 100, variantKey: "x" }),
      job("ordered-2", hours(1, "p"), { position: 2, fundedAt: 900 }),
      job("ordered-1", hours(1, "p"), { position: 1, fundedAt: 900 }),
      job("pinned", hours(1, "p"), { pinned: true, fundedAt: 999 }),
    ];
    const schedule = buildSchedule({ now: 0, calendar: alwaysStaffed, printers: [printer("p")], jobs });
    // early-funded-a and -b share a class with equal hours, so the set-up key decides: "stock" sorts before "x".
    expect(schedule.placements.map((x) => x.jobId)).toEqual(["pinned", "ordered-1", "ordered-2", "early-funded-b", "early-funded-a", "late-funded"]);
  });

  it("keeps the host's printer when it can take the job, and otherwise says why", () => {
    const printers = [printer("fast"), printer("slow", { materials: ["PLA"] })];
    const jobs = [
      job("kept", { fast: 1, slow: 5 }, { printerId: "slow" }),
      job("refused", { fast: 1, slow: 5 }, { printerId: "slow", material: "PETG" }),
      job("nowhere", { fast: 1 }, { material: "TPU" }),
    ];
    const schedule = buildSchedule({ now: 0, calendar: alwaysStaffed, printers, jobs });
    expect(at(schedule, "kept")?.printerId).toBe("slow");
    expect(schedule.unplaced.map((x) => [x.jobId, x.reason])).toEqual([
      ["nowhere", "no_eligible_printer"],
      ["refused", "chosen_printer_ineligible"],
    ]);
    expect(schedule.unplaced[1]?.message).toContain("PETG");
  });

  it("leaves running jobs where they are, even on a printer now down, and starts the next after them", () => {
    const now = 10 * HOUR;
    const printers = [printer("down", { available: false }), printer("up")];
    const jobs = [
      job("running-down", { down: 4, up: 4 }, { running: { printerId: "down", start: 8 * HOUR } }),
      // Started 9 h ago with a 6 h estimate: overrunning, so taken to end now.
      job("overrunning", { up: 6 }, { running: { printerId: "up", start: 1 * HOUR } }),
      job("next", { down: 1, up: 1 }),
    ];
    const schedule = buildSchedule({ now, calendar: alwaysStaffed, printers, jobs });
    expect(at(schedule, "running-down")).toMatchObject({ printerId: "down", start: 8 * HOUR, end: 12 * HOUR });
    expect(at(schedule, "overrunning")).toMatchObject({ printerId: "up", start: 1 * HOUR, end: now });
    expect(at(schedule, "next")).toMatchObject({ printerId: "up", start: now, end: now + HOUR });
  });
});

describe("windows, maintenance and the horizon", () => {
  // 1 March 2027 00:00 UTC is a Monday; the lab is staffed 09:00–17:00 on weekdays.
  const monday = Date.UTC(2027, 2, 1);
  const weekdays: WeeklyWindow[] = ([1, 2, 3, 4, 5] as const).map((isoWeekday) => ({ isoWeekday, startMinute: 9 * 60, endMinute: 17 * 60 }));
  const lab: LabCalendar = { timeZone: "UTC", startWindows: weekdays, closures: [] };

  it("starts jobs only when someone is in, and finishes the changeover inside the window", () => {
    const p = printer("p", { changeoverMinutes: 60, setup: { variantKey: "stock", material: "PLA" } });
    const jobs = [job("1", hours(7.5, "p"), { position: 1 }), job("2", hours(2, "p"), { position: 2, variantKey: "other" })];
    const schedule = buildSchedule({ now: monday, calendar: lab, printers: [p], jobs });
    // 1 waits for 09:00 and runs to 16:30. 2's changeover would run 16:30–17:30, past 17:00, so it
    // waits for Tuesday 09:00: changeover 09:00–10:00, print 10:00–12:00.
    expect(at(schedule, "1")).toMatchObject({ start: monday + 9 * HOUR, end: monday + 16.5 * HOUR });
    expect(at(schedule, "2")).toMatchObject({ changeoverStart: monday + 33 * HOUR, start: monday + 34 * HOUR, end: monday + 36 * HOUR });
  });

  it("never lets changeover or print overlap maintenance", () => {
    const p = printer("p", { changeoverMinutes: 30, maintenance: [{ start: monday + 14 * HOUR, end: monday + 15 * HOUR }] });
    const schedule = buildSchedule({ now: monday, calendar: lab, printers: [p], jobs: [job("1", hours(4.75, "p"))] });
    // 09:00 + 0.5 + 4.75 = 14:15 would overlap 14:00–15:00; the next start is 15:00.
    expect(at(schedule, "1")).toMatchObject({ changeoverStart: monday + 15 * HOUR, start: monday + 15.5 * HOUR });
  });

  it("reports jobs it cannot start before the horizon", () => {
    const closedAllYear = { ...lab, closures: [{ start: monday, end: monday + 400 * 24 * HOUR }] };
    const schedule = buildSchedule({ now: monday, calendar: closedAllYear, printers: [printer("p")], jobs: [job("1", hours(1, "p"))] });
    expect(schedule.unplaced).toEqual([{ jobId: "1", reason: "beyond_horizon", message: expect.stringContaining("no start window") }]);
    const short = buildSchedule({ now: monday + 18 * HOUR, calendar: lab, printers: [printer("p")], jobs: [job("1", hours(1, "p"))], horizonDays: 0.5 });
    expect(short.unplaced[0]?.reason).toBe("beyond_horizon");
  });
});

describe("checking a host's move", () => {
  const monday = Date.UTC(2027, 2, 1);
  const lab: LabCalendar = { timeZone: "UTC", startWindows: [{ isoWeekday: 1, startMinute: 9 * 60, endMinute: 17 * 60 }], closures: [] };
  const input: ScheduleInput = {
    now: monday,
    calendar: lab,
    printers: [printer("p", { changeoverMinutes: 30, maintenance: [{ start: monday + 12 * HOUR, end: monday + 13 * HOUR }] }), printer("small", { buildMm: { x: 10, y: 10, z: 10 } })],
    jobs: [job("1", hours(2, "p", "small"))],
  };

  it("refuses an ineligible printer, a maintenance clash and a time nobody is in", () => {
    expect(checkPlacement(input, "1", "small")).toMatchObject({ ok: false, code: "ineligible" });
    expect(checkPlacement(input, "1", "p")).toEqual({ ok: true });
    expect(checkPlacement(input, "1", "p", monday + 9 * HOUR)).toEqual({ ok: true });
    // 10:00 + 0.5 + 2 = 12:30 runs into 12:00–13:00.
    expect(checkPlacement(input, "1", "p", monday + 10 * HOUR)).toMatchObject({ ok: false, code: "maintenance" });
    // 16:45: the half-hour changeover would end after 17:00.
    expect(checkPlacement(input, "1", "p", monday + 16.75 * HOUR)).toMatchObject({ ok: false, code: "outside_window" });
    expect(checkPlacement(input, "1", "p", monday + 20 * HOUR)).toMatchObject({ ok: false, code: "outside_window" });
    expect(checkPlacement(input, "missing", "p")).toMatchObject({ ok: false, code: "ineligible" });
  });

  it("refuses a printer whose maintenance leaves no long enough stretch", () => {
    const blocked = { ...input, printers: [printer("p", { maintenance: [{ start: monday, end: monday + 400 * 24 * HOUR }] })] };
    expect(checkPlacement(blocked, "1", "p")).toMatchObject({ ok: false, code: "maintenance" });
  });
});

describe("results dates", () => {
  it("is the campaign's last job end plus report preparation, or null while any job is unplaced", () => {
    const jobs = [
      job("a1", hours(3, "p1", "p2"), { campaignId: "A" }),
      job("a2", hours(5, "p1", "p2"), { campaignId: "A" }),
      job("b1", hours(1, "p1", "p2"), { campaignId: "B", material: "TPU" }),
      job("b2", hours(1, "p1", "p2"), { campaignId: "B" }),
    ];
    const schedule = buildSchedule({ now: 0, calendar: alwaysStaffed, printers: [printer("p1"), printer("p2")], jobs });
    // A: a2 on p1 0–5, a1 on p2 0–3 → last end 5 h; + 24 h preparation = 29 h. B: b1 needs TPU, which no printer takes.
    expect(resultDates(schedule, jobs, 24)).toEqual({ A: 29 * HOUR, B: null });
  });
});

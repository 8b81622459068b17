import { describe, expect, it } from "vitest";
import { ALWAYS_STAFFED, expandStartWindows } from "@/lib/schedule";
import type { LabCalendar, WeeklyWindow } from "@/lib/schedule";

/*
 * Clock changes from the IANA tz database rules (from memory, checked against the zone data the
 * runtime ships):
 *   Pacific/Auckland — "Rule NZ 2007 max Sep lastSun 2:00s 1:00 D" and "Rule NZ 2008 max Apr
 *   Sun>=1 2:00s 0 S": NZST UTC+12; NZDT UTC+13 from 02:00 NZST on the last Sunday of September
 *   until 03:00 NZDT on the first Sunday of April. In 2027: 4 April and 26 September.
 *   America/Denver — "Rule US 2007 max Mar Sun>=8 2:00 1:00 D" and "Rule US 2007 max Nov Sun>=1
 *   2:00 0 S": MST UTC−7; MDT UTC−6 from 02:00 on the second Sunday of March until 02:00 on the
 *   first Sunday of November. In 2027: 14 March and 7 November.
 */

const iso = (value: string) => Date.parse(value);
const show = (intervals: { start: number; end: number }[]) => intervals.map(({ start, end }) => [new Date(start).toISOString(), new Date(end).toISOString()]);
const weekdays = (startMinute: number, endMinute: number): WeeklyWindow[] =>
  ([1, 2, 3, 4, 5] as const).map((isoWeekday) => ({ isoWeekday, startMinute, endMinute }));
const calendar = (timeZone: string, startWindows: WeeklyWindow[], closures: LabCalendar["closures"] = []): LabCalendar => ({ timeZone, startWindows, closures });

describe("start windows across clock changes", () => {
  it("keeps 09:00–17:00 local in Auckland's autumn week, with the 25-hour Sunday (4 April 2027)", () => {
    const cal = calendar("Pacific/Auckland", [...weekdays(9 * 60, 17 * 60), { isoWeekday: 7, startMinute: 60, endMinute: 4 * 60 }]);
    expect(show(expandStartWindows(cal, iso("2027-03-31T12:00:00Z"), iso("2027-04-05T12:00:00Z")))).toEqual([
      // Thu 1 Apr (NZDT, +13): 09:00 = 31 Mar 20:00Z
      ["2027-03-31T20:00:00.000Z", "2027-04-01T04:00:00.000Z"],
      // Fri 2 Apr (NZDT)
      ["2027-04-01T20:00:00.000Z", "2027-04-02T04:00:00.000Z"],
      // Sun 4 Apr 01:00 NZDT = 3 Apr 12:00Z; 04:00 NZST (+12) = 3 Apr 16:00Z: four real hours for three on the clock
      ["2027-04-03T12:00:00.000Z", "2027-04-03T16:00:00.000Z"],
      // Mon 5 Apr (NZST, +12): 09:00 = 4 Apr 21:00Z
      ["2027-04-04T21:00:00.000Z", "2027-04-05T05:00:00.000Z"],
    ]);
  });

  it("keeps 09:00 local in Auckland's spring week; a window in the skipped hour is empty (26 September 2027)", () => {
    const cal = calendar("Pacific/Auckland", [...weekdays(9 * 60, 17 * 60), { isoWeekday: 7, startMinute: 60, endMinute: 4 * 60 }]);
    expect(show(expandStartWindows(cal, iso("2027-09-23T12:00:00Z"), iso("2027-09-27T12:00:00Z")))).toEqual([
      // Fri 24 Sep 09:00 NZST (+12) = 23 Sep 21:00Z
      ["2027-09-23T21:00:00.000Z", "2027-09-24T05:00:00.000Z"],
      // Sun 26 Sep 01:00 NZST = 25 Sep 13:00Z; 04:00 NZDT (+13) = 25 Sep 15:00Z: two real hours
      ["2027-09-25T13:00:00.000Z", "2027-09-25T15:00:00.000Z"],
      // Mon 27 Sep 09:00 NZDT (+13) = 26 Sep 20:00Z
      ["2027-09-26T20:00:00.000Z", "2027-09-27T04:00:00.000Z"],
    ]);
    // Both ends in the hour that never happens (02:00–03:00 NZST on 26 Sep): nobody is there.
    const skipped = calendar("Pacific/Auckland", [{ isoWeekday: 7, startMinute: 2 * 60 + 15, endMinute: 2 * 60 + 45 }]);
    expect(expandStartWindows(skipped, iso("2027-09-20T00:00:00Z"), iso("2027-09-30T00:00:00Z"))).toEqual([]);
  });

  it("gives Denver's 23-hour and 25-hour Sundays and moves weekday windows by the offset (March and November 2027)", () => {
    const cal = calendar("America/Denver", [...weekdays(9 * 60, 17 * 60), { isoWeekday: 7, startMinute: 0, endMinute: 1440 }]);
    expect(show(expandStartWindows(cal, iso("2027-03-12T12:00:00Z"), iso("2027-03-16T12:00:00Z")))).toEqual([
      // Fri 12 Mar 09:00 MST (−7) = 16:00Z
      ["2027-03-12T16:00:00.000Z", "2027-03-13T00:00:00.000Z"],
      // Sun 14 Mar 00:00 MST = 07:00Z to Mon 00:00 MDT (−6) = 15 Mar 06:00Z: 23 hours
      ["2027-03-14T07:00:00.000Z", "2027-03-15T06:00:00.000Z"],
      // Mon 15 Mar 09:00 MDT = 15:00Z
      ["2027-03-15T15:00:00.000Z", "2027-03-15T23:00:00.000Z"],
    ]);
    expect(show(expandStartWindows(cal, iso("2027-11-05T12:00:00Z"), iso("2027-11-09T12:00:00Z")))).toEqual([
      // Fri 5 Nov 09:00 MDT (−6) = 15:00Z
      ["2027-11-05T15:00:00.000Z", "2027-11-05T23:00:00.000Z"],
      // Sun 7 Nov 00:00 MDT = 06:00Z to Mon 00:00 MST (−7) = 8 Nov 07:00Z: 25 hours
      ["2027-11-07T06:00:00.000Z", "2027-11-08T07:00:00.000Z"],
      // Mon 8 Nov 09:00 MST = 16:00Z
      ["2027-11-08T16:00:00.000Z", "2027-11-09T00:00:00.000Z"],
    ]);
  });

  it("takes a repeated time at its first occurrence and a skipped one at the jump (Denver 2027)", () => {
    // 7 Nov: 01:30 first happens at 01:30 MDT = 07:30Z; the clock first reads 02:00 at 02:00 MST = 09:00Z.
    const autumn = calendar("America/Denver", [{ isoWeekday: 7, startMinute: 90, endMinute: 120 }]);
    expect(show(expandStartWindows(autumn, iso("2027-11-06T00:00:00Z"), iso("2027-11-08T00:00:00Z")))).toEqual([["2027-11-07T07:30:00.000Z", "2027-11-07T09:00:00.000Z"]]);
    // 14 Mar: 02:30 never happens; the clock jumps at 02:00 MST = 09:00Z; 03:30 MDT = 09:30Z.
    const spring = calendar("America/Denver", [{ isoWeekday: 7, startMinute: 150, endMinute: 210 }]);
    expect(show(expandStartWindows(spring, iso("2027-03-13T00:00:00Z"), iso("2027-03-15T00:00:00Z")))).toEqual([["2027-03-14T09:00:00.000Z", "2027-03-14T09:30:00.000Z"]]);
  });
});

describe("start windows, closures and edges", () => {
  it("joins windows that meet at midnight and clips to the range asked for", () => {
    const cal = calendar("UTC", [
      { isoWeekday: 1, startMinute: 22 * 60, endMinute: 1440 },
      { isoWeekday: 2, startMinute: 0, endMinute: 6 * 60 },
    ]);
    // 1 March 2027 is a Monday (proleptic Gregorian calendar).
    expect(show(expandStartWindows(cal, iso("2027-03-01T23:00:00Z"), iso("2027-03-09T00:00:00Z")))).toEqual([
      ["2027-03-01T23:00:00.000Z", "2027-03-02T06:00:00.000Z"],
      ["2027-03-08T22:00:00.000Z", "2027-03-09T00:00:00.000Z"],
    ]);
  });

  it("cuts closures out, whole days and parts of windows", () => {
    const cal = calendar("UTC", weekdays(9 * 60, 17 * 60), [
      { start: iso("2027-03-02T00:00:00Z"), end: iso("2027-03-03T00:00:00Z") },
      { start: iso("2027-03-03T12:00:00Z"), end: iso("2027-03-03T13:00:00Z") },
    ]);
    expect(show(expandStartWindows(cal, iso("2027-03-01T00:00:00Z"), iso("2027-03-04T00:00:00Z")))).toEqual([
      ["2027-03-01T09:00:00.000Z", "2027-03-01T17:00:00.000Z"],
      ["2027-03-03T09:00:00.000Z", "2027-03-03T12:00:00.000Z"],
      ["2027-03-03T13:00:00.000Z", "2027-03-03T17:00:00.000Z"],
    ]);
  });

  it("has no staffing limit when the lab sets no windows, and one unbroken stretch when always staffed", () => {
    const closure = { start: iso("2027-03-02T00:00:00Z"), end: iso("2027-03-03T00:00:00Z") };
    expect(show(expandStartWindows(calendar("UTC", [], [closure]), iso("2027-03-01T00:00:00Z"), iso("2027-03-04T00:00:00Z")))).toEqual([
      ["2027-03-01T00:00:00.000Z", "2027-03-02T00:00:00.000Z"],
      ["2027-03-03T00:00:00.000Z", "2027-03-04T00:00:00.000Z"],
    ]);
    // A window list whose every entry is empty (end ≤ start) is a limit that allows nothing.
    expect(expandStartWindows(calendar("UTC", [{ isoWeekday: 1, startMinute: 600, endMinute: 600 }]), 0, 7 * 86_400_000)).toEqual([]);
    const always = calendar("Pacific/Auckland", ALWAYS_STAFFED);
    const from = iso("2027-03-30T00:00:00Z");
    const to = iso("2027-04-10T00:00:00Z");
    expect(expandStartWindows(always, from, to)).toEqual([{ start: from, end: to }]);
  });
});

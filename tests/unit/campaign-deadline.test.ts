import { describe, expect, it } from "vitest";
import {
  addCalendarDays,
  calendarDateInZone,
  calendarDaysBetween,
  deadlineInstant,
  deadlineProblem,
  deadlineWindow,
  isCalendarDate,
} from "@/lib/campaign/deadline";

/*
 * Time-zone facts from the IANA tz database: US daylight saving time runs from the second Sunday
 * in March to the first Sunday in November (Energy Policy Act of 2005) — in 2026, 8 March and
 * 1 November; Chicago is UTC−6 in standard time and UTC−5 in daylight time. New Zealand daylight
 * time (UTC+13) ends on the first Sunday in April, so on 9 March 2026 Auckland is at UTC+13.
 */
const CHICAGO = "America/Chicago";

describe("calendar dates in the lab's time zone", () => {
  it("reads the wall calendar of the zone, not the server's", () => {
    const instant = new Date("2026-03-08T11:30:00Z");
    expect(calendarDateInZone(instant, CHICAGO)).toBe("2026-03-08"); // 06:30 CDT
    expect(calendarDateInZone(instant, "Pacific/Auckland")).toBe("2026-03-09"); // 00:30 NZDT
    expect(calendarDateInZone(new Date("2026-03-02T05:59:59Z"), CHICAGO)).toBe("2026-03-01"); // 23:59:59 CST
  });

  it("adds days across months, years and a leap day (Gregorian: 2028 is a leap year)", () => {
    expect(addCalendarDays("2026-12-31", 1)).toBe("2027-01-01");
    expect(addCalendarDays("2028-02-28", 1)).toBe("2028-02-29");
    expect(addCalendarDays("2026-03-01", 90)).toBe("2026-05-30");
    expect(calendarDaysBetween("2026-03-01", "2026-05-30")).toBe(90);
    expect(calendarDaysBetween("2026-03-10", "2026-03-08")).toBe(-2);
  });

  it("rejects things that are not dates", () => {
    expect(isCalendarDate("2026-02-30")).toBe(false);
    expect(isCalendarDate("2026-2-3")).toBe(false);
    expect(isCalendarDate("2026-02-28")).toBe(true);
    expect(() => addCalendarDays("yesterday", 1)).toThrow(RangeError);
  });
});

describe("the deadline instant", () => {
  it("is the last second of the chosen day on the lab's clock, on either side of a DST change", () => {
    // 8 March 2026 (DST starts that morning): 23:59:59 CDT = 04:59:59 UTC on 9 March.
    expect(deadlineInstant("2026-03-08", CHICAGO).toISOString()).toBe("2026-03-09T04:59:59.000Z");
    // 7 March 2026, still standard time: 23:59:59 CST = 05:59:59 UTC on 8 March.
    expect(deadlineInstant("2026-03-07", CHICAGO).toISOString()).toBe("2026-03-08T05:59:59.000Z");
    // 1 November 2026 (DST ends that morning): 23:59:59 CST = 05:59:59 UTC on 2 November.
    expect(deadlineInstant("2026-11-01", CHICAGO).toISOString()).toBe("2026-11-02T05:59:59.000Z");
    expect(deadlineInstant("2026-06-15", "UTC").toISOString()).toBe("2026-06-15T23:59:59.000Z");
  });
});

describe("the deadline window (3 to 90 days ahead)", () => {
  const now = new Date("2026-03-01T12:00:00Z"); // 06:00 CST on 1 March in Chicago

  it("counts calendar days from today in the lab's zone", () => {
    expect(deadlineWindow(now, CHICAGO, 3, 90)).toEqual({ today: "2026-03-01", earliest: "2026-03-04", latest: "2026-05-30" });
    // Late evening in Chicago is already the next day in Auckland; the lab's zone decides.
    const evening = new Date("2026-03-02T04:00:00Z");
    expect(deadlineWindow(evening, CHICAGO, 3, 90).today).toBe("2026-03-01");
  });

  it("accepts the bounds and refuses a day outside them, with a reason", () => {
    expect(deadlineProblem("2026-03-04", now, CHICAGO, 3, 90)).toBeUndefined();
    expect(deadlineProblem("2026-05-30", now, CHICAGO, 3, 90)).toBeUndefined();
    expect(deadlineProblem("2026-03-03", now, CHICAGO, 3, 90)).toMatch(/at least 3 days/);
    expect(deadlineProblem("2026-05-31", now, CHICAGO, 3, 90)).toMatch(/at most 90 days/);
    expect(deadlineProblem("not-a-date", now, CHICAGO, 3, 90)).toBe("Pick a deadline date.");
  });
});

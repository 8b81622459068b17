import { describe, expect, it } from "vitest";
import { formatLocalDateTime, formatMinuteOfDay, parseLocalDateTime, parseMinuteOfDay } from "@/lib/lab-calendar/local-time";
import { overlappingWindow, rangesOverlap } from "@/lib/lab-calendar/overlaps";

// US daylight saving (Energy Policy Act of 2005, 15 U.S.C. §260a): from 02:00 on the second Sunday
// of March to 02:00 on the first Sunday of November. In 2026 those are 8 March and 1 November.
// America/Chicago is UTC−6 in standard time (CST) and UTC−5 in daylight time (CDT).
const zone = "America/Chicago";

describe("lab wall-clock times", () => {
  it("reads a local time on either side of the spring change with the right offset", () => {
    expect(parseLocalDateTime("2026-03-08T01:30", zone)).toBe(Date.UTC(2026, 2, 8, 7, 30));
    expect(parseLocalDateTime("2026-03-08T03:30", zone)).toBe(Date.UTC(2026, 2, 8, 8, 30));
    expect(parseLocalDateTime("2026-07-01T08:00", zone)).toBe(Date.UTC(2026, 6, 1, 13, 0));
    expect(parseLocalDateTime("2026-12-24T08:00", zone)).toBe(Date.UTC(2026, 11, 24, 14, 0));
  });

  it("refuses the skipped hour, impossible dates and malformed strings", () => {
    expect(parseLocalDateTime("2026-03-08T02:30", zone)).toBeUndefined();
    expect(parseLocalDateTime("2026-02-31T08:00", zone)).toBeUndefined();
    expect(parseLocalDateTime("2026-12-24 08:00", zone)).toBeUndefined();
    expect(parseLocalDateTime("tomorrow", zone)).toBeUndefined();
  });

  it("names one of the two instants of the repeated autumn hour, and round-trips it", () => {
    const instant = parseLocalDateTime("2026-11-01T01:30", zone);
    expect([Date.UTC(2026, 10, 1, 6, 30), Date.UTC(2026, 10, 1, 7, 30)]).toContain(instant);
    expect(formatLocalDateTime(instant!, zone)).toBe("2026-11-01T01:30");
  });

  it("formats UTC instants on the lab's wall clock", () => {
    expect(formatLocalDateTime(Date.UTC(2026, 11, 24, 14, 0), zone)).toBe("2026-12-24T08:00");
    expect(formatLocalDateTime(Date.UTC(2026, 11, 24, 14, 0), "Pacific/Auckland")).toBe("2026-12-25T03:00"); // NZDT, UTC+13
  });

  it("reads minutes of the day, with 24:00 as the end of the day (ISO 8601-1:2019 §5.3.2)", () => {
    expect(parseMinuteOfDay("08:30")).toBe(510);
    expect(parseMinuteOfDay("24:00")).toBe(1440);
    expect(parseMinuteOfDay("24:30")).toBeUndefined();
    expect(parseMinuteOfDay("8:30")).toBeUndefined();
    expect(parseMinuteOfDay("12:60")).toBeUndefined();
    expect(formatMinuteOfDay(1230)).toBe("20:30");
  });
});

describe("overlaps", () => {
  it("treats ranges as half-open: touching ends do not overlap", () => {
    expect(rangesOverlap({ start: 0, end: 10 }, { start: 10, end: 20 })).toBe(false);
    expect(rangesOverlap({ start: 0, end: 10 }, { start: 9, end: 20 })).toBe(true);
    expect(rangesOverlap({ start: 5, end: 6 }, { start: 0, end: 20 })).toBe(true);
  });

  it("finds a clashing window only on the same weekday", () => {
    const existing = [{ id: "a", isoWeekday: 1, startMinute: 480, endMinute: 720 }];
    expect(overlappingWindow(existing, { isoWeekday: 2, startMinute: 600, endMinute: 900 })).toBeUndefined();
    expect(overlappingWindow(existing, { isoWeekday: 1, startMinute: 720, endMinute: 900 })).toBeUndefined();
    expect(overlappingWindow(existing, { isoWeekday: 1, startMinute: 700, endMinute: 900 })?.id).toBe("a");
  });
});

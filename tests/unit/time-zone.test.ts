import { describe, expect, it } from "vitest";
import { monthInZone, zonedMidnight } from "@/lib/time-zone";

// Offsets from the IANA tz database (US Central: CST UTC−6, CDT UTC−5 from the second Sunday of
// March; New Zealand: NZDT UTC+13 until the first Sunday of April, NZST UTC+12 after).
describe("time zones", () => {
  it("finds local midnight across daylight-saving changes", () => {
    expect(zonedMidnight(2026, 12, 1, "America/Chicago").toISOString()).toBe("2026-12-01T06:00:00.000Z");
    expect(zonedMidnight(2027, 3, 14, "America/Chicago").toISOString()).toBe("2027-03-14T06:00:00.000Z");
    expect(zonedMidnight(2027, 3, 15, "America/Chicago").toISOString()).toBe("2027-03-15T05:00:00.000Z");
    expect(zonedMidnight(2026, 12, 1, "Pacific/Auckland").toISOString()).toBe("2026-11-30T11:00:00.000Z");
    expect(zonedMidnight(2027, 5, 1, "Pacific/Auckland").toISOString()).toBe("2027-04-30T12:00:00.000Z");
    expect(zonedMidnight(2027, 1, 1, "UTC").toISOString()).toBe("2027-01-01T00:00:00.000Z");
  });

  it("gives the month containing an instant in the lab's zone, not the server's", () => {
    // 03:30 UTC on 1 Dec is still 30 Nov, 21:30 in Chicago.
    const lateNovemberInChicago = new Date("2026-12-01T03:30:00Z");
    expect(monthInZone(lateNovemberInChicago, "America/Chicago")).toEqual({
      start: new Date("2026-11-01T05:00:00Z"),
      end: new Date("2026-12-01T06:00:00Z"),
    });
    expect(monthInZone(new Date("2026-12-31T23:00:00Z"), "America/Chicago").end).toEqual(new Date("2027-01-01T06:00:00Z"));
  });
});

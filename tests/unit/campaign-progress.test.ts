import { describe, expect, it } from "vitest";
import { fundingProgress, timeLeft } from "@/lib/campaign/progress";
import { formatMoney } from "@/lib/format";

describe("fundingProgress", () => {
  it("rounds the percentage down so a campaign short of its goal never shows 100 %", () => {
    expect(fundingProgress(39_960, 40_000).percent).toBe(99);
    expect(fundingProgress(39_960, 40_000).goalMet).toBe(false);
    expect(fundingProgress(40_000, 40_000)).toMatchObject({ percent: 100, goalMet: true, remainingMinor: 0 });
    expect(fundingProgress(52_000, 40_000)).toMatchObject({ percent: 130, remainingMinor: 0 });
  });

  it("rejects fractional minor units and empty goals", () => {
    expect(() => fundingProgress(10.5, 100)).toThrow(RangeError);
    expect(() => fundingProgress(10, 0)).toThrow(RangeError);
  });
});

describe("timeLeft", () => {
  const now = new Date("2026-03-08T12:00:00Z");
  it("uses the coarsest whole unit", () => {
    expect(timeLeft(new Date("2026-03-20T13:00:00Z"), now)).toBe("12 days left");
    expect(timeLeft(new Date("2026-03-09T17:00:00Z"), now)).toBe("29 hours left");
    expect(timeLeft(new Date("2026-03-08T12:01:00Z"), now)).toBe("1 minute left");
    expect(timeLeft(new Date("2026-03-08T11:00:00Z"), now)).toBe("ended");
  });
});

describe("money formatting", () => {
  it("drops decimals only for whole amounts, by ISO 4217 minor units (USD 2, JPY 0, BHD 3)", () => {
    expect(formatMoney(1_234, "BHD")).toMatch(/^BHD\s1\.234$/);
    expect(formatMoney(123_456, "USD")).toBe("$1,234.56");
    expect(formatMoney(40_000, "USD")).toBe("$400");
    expect(formatMoney(5_000, "JPY")).toBe("¥5,000");
  });
});

describe("date formatting", () => {
  it("shows instants in the lab's time zone, whatever the server's (IANA tz: Chicago is UTC−6 in winter)", async () => {
    const { formatDate, formatDateTime } = await import("@/lib/format");
    const instant = new Date("2026-12-02T03:30:00Z");
    expect(formatDate(instant, "America/Chicago")).toBe("Dec 1, 2026");
    expect(formatDateTime(instant, "America/Chicago")).toBe("Dec 1, 2026, 9:30 PM CST");
  });
});

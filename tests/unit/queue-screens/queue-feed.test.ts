import { describe, expect, it } from "vitest";
import { buildQueueCalendar, feedUid, type FeedJob } from "@/lib/queue-feed/ics";

const job = (overrides: Partial<FeedJob> = {}): FeedJob => ({
  jobId: "7d1c2a9e-0000-4000-8000-000000000001",
  sequence: 0,
  start: Date.UTC(2026, 11, 3, 14, 0),
  end: Date.UTC(2026, 11, 3, 16, 45),
  printerName: "Bay 1 — Kestrel",
  campaignTitle: "Twin-inlet ring duct, long overhangs; does it beat the stock duct?",
  pieceName: "Overhang ladder",
  variantName: "Ring duct, 2 inlets",
  repeat: 2,
  running: false,
  ...overrides,
});

/** RFC 5545 §3.1: unfold by removing each CRLF followed by one space or tab, then split into content lines. */
function contentLines(text: string): string[] {
  return text.replace(/\r\n[ \t]/g, "").split("\r\n").filter(Boolean);
}

function events(text: string): Map<string, string>[] {
  const result: Map<string, string>[] = [];
  let current: Map<string, string> | null = null;
  for (const line of contentLines(text)) {
    if (line === "BEGIN:VEVENT") current = new Map();
    else if (line === "END:VEVENT" && current) {
      result.push(current);
      current = null;
    } else if (current) {
      const colon = line.indexOf(":");
      const name = line.slice(0, colon).split(";")[0]!;
      current.set(name, line.slice(colon + 1));
    }
  }
  return result;
}

describe("the host calendar feed (RFC 5545)", () => {
  const now = Date.UTC(2026, 11, 2, 1, 0);
  const text = buildQueueCalendar([job(), job({ jobId: "7d1c2a9e-0000-4000-8000-000000000002", running: true, sequence: 1, repeat: 1 })], { labName: "Harbor Street Print Lab", now });

  it("is one VCALENDAR with VERSION 2.0 and a PRODID (§3.4, §3.7.3, §3.7.4), lines in CRLF, folded at 75 octets (§3.1)", () => {
    const lines = contentLines(text);
    expect(lines[0]).toBe("BEGIN:VCALENDAR");
    expect(lines.at(-1)).toBe("END:VCALENDAR");
    expect(lines).toContain("VERSION:2.0");
    expect(lines.some((line) => line.startsWith("PRODID:"))).toBe(true);
    expect(text.replace(/\r\n/g, "")).not.toMatch(/\n/);
    for (const physical of text.split("\r\n")) expect(Buffer.byteLength(physical, "utf8")).toBeLessThanOrEqual(75);
  });

  it("gives each VEVENT the required UID and DTSTAMP (§3.6.1) and UTC DTSTART/DTEND (§3.3.5 form #2)", () => {
    const [first, second] = events(text);
    expect(first?.get("UID")).toBe(feedUid("7d1c2a9e-0000-4000-8000-000000000001"));
    expect(first?.get("DTSTAMP")).toMatch(/^\d{8}T\d{6}Z$/);
    expect(first?.get("DTSTART")).toBe("20261203T140000Z");
    expect(first?.get("DTEND")).toBe("20261203T164500Z");
    expect(first?.get("STATUS")).toBe("TENTATIVE");
    expect(second?.get("STATUS")).toBe("CONFIRMED");
    expect(second?.get("SEQUENCE")).toBe("1");
  });

  it("escapes commas and semicolons in TEXT values (§3.3.11)", () => {
    const [first] = events(text);
    expect(first?.get("DESCRIPTION")).toContain("Twin-inlet ring duct\\, long overhangs\\; does it beat the stock duct?");
    expect(first?.get("SUMMARY")).toBe("Bay 1 — Kestrel: Overhang ladder × Ring duct\\, 2 inlets #2");
  });

  it("keeps a job's UID when it moves, so calendar apps update the event instead of adding one", () => {
    const moved = buildQueueCalendar([job({ start: Date.UTC(2026, 11, 4, 14, 0), end: Date.UTC(2026, 11, 4, 16, 45) })], { labName: "Lab", now });
    expect(events(moved)[0]?.get("UID")).toBe(events(text)[0]?.get("UID"));
    expect(events(moved)[0]?.get("DTSTART")).toBe("20261204T140000Z");
  });

  it("is still a calendar when nothing is scheduled", () => {
    const empty = buildQueueCalendar([], { labName: "Lab", now });
    expect(contentLines(empty)).toEqual(expect.arrayContaining(["BEGIN:VCALENDAR", "VERSION:2.0", "END:VCALENDAR"]));
    expect(events(empty)).toHaveLength(0);
  });
});

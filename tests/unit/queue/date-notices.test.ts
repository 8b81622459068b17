import { describe, expect, it } from "vitest";
import { dateNotice } from "@/lib/queue/date-notices";

const DAY = 86_400_000;
const told = Date.UTC(2026, 11, 10, 17, 0);

describe("which date mail backers get after a recompute", () => {
  it("announces the first date once", () => {
    expect(dateNotice({ estimatedResultsAt: told, scheduledNotifiedAt: null, lastNotifiedResultsAt: null }, 2)).toEqual({ kind: "scheduled", resultsAt: told });
    expect(dateNotice({ estimatedResultsAt: told, scheduledNotifiedAt: told - 5 * DAY, lastNotifiedResultsAt: told }, 2)).toBeNull();
  });

  it("stays quiet while there is no honest date (an unplaced job)", () => {
    expect(dateNotice({ estimatedResultsAt: null, scheduledNotifiedAt: null, lastNotifiedResultsAt: null }, 2)).toBeNull();
    expect(dateNotice({ estimatedResultsAt: null, scheduledNotifiedAt: 1, lastNotifiedResultsAt: told }, 2)).toBeNull();
  });

  it("mails a slip only when the date is later by more than the threshold", () => {
    const base = { scheduledNotifiedAt: told - 5 * DAY, lastNotifiedResultsAt: told };
    expect(dateNotice({ ...base, estimatedResultsAt: told + 2 * DAY }, 2)).toBeNull();
    expect(dateNotice({ ...base, estimatedResultsAt: told + 2 * DAY + 1 }, 2)).toEqual({ kind: "slipped", previous: told, resultsAt: told + 2 * DAY + 1 });
    expect(dateNotice({ ...base, estimatedResultsAt: told - 4 * DAY }, 2)).toBeNull();
    expect(dateNotice({ ...base, estimatedResultsAt: told + 1 * DAY }, 0)).toEqual({ kind: "slipped", previous: told, resultsAt: told + DAY });
  });
});

import { afterAll, describe, expect, it } from "vitest";
import { enqueueMail, MAX_SEND_ATTEMPTS, retryDelayMs } from "@/db/queries/outbox";
import { outbox } from "@/db/schema";
import { drainOutbox } from "@/server/outbox-worker";
import type { OutgoingMail } from "@/server/mailer";
import { createTempDb } from "../helpers/temp-db";

const temp = createTempDb();
afterAll(() => temp.cleanup());

const declined = (n: number) => ({
  dedupeKey: `proposal-declined:p${n}:ada@backers.example`,
  toAddress: "ada@backers.example",
  template: "proposal-declined",
  subject: `About proposal ${n}`,
  payload: { name: "Ada", proposalTitle: `Proposal ${n}`, reason: "Already tested last spring.", proposalUrl: "http://localhost/p" },
});

describe("outbox", () => {
  it("keeps one message per (recipient, event) however often it is queued", () => {
    enqueueMail(temp.db, declined(1));
    enqueueMail(temp.db, declined(1));
    expect(temp.db.select().from(outbox).all()).toHaveLength(1);
  });

  it("sends due mail once, with HTML and text parts and a stable Message-ID", async () => {
    const sent: OutgoingMail[] = [];
    const count = await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "proofbay.test" });
    expect(count).toBe(1);
    expect(sent[0]?.html).toContain("Already tested last spring.");
    expect(sent[0]?.text).toContain("Already tested last spring.");
    expect(sent[0]?.headers?.["Message-ID"]).toMatch(/^<[0-9a-f]{32}@proofbay\.test>$/);
    expect(await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "proofbay.test" })).toBe(0);
    expect(sent).toHaveLength(1);
  });

  it("retries a failed send with exponential backoff, then gives up after the last attempt", async () => {
    enqueueMail(temp.db, declined(2), new Date("2026-12-01T00:00:00Z"));
    let clock = new Date("2026-12-01T00:00:00Z").getTime();
    const failing = async () => {
      throw new Error("421 try later");
    };
    for (let attempt = 1; attempt <= MAX_SEND_ATTEMPTS; attempt++) {
      await drainOutbox(temp.db, failing, { domain: "proofbay.test", now: () => new Date(clock) });
      const row = temp.db.select().from(outbox).all().find((message) => message.dedupeKey === declined(2).dedupeKey);
      expect(row?.attempts).toBe(attempt);
      if (attempt < MAX_SEND_ATTEMPTS) {
        expect(row?.state).toBe("queued");
        expect(row?.nextAttemptAt.getTime()).toBe(clock + retryDelayMs(attempt));
        clock += retryDelayMs(attempt);
      } else {
        expect(row?.state).toBe("failed");
        expect(row?.lastError).toBe("421 try later");
      }
    }
    // Doubling delays: 30 s, 60 s, 120 s … (exponential backoff, capped at an hour).
    expect([1, 2, 3].map(retryDelayMs)).toEqual([30_000, 60_000, 120_000]);
    expect(retryDelayMs(20)).toBe(3_600_000);
  });

  it("re-sends a message whose sender died mid-send once its lease has run out", async () => {
    const start = new Date("2026-12-02T00:00:00Z").getTime();
    enqueueMail(temp.db, declined(3), new Date(start));
    // A crash between claiming and recording the outcome leaves the row "sending".
    const { claimDueMail } = await import("@/db/queries/outbox");
    expect(claimDueMail(temp.db, new Date(start), 10)).toHaveLength(1);
    const sent: OutgoingMail[] = [];
    expect(await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "t", now: () => new Date(start + 1_000) })).toBe(0);
    expect(await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "t", now: () => new Date(start + 3 * 60_000) })).toBe(1);
    expect(sent[0]?.subject).toBe("About proposal 3");
  });
});

import { afterAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { claimDueMail, enqueueMail, markMailFailed, MAX_SEND_ATTEMPTS, retryDelayMs, retryFailedMail } from "@/db/queries/outbox";
import { outbox } from "@/db/schema";
import { drainOutbox } from "@/server/outbox-worker";
import type { OutgoingMail } from "@/server/mailer";
import { createTempDb } from "../helpers/temp-db";

const links = { appUrl: "http://localhost:3000", unsubscribeSecret: "outbox-test-secret-0123456789" };
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
    const count = await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "proofbay.test", links });
    expect(count).toBe(1);
    expect(sent[0]?.html).toContain("Already tested last spring.");
    expect(sent[0]?.text).toContain("Already tested last spring.");
    expect(sent[0]?.headers?.["Message-ID"]).toMatch(/^<[0-9a-f]{32}@proofbay\.test>$/);
    expect(await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "proofbay.test", links })).toBe(0);
    expect(sent).toHaveLength(1);
  });

  it("retries a failed send with exponential backoff, then gives up after the last attempt", async () => {
    enqueueMail(temp.db, declined(2), new Date("2026-12-01T00:00:00Z"));
    let clock = new Date("2026-12-01T00:00:00Z").getTime();
    const failing = async () => {
      throw new Error("421 try later");
    };
    for (let attempt = 1; attempt <= MAX_SEND_ATTEMPTS; attempt++) {
      await drainOutbox(temp.db, failing, { domain: "proofbay.test", links, now: () => new Date(clock) });
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
    expect(claimDueMail(temp.db, new Date(start), 10)).toHaveLength(1);
    const sent: OutgoingMail[] = [];
    expect(await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "t", links, now: () => new Date(start + 1_000) })).toBe(0);
    expect(await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "t", links, now: () => new Date(start + 3 * 60_000) })).toBe(1);
    expect(sent[0]?.subject).toBe("About proposal 3");
    const row = temp.db.select().from(outbox).where(eq(outbox.dedupeKey, declined(3).dedupeKey)).get();
    expect(row).toMatchObject({ state: "sent", attempts: 1, interruptedAttempts: 1 });
  });

  // Each of these starts from an empty outbox so that leases left by earlier tests cannot interfere.
  it("lets only the attempt holding the claim record a failure", () => {
    const { db, cleanup } = createTempDb();
    try {
      const start = new Date("2026-12-03T00:00:00Z").getTime();
      enqueueMail(db, declined(4), new Date(start));
      const [stale] = claimDueMail(db, new Date(start), 10, { leaseMs: 1_000 });
      // The lease runs out and a second attempt takes the message over.
      const [current] = claimDueMail(db, new Date(start + 2_000), 10, { leaseMs: 60_000 });
      expect(current?.claimToken).not.toBe(stale?.claimToken);
      markMailFailed(db, stale!, "late timeout from the first attempt", new Date(start + 3_000));
      expect(db.select().from(outbox).get()).toMatchObject({ state: "sending", claimToken: current?.claimToken, lastError: null });
    } finally {
      cleanup();
    }
  });

  it("gives up on a message whose worker keeps dying before recording it", () => {
    const { db, cleanup } = createTempDb();
    try {
      let clock = new Date("2026-12-04T00:00:00Z").getTime();
      enqueueMail(db, declined(5), new Date(clock));
      for (let claim = 1; claim <= MAX_SEND_ATTEMPTS; claim++) {
        expect(claimDueMail(db, new Date(clock), 10, { leaseMs: 1_000 })).toHaveLength(1);
        clock += 2_000;
      }
      expect(claimDueMail(db, new Date(clock), 10, { leaseMs: 1_000 })).toHaveLength(0);
      expect(db.select().from(outbox).get()).toMatchObject({ state: "failed", attempts: MAX_SEND_ATTEMPTS, interruptedAttempts: MAX_SEND_ATTEMPTS });
    } finally {
      cleanup();
    }
  });

  it("re-queues a failed message once on 'retry now', however often it is clicked", async () => {
    const { db, cleanup } = createTempDb();
    try {
      const at = new Date("2026-12-05T00:00:00Z");
      enqueueMail(db, declined(6), at);
      const [claimed] = claimDueMail(db, at, 10);
      markMailFailed(db, claimed!, "550 mailbox unavailable", at, true);
      const failed = db.select().from(outbox).get()!;
      expect(failed).toMatchObject({ state: "failed", attempts: 1 });
      expect(retryFailedMail(db, failed.id, at)).toBe(true);
      expect(retryFailedMail(db, failed.id, at)).toBe(false);
      const sent: OutgoingMail[] = [];
      expect(await drainOutbox(db, async (mail) => void sent.push(mail), { domain: "t", links, now: () => at })).toBe(1);
      expect(sent.map((mail) => mail.subject)).toEqual(["About proposal 6"]);
      expect(retryFailedMail(db, failed.id, at)).toBe(false);
    } finally {
      cleanup();
    }
  });
});

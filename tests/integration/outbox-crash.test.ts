import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  backerAddress,
  createFanoutDb,
  interruptedAttempts,
  outboxStateCounts,
  queueReportFanout,
  runCrashAndRestart,
  storedPerRecipient,
} from "@/bench/mail-fanout-setup";
import { startFakeInbox, type FakeInbox } from "@/fakes/smtp/inbox";

const COUNT = 200;

describe("outbox worker killed mid-run and restarted", () => {
  let inbox: FakeInbox;
  const temp = createFanoutDb();

  beforeAll(async () => {
    // The receiving side drops repeated Message-IDs, as the outbox's guarantee assumes (see DEVELOPERS.md).
    inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, quiet: true, dedupeByMessageId: true });
    queueReportFanout(temp.db, COUNT);
  });
  afterAll(async () => {
    await inbox?.close();
    temp.cleanup();
  });

  it("leaves every recipient exactly one message, and re-sends only what an interrupted attempt may have sent", { timeout: 90_000 }, async () => {
    const run = await runCrashAndRestart(temp.file, inbox, { killAfter: 60, leaseMs: 1_500, timeoutMs: 80_000 });
    expect(run.killSignal).toBe("SIGKILL");
    expect(run.receivedWhenKilled).toBeLessThan(COUNT);
    expect(run.restartExitCode).toBe(0);

    expect(outboxStateCounts(temp.db)).toEqual({ sent: COUNT });
    const perRecipient = storedPerRecipient(inbox.messages());
    const counts = Array.from({ length: COUNT }, (_, i) => perRecipient.get(backerAddress(i + 1)) ?? 0);
    expect(counts.filter((count) => count !== 1)).toEqual([]);

    // What SMTP accepted, before the receiver's suppression: a copy accepted twice must be one the
    // killed worker had claimed but not recorded, so it cannot outnumber the interrupted attempts.
    const receptions = inbox.receptions();
    expect(receptions.distinctMessageIds).toBe(COUNT);
    expect(receptions.received).toBe(COUNT + receptions.suppressedDuplicates);
    expect(receptions.repeated.length).toBeLessThanOrEqual(interruptedAttempts(temp.db));
    expect(receptions.repeated.every((entry) => entry.count === 2)).toBe(true);
  });
});

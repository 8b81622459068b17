/**
 * Publishing a report to 10,000 backers (report issue): every message reaches the local fake SMTP
 * inbox in under 60 s with no duplicates, and after the worker is SIGKILLed mid-run and restarted
 * every recipient still has exactly one.
 *
 * Duplicates are counted by Message-ID in what the SMTP server accepted, before any suppression.
 * The first run keeps every copy (no receiver-side dedupe). The crash run turns on the inbox's
 * `dedupeByMessageId` (a receiver that drops repeated Message-IDs) and reports both what SMTP
 * accepted and what each mailbox holds.
 *   npx tsx bench/mail-fanout.ts
 */
import path from "node:path";
import { fileURLToPath } from "node:url";
import { SEND_LEASE_MS } from "../db/queries/outbox";
import { startFakeInbox } from "../fakes/smtp/inbox";
import {
  backerAddress,
  createFanoutDb,
  exited,
  interruptedAttempts,
  outboxStateCounts,
  queueReportFanout,
  runCrashAndRestart,
  startWorker,
  storedPerRecipient,
} from "./mail-fanout-setup";

export type MailFanoutFigures = {
  messages: number;
  /** Seconds from starting the worker process (drainOutbox + the pooled nodemailer transport) to all sent. */
  fanout: { seconds: number; messagesPerSecond: number; received: number; duplicateMessageIds: number; sent: number; enqueueMs: number };
  crash: {
    receivedWhenKilled: number;
    seconds: number;
    /** Accepted by SMTP, duplicates included. */
    received: number;
    /** Message-IDs SMTP accepted more than once: copies sent again after the kill. */
    duplicateMessageIds: number;
    interruptedAttempts: number;
    recipientsWithExactlyOne: number;
    recipientsWithNone: number;
    recipientsWithMore: number;
    sent: number;
  };
  meetsTimeTarget: boolean;
  exactlyOnce: boolean;
};

const TARGET_SECONDS = 60;

export async function runMailFanoutBench(count = 10_000): Promise<MailFanoutFigures> {
  const fanout = await runFanout(count);
  const crash = await runCrash(count);
  return {
    messages: count,
    fanout,
    crash,
    meetsTimeTarget: fanout.seconds < TARGET_SECONDS && fanout.received === count && fanout.sent === count && fanout.duplicateMessageIds === 0,
    exactlyOnce: crash.recipientsWithExactlyOne === count && crash.sent === count && crash.duplicateMessageIds <= crash.interruptedAttempts,
  };
}

/**
 * The worker runs as its own process (as it runs inside the app's), so the inbox's parsing in this
 * process and the worker's rendering and sending use the machine's two cores as they would in a
 * deployment with a separate mail server. Timed from starting the worker to its exit with nothing left.
 */
async function runFanout(count: number): Promise<MailFanoutFigures["fanout"]> {
  const inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, quiet: true, maxMessages: count * 2 });
  const temp = createFanoutDb();
  try {
    const enqueueStart = performance.now();
    queueReportFanout(temp.db, count);
    const enqueueMs = performance.now() - enqueueStart;
    const start = performance.now();
    const { code } = await exited(startWorker(temp.file, inbox.smtpPort, SEND_LEASE_MS));
    const seconds = (performance.now() - start) / 1000;
    if (code !== 0) throw new Error(`The worker exited with ${code}`);
    const receptions = inbox.receptions();
    return {
      seconds,
      messagesPerSecond: count / seconds,
      received: receptions.received,
      duplicateMessageIds: receptions.repeated.length,
      sent: outboxStateCounts(temp.db).sent ?? 0,
      enqueueMs,
    };
  } finally {
    temp.cleanup();
    await inbox.close();
  }
}

async function runCrash(count: number): Promise<MailFanoutFigures["crash"]> {
  const inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, quiet: true, maxMessages: count * 2, dedupeByMessageId: true });
  const temp = createFanoutDb();
  try {
    queueReportFanout(temp.db, count);
    const run = await runCrashAndRestart(temp.file, inbox, { killAfter: Math.round(count * 0.3) + 37, leaseMs: 3_000, timeoutMs: 180_000 });
    const perRecipient = storedPerRecipient(inbox.messages());
    let exactlyOne = 0;
    let none = 0;
    let more = 0;
    for (let i = 1; i <= count; i++) {
      const received = perRecipient.get(backerAddress(i)) ?? 0;
      if (received === 1) exactlyOne++;
      else if (received === 0) none++;
      else more++;
    }
    const receptions = inbox.receptions();
    return {
      receivedWhenKilled: run.receivedWhenKilled,
      seconds: run.seconds,
      received: receptions.received,
      duplicateMessageIds: receptions.repeated.length,
      interruptedAttempts: interruptedAttempts(temp.db),
      recipientsWithExactlyOne: exactlyOne,
      recipientsWithNone: none,
      recipientsWithMore: more,
      sent: outboxStateCounts(temp.db).sent ?? 0,
    };
  } finally {
    temp.cleanup();
    await inbox.close();
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const figures = await runMailFanoutBench(Number(process.argv[2] ?? 10_000));
  console.log(JSON.stringify(figures, null, 2));
  if (!figures.meetsTimeTarget || !figures.exactlyOnce) process.exitCode = 1;
}

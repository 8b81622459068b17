/**
 * Shared by the fan-out bench (bench/mail-fanout.ts), its worker process and the crash test:
 * one configuration, the queued report fan-out, and the kill-and-restart run.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { sql } from "drizzle-orm";
import { migrateDatabase, openDatabase, type Db } from "../db/client";
import { enqueueMail } from "../db/queries/outbox";
import { outbox, users } from "../db/schema";
import type { FakeInbox, StoredMessage } from "../fakes/smtp/inbox";

export const FANOUT_WORKER_SETTINGS = {
  smtp: { host: "127.0.0.1", secure: false, from: "Harbor Street Print Lab <lab@proofbay.localhost>", maxConnections: 5 },
  worker: {
    domain: "proofbay.bench",
    links: { appUrl: "http://localhost:3000", unsubscribeSecret: "mail-fanout-bench-secret-not-for-production" },
    batchSize: 100,
    concurrency: 10,
  },
} as const;

export const backerAddress = (index: number) => `backer-${String(index).padStart(5, "0")}@backers.example`;

export function createFanoutDb(): { db: Db; file: string; cleanup(): void } {
  const dir = mkdtempSync(path.join(os.tmpdir(), "proofbay-mail-fanout-"));
  const file = path.join(dir, "fanout.db");
  const db = openDatabase(file);
  migrateDatabase(db);
  return {
    db,
    file,
    cleanup() {
      if (db.$client.open) db.$client.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** `count` invented backers and one report-published mail each, queued in one transaction as publishing does. */
export function queueReportFanout(db: Db, count: number, now = new Date()): void {
  db.transaction((tx) => {
    const rows = Array.from({ length: count }, (_, i) => ({ id: `fanout-backer-${i + 1}`, name: `Backer ${i + 1}`, email: backerAddress(i + 1) }));
    for (let i = 0; i < rows.length; i += 500) tx.insert(users).values(rows.slice(i, i + 500)).run();
    for (const row of rows) {
      enqueueMail(
        tx,
        {
          dedupeKey: `report-published:fanout-report:${row.id}`,
          toAddress: row.email,
          userId: row.id,
          template: "report-published",
          subject: "The report on “Ring duct at high flow” is published",
          payload: {
            name: row.name,
            campaignTitle: "Ring duct at high flow",
            summary: "The ring duct held bridges flatter than the reference at every fan setting but added noise.",
            reportUrl: "http://localhost:3000/campaigns/ring-duct-at-high-flow/report",
          },
        },
        now,
      );
    }
  });
}

export function outboxStateCounts(db: Db): Record<string, number> {
  const rows = db.select({ state: outbox.state, count: sql<number>`count(*)` }).from(outbox).groupBy(outbox.state).all();
  return Object.fromEntries(rows.map((row) => [row.state, row.count]));
}

export function interruptedAttempts(db: Db): number {
  return db.select({ total: sql<number>`coalesce(sum(${outbox.interruptedAttempts}), 0)` }).from(outbox).get()?.total ?? 0;
}

/** How many stored messages each recipient has, by envelope recipient. */
export function storedPerRecipient(messages: readonly StoredMessage[]): Map<string, number> {
  const counts = new Map<string, number>();
  for (const message of messages) {
    for (const to of message.envelope.to) counts.set(to.toLowerCase(), (counts.get(to.toLowerCase()) ?? 0) + 1);
  }
  return counts;
}

export function startWorker(databasePath: string, smtpPort: number, leaseMs: number): ChildProcess {
  return spawn(process.execPath, ["--import", "tsx", "bench/mail-fanout-worker.ts", databasePath, String(smtpPort), String(leaseMs)], {
    cwd: process.cwd(),
    stdio: ["ignore", "inherit", "inherit"],
  });
}

export function exited(child: ChildProcess): Promise<{ code: number | null; signal: NodeJS.Signals | null }> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve({ code: child.exitCode, signal: child.signalCode });
  return new Promise((resolve) => child.once("exit", (code, signal) => resolve({ code, signal })));
}

export type CrashRunResult = {
  receivedWhenKilled: number;
  killSignal: NodeJS.Signals | null;
  restartExitCode: number | null;
  seconds: number;
};

/**
 * Runs the worker in a child process, SIGKILLs it once the inbox has accepted `killAfter`
 * messages, then starts a fresh worker and waits for it to finish the outbox.
 */
export async function runCrashAndRestart(
  databasePath: string,
  inbox: FakeInbox,
  options: { killAfter: number; leaseMs: number; timeoutMs: number },
): Promise<CrashRunResult> {
  const started = performance.now();
  const first = startWorker(databasePath, inbox.smtpPort, options.leaseMs);
  const firstExit = exited(first);
  const deadline = Date.now() + options.timeoutMs;
  while (inbox.receptions().received < options.killAfter) {
    if (first.exitCode !== null) throw new Error(`The worker finished before it could be killed (exit ${first.exitCode})`);
    if (Date.now() > deadline) {
      first.kill("SIGKILL");
      throw new Error(`Only ${inbox.receptions().received} messages arrived within ${options.timeoutMs} ms`);
    }
    await new Promise((resolve) => setTimeout(resolve, 2));
  }
  const receivedWhenKilled = inbox.receptions().received;
  first.kill("SIGKILL");
  const { signal } = await firstExit;

  const second = startWorker(databasePath, inbox.smtpPort, options.leaseMs);
  const timer = setTimeout(() => second.kill("SIGKILL"), Math.max(deadline - Date.now(), 1_000));
  const { code } = await exited(second);
  clearTimeout(timer);
  return { receivedWhenKilled, killSignal: signal, restartExitCode: code, seconds: (performance.now() - started) / 1000 };
}

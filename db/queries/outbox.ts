import { createHash } from "node:crypto";
import { and, asc, desc, eq, inArray, lte, sql } from "drizzle-orm";
import type { Db } from "../client";
import { outbox, type OutboxMessage } from "../schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export type OutgoingMessage = {
  /** Recipient plus the event that causes the mail, e.g. `proposal-declined:<id>:<user>`. */
  dedupeKey: string;
  toAddress: string;
  template: string;
  subject: string;
  payload: Record<string, unknown>;
};

/**
 * Queues a mail inside the caller's transaction, so it exists exactly when the event that causes
 * it was committed. A second enqueue with the same dedupe key is ignored.
 */
export function enqueueMail(tx: Tx | Db, message: OutgoingMessage, now = new Date()): void {
  tx.insert(outbox)
    .values({ ...message, state: "queued", attempts: 0, nextAttemptAt: now, createdAt: now })
    .onConflictDoNothing({ target: outbox.dedupeKey })
    .run();
}

/** A sending claim lasts this long; a worker that dies mid-send frees its messages after it. */
export const SEND_LEASE_MS = 2 * 60_000;
export const MAX_SEND_ATTEMPTS = 8;

/** Exponential backoff: 30 s, 1 min, 2 min … capped at an hour. */
export function retryDelayMs(attempts: number): number {
  return Math.min(60 * 60_000, 30_000 * 2 ** Math.max(0, attempts - 1));
}

/** Claims due messages for one worker pass: queued ones whose time has come, and expired leases. */
export function claimDueMail(db: Db, now: Date, limit: number): OutboxMessage[] {
  return db.transaction(
    (tx) => {
      const due = tx
        .select()
        .from(outbox)
        .where(and(inArray(outbox.state, ["queued", "sending"]), lte(outbox.nextAttemptAt, now)))
        .orderBy(asc(outbox.nextAttemptAt))
        .limit(limit)
        .all();
      if (due.length === 0) return [];
      tx.update(outbox)
        .set({ state: "sending", nextAttemptAt: new Date(now.getTime() + SEND_LEASE_MS) })
        .where(inArray(outbox.id, due.map((message) => message.id)))
        .run();
      return due;
    },
    { behavior: "immediate" },
  );
}

export function markMailSent(db: Db, id: string, now: Date): void {
  db.update(outbox).set({ state: "sent", sentAt: now, lastError: null }).where(eq(outbox.id, id)).run();
}

export function markMailFailed(db: Db, message: OutboxMessage, error: string, now: Date): void {
  const attempts = message.attempts + 1;
  const giveUp = attempts >= MAX_SEND_ATTEMPTS;
  db.update(outbox)
    .set({
      state: giveUp ? "failed" : "queued",
      attempts,
      lastError: error.slice(0, 500),
      nextAttemptAt: new Date(now.getTime() + (giveUp ? 0 : retryDelayMs(attempts))),
    })
    .where(eq(outbox.id, message.id))
    .run();
}

/** Stable per (recipient, event), so a resend after a crash is recognisable as the same message. */
export function messageIdFor(dedupeKey: string, domain: string): string {
  return `<${createHash("sha256").update(dedupeKey).digest("hex").slice(0, 32)}@${domain}>`;
}

export function listOutbox(db: Db, filter: { state?: OutboxMessage["state"] } = {}, limit = 200) {
  const query = db.select().from(outbox).orderBy(desc(outbox.createdAt)).limit(limit).$dynamic();
  return filter.state ? query.where(eq(outbox.state, filter.state)).all() : query.all();
}

export function outboxCounts(db: Db): Record<OutboxMessage["state"], number> {
  const rows = db.select({ state: outbox.state, count: sql<number>`count(*)` }).from(outbox).groupBy(outbox.state).all();
  const counts = { queued: 0, sending: 0, sent: 0, failed: 0 };
  for (const row of rows) counts[row.state] = row.count;
  return counts;
}

export function mailFor(db: Db, toAddress: string) {
  return db.select().from(outbox).where(eq(outbox.toAddress, toAddress)).orderBy(desc(outbox.createdAt)).all();
}

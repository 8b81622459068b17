import { createHash, randomUUID } from "node:crypto";
import { and, asc, desc, eq, inArray, isNull, lte, ne, or, sql, type SQL } from "drizzle-orm";
import { emailCategoryOf, isOptionalCategory } from "../../lib/email/categories";
import type { Db } from "../client";
import { emailPreferences, outbox, users, type OutboxMessage } from "../schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export type OutgoingMessage = {
  /** Recipient plus the event that causes the mail, e.g. `proposal-declined:<id>:<user>`. */
  dedupeKey: string;
  toAddress: string;
  template: string;
  subject: string;
  payload: Record<string, unknown>;
  /** The recipient's account; looked up by address when left out, null for someone without one. */
  userId?: string | null;
};

/**
 * Queues a mail inside the caller's transaction, so it exists exactly when the event that causes
 * it was committed. A second enqueue with the same dedupe key is ignored.
 */
export function enqueueMail(tx: Tx | Db, message: OutgoingMessage, now = new Date()): void {
  const { userId: givenUserId, ...fields } = message;
  const userId =
    givenUserId !== undefined
      ? givenUserId
      : (tx.select({ id: users.id }).from(users).where(eq(users.email, message.toAddress)).get()?.id ?? null);
  tx.insert(outbox)
    .values({ ...fields, userId, category: emailCategoryOf(message.template), state: "queued", attempts: 0, nextAttemptAt: now, createdAt: now })
    .onConflictDoNothing({ target: outbox.dedupeKey })
    .run();
}

/**
 * A sending claim lasts this long; a worker that dies mid-send frees its messages after it. The
 * SMTP transport's socket timeout is shorter, so a live attempt always ends before its lease does.
 */
export const SEND_LEASE_MS = 2 * 60_000;
export const MAX_SEND_ATTEMPTS = 8;

/** Exponential backoff: 30 s, 1 min, 2 min … capped at an hour. */
export function retryDelayMs(attempts: number): number {
  return Math.min(60 * 60_000, 30_000 * 2 ** Math.max(0, attempts - 1));
}

export type ClaimOptions = { leaseMs?: number; claimToken?: string };

/**
 * Claims due messages for one send attempt and commits the claim before anything is sent: queued
 * messages whose time has come, and `sending` ones whose lease ran out (their worker stopped after
 * claiming; the earlier attempt may or may not have reached the server, so it counts as an
 * interrupted attempt). Messages whose category the recipient has turned off become `suppressed`
 * here, so a preference change applies to everything not yet handed to the server.
 */
export function claimDueMail(db: Db, now: Date, limit: number, options: ClaimOptions = {}): OutboxMessage[] {
  const claimToken = options.claimToken ?? randomUUID();
  const leaseUntil = new Date(now.getTime() + (options.leaseMs ?? SEND_LEASE_MS));
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

      const turnedOff = disabledCategories(
        tx,
        due.filter((message) => message.userId !== null && isOptionalCategory(message.category)).map((message) => message.userId!),
      );
      const claimed: OutboxMessage[] = [];
      const suppressedIds: string[] = [];
      for (const message of due) {
        if (message.userId !== null && turnedOff.has(preferenceKey(message.userId, message.category))) {
          suppressedIds.push(message.id);
          continue;
        }
        if (message.state === "sending") {
          const attempts = message.attempts + 1;
          const interruptedAttempts = message.interruptedAttempts + 1;
          if (attempts >= MAX_SEND_ATTEMPTS) {
            tx.update(outbox)
              .set({
                state: "failed",
                attempts,
                interruptedAttempts,
                claimToken: null,
                finishedAt: now,
                lastError: `The worker stopped mid-send ${interruptedAttempts} times`,
              })
              .where(eq(outbox.id, message.id))
              .run();
            continue;
          }
          tx.update(outbox).set({ attempts, interruptedAttempts }).where(eq(outbox.id, message.id)).run();
          claimed.push({ ...message, attempts, interruptedAttempts });
        } else {
          claimed.push(message);
        }
      }
      if (suppressedIds.length > 0) {
        tx.update(outbox)
          .set({ state: "suppressed", claimToken: null, finishedAt: now, lastError: null })
          .where(inArray(outbox.id, suppressedIds))
          .run();
      }
      if (claimed.length > 0) {
        tx.update(outbox)
          .set({ state: "sending", claimToken, nextAttemptAt: leaseUntil })
          .where(inArray(outbox.id, claimed.map((message) => message.id)))
          .run();
      }
      return claimed.map((message) => ({ ...message, state: "sending" as const, claimToken, nextAttemptAt: leaseUntil }));
    },
    { behavior: "immediate" },
  );
}

function preferenceKey(userId: string, category: string): string {
  return `${userId}\u0000${category}`;
}

function disabledCategories(tx: Tx, userIds: string[]): Set<string> {
  if (userIds.length === 0) return new Set();
  const rows = tx
    .select({ userId: emailPreferences.userId, category: emailPreferences.category })
    .from(emailPreferences)
    .where(and(inArray(emailPreferences.userId, [...new Set(userIds)]), eq(emailPreferences.enabled, false)))
    .all();
  return new Set(rows.map((row) => preferenceKey(row.userId, row.category)));
}

/**
 * Records that the server accepted the message, whichever attempt sent it: a late success of an
 * attempt whose lease was taken over still counts, so the mail is not sent a third time.
 */
export function markMailSent(db: Db, id: string, now: Date): void {
  db.update(outbox)
    .set({ state: "sent", sentAt: now, finishedAt: now, lastError: null, claimToken: null })
    .where(and(eq(outbox.id, id), ne(outbox.state, "sent")))
    .run();
}

/** `markMailSent` for several messages in one transaction: one disk sync for the lot. */
export function markManyMailSent(db: Db, ids: readonly string[], now: Date): void {
  if (ids.length === 0) return;
  db.update(outbox)
    .set({ state: "sent", sentAt: now, finishedAt: now, lastError: null, claimToken: null })
    .where(and(inArray(outbox.id, [...ids]), ne(outbox.state, "sent")))
    .run();
}

/**
 * Records a refused or failed send. Only the attempt that holds the claim may do so; `permanent`
 * (an SMTP 5xx reply) gives up at once instead of retrying.
 */
export function markMailFailed(db: Db, message: OutboxMessage, error: string, now: Date, permanent = false): void {
  const attempts = message.attempts + 1;
  const giveUp = permanent || attempts >= MAX_SEND_ATTEMPTS;
  db.update(outbox)
    .set({
      state: giveUp ? "failed" : "queued",
      attempts,
      claimToken: null,
      lastError: error.slice(0, 500),
      finishedAt: giveUp ? now : null,
      nextAttemptAt: new Date(now.getTime() + (giveUp ? 0 : retryDelayMs(attempts))),
    })
    .where(
      and(
        eq(outbox.id, message.id),
        eq(outbox.state, "sending"),
        message.claimToken === null ? isNull(outbox.claimToken) : eq(outbox.claimToken, message.claimToken),
      ),
    )
    .run();
}

/**
 * A host's "retry now" for a failed message: a fresh round of attempts, due at once. Only a
 * `failed` message changes, so a double click queues it once. Returns whether it was re-queued.
 */
export function retryFailedMail(db: Db, id: string, now: Date): boolean {
  const result = db
    .update(outbox)
    .set({ state: "queued", attempts: 0, nextAttemptAt: now, finishedAt: null, claimToken: null })
    .where(and(eq(outbox.id, id), eq(outbox.state, "failed")))
    .run();
  return result.changes === 1;
}

/** Stable per (recipient, event), so a resend after a crash is recognisable as the same message. */
export function messageIdFor(dedupeKey: string, domain: string): string {
  return `<${createHash("sha256").update(dedupeKey).digest("hex").slice(0, 32)}@${domain}>`;
}

export type OutboxFilter = { state?: OutboxMessage["state"]; category?: string; search?: string };

function filterConditions(filter: OutboxFilter): SQL | undefined {
  const conditions: SQL[] = [];
  if (filter.state) conditions.push(eq(outbox.state, filter.state));
  if (filter.category) conditions.push(eq(outbox.category, filter.category));
  const search = filter.search?.trim();
  if (search) {
    const pattern = `%${search.replace(/[\\%_]/g, (char) => `\\${char}`)}%`;
    conditions.push(or(sql`${outbox.toAddress} like ${pattern} escape '\\'`, sql`${outbox.subject} like ${pattern} escape '\\'`)!);
  }
  return conditions.length > 0 ? and(...conditions) : undefined;
}

export function listOutbox(db: Db, filter: OutboxFilter = {}, limit = 200): OutboxMessage[] {
  return db.select().from(outbox).where(filterConditions(filter)).orderBy(desc(outbox.createdAt), asc(outbox.id)).limit(limit).all();
}

export function outboxCounts(db: Db): Record<OutboxMessage["state"], number> {
  const rows = db.select({ state: outbox.state, count: sql<number>`count(*)` }).from(outbox).groupBy(outbox.state).all();
  const counts = { queued: 0, sending: 0, sent: 0, failed: 0, suppressed: 0 };
  for (const row of rows) counts[row.state] = row.count;
  return counts;
}

/** Retries so far: attempts beyond the first of every message, and interrupted attempts among them. */
export function outboxRetryTotals(db: Db): { retried: number; retries: number; interrupted: number } {
  const row = db
    .select({
      retried: sql<number>`coalesce(sum(case when ${outbox.attempts} > 0 then 1 else 0 end), 0)`,
      retries: sql<number>`coalesce(sum(${outbox.attempts}), 0)`,
      interrupted: sql<number>`coalesce(sum(${outbox.interruptedAttempts}), 0)`,
    })
    .from(outbox)
    .get();
  return row ?? { retried: 0, retries: 0, interrupted: 0 };
}

export function mailFor(db: Db, toAddress: string) {
  return db.select().from(outbox).where(eq(outbox.toAddress, toAddress)).orderBy(desc(outbox.createdAt)).all();
}

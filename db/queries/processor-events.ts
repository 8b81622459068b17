import { eq } from "drizzle-orm";
import type { Db } from "../client";
import { processorEvents } from "../schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/**
 * Records an event id inside the caller's transaction; false when it was seen before, so the
 * caller skips its effects. Because it shares the transaction with those effects, a crash before
 * commit leaves no row and the processor's retry runs them again.
 */
export function recordProcessorEvent(tx: Tx | Db, event: { id: string; type: string }, now = new Date()): boolean {
  const result = tx
    .insert(processorEvents)
    .values({ id: event.id, type: event.type, receivedAt: now, processedAt: now })
    .onConflictDoNothing({ target: processorEvents.id })
    .run();
  return result.changes === 1;
}

export function findProcessorEvent(db: Db, id: string) {
  return db.select().from(processorEvents).where(eq(processorEvents.id, id)).get();
}

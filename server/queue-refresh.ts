import "server-only";
import type { Db } from "@/db/client";
import { recomputeQueue } from "@/db/queries/queue";
import { env } from "@/lib/env";

/**
 * Every change that moves the queue (a printer's status or calendar, a run logged, calibration)
 * calls this after its own transaction has committed. `reason` is what backers read if their date
 * slips because of it. A failed recompute is logged, not thrown: the change itself is saved, and
 * the next change or the board's recompute catches the schedule up.
 */
export function refreshQueue(db: Db, reason: string | null = null, now = new Date()): boolean {
  try {
    recomputeQueue(db, { now, appUrl: env.appUrl, reason });
    return true;
  } catch (error) {
    console.error("Queue recompute failed", error);
    return false;
  }
}

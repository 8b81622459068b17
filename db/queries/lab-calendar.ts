import { randomBytes, timingSafeEqual } from "node:crypto";
import { asc, eq, gt } from "drizzle-orm";
import { formatMinuteOfDay, weekdayName } from "../../lib/lab-calendar/local-time";
import { overlappingWindow } from "../../lib/lab-calendar/overlaps";
import { RuleViolation } from "../../lib/rule-violation";
import type { ClosureInput, StartWindowInput } from "../../lib/validation/lab-calendar";
import type { Db } from "../client";
import { labClosures, labSettings, labStartWindows, type LabClosure, type LabStartWindow } from "../schema";

const immediate = { behavior: "immediate" } as const;

export function listStartWindows(db: Db): LabStartWindow[] {
  return db.select().from(labStartWindows).orderBy(asc(labStartWindows.isoWeekday), asc(labStartWindows.startMinute)).all();
}

/**
 * Adds the same start hours to each chosen weekday. Refuses (422, field `start`) when any of them
 * would overlap a window already on that day, and then adds none, so nothing is half-saved.
 */
export function addStartWindows(db: Db, input: StartWindowInput): LabStartWindow[] {
  return db.transaction((tx) => {
    const existing = tx.select().from(labStartWindows).all();
    for (const isoWeekday of input.isoWeekdays) {
      const clash = overlappingWindow(existing, { isoWeekday, startMinute: input.startMinute, endMinute: input.endMinute });
      if (clash) {
        throw new RuleViolation(
          422,
          "overlapping_window",
          `${weekdayName(isoWeekday)} already has a window ${formatMinuteOfDay(clash.startMinute)}–${formatMinuteOfDay(clash.endMinute)} that overlaps this one.`,
          "start",
        );
      }
    }
    return input.isoWeekdays.map((isoWeekday) =>
      tx.insert(labStartWindows).values({ isoWeekday, startMinute: input.startMinute, endMinute: input.endMinute }).returning().get(),
    );
  }, immediate);
}

export function removeStartWindow(db: Db, id: string): void {
  const removed = db.delete(labStartWindows).where(eq(labStartWindows.id, id)).run().changes;
  if (removed === 0) throw new RuleViolation(404, "not_found", "That start window is already gone.");
}

/** Closures that have not ended yet, soonest first. */
export function listUpcomingClosures(db: Db, now: number): LabClosure[] {
  return db.select().from(labClosures).where(gt(labClosures.endsAt, new Date(now))).orderBy(asc(labClosures.startsAt)).all();
}

export function addClosure(db: Db, input: ClosureInput, now: number): LabClosure {
  if (input.end <= now) throw new RuleViolation(422, "in_the_past", "That closure is already over; enter one that ends in the future.", "end");
  return db.insert(labClosures).values({ startsAt: new Date(input.start), endsAt: new Date(input.end), reason: input.reason }).returning().get();
}

export function removeClosure(db: Db, id: string): void {
  const removed = db.delete(labClosures).where(eq(labClosures.id, id)).run().changes;
  if (removed === 0) throw new RuleViolation(404, "not_found", "That closure is already gone.");
}

/* ---------- The host calendar feed's secret ---------- */

export function getCalendarFeedToken(db: Db): string | null {
  return db.select({ token: labSettings.calendarFeedToken }).from(labSettings).where(eq(labSettings.id, 1)).get()?.token ?? null;
}

/** A new secret (192 random bits, URL-safe); the old feed URL stops working at once. */
export function rotateCalendarFeedToken(db: Db): string {
  const token = randomBytes(24).toString("base64url");
  db.update(labSettings).set({ calendarFeedToken: token }).where(eq(labSettings.id, 1)).run();
  return token;
}

/** Compares in constant time, so response timing does not reveal how much of a guess was right. */
export function isCalendarFeedToken(db: Db, candidate: string | null): boolean {
  const token = getCalendarFeedToken(db);
  if (!token || !candidate) return false;
  const expected = Buffer.from(token);
  const given = Buffer.from(candidate);
  return expected.length === given.length && timingSafeEqual(expected, given);
}


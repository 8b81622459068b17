import { and, eq, gt, inArray } from "drizzle-orm";
import type { Db } from "../client";
import { memberships, users, type StoredRole } from "../schema";

/** Active means paid up: status active (or past_due inside the grace of the current period). */
export function hasActiveMembership(db: Db, userId: string, now: Date): boolean {
  const row = db
    .select({ id: memberships.id })
    .from(memberships)
    .where(
      and(
        eq(memberships.userId, userId),
        inArray(memberships.status, ["active", "past_due"]),
        gt(memberships.currentPeriodEnd, now),
      ),
    )
    .limit(1)
    .get();
  return row !== undefined;
}

export function findUserByEmail(db: Db, email: string) {
  return db.select().from(users).where(eq(users.email, email.toLowerCase())).get();
}

export function listUsersByRole(db: Db, role: StoredRole) {
  return db.select().from(users).where(eq(users.role, role)).all();
}

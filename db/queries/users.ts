import { eq } from "drizzle-orm";
import type { Db } from "../client";
import { users, type StoredRole } from "../schema";
import { memberPerks } from "./memberships";

/** A member right now: an active Filament Club membership inside its paid period (db/queries/memberships.ts). */
export function hasActiveMembership(db: Db, userId: string, now: Date): boolean {
  return memberPerks(db, userId, now) !== null;
}

export function findUserByEmail(db: Db, email: string) {
  return db.select().from(users).where(eq(users.email, email.toLowerCase())).get();
}

export function listUsersByRole(db: Db, role: StoredRole) {
  return db.select().from(users).where(eq(users.role, role)).all();
}

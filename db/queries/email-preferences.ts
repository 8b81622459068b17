import { and, eq } from "drizzle-orm";
import { optionalEmailCategories, type OptionalEmailCategory } from "../../lib/email/categories";
import type { Db } from "../client";
import { emailPreferences, users } from "../schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export type EmailPreferenceMap = Record<OptionalEmailCategory, boolean>;
export type PreferenceChannel = "page" | "one-click";

/** Every optional category for one person: on unless they turned it off. */
export function emailPreferencesFor(db: Db, userId: string): EmailPreferenceMap {
  const rows = db.select().from(emailPreferences).where(eq(emailPreferences.userId, userId)).all();
  const map = Object.fromEntries(optionalEmailCategories.map((category) => [category, true])) as EmailPreferenceMap;
  for (const row of rows) {
    if (row.category in map) map[row.category as OptionalEmailCategory] = row.enabled;
  }
  return map;
}

export function setEmailPreference(
  db: Db | Tx,
  change: { userId: string; category: OptionalEmailCategory; enabled: boolean; via: PreferenceChannel; now: Date },
): void {
  db.insert(emailPreferences)
    .values({ userId: change.userId, category: change.category, enabled: change.enabled, changedVia: change.via, updatedAt: change.now })
    .onConflictDoUpdate({
      target: [emailPreferences.userId, emailPreferences.category],
      set: { enabled: change.enabled, changedVia: change.via, updatedAt: change.now },
    })
    .run();
}

/** Saves the whole preferences form in one transaction. */
export function saveEmailPreferences(db: Db, userId: string, choices: EmailPreferenceMap, now: Date): void {
  db.transaction((tx) => {
    for (const category of optionalEmailCategories) {
      setEmailPreference(tx, { userId, category, enabled: choices[category], via: "page", now });
    }
  });
}

/**
 * The one-click unsubscribe: turns the category off for the account the verified token names.
 * Returns false when there is no such account (nothing is written).
 */
export function unsubscribeFromCategory(db: Db, userId: string, category: OptionalEmailCategory, now: Date): boolean {
  return db.transaction(
    (tx) => {
      const exists = tx.select({ id: users.id }).from(users).where(eq(users.id, userId)).get();
      if (!exists) return false;
      setEmailPreference(tx, { userId, category, enabled: false, via: "one-click", now });
      return true;
    },
    { behavior: "immediate" },
  );
}

export function isCategoryEnabled(db: Db, userId: string, category: OptionalEmailCategory): boolean {
  const row = db
    .select({ enabled: emailPreferences.enabled })
    .from(emailPreferences)
    .where(and(eq(emailPreferences.userId, userId), eq(emailPreferences.category, category)))
    .get();
  return row?.enabled ?? true;
}

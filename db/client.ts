import Database from "better-sqlite3";
import { drizzle, type BetterSQLite3Database } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { mkdirSync } from "node:fs";
import path from "node:path";
import * as schema from "./schema";

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

export const migrationsFolder = path.join(process.cwd(), "db", "migrations");

/**
 * Opens a SQLite file with the pragmas Proofbay relies on: WAL so readers never wait for the
 * writer, a busy timeout so concurrent writers queue instead of failing, foreign keys enforced,
 * and synchronous=FULL so a committed payment survives a power cut (in WAL mode NORMAL may lose
 * the last commits).
 */
export function openDatabase(file: string): Db {
  if (file !== ":memory:") mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  const sqlite = new Database(file);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("synchronous = FULL");
  sqlite.pragma("foreign_keys = ON");
  sqlite.pragma("busy_timeout = 5000");
  return drizzle(sqlite, { schema }) as Db;
}

export function migrateDatabase(db: Db): void {
  migrate(db, { migrationsFolder });
}

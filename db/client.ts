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
  cacheStatements(sqlite);
  return drizzle(sqlite, { schema }) as Db;
}

/**
 * The query builder prepares every query afresh; SQLite's prepare is a good share of a short
 * query's cost (about a fifth of a payment webhook's database time). Statements are reusable, so
 * the connection keeps the most recent ones by SQL text. Safe because nothing here iterates a
 * statement lazily; the raw (array) mode the builder may switch on is switched off again.
 */
function cacheStatements(sqlite: Database.Database, max = 500): void {
  const cache = new Map<string, Database.Statement>();
  const prepare = sqlite.prepare.bind(sqlite);
  sqlite.prepare = ((source: string) => {
    const cached = cache.get(source);
    if (cached) {
      if (cached.reader) cached.raw(false);
      return cached;
    }
    const statement = prepare(source);
    if (cache.size >= max) cache.delete(cache.keys().next().value as string);
    cache.set(source, statement);
    return statement;
  }) as typeof sqlite.prepare;
}

export function migrateDatabase(db: Db): void {
  migrate(db, { migrationsFolder });
}

import "server-only";
import { env } from "@/lib/env";
import { openDatabase, type Db } from "./client";

const cache = globalThis as unknown as { proofbayDb?: Db };

/** The app's database, opened once per process (and kept across hot reloads in development). */
export function getDb(): Db {
  cache.proofbayDb ??= openDatabase(env.databasePath);
  return cache.proofbayDb;
}

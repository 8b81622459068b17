/** Applies the migrations in db/migrations to DATABASE_PATH (default data/proofbay.db). */
import { migrateDatabase, openDatabase } from "@/db/client";
import { parseEnv } from "@/lib/env";

const { databasePath } = parseEnv(process.env);
const db = openDatabase(databasePath);
try {
  migrateDatabase(db);
  console.log(`Migrated ${databasePath}`);
} finally {
  db.$client.close();
}

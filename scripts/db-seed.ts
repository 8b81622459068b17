/** Migrates DATABASE_PATH (default data/proofbay.db), then writes the demo lab; safe to re-run. */
import { migrateDatabase, openDatabase } from "@/db/client";
import { formatSeedSummary, seedDemo } from "@/db/seed";
import { parseEnv } from "@/lib/env";

const { databasePath } = parseEnv(process.env);
const db = openDatabase(databasePath);
try {
  migrateDatabase(db);
  const summary = seedDemo(db);
  console.log(`Seeded ${databasePath}: ${formatSeedSummary(summary)}`);
} finally {
  db.$client.close();
}

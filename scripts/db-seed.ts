/** Migrates DATABASE_PATH (default data/proofbay.db), then writes the demo lab; safe to re-run. */
import { migrateDatabase, openDatabase } from "@/db/client";
import { formatSeedSummary, seedDemo, seedId } from "@/db/seed";
import { seedReportPhotos } from "@/db/seed-reports";
import { parseEnv } from "@/lib/env";

const { databasePath, uploadsDir } = parseEnv(process.env);
const db = openDatabase(databasePath);
try {
  migrateDatabase(db);
  const summary = seedDemo(db);
  const photos = await seedReportPhotos(db, uploadsDir, seedId);
  console.log(`Seeded ${databasePath}: ${formatSeedSummary(summary)}, report photos +${photos}`);
} finally {
  db.$client.close();
}

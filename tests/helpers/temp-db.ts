import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { migrateDatabase, openDatabase, type Db } from "@/db/client";

/** A migrated SQLite database in a fresh temporary file (with its WAL files), removed by cleanup(). */
export function createTempDb(): { db: Db; file: string; cleanup(): void } {
  const dir = mkdtempSync(path.join(os.tmpdir(), "proofbay-test-"));
  const file = path.join(dir, "test.db");
  const db = openDatabase(file);
  migrateDatabase(db);
  let cleaned = false;
  return {
    db,
    file,
    cleanup() {
      if (cleaned) return;
      cleaned = true;
      if (db.$client.open) db.$client.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

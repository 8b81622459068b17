/**
 * The outbox worker as its own process, for the crash run of bench/mail-fanout.ts and
 * tests/integration/outbox-crash.test.ts (they kill it with SIGKILL mid-run and start it again).
 * Drains until nothing is queued or sending, then exits 0.
 *   node --import tsx bench/mail-fanout-worker.ts <db file> <smtp port> <lease ms>
 */
import { inArray, sql } from "drizzle-orm";
import { openDatabase } from "../db/client";
import { outbox } from "../db/schema";
import { createSmtpTransport } from "../server/mail-transport";
import { drainOutbox } from "../server/outbox-worker";
import { FANOUT_WORKER_SETTINGS } from "./mail-fanout-setup";

const [databasePath, smtpPortArg, leaseMsArg] = process.argv.slice(2);
if (!databasePath || !smtpPortArg || !leaseMsArg) {
  console.error("usage: mail-fanout-worker.ts <db file> <smtp port> <lease ms>");
  process.exit(2);
}

const db = openDatabase(databasePath);
const { transporter, send } = createSmtpTransport({ ...FANOUT_WORKER_SETTINGS.smtp, port: Number(smtpPortArg) });
const options = { ...FANOUT_WORKER_SETTINGS.worker, leaseMs: Number(leaseMsArg) };

const unfinished = () =>
  db
    .select({ count: sql<number>`count(*)` })
    .from(outbox)
    .where(inArray(outbox.state, ["queued", "sending"]))
    .get()?.count ?? 0;

// Messages a killed predecessor left `sending` come back once their lease runs out.
while (unfinished() > 0) {
  await drainOutbox(db, send, options);
  if (unfinished() > 0) await new Promise((resolve) => setTimeout(resolve, 100));
}
transporter.close();
db.$client.close();

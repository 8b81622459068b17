import { sql } from "drizzle-orm";
import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { checkSmtp } from "@/server/mailer";

export const dynamic = "force-dynamic";

/** Liveness for the app, its database and its mail relay; 503 when either dependency is down. */
export async function GET() {
  const database = checkDatabase();
  const smtp = await checkSmtp();
  const ok = database.ok && smtp.ok;
  return NextResponse.json({ ok, database, smtp }, { status: ok ? 200 : 503 });
}

function checkDatabase(): { ok: boolean; journalMode?: string; error?: string } {
  try {
    const db = getDb();
    db.get(sql`select 1`);
    const journalMode = String(db.$client.pragma("journal_mode", { simple: true }));
    return { ok: true, journalMode };
  } catch (error) {
    return { ok: false, error: error instanceof Error ? error.message : String(error) };
  }
}

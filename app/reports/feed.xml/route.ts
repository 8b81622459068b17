import { getDb } from "@/db";
import { listPublishedReports } from "@/db/queries/reports";
import { env } from "@/lib/env";
import { reportsAtomFeed } from "@/lib/reports/feed";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

/** `GET /reports/feed.xml`: the Atom feed of the 50 newest published reports. */
export function GET(): Response {
  const xml = reportsAtomFeed(listPublishedReports(getDb(), 50), env.appUrl, new Date());
  return new Response(xml, {
    headers: { "Content-Type": "application/atom+xml; charset=utf-8", "Cache-Control": "public, max-age=300" },
  });
}

import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { isCalendarFeedToken } from "@/db/queries/lab-calendar";
import { listFeedJobs } from "@/db/queries/queue-feed";
import { env } from "@/lib/env";
import { buildQueueCalendar } from "@/lib/queue-feed/ics";
import { apiRoute } from "@/server/api-route";
import { HttpError } from "@/server/http-error";

export const dynamic = "force-dynamic";

/**
 * The host calendar feed (RFC 5545). Calendar apps cannot sign in, so the secret in the URL is
 * the key; a wrong or missing token answers 404 so the feed's existence is not revealed.
 */
export const GET = apiRoute({ role: "visitor" }, async ({ request }) => {
  const db = getDb();
  if (!isCalendarFeedToken(db, new URL(request.url).searchParams.get("token"))) {
    throw new HttpError(404, "not_found", "No such calendar.");
  }
  const settings = getLabSettings(db);
  const body = buildQueueCalendar(
    listFeedJobs(db).map((job) => ({ ...job, url: `${env.appUrl}/lab/jobs/${job.jobId}` })),
    { labName: settings.labName, now: Date.now() },
  );
  return new Response(body, {
    headers: {
      "Content-Type": "text/calendar; charset=utf-8",
      "Content-Disposition": 'inline; filename="print-queue.ics"',
      "Cache-Control": "private, no-store",
      "Referrer-Policy": "no-referrer",
    },
  });
});

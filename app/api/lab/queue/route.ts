import { getDb } from "@/db";
import { queueBoardJson, queueNeedsRecompute } from "@/db/queries/queue-board";
import { apiRoute } from "@/server/api-route";
import { refreshQueue } from "@/server/queue-refresh";

export const dynamic = "force-dynamic";

/**
 * Host: the queue board's data — printers, windows, maintenance, closures, campaigns and placed
 * jobs (`QueueBoard` in db/queries/queue-board.ts), read from the stored schedule; recomputed
 * first only when it is behind (a newly funded campaign the webhook could not place).
 */
export const GET = apiRoute({ role: "host" }, async () => {
  const db = getDb();
  if (queueNeedsRecompute(db)) refreshQueue(db);
  return new Response(queueBoardJson(db, Date.now()), { headers: { "content-type": "application/json", "cache-control": "no-store" } });
});

import { getDb } from "@/db";
import { assignJobPrinter, moveJob, setJobPinned } from "@/db/queries/queue-board";
import { queueJobActionSchema } from "@/lib/validation/queue";
import { apiRoute, parseJsonBody } from "@/server/api-route";
import { queueCommandOptions } from "@/server/queue-commands";

/**
 * Host: one action on a queued job, then the queue is recomputed in the same transaction.
 * Body: `{ action: "pin", pinned }` | `{ action: "move", direction: "up" | "down" }` |
 * `{ action: "assign", printerId }` (null: the queue chooses). A printer that cannot print the job
 * answers 422 with the reason; a printer down or in maintenance, 409.
 */
export const POST = apiRoute<{ id: string }>({ role: "host" }, async ({ request, params }) => {
  const body = await parseJsonBody(request, queueJobActionSchema);
  const db = getDb();
  const options = queueCommandOptions();
  const { value, recompute } =
    body.action === "pin"
      ? setJobPinned(db, params.id, body.pinned, options)
      : body.action === "move"
        ? moveJob(db, params.id, body.direction, options)
        : assignJobPrinter(db, params.id, body.printerId, options);
  return { ...value, jobsMoved: recompute.jobsUpdated, unplaced: recompute.schedule.unplaced.length };
});

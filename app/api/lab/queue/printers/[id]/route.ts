import { getDb } from "@/db";
import { setPrinterAvailability } from "@/db/queries/queue-board";
import { queuePrinterStatusSchema } from "@/lib/validation/queue";
import { apiRoute, parseJsonBody } from "@/server/api-route";
import { queueCommandOptions } from "@/server/queue-commands";

/** Host: mark a printer down or available from the queue board; its jobs are rescheduled at once. Body: `{ status }`. */
export const POST = apiRoute<{ id: string }>({ role: "host" }, async ({ request, params }) => {
  const body = await parseJsonBody(request, queuePrinterStatusSchema);
  const { value, recompute } = setPrinterAvailability(getDb(), params.id, body.status, queueCommandOptions());
  return { ...value, jobsMoved: recompute.jobsUpdated, unplaced: recompute.schedule.unplaced.length };
});

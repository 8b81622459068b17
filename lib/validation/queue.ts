import { z } from "zod";

/** One host action on a queued job (`POST /api/lab/queue/jobs/[id]`). */
export const queueJobActionSchema = z.discriminatedUnion(
  "action",
  [
    z.object({ action: z.literal("pin"), pinned: z.boolean({ error: "pinned must be true or false." }) }),
    z.object({ action: z.literal("move"), direction: z.enum(["up", "down"], { error: "direction must be up or down." }) }),
    z.object({
      action: z.literal("assign"),
      printerId: z.string({ error: "Pick a printer, or null to let the queue choose." }).min(1, { error: "Pick a printer." }).nullable(),
    }),
  ],
  { error: "action must be pin, move or assign." },
);
export type QueueJobAction = z.output<typeof queueJobActionSchema>;

/** The board's down/up switch (`POST /api/lab/queue/printers/[id]`); maintenance status is set on the printers page. */
export const queuePrinterStatusSchema = z.object({
  status: z.enum(["available", "down"], { error: "status must be available or down." }),
});

import { z } from "zod";

export const startRunSchema = z.object({ jobId: z.string({ error: "Missing job." }).min(1, { error: "Missing job." }).max(80) });

const optionalText = (max: number, message: string) =>
  z.preprocess((value) => (typeof value === "string" && value.trim() === "" ? undefined : value), z.string().trim().max(max, { error: message }).optional());

/** What a host logs when a print comes off the bed. */
export const finishRunSchema = z
  .object({
    runId: z.string({ error: "Missing run." }).min(1, { error: "Missing run." }).max(80),
    actualHours: z.number({ error: "Enter the hours it took." }).positive({ error: "Hours: more than 0." }).max(500, { error: "Hours: at most 500." }),
    filamentUsedGrams: z.number({ error: "Enter the filament used in grams." }).min(0, { error: "Filament: 0 g or more." }).max(10_000, { error: "Filament: at most 10,000 g." }),
    outcome: z.enum(["done", "failed"], { error: "Pick done or failed." }),
    failureReason: optionalText(300, "Keep the reason under 300 characters."),
    notes: optionalText(2_000, "Keep the notes under 2,000 characters."),
  })
  .superRefine((input, ctx) => {
    if (input.outcome === "failed" && (!input.failureReason || input.failureReason.length < 3)) {
      ctx.addIssue({ code: "custom", path: ["failureReason"], message: "Say what went wrong (3 characters or more)." });
    }
  });
export type FinishRunInput = z.output<typeof finishRunSchema>;
export type FinishRunFormValues = z.input<typeof finishRunSchema>;

import { z } from "zod";
import { formatMinuteOfDay, parseLocalDateTime, parseMinuteOfDay } from "@/lib/lab-calendar/local-time";

/** The longest closure or maintenance block one entry may cover. */
export const MAX_BLOCK_DAYS = 92;
const DAY_MS = 86_400_000;

/** Start hours for one or more weekdays, typed as "HH:MM" in the lab's time zone. */
export const startWindowSchema = z
  .object({
    isoWeekdays: z
      .array(z.number({ error: "Pick a weekday." }).int().min(1, { error: "Weekdays run 1 (Monday) to 7 (Sunday)." }).max(7, { error: "Weekdays run 1 (Monday) to 7 (Sunday)." }), {
        error: "Pick at least one weekday.",
      })
      .min(1, { error: "Pick at least one weekday." }),
    start: z.string({ error: "Enter a start time like 08:00." }),
    end: z.string({ error: "Enter an end time like 18:00." }),
  })
  .transform((input, ctx) => {
    const startMinute = parseMinuteOfDay(input.start);
    const endMinute = parseMinuteOfDay(input.end);
    if (startMinute === undefined || startMinute >= 1440) ctx.addIssue({ code: "custom", path: ["start"], message: "Enter a start time like 08:00." });
    if (endMinute === undefined) ctx.addIssue({ code: "custom", path: ["end"], message: "Enter an end time like 18:00 (24:00 for midnight)." });
    if (startMinute === undefined || endMinute === undefined || startMinute >= 1440) return z.NEVER;
    if (endMinute <= startMinute) {
      ctx.addIssue({ code: "custom", path: ["end"], message: `The end must be after the start (${formatMinuteOfDay(startMinute)}); split a window that crosses midnight in two.` });
      return z.NEVER;
    }
    return { isoWeekdays: [...new Set(input.isoWeekdays)].sort(), startMinute, endMinute };
  });
export type StartWindowInput = z.output<typeof startWindowSchema>;
export type StartWindowFormValues = z.input<typeof startWindowSchema>;

/** A block of time typed as two `datetime-local` values on the lab's wall clock; parsed to UTC ms. Every field's problem is reported at once. */
function localBlockSchema(timeZone: string, what: string) {
  return z
    .object({
      start: z.string({ error: "Enter when it starts." }),
      end: z.string({ error: "Enter when it ends." }),
      reason: z.string({ error: `Say why the ${what} is there.` }),
    })
    .transform((input, ctx) => {
      const reason = input.reason.trim();
      if (reason.length < 3) ctx.addIssue({ code: "custom", path: ["reason"], message: `Say why the ${what} is there (3 characters or more).` });
      if (reason.length > 200) ctx.addIssue({ code: "custom", path: ["reason"], message: "Keep the reason under 200 characters." });
      const start = parseLocalDateTime(input.start, timeZone);
      const end = parseLocalDateTime(input.end, timeZone);
      const badTime = `Enter a date and time like 2026-12-24T08:00 that exists in ${timeZone}.`;
      if (start === undefined) ctx.addIssue({ code: "custom", path: ["start"], message: badTime });
      if (end === undefined) ctx.addIssue({ code: "custom", path: ["end"], message: badTime });
      if (start !== undefined && end !== undefined && end <= start) {
        ctx.addIssue({ code: "custom", path: ["end"], message: "The end must be after the start." });
      } else if (start !== undefined && end !== undefined && end - start > MAX_BLOCK_DAYS * DAY_MS) {
        ctx.addIssue({ code: "custom", path: ["end"], message: `One entry covers at most ${MAX_BLOCK_DAYS} days; add another for longer.` });
      }
      if (start === undefined || end === undefined || end <= start || end - start > MAX_BLOCK_DAYS * DAY_MS || reason.length < 3 || reason.length > 200) return z.NEVER;
      return { start, end, reason };
    });
}

export const closureSchema = (timeZone: string) => localBlockSchema(timeZone, "closure");
export type ClosureInput = z.output<ReturnType<typeof closureSchema>>;

export function maintenanceSchema(timeZone: string) {
  return z
    .object({ printerId: z.string({ error: "Pick a printer." }).min(1, { error: "Pick a printer." }) })
    .and(localBlockSchema(timeZone, "maintenance block"));
}
export type MaintenanceInput = z.output<ReturnType<typeof maintenanceSchema>>;

export type BlockFormValues = { start: string; end: string; reason: string };

export const idSchema = z.string({ error: "Missing id." }).min(1, { error: "Missing id." }).max(80);

import { z } from "zod";
import { LEDGER_KINDS } from "@/lib/ledger/summary";

const month = z
  .string()
  .trim()
  .regex(/^\d{4}-(0[1-9]|1[0-2])$/, { error: "Pick a month as YYYY-MM." })
  .optional()
  .or(z.literal("").transform(() => undefined));

/** The ledger page's and CSV export's filters, from the query string; empty values mean "any". */
export const ledgerFilterSchema = z
  .object({
    kind: z.enum(LEDGER_KINDS, { error: `Kind must be one of ${LEDGER_KINDS.join(", ")}.` }).optional().or(z.literal("").transform(() => undefined)),
    campaign: z.string().trim().max(80).optional().transform((value) => value || undefined),
    from: month,
    to: month,
  })
  .refine((value) => !value.from || !value.to || value.from <= value.to, { error: "The first month must not be after the last.", path: ["to"] });

export type LedgerFilter = z.output<typeof ledgerFilterSchema>;

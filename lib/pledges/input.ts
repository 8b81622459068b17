import { z } from "zod";

/**
 * What the browser may send to start a pledge: the typed amount (checked against the campaign's
 * currency and bounds on the server, lib/pledges/amounts.ts) and an optional public name.
 * Everything else — campaign, supporter, metadata — the server decides.
 */
export const pledgeStartSchema = z.object({
  amount: z.string({ error: "Amount is required: pick one or type it." }).max(32, "Amount is too long."),
  publicName: z
    .string()
    .trim()
    .max(60, "Public name can be at most 60 characters.")
    .nullish()
    .transform((value) => (value ? value : null)),
});

export type PledgeStartInput = z.output<typeof pledgeStartSchema>;

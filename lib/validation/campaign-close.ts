import { z } from "zod";

/** A host withdrawing a campaign: the reason is required, and every backer's refund mail quotes it. */
export const withdrawCampaignSchema = z.object({
  reason: z
    .string({ error: "Give the reason backers will read." })
    .trim()
    .min(10, { error: "Give the reason backers will read (at least 10 characters)." })
    .max(1_000, { error: "The reason can be at most 1,000 characters." }),
});

export type WithdrawCampaignInput = z.output<typeof withdrawCampaignSchema>;

import { z } from "zod";

/** The host's allocation form: the campaign, the typed amount (checked on the server), and the form's one-time id. */
export const allocationFormSchema = z.object({
  campaignId: z.string({ error: "Choose a campaign." }).min(1, "Choose a campaign.").max(100),
  amount: z.string({ error: "Amount is required." }).max(32, "Amount is too long."),
  requestId: z.uuid({ error: "The form has expired; reload the page." }),
});

/** The JSON API: the amount in minor units of the fund's currency. */
export const allocationApiSchema = z.object({
  campaignId: z.string({ error: "campaignId is required." }).min(1, "campaignId is required.").max(100),
  amountMinor: z.number({ error: "amountMinor must be a number of minor units." }),
  requestId: z.uuid({ error: "requestId must be a UUID." }),
});

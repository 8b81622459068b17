import { z } from "zod";

export const blindPairChoices = ["left", "right", "tie"] as const;
export type BlindPairChoice = (typeof blindPairChoices)[number];

/**
 * A blind-pair vote: the ticket the pair came with, the choice, and the honeypot field `website`,
 * hidden from people (and from screen readers) and left empty by them; a form filler that fills
 * every field gives itself away.
 */
export const blindPairVoteSchema = z.object({
  ticket: z.string({ error: "The pair ticket is missing." }).min(20, "The pair ticket is missing or cut short.").max(2000, "The pair ticket is too long."),
  choice: z.enum(blindPairChoices, { error: "Choose left, right or can't tell." }),
  website: z.string().max(0, "Leave this field empty; it is there to catch automated votes.").optional(),
});
export type BlindPairVoteInput = z.output<typeof blindPairVoteSchema>;

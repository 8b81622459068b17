import { z } from "zod";
import { planCodes } from "./plans";

/** What the browser may send to join: the plan. The price, customer and metadata are the server's. */
export const joinPlanSchema = z.object({
  plan: z.enum(planCodes, { error: "Choose one of the plans: Spool, Reel or Workshop." }),
});

import { getDb } from "@/db";
import { allocateLabFund, type AllocationResult } from "@/db/queries/lab-fund";
import { env } from "@/lib/env";
import { allocationApiSchema } from "@/lib/lab-fund/input";
import { apiRoute, parseJsonBody } from "@/server/api-route";
import { RuleViolation } from "@/lib/rule-violation";
import { HttpError } from "@/server/http-error";

/**
 * Hosts: moves lab-fund money to an open campaign. Body `{ campaignId, amountMinor, requestId }`;
 * 200 `AllocationResult` (the same one again for a repeated requestId); 422 naming `amountMinor`
 * for an amount that is not a whole number of minor units, not above zero, or more than the fund
 * holds or the campaign needs; 409 for a campaign that is not open.
 */
export const POST = apiRoute({ role: "host" }, async ({ request, viewer }): Promise<AllocationResult> => {
  if (!viewer) throw new HttpError(401, "unauthenticated", "Sign in to do this.");
  const body = await parseJsonBody(request, allocationApiSchema);
  try {
    return allocateLabFund(getDb(), { campaignId: body.campaignId, hostId: viewer.id, amount: { minor: body.amountMinor }, requestId: body.requestId, appUrl: env.appUrl });
  } catch (error) {
    // The API's field is amountMinor, the form's amount.
    if (error instanceof RuleViolation && error.field === "amount") throw new RuleViolation(error.status, error.code, error.message, "amountMinor");
    throw error;
  }
});

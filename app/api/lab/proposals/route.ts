import { z } from "zod";
import { getDb } from "@/db";
import { listProposalsForTriage } from "@/db/queries/proposals";
import { proposalStates } from "@/db/schema";
import { apiRoute, parseSearchParams } from "@/server/api-route";

const querySchema = z.object({ state: z.enum(proposalStates).optional() });

export const GET = apiRoute({ role: "host" }, async ({ request }) => {
  const { state } = parseSearchParams(request, querySchema);
  return { proposals: listProposalsForTriage(getDb(), { state }) };
});

import { getDb } from "@/db";
import { cachedLabRates } from "@/db/queries/pricing";
import { estimateResolvedPlan, loadLibraryPieces, planEstimateSummary, resolvePlan } from "@/db/queries/test-plans";
import { testPlanDraftSchema } from "@/lib/validation/test-plan";
import { apiRoute, parseJsonBody } from "@/server/api-route";

/**
 * Host: prices a test plan while it is being edited, at the lab's (briefly cached) rates. Body:
 * `{ printerId, material, layerHeightMm, maxFlowMm3PerS, fanPercent, repeats, pieces:
 * [{ libraryPieceId, filamentGrams }], variants: [{ name }] }` (the first variant is the
 * reference). Answers `PlanEstimateSummary`; 422 names the field (e.g. `material` when the
 * printer cannot print it).
 */
export const POST = apiRoute({ role: "host" }, async ({ request }) => {
  const plan = await parseJsonBody(request, testPlanDraftSchema);
  const db = getDb();
  const { pricing, printers } = cachedLabRates(db);
  const resolved = resolvePlan(plan, printers, loadLibraryPieces(db, plan.pieces.map((piece) => piece.libraryPieceId)));
  return planEstimateSummary(estimateResolvedPlan(plan, resolved, pricing), plan, resolved.printer);
});

import { getDb } from "@/db";
import { listTriagePage } from "@/db/queries/triage";
import { searchParamsToTriageInput, triageQuerySchema } from "@/lib/validation/triage";
import { apiRoute } from "@/server/api-route";
import { validationError } from "@/server/http-error";

/**
 * Host: one page of proposals for triage. Query: `state` (repeatable or comma-separated; default
 * submitted), `kind`, `printerType`, `q` (full text over title, why and description), `sort`
 * (votes | age), `dir` (asc | desc), `page` (1-based), `pageSize` (≤ 100, default 25).
 * Answers `{ rows, total, page, pageSize }`; a page past the end answers the last one.
 */
export const GET = apiRoute({ role: "host" }, async ({ request }) => {
  const parsed = triageQuerySchema.safeParse(searchParamsToTriageInput(new URL(request.url).searchParams));
  if (!parsed.success) throw validationError(parsed.error);
  return listTriagePage(getDb(), parsed.data);
});

import { getDb } from "@/db";
import { apiRoute } from "@/server/api-route";
import { createUpload } from "@/server/uploads/create";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

/**
 * Uploads a photo (JPEG, PNG, WebP; 15 MB) or a model (STL, 3MF; 64 MB) for a proposal:
 * multipart/form-data with `file` and an optional `proposalId` of the caller's own editable
 * proposal. Answers `{ upload }`: 201 when stored, 200 when the caller had sent the same content
 * before. The contract is in server/uploads/create.ts and lib/uploads/api.ts.
 */
export const POST = apiRoute({ role: "supporter" }, async ({ request, viewer }) => createUpload(getDb(), viewer!, request));

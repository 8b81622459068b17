import { getDb } from "@/db";
import { apiRoute } from "@/server/api-route";
import { getViewer } from "@/server/auth";
import { serveUpload } from "@/server/uploads/serve";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

/** The stored file (the cleaned image for photos); public once its proposal is submitted. */
export const GET = apiRoute<{ id: string }>({ role: "visitor" }, async ({ request, params }) =>
  serveUpload(getDb(), request, params.id, await getViewer(), "file"),
);

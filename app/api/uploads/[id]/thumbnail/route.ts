import { getDb } from "@/db";
import { apiRoute } from "@/server/api-route";
import { getViewer } from "@/server/auth";
import { serveUpload } from "@/server/uploads/serve";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

/** A photo's WebP thumbnail (480 px on the long side), readable by whoever may read the photo. */
export const GET = apiRoute<{ id: string }>({ role: "visitor" }, async ({ request, params }) =>
  serveUpload(getDb(), request, params.id, await getViewer(), "thumbnail"),
);

import { getDb } from "@/db";
import { apiRoute } from "@/server/api-route";
import { serveBlindPairImage } from "@/server/blind-pair-image";
import { HttpError } from "@/server/http-error";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

/** One photo of a blind pair by its opaque token, for the judge it was issued to only; no name, no ETag. */
export const GET = apiRoute<{ token: string }>({ role: "supporter" }, async ({ params, viewer }) => {
  if (!viewer) throw new HttpError(401, "unauthenticated", "Sign in to do this.");
  return serveBlindPairImage(getDb(), params.token, viewer.id, new Date());
});

import { getDb } from "@/db";
import { blindPairVoteSchema } from "@/lib/validation/blind-pairs";
import { apiRoute, parseJsonBody } from "@/server/api-route";
import type { Viewer } from "@/server/auth";
import { castBlindPairVote, requireJudging, showNextPair, type NextPairResponse } from "@/server/blind-pairs";
import { HttpError } from "@/server/http-error";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

type Params = { slug: string };

function signedIn(viewer: Viewer | null): Viewer {
  if (!viewer) throw new HttpError(401, "unauthenticated", "Sign in to do this.");
  return viewer;
}

/** The viewer's next blind pair (ticket + two opaque image URLs) and progress: 200 `NextPairResponse`; 403, 404, 409 no_pairs. */
export const GET = apiRoute<Params>({ role: "supporter" }, async ({ params, viewer }): Promise<NextPairResponse> => {
  const now = new Date();
  const me = signedIn(viewer);
  const db = getDb();
  return showNextPair(db, requireJudging(db, params.slug, me.id, now), me.id, now);
});

/**
 * A vote `{ ticket, choice: "left" | "right" | "tie", website? }`: 200 with the next pair; 403 not
 * eligible; 400/422/429 for a forged, expired or too-fast ticket or a filled honeypot; 409 for a
 * spent ticket or a second vote on the pair.
 */
export const POST = apiRoute<Params>({ role: "supporter" }, async ({ request, params, viewer }): Promise<NextPairResponse> => {
  const now = new Date();
  const me = signedIn(viewer);
  const db = getDb();
  const context = requireJudging(db, params.slug, me.id, now);
  const input = await parseJsonBody(request, blindPairVoteSchema);
  return castBlindPairVote(db, context, me.id, input, now);
});

import { getDb } from "@/db";
import { castVote, voteStatus, withdrawVote, type VoteStatus } from "@/db/queries/proposal-commands";
import { apiRoute } from "@/server/api-route";
import type { Viewer } from "@/server/auth";
import { HttpError } from "@/server/http-error";

type Params = { id: string };

/** apiRoute has already refused visitors (401) and non-members (403); this narrows the type. */
function signedIn(viewer: Viewer | null): Viewer {
  if (!viewer) throw new HttpError(401, "unauthenticated", "Sign in to do this.");
  return viewer;
}

/** The member's vote on this proposal and their allowance: `VoteStatus`. */
export const GET = apiRoute<Params>({ role: "member" }, async ({ params, viewer }): Promise<VoteStatus> =>
  voteStatus(getDb(), signedIn(viewer).id, params.id),
);

/** Casts the member's vote: 200 `VoteStatus`; 403 members_only, 404, 409 already_voted / no_votes_left / not_votable. */
export const POST = apiRoute<Params>({ role: "member" }, async ({ params, viewer }): Promise<VoteStatus> =>
  castVote(getDb(), signedIn(viewer).id, params.id),
);

/** Withdraws it, giving the vote back: 200 `VoteStatus`; 404, 409 not_voted / not_votable. */
export const DELETE = apiRoute<Params>({ role: "member" }, async ({ params, viewer }): Promise<VoteStatus> =>
  withdrawVote(getDb(), signedIn(viewer).id, params.id),
);

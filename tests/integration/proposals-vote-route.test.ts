import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createProposal } from "@/db/queries/proposal-commands";
import { seedDemo, seedId } from "@/db/seed";
import type { Role } from "@/lib/roles";
import { proposalSubmissionSchema } from "@/lib/validation/proposal";
import { createTempDb } from "../helpers/temp-db";

type TestViewer = { id: string; email: string; name: string | null; role: Role };

// Acts as whoever `signedIn.viewer` names: the route's guard reads the session only through getViewer.
const signedIn = vi.hoisted(() => ({ viewer: null as TestViewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => signedIn.viewer,
  auth: async () => (signedIn.viewer ? { user: signedIn.viewer } : null),
}));

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;
afterAll(() => temp.cleanup());

type Handler = (request: Request, segment: { params: Promise<{ id: string }> }) => Promise<Response>;
let POST: Handler;
let DELETE: Handler;
let GET: Handler;
beforeAll(async () => {
  ({ POST, DELETE, GET } = (await import("@/app/api/proposals/[id]/vote/route")) as unknown as { POST: Handler; DELETE: Handler; GET: Handler });
});

// db/seed-data.ts: Jules is a supporter without a membership, Mina a Reel member (8 votes a month).
const jules: TestViewer = { id: seedId("user", "supporter"), email: "supporter@harbor-street.example", name: "Jules Adeyemi-Hart", role: "supporter" };
const mina: TestViewer = { id: seedId("user", "member"), email: "member@harbor-street.example", name: "Mina Sato-Ferris", role: "member" };

const proposal = createProposal(
  temp.db,
  jules.id,
  proposalSubmissionSchema.parse({
    title: "Route test: wide outlet duct",
    kind: "duct",
    printerType: "bedslinger",
    why: "A wider outlet might cool long bridges more evenly at the same fan speed.",
  }),
  { submit: true },
);

async function call(handler: Handler, viewer: TestViewer | null, id = proposal.id, method = "POST") {
  signedIn.viewer = viewer;
  const response = await handler(new Request(`http://localhost/api/proposals/${id}/vote`, { method }), { params: Promise.resolve({ id }) });
  return { status: response.status, body: await response.json() };
}

describe("POST and DELETE /api/proposals/[id]/vote", () => {
  it("asks a visitor to sign in", async () => {
    const { status, body } = await call(POST, null);
    expect(status).toBe(401);
    expect(body.error.code).toBe("unauthenticated");
  });

  it("refuses a supporter who is not a member", async () => {
    const { status, body } = await call(POST, jules);
    expect(status).toBe(403);
    expect(body.error.code).toBe("forbidden");
    expect((await call(DELETE, jules, proposal.id, "DELETE")).status).toBe(403);
  });

  it("refuses a session that says member when the membership is gone", async () => {
    const { status, body } = await call(POST, { ...jules, role: "member" });
    expect(status).toBe(403);
    expect(body.error.code).toBe("members_only");
  });

  it("counts a member's vote, refuses a second, and gives it back on withdrawal", async () => {
    const before = await call(GET, mina, proposal.id, "GET");
    expect(before.status).toBe(200);
    expect(before.body).toMatchObject({ proposalId: proposal.id, voteCount: 0, votedByMe: false, allowance: 8 });

    const cast = await call(POST, mina);
    expect(cast.status).toBe(200);
    expect(cast.body).toEqual({ ...before.body, voteCount: 1, votedByMe: true, votesLeft: before.body.votesLeft - 1 });

    const again = await call(POST, mina);
    expect(again.status).toBe(409);
    expect(again.body.error).toMatchObject({ code: "already_voted", message: "You already voted for this proposal." });

    const withdrawn = await call(DELETE, mina, proposal.id, "DELETE");
    expect(withdrawn.status).toBe(200);
    expect(withdrawn.body).toEqual(before.body);

    const twice = await call(DELETE, mina, proposal.id, "DELETE");
    expect(twice.status).toBe(409);
    expect(twice.body.error.code).toBe("not_voted");
  });

  it("answers 404 for a proposal that does not exist", async () => {
    const { status, body } = await call(POST, mina, "no-such-proposal");
    expect(status).toBe(404);
    expect(body.error.code).toBe("not_found");
  });
});

import { and, eq, like } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { campaigns, jobs, printers } from "@/db/schema";
import { seedDemo, seedId } from "@/db/seed";
import type { Role } from "@/lib/roles";
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

type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
let boardGet: Handler;
let jobPost: Handler;
let printerPost: Handler;
beforeAll(async () => {
  boardGet = (await import("@/app/api/lab/queue/route")).GET as unknown as Handler;
  jobPost = (await import("@/app/api/lab/queue/jobs/[id]/route")).POST as unknown as Handler;
  printerPost = (await import("@/app/api/lab/queue/printers/[id]/route")).POST as unknown as Handler;
});

// db/seed-data.ts demo accounts: Eli is a host, Mina a Reel member, Jules a supporter.
const host: TestViewer = { id: seedId("user", "host"), email: "host@harbor-street.example", name: "Eli Navarro-Brandt", role: "host" };
const member: TestViewer = { id: seedId("user", "member"), email: "member@harbor-street.example", name: "Mina Sato-Ferris", role: "member" };
const supporter: TestViewer = { id: seedId("user", "supporter"), email: "supporter@harbor-street.example", name: "Jules Adeyemi-Hart", role: "supporter" };
const kestrel = seedId("printer", "kestrel");
const wren = seedId("printer", "wren");

const asaCampaign = temp.db.select().from(campaigns).where(like(campaigns.slug, "asa-corner%")).get()!;
const asaJob = temp.db.select().from(jobs).where(and(eq(jobs.campaignId, asaCampaign.id), eq(jobs.state, "scheduled"))).get()!;

async function call(handler: Handler, viewer: TestViewer | null, path: string, params: Record<string, string>, body?: unknown) {
  signedIn.viewer = viewer;
  const init: RequestInit = body === undefined ? { method: "GET" } : { method: "POST", body: typeof body === "string" ? body : JSON.stringify(body), headers: { "content-type": "application/json" } };
  const response = await handler(new Request(`http://localhost${path}`, init), { params: Promise.resolve(params) });
  return { status: response.status, body: await response.json() };
}
const getBoard = (viewer: TestViewer | null) => call(boardGet, viewer, "/api/lab/queue", {});
const postJob = (viewer: TestViewer | null, id: string, body: unknown) => call(jobPost, viewer, `/api/lab/queue/jobs/${id}`, { id }, body);
const postPrinter = (viewer: TestViewer | null, id: string, body: unknown) => call(printerPost, viewer, `/api/lab/queue/printers/${id}`, { id }, body);

describe("queue board API: who may call it", () => {
  it.each([
    ["a visitor", null, 401, "unauthenticated"],
    ["a supporter", supporter, 403, "forbidden"],
    ["a member", member, 403, "forbidden"],
  ] as const)("refuses %s", async (_, viewer, status, code) => {
    for (const response of [
      await getBoard(viewer),
      await postJob(viewer, asaJob.id, { action: "pin", pinned: true }),
      await postPrinter(viewer, kestrel, { status: "down" }),
    ]) {
      expect(response.status).toBe(status);
      expect(response.body.error.code).toBe(code);
    }
    expect(temp.db.select().from(jobs).where(eq(jobs.id, asaJob.id)).get()?.pinned).toBe(false);
    expect(temp.db.select().from(printers).where(eq(printers.id, kestrel)).get()?.status).toBe("available");
  });

  it("answers a host with printers, campaigns and placed jobs", async () => {
    const { status, body } = await getBoard(host);
    expect(status).toBe(200);
    expect(body.printers.map((printer: { id: string }) => printer.id)).toEqual(expect.arrayContaining([kestrel, wren]));
    expect(body.jobs.length).toBeGreaterThan(0);
    expect(body.jobs.every((job: { start: number | null }) => job.start !== null)).toBe(true);
    expect(body.campaigns.some((campaign: { id: string }) => campaign.id === asaCampaign.id)).toBe(true);
  });
});

describe("queue board API: bad input and refused moves", () => {
  it("names the field of a malformed action (422)", async () => {
    const missing = await postJob(host, asaJob.id, { action: "move" });
    expect(missing.status).toBe(422);
    expect(Object.keys(missing.body.error.fields)).toContain("direction");
    const unknown = await postJob(host, asaJob.id, { action: "teleport" });
    expect(unknown.status).toBe(422);
    expect(Object.keys(unknown.body.error.fields)).toContain("action");
    const status = await postPrinter(host, kestrel, { status: "broken" });
    expect(status.status).toBe(422);
    expect(Object.keys(status.body.error.fields)).toContain("status");
    expect((await postJob(host, asaJob.id, "{not json")).status).toBe(400);
  });

  it("refuses an ASA job on a printer that does not print ASA, with the reason", async () => {
    const { status, body } = await postJob(host, asaJob.id, { action: "assign", printerId: kestrel });
    expect(status).toBe(422);
    expect(body.error.fields.printerId).toMatch(/ASA/);
    expect(temp.db.select().from(jobs).where(eq(jobs.id, asaJob.id)).get()?.chosenPrinterId).toBeNull();
  });

  it("answers 404 for a job that is not in the queue", async () => {
    expect((await postJob(host, "no-such-job", { action: "pin", pinned: true })).status).toBe(404);
  });
});

describe("queue board API: host actions", () => {
  it("pins a job, and marks a printer down and up again with the jobs following", async () => {
    const pinned = await postJob(host, asaJob.id, { action: "pin", pinned: true });
    expect(pinned.status).toBe(200);
    expect(temp.db.select().from(jobs).where(eq(jobs.id, asaJob.id)).get()?.pinned).toBe(true);

    const down = await postPrinter(host, wren, { status: "down" });
    expect(down.status).toBe(200);
    expect(down.body).toMatchObject({ printerId: wren, status: "down", changed: true });
    const board = (await getBoard(host)).body as { jobs: { state: string; printerId: string | null }[] };
    expect(board.jobs.filter((job) => job.state !== "running" && job.printerId === wren)).toHaveLength(0);

    const up = await postPrinter(host, wren, { status: "available" });
    expect(up.status).toBe(200);
    expect(temp.db.select().from(printers).where(eq(printers.id, wren)).get()?.status).toBe("available");
  });
});

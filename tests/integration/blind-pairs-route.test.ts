import { createHash, randomBytes } from "node:crypto";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { hasEarlyBlindPairAccess } from "@/db/queries/memberships";
import { blindPairVotes, pledges, reportPhotos, reports, uploads, users } from "@/db/schema";
import { seedDemo, seedId } from "@/db/seed";
import { issuePairTicket } from "@/lib/judging/tickets";
import type { Role } from "@/lib/roles";
import { uploadPath } from "@/lib/uploads/paths";
import { createTempDb } from "../helpers/temp-db";

type TestViewer = { id: string; email: string; name: string | null; role: Role };

const signedIn = vi.hoisted(() => ({ viewer: null as TestViewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => signedIn.viewer,
  auth: async () => (signedIn.viewer ? { user: signedIn.viewer } : null),
}));

const SECRET = "blind-pair-route-test-secret-0123456789";
const uploadsDir = mkdtempSync(path.join(os.tmpdir(), "proofbay-blind-uploads-"));
const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;
process.env.AUTH_SECRET = SECRET;
process.env.UPLOADS_DIR = uploadsDir;
afterAll(() => {
  temp.cleanup();
  rmSync(uploadsDir, { recursive: true, force: true });
});
afterEach(() => {
  vi.useRealTimers();
});

type Handler<P> = (request: Request, segment: { params: Promise<P> }) => Promise<Response>;
let GET: Handler<{ slug: string }>;
let POST: Handler<{ slug: string }>;
let IMAGE: Handler<{ token: string }>;
beforeAll(async () => {
  ({ GET, POST } = (await import("@/app/api/blind-pairs/campaigns/[slug]/route")) as unknown as { GET: typeof GET; POST: typeof POST });
  ({ GET: IMAGE } = (await import("@/app/api/blind-pairs/images/[token]/route")) as unknown as { GET: typeof IMAGE });
});

/* ---------- Photos for two campaigns: the reported one (published report) and one still printing (draft) ---------- */

const db = temp.db;
const host = seedId("user", "host");
const photoBytes = new Map<string, Buffer>();

function addPhotos(campaignKey: string, reportId: string, pieces: number, variants: number) {
  for (let p = 1; p <= pieces; p++) {
    for (let v = 1; v <= variants; v++) {
      const bytes = randomBytes(256);
      const sha256 = createHash("sha256").update(bytes).digest("hex");
      const file = uploadPath(sha256, uploadsDir);
      mkdirSync(path.dirname(file), { recursive: true });
      writeFileSync(file, bytes);
      const uploadId = crypto.randomUUID();
      db.insert(uploads)
        .values({ id: uploadId, sha256, kind: "photo", mimeType: "image/webp", sizeBytes: bytes.length, originalName: `${campaignKey}-variant-${v}-secret-name.webp`, ownerId: host })
        .run();
      const id = crypto.randomUUID();
      db.insert(reportPhotos)
        .values({ id, reportId, pieceId: seedId("piece", `${campaignKey}:${p}`), variantId: seedId("variant", `${campaignKey}:${v}`), uploadId, lightSetKey: `light-${p}` })
        .run();
      photoBytes.set(id, bytes);
    }
  }
}

const reported = { slug: "wide-mouth-blower-duct-for-the-wren", id: seedId("campaign", "wide-mouth") };
addPhotos("wide-mouth", seedId("report", "wide-mouth"), 2, 3); // 2 pieces × 3 variants → 2 × 3 pairs
const printing = { slug: "petg-bridging-with-100-percent-fan", id: seedId("campaign", "petg-bridging") };
const draftReportId = crypto.randomUUID();
db.insert(reports).values({ id: draftReportId, campaignId: printing.id, state: "draft" }).run();
addPhotos("petg-bridging", draftReportId, 1, 2);

function viewer(key: string, role: Role = "supporter"): TestViewer {
  const row = db.select().from(users).where(eq(users.id, seedId("user", key))).get();
  if (!row) throw new Error(`no seeded user ${key}`);
  return { id: row.id, email: row.email ?? "", name: row.name, role };
}

// db/seed-data.ts: Mina is a Reel member (early blind pairs) and backed the reported campaign; Jules backed other campaigns only.
const mina = viewer("member", "member");
const jules = viewer("supporter");
const spoolMember = viewer("b03", "member"); // Spool plan: no early blind pairs
const plainBacker = (() => {
  const rows = db.select({ supporterId: pledges.supporterId }).from(pledges).where(and(eq(pledges.campaignId, reported.id), eq(pledges.state, "paid"))).all();
  const id = rows.map((r) => r.supporterId).find((candidate) => !hasEarlyBlindPairAccess(db, candidate, new Date()) && candidate !== mina.id);
  const row = db.select().from(users).where(eq(users.id, id ?? "")).get();
  if (!row) throw new Error("the seed has no non-member backer of the reported campaign");
  return { id: row.id, email: row.email ?? "", name: row.name, role: "supporter" as Role };
})();

async function next(who: TestViewer | null, slug = reported.slug) {
  signedIn.viewer = who;
  const response = await GET(new Request(`http://localhost/api/blind-pairs/campaigns/${slug}`), { params: Promise.resolve({ slug }) });
  return { status: response.status, body: await response.json() };
}

async function vote(who: TestViewer | null, body: unknown, slug = reported.slug) {
  signedIn.viewer = who;
  const response = await POST(
    new Request(`http://localhost/api/blind-pairs/campaigns/${slug}`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) }),
    { params: Promise.resolve({ slug }) },
  );
  return { status: response.status, body: await response.json() };
}

/** Lets `ms` pass on the clock the route reads (new Date()). */
function later(ms: number) {
  const now = Date.now();
  if (!vi.isFakeTimers()) vi.useFakeTimers({ toFake: ["Date"] });
  vi.setSystemTime(now + ms);
}

describe("who may judge", () => {
  it("asks a visitor to sign in", async () => {
    expect((await next(null)).status).toBe(401);
  });

  it("refuses a supporter who did not back the reported campaign (403)", async () => {
    const { status, body } = await next(jules);
    expect(status).toBe(403);
    expect(body.error.code).toBe("backers_only");
    const cast = await vote(jules, { ticket: "x".repeat(40), choice: "left" });
    expect(cast.status).toBe(403);
  });

  it("lets a backer without a membership judge the reported campaign", async () => {
    const { status, body } = await next(plainBacker);
    expect(status).toBe(200);
    expect(body.progress).toEqual({ judged: 0, total: 6 });
    expect(body.pair.left.imageUrl).toMatch(/^\/api\/blind-pairs\/images\/[A-Za-z0-9_-]+$/);
  });

  it("lets an early-access member judge a draft report, and nobody else", async () => {
    expect((await next(mina, printing.slug)).status).toBe(200);
    const spool = await next(spoolMember, printing.slug);
    expect(spool.status).toBe(403);
    expect(spool.body.error.code).toBe("early_access_only");
    expect((await next(jules, printing.slug)).status).toBe(403);
  });

  it("answers 409 for a campaign without photos to judge", async () => {
    const { status, body } = await next(mina, "twin-inlet-ring-duct-vs-stock");
    expect(status).toBe(409);
    expect(body.error.code).toBe("no_pairs");
  });
});

describe("what a pair shows", () => {
  it("hides variant, photo and upload: opaque image URLs serve the bytes without a name", async () => {
    const { body } = await next(plainBacker);
    const text = JSON.stringify(body);
    for (const row of db.select({ id: reportPhotos.id, uploadId: reportPhotos.uploadId, variantId: reportPhotos.variantId }).from(reportPhotos).all()) {
      expect(text).not.toContain(row.uploadId);
      expect(text).not.toContain(row.variantId);
    }
    expect(text).not.toMatch(/secret-name|variant-|Stock|Wide-mouth/);
    const token = (body.pair.left.imageUrl as string).split("/").pop() as string;
    signedIn.viewer = plainBacker;
    const image = await IMAGE(new Request(`http://localhost${body.pair.left.imageUrl}`), { params: Promise.resolve({ token }) });
    expect(image.status).toBe(200);
    const bytes = Buffer.from(await image.arrayBuffer());
    expect([...photoBytes.values()].some((b) => b.equals(bytes))).toBe(true);
    expect(image.headers.get("content-disposition")).toBeNull();
    expect(image.headers.get("etag")).toBeNull();
    signedIn.viewer = mina;
    const other = await IMAGE(new Request(`http://localhost${body.pair.left.imageUrl}`), { params: Promise.resolve({ token }) });
    expect(other.status).toBe(403);
  });

  it("puts the photos on random sides", async () => {
    const seen = new Set<string>();
    for (let i = 0; i < 40; i++) {
      const { body } = await next(plainBacker);
      const [payload] = (body.pair.ticket as string).split(".");
      const claim = JSON.parse(Buffer.from(payload as string, "base64url").toString("utf8"));
      seen.add(claim.l === claim.a ? "a-left" : "b-left");
    }
    // Fair coin: both sides within 40 draws fail to appear with probability 2 × 0.5^40.
    expect(seen).toEqual(new Set(["a-left", "b-left"]));
  });
});

describe("voting", () => {
  it("refuses a vote sooner than 1.5 s after the pair was shown (429)", async () => {
    const { body } = await next(plainBacker);
    const cast = await vote(plainBacker, { ticket: body.pair.ticket, choice: "left" });
    expect(cast.status).toBe(429);
    expect(cast.body.error.code).toBe("too_fast");
  });

  it("counts a vote once, then refuses the same ticket and a second vote on the pair (409)", async () => {
    const first = await next(plainBacker);
    later(2000);
    const cast = await vote(plainBacker, { ticket: first.body.pair.ticket, choice: "right" });
    expect(cast.status).toBe(200);
    expect(cast.body.progress).toEqual({ judged: 1, total: 6 });
    const stored = db.select().from(blindPairVotes).where(eq(blindPairVotes.userId, plainBacker.id)).all();
    expect(stored).toHaveLength(1);
    const [payload] = (first.body.pair.ticket as string).split(".");
    const claim = JSON.parse(Buffer.from(payload as string, "base64url").toString("utf8"));
    expect(stored[0]?.winnerPhotoId).toBe(claim.l === claim.a ? claim.b : claim.a); // "right" = the photo not on the left

    const reused = await vote(plainBacker, { ticket: first.body.pair.ticket, choice: "left" });
    expect(reused.status).toBe(409);
    expect(reused.body.error.code).toBe("ticket_used");

    // A fresh, genuine ticket for the pair already judged.
    const again = issuePairTicket({ userId: plainBacker.id, campaignId: reported.id, photoAId: claim.a, photoBId: claim.b, leftPhotoId: claim.a, shownAt: Date.now() - 2000 }, SECRET);
    const second = await vote(plainBacker, { ticket: again, choice: "tie" });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe("already_voted");
    expect(db.select().from(blindPairVotes).where(eq(blindPairVotes.userId, plainBacker.id)).all()).toHaveLength(1);
  });

  it("refuses a forged ticket (400) and one issued to someone else (403)", async () => {
    const { body } = await next(plainBacker);
    later(2000);
    const [payload, signature] = (body.pair.ticket as string).split(".") as [string, string];
    const claim = JSON.parse(Buffer.from(payload, "base64url").toString("utf8"));
    const tampered = Buffer.from(JSON.stringify({ ...claim, l: claim.l === claim.a ? claim.b : claim.a })).toString("base64url");
    const forged = await vote(plainBacker, { ticket: `${tampered}.${signature}`, choice: "left" });
    expect(forged.status).toBe(400);
    expect(forged.body.error).toMatchObject({ code: "invalid_ticket", fields: { ticket: expect.any(String) } });
    const wrongKey = issuePairTicket({ userId: plainBacker.id, campaignId: reported.id, photoAId: claim.a, photoBId: claim.b, leftPhotoId: claim.a, shownAt: Date.now() - 2000 }, "another-secret-entirely-0123456789");
    expect((await vote(plainBacker, { ticket: wrongKey, choice: "left" })).status).toBe(400);
    const minas = await vote(mina, { ticket: body.pair.ticket, choice: "left" });
    expect(minas.status).toBe(403);
    expect(minas.body.error.code).toBe("ticket_not_yours");
  });

  it("refuses an expired ticket (422)", async () => {
    const { body } = await next(plainBacker);
    later(11 * 60_000);
    const cast = await vote(plainBacker, { ticket: body.pair.ticket, choice: "left" });
    expect(cast.status).toBe(422);
    expect(cast.body.error.code).toBe("ticket_expired");
  });

  it("refuses a filled honeypot and a missing choice with the field named (422)", async () => {
    const { body } = await next(plainBacker);
    later(2000);
    const bot = await vote(plainBacker, { ticket: body.pair.ticket, choice: "left", website: "http://spam.example" });
    expect(bot.status).toBe(422);
    expect(bot.body.error.fields.website).toMatch(/empty/);
    const missing = await vote(plainBacker, { ticket: body.pair.ticket });
    expect(missing.status).toBe(422);
    expect(missing.body.error.fields.choice).toBeDefined();
    // Neither refusal spent the ticket.
    expect((await vote(plainBacker, { ticket: body.pair.ticket, choice: "tie" })).status).toBe(200);
  });

  it("serves every pair once and then says so", async () => {
    let response = await next(mina);
    let judged = 0;
    while (response.body.pair) {
      later(2000);
      response = await vote(mina, { ticket: response.body.pair.ticket, choice: judged % 3 === 0 ? "tie" : "left" });
      expect(response.status).toBe(200);
      judged++;
    }
    expect(judged).toBe(6);
    expect(response.body.progress).toEqual({ judged: 6, total: 6 });
    const keys = db.select({ pairKey: blindPairVotes.pairKey }).from(blindPairVotes).where(eq(blindPairVotes.userId, mina.id)).all();
    expect(new Set(keys.map((k) => k.pairKey)).size).toBe(6);
  });
});

describe("rankingInput", () => {
  it("turns each stored vote into a comparison of the two photos' variants", async () => {
    const { rankingInput } = await import("@/db/queries/blind-pairs");
    const input = rankingInput(db, reported.id);
    const stored = db.select().from(blindPairVotes).where(eq(blindPairVotes.campaignId, reported.id)).all();
    expect(input.totalVotes).toBe(stored.length);
    const variantOf = new Map(db.select({ id: reportPhotos.id, variantId: reportPhotos.variantId }).from(reportPhotos).all().map((r) => [r.id, r.variantId]));
    // Tally "variant preferred" both ways and compare: the arrays must say the same as the rows.
    const fromRows = new Map<string, number>();
    for (const vote of stored) {
      const key = vote.winnerPhotoId === null ? "tie" : (variantOf.get(vote.winnerPhotoId) as string);
      fromRows.set(key, (fromRows.get(key) ?? 0) + 1);
    }
    const fromArrays = new Map<string, number>();
    for (let k = 0; k < input.totalVotes; k++) {
      const o = input.comparisons.outcome[k];
      const winner = o === 0 ? "tie" : input.variants[(o === 1 ? input.comparisons.first[k] : input.comparisons.second[k]) as number]!.id;
      fromArrays.set(winner, (fromArrays.get(winner) ?? 0) + 1);
    }
    expect(fromArrays).toEqual(fromRows);
    expect(input.variants.map((v) => v.id)).toEqual([1, 2, 3].map((v) => seedId("variant", `wide-mouth:${v}`)));
  });
});

import { and, eq, like } from "drizzle-orm";
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { listLabNotes } from "@/db/queries/reports";
import { seedDemo, seedId } from "@/db/seed";
import { campaigns, outbox, pledges, reports, reportScores, uploads, users } from "@/db/schema";
import type { Role } from "@/lib/roles";
import type { Viewer } from "@/server/auth";
import { createTempDb } from "../helpers/temp-db";

const session = vi.hoisted(() => ({ viewer: null as Viewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => session.viewer,
  auth: async () => (session.viewer ? { user: session.viewer } : null),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;
const db = temp.db;

let actions: typeof import("@/app/lab/reports/[campaignId]/actions");
let feedRoute: typeof import("@/app/reports/feed.xml/route");
beforeAll(async () => {
  actions = await import("@/app/lab/reports/[campaignId]/actions");
  feedRoute = await import("@/app/reports/feed.xml/route");
});
afterAll(() => temp.cleanup());

function as(key: string, role: Role): Viewer {
  const row = db.select().from(users).where(eq(users.id, seedId("user", key))).get();
  if (!row) throw new Error(`no seeded user ${key}`);
  return { id: row.id, email: row.email ?? "", name: row.name, role };
}
const host = as("host", "host");
const admin = as("owner", "admin");
const member = as("member", "member");
const supporter = as("supporter", "supporter");

// db/seed-data.ts: petg-bridging is printing, matte-pla funded (or queued once scheduled), twin-inlet open, wide-mouth reported.
const printing = seedId("campaign", "petg-bridging");
const funded = seedId("campaign", "matte-pla");
const open = seedId("campaign", "twin-inlet");
const reported = seedId("campaign", "wide-mouth");
const fundedState = db.select().from(campaigns).where(eq(campaigns.id, funded)).get()?.state;
const variant = (key: string, n: number) => seedId("variant", `${key}:${n}`);
const piece = (key: string, n: number) => seedId("piece", `${key}:${n}`);

function paidBackerIds(campaignId: string): Set<string> {
  return new Set(
    db
      .select({ id: pledges.supporterId })
      .from(pledges)
      .where(and(eq(pledges.campaignId, campaignId), eq(pledges.state, "paid")))
      .all()
      .map((row) => row.id),
  );
}

function draft(extra: Record<string, unknown> = {}) {
  return {
    summary: "Sample B bridges with the least sag; sample A curls on far-side overhangs at full fan.",
    bodyMd: "## What we tested\n\nThree PETG spools.\n\n<script>alert('x')</script>",
    videoUrl: "https://video.harbor-street.example/reports/petg-bridging",
    actualCost: "",
    scores: [
      { pieceId: null, variantId: variant("petg-bridging", 2), criterion: "bridge-sag", score: -1, note: "" },
      { pieceId: null, variantId: variant("petg-bridging", 3), criterion: "bridge-sag", score: 2, note: "flat at 40 mm" },
    ],
    photos: [],
    ...extra,
  };
}

describe("who may edit, publish and post notes", () => {
  const cases: [string, Viewer | null, number][] = [
    ["a visitor", null, 401],
    ["a supporter", supporter, 403],
    ["a member", member, 403],
  ];
  it.each(cases)("%s is refused the draft, the publish and the note", async (_label, viewer, status) => {
    session.viewer = viewer;
    const save = await actions.saveReportDraftAction(funded, draft());
    const publish = await actions.publishReportAction(funded, draft());
    const note = await actions.postLabNoteAction(funded, { bodyMd: "A first photo of the beam." });
    for (const result of [save, publish, note]) expect(result).toMatchObject({ ok: false, status });
    expect(db.select().from(reports).where(eq(reports.campaignId, funded)).get()).toBeUndefined();
    expect(listLabNotes(db, funded)).toHaveLength(0);
    expect(["funded", "queued"]).toContain(fundedState);
    expect(db.select().from(campaigns).where(eq(campaigns.id, funded)).get()?.state).toBe(fundedState);
  });

  it("a host saves a draft and an admin may too", async () => {
    session.viewer = host;
    const first = await actions.saveReportDraftAction(funded, draft({ scores: [] }));
    expect(first.ok).toBe(true);
    session.viewer = admin;
    const second = await actions.saveReportDraftAction(funded, draft({ scores: [], summary: "Changed by the owner, still a draft." }));
    expect(second.ok).toBe(true);
    const row = db.select().from(reports).where(eq(reports.campaignId, funded)).get();
    expect(row).toMatchObject({ state: "draft", summary: "Changed by the owner, still a draft." });
  });
});

describe("drafts", () => {
  it("refuses an http video link with a 422 naming videoUrl, and keeps the saved draft", async () => {
    session.viewer = host;
    expect((await actions.saveReportDraftAction(printing, draft())).ok).toBe(true);
    for (const videoUrl of ["http://video.harbor-street.example/run", "javascript:alert(1)", "video.harbor-street.example/run"]) {
      const result = await actions.saveReportDraftAction(printing, draft({ videoUrl, summary: "should not be saved" }));
      expect(result).toMatchObject({ ok: false, status: 422 });
      if (!result.ok) expect(Object.keys(result.fields ?? {})).toEqual(["videoUrl"]);
    }
    const row = db.select().from(reports).where(eq(reports.campaignId, printing)).get();
    expect(row?.videoUrl).toBe("https://video.harbor-street.example/reports/petg-bridging");
    expect(row?.summary).not.toBe("should not be saved");
  });

  it("refuses a score out of range, a score for the reference variant, and a piece from another plan", async () => {
    session.viewer = host;
    const outOfRange = await actions.saveReportDraftAction(printing, draft({ scores: [{ pieceId: null, variantId: variant("petg-bridging", 2), criterion: "surface", score: 3 }] }));
    expect(outOfRange).toMatchObject({ ok: false, status: 422, fields: { "scores.0.score": expect.any(String) } });
    const reference = await actions.saveReportDraftAction(printing, draft({ scores: [{ pieceId: null, variantId: variant("petg-bridging", 1), criterion: "surface", score: 1 }] }));
    expect(reference).toMatchObject({ ok: false, status: 422, fields: { "scores.0": expect.any(String) } });
    const foreign = await actions.saveReportDraftAction(
      printing,
      draft({ scores: [{ pieceId: piece("wide-mouth", 1), variantId: variant("petg-bridging", 2), criterion: "surface", score: 1 }] }),
    );
    expect(foreign).toMatchObject({ ok: false, status: 422, fields: { "scores.0": expect.any(String) } });
  });

  it("refuses a photo that is not the lab's own", async () => {
    session.viewer = host;
    const uploadId = db
      .insert(uploads)
      .values({ sha256: "a".repeat(64), kind: "photo", mimeType: "image/png", sizeBytes: 10, originalName: "mine.png", ownerId: supporter.id })
      .returning()
      .get().id;
    const result = await actions.saveReportDraftAction(
      printing,
      draft({ photos: [{ uploadId, pieceId: piece("petg-bridging", 1), variantId: variant("petg-bridging", 2), caption: "", lightSetKey: null }] }),
    );
    expect(result).toMatchObject({ ok: false, status: 422, fields: { "photos.0": expect.any(String) } });
  });

  it("takes the run log's cost when none is entered, and the typed amount when it is", async () => {
    session.viewer = host;
    await actions.saveReportDraftAction(printing, draft());
    const fromLog = db.select().from(reports).where(eq(reports.campaignId, printing)).get();
    // The printing campaign has done jobs with filament and hours logged (db/seed.ts), so a cost exists.
    expect(fromLog).toMatchObject({ actualCostSource: "run_log" });
    expect(fromLog?.actualCostMinor).toBeGreaterThan(0);
    await actions.saveReportDraftAction(printing, draft({ actualCost: "312.50" }));
    expect(db.select().from(reports).where(eq(reports.campaignId, printing)).get()).toMatchObject({ actualCostSource: "entered", actualCostMinor: 31250 });
    const bad = await actions.saveReportDraftAction(printing, draft({ actualCost: "about 300" }));
    expect(bad).toMatchObject({ ok: false, status: 422, fields: { actualCost: expect.any(String) } });
  });
});

describe("publishing", () => {
  it("a double submit changes the state once and queues one mail per paid backer", async () => {
    session.viewer = host;
    const backers = paidBackerIds(printing);
    expect(backers.size).toBeGreaterThan(3);
    const [a, b] = await Promise.all([actions.publishReportAction(printing, draft()), actions.publishReportAction(printing, draft())]);
    expect(a.ok && b.ok).toBe(true);
    if (!a.ok || !b.ok) return;
    expect([a.data.published, b.data.published].sort()).toEqual([false, true]);
    expect(a.data.mailed + b.data.mailed).toBe(backers.size);

    const report = db.select().from(reports).where(eq(reports.campaignId, printing)).get()!;
    expect(report.state).toBe("published");
    expect(db.select().from(campaigns).where(eq(campaigns.id, printing)).get()?.state).toBe("reported");
    const mail = db.select().from(outbox).where(like(outbox.dedupeKey, `report-published:${report.id}:%`)).all();
    expect(mail).toHaveLength(backers.size);
    expect(new Set(mail.map((m) => m.dedupeKey.split(":")[2]))).toEqual(backers);
    expect(new Set(mail.map((m) => m.category))).toEqual(new Set(["reports"]));
    expect(mail.every((m) => m.template === "report-published" && m.userId !== null)).toBe(true);

    // A third try later: still one report, nothing more queued, and the draft can no longer change.
    const again = await actions.publishReportAction(printing, draft({ summary: "A different summary, far too late." }));
    expect(again).toMatchObject({ ok: true, data: { published: false, mailed: 0 } });
    expect(db.select().from(outbox).where(like(outbox.dedupeKey, `report-published:${report.id}:%`)).all()).toHaveLength(backers.size);
    expect(await actions.saveReportDraftAction(printing, draft())).toMatchObject({ ok: false, status: 409 });
    expect(db.select().from(reportScores).where(eq(reportScores.reportId, report.id)).all()).toHaveLength(2);
  });

  it("refuses to publish an open campaign's report (409)", async () => {
    session.viewer = host;
    expect(await actions.publishReportAction(open, draft({ scores: [] }))).toMatchObject({ ok: false, status: 409 });
    expect(db.select().from(campaigns).where(eq(campaigns.id, open)).get()?.state).toBe("open");
  });

  it("needs a summary to publish (422 on summary)", async () => {
    session.viewer = host;
    expect(await actions.publishReportAction(funded, draft({ scores: [], summary: "" }))).toMatchObject({
      ok: false,
      status: 422,
      fields: { summary: expect.any(String) },
    });
  });
});

describe("lab notes", () => {
  it("are refused outside funded, queued and printing with a 409", async () => {
    session.viewer = host;
    for (const campaignId of [open, reported, seedId("campaign", "side-blower")]) {
      const result = await actions.postLabNoteAction(campaignId, { bodyMd: "The bed heater needed a new thermistor." });
      expect(result).toMatchObject({ ok: false, status: 409 });
      expect(listLabNotes(db, campaignId)).toHaveLength(0);
    }
  });

  it("are posted on a funded campaign, listed newest first and mailed once per backer", async () => {
    session.viewer = host;
    const backers = paidBackerIds(funded);
    const first = await actions.postLabNoteAction(funded, { bodyMd: "Spools are drying; first beams print tomorrow." });
    await new Promise((resolve) => setTimeout(resolve, 5));
    const second = await actions.postLabNoteAction(funded, { bodyMd: "**First beam done.** Photo in the next note." });
    expect(first.ok && second.ok).toBe(true);
    if (!first.ok || !second.ok) return;
    expect(listLabNotes(db, funded).map((note) => note.id)).toEqual([second.data.noteId, first.data.noteId]);
    for (const noteId of [first.data.noteId, second.data.noteId]) {
      const mail = db.select().from(outbox).where(like(outbox.dedupeKey, `lab-note:${noteId}:%`)).all();
      expect(mail).toHaveLength(backers.size);
      expect(mail.every((m) => m.category === "campaign-updates")).toBe(true);
    }
  });

  it("a double submit of the same note posts it once and mails each backer once", async () => {
    session.viewer = host;
    const body = { bodyMd: "Second repeat of the beams is on the printer now." };
    const [a, b] = await Promise.all([actions.postLabNoteAction(funded, body), actions.postLabNoteAction(funded, body)]);
    expect(a.ok && b.ok).toBe(true);
    if (!a.ok || !b.ok) return;
    expect(a.data.noteId).toBe(b.data.noteId);
    expect(a.data.mailed + b.data.mailed).toBe(paidBackerIds(funded).size);
    expect(listLabNotes(db, funded).filter((note) => note.bodyMd === body.bodyMd)).toHaveLength(1);
  });

  it("refuses an empty note with a 422 naming bodyMd", async () => {
    session.viewer = host;
    expect(await actions.postLabNoteAction(funded, { bodyMd: "  " })).toMatchObject({ ok: false, status: 422, fields: { bodyMd: expect.any(String) } });
  });
});

describe("the reports feed", () => {
  it("is well-formed Atom listing every published report, newest first", async () => {
    const response = feedRoute.GET();
    expect(response.headers.get("content-type")).toMatch(/^application\/atom\+xml/);
    const xml = await response.text();
    expect(XMLValidator.validate(xml)).toBe(true);
    type Entry = { title: string | { "#text": string }; id: string; link: { "@_href": string }; published: string };
    const parsed = new XMLParser({ ignoreAttributes: false }).parse(xml) as { feed: { "@_xmlns": string; entry: Entry[] | Entry } };
    // RFC 4287 §4.1.1: the Atom namespace.
    expect(parsed.feed["@_xmlns"]).toBe("http://www.w3.org/2005/Atom");
    const entries = Array.isArray(parsed.feed.entry) ? parsed.feed.entry : [parsed.feed.entry];
    const published = db.select({ id: reports.id }).from(reports).where(eq(reports.state, "published")).all();
    expect(entries).toHaveLength(published.length);
    const titleOf = (entry: Entry) => (typeof entry.title === "string" ? entry.title : entry.title["#text"]);
    const titles = entries.map(titleOf);
    expect(titles).toContain("Wide-mouth blower duct for the Wren");
    expect(titles).toContain("PETG bridging with 100 % fan");
    // The PETG report was published in this test run; the seeded one 20 days ago.
    expect(titles.indexOf("PETG bridging with 100 % fan")).toBeLessThan(titles.indexOf("Wide-mouth blower duct for the Wren"));
    const petg = entries.find((entry) => titleOf(entry).startsWith("PETG"));
    expect(petg?.link["@_href"]).toMatch(/\/reports\/petg-bridging-with-100-percent-fan$/);
  });
});

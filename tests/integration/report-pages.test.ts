import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { seedDemo, seedId } from "@/db/seed";
import { reportPhotos, reports, uploads } from "@/db/schema";
import type { Viewer } from "@/server/auth";
import { uploadPath } from "@/lib/uploads/paths";
import { createTempDb } from "../helpers/temp-db";

const session = vi.hoisted(() => ({ viewer: null as Viewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => session.viewer,
  auth: async () => (session.viewer ? { user: session.viewer } : null),
}));
vi.mock("next/navigation", () => ({
  notFound: () => {
    throw new Error("NEXT_NOT_FOUND");
  },
  redirect: (to: string) => {
    throw new Error(`NEXT_REDIRECT ${to}`);
  },
  useRouter: () => ({ push: () => undefined, refresh: () => undefined }),
}));

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;
const uploadsDir = mkdtempSync(path.join(os.tmpdir(), "proofbay-report-uploads-"));
process.env.UPLOADS_DIR = uploadsDir;
const db = temp.db;

// Two photos of the first piece (db/seed-data.ts: wide-mouth), reference and second variant, same light.
const reportId = seedId("report", "wide-mouth");
const host = seedId("user", "host");
for (const [i, variant] of [1, 2].entries()) {
  const uploadId = db
    .insert(uploads)
    .values({ sha256: String(i).repeat(64), kind: "photo", mimeType: "image/webp", sizeBytes: 100, originalName: `p${i}.webp`, ownerId: host, thumbnailSha256: String(i + 5).repeat(64), widthPx: 800, heightPx: 600 })
    .returning()
    .get().id;
  db.insert(reportPhotos)
    .values({ reportId, pieceId: seedId("piece", "wide-mouth:1"), variantId: seedId("variant", `wide-mouth:${variant}`), uploadId, caption: `Shot ${i + 1}`, lightSetKey: "box-front" })
    .run();
}

type Page = typeof import("@/app/(public)/reports/[slug]/page");
let page: Page;
beforeAll(async () => {
  page = await import("@/app/(public)/reports/[slug]/page");
});
afterAll(() => {
  temp.cleanup();
  rmSync(uploadsDir, { recursive: true, force: true });
});

const params = (slug: string) => ({ params: Promise.resolve({ slug }) });

describe("the public report page", () => {
  it("shows the scorecard, both photos side by side, the write-up, cost and cautions", async () => {
    const html = renderToStaticMarkup(await page.default(params("wide-mouth-blower-duct-for-the-wren")));
    expect(html).toContain('data-testid="scorecard"');
    // db/seed-reports.ts: the splitter scores +2 on bridge sag, the plain wide mouth −1.
    expect(html).toMatch(/Bridge sag<\/th><td[^>]*><span[^>]*>0<\/span>.*?<td[^>]*><span[^>]*>\u22121<\/span>.*?<td[^>]*><span[^>]*>\+2<\/span>/);
    expect(html).toContain("Shot 1");
    expect(html).toContain("Shot 2");
    expect(html).toContain("Same light: box-front");
    expect(html).toContain("What we learned");
    expect(html).toContain("Loud blower fans");
    // The seeded report's cost comes from the run log (db/seed-reports.ts) and is shown against the goal.
    const spent = db.select().from(reports).where(eq(reports.id, reportId)).get()!;
    expect(spent.actualCostSource).toBe("run_log");
    expect(html).toMatch(new RegExp(`data-testid="cost-spent">\\$${(spent.actualCostMinor! / 100).toLocaleString("en-US", { maximumFractionDigits: 2 })}`));
  });

  it("has share metadata with the first photo as the Open Graph image", async () => {
    const metadata = await page.generateMetadata(params("wide-mouth-blower-duct-for-the-wren"));
    const first = db.select().from(reportPhotos).where(eq(reportPhotos.variantId, seedId("variant", "wide-mouth:1"))).get()!;
    expect(metadata.title).toBe("Report: Wide-mouth blower duct for the Wren");
    expect(String(metadata.description)).toMatch(/^The splitter version is the clear winner/);
    const images = metadata.openGraph?.images as { url: string }[];
    expect(images[0]?.url).toMatch(new RegExp(`/api/uploads/${first.uploadId}$`));
    expect(JSON.stringify(metadata.alternates?.types)).toContain("/reports/feed.xml");
  });

  it("is not found for a draft", async () => {
    expect(db.select().from(reports).where(eq(reports.id, seedId("report", "asa-warp"))).get()?.state).toBe("draft");
    await expect(page.default(params("asa-corner-lift-in-the-heron"))).rejects.toThrow("NEXT_NOT_FOUND");
  });
});

describe("the host's report editor page", () => {
  const editorParams = (campaignId: string) => ({ params: Promise.resolve({ campaignId }) });
  const asaCampaign = seedId("campaign", "asa-warp");

  it("sends a supporter away and a visitor to sign in", async () => {
    const editor = await import("@/app/lab/reports/[campaignId]/page");
    session.viewer = { id: seedId("user", "supporter"), email: "supporter@harbor-street.example", name: "Jules", role: "member" };
    await expect(editor.default(editorParams(asaCampaign))).rejects.toThrow("NEXT_REDIRECT /forbidden?needs=host");
    session.viewer = null;
    await expect(editor.default(editorParams(asaCampaign))).rejects.toThrow(/NEXT_REDIRECT \/sign-in/);
  });

  it("shows a host the seeded draft, its scores and the note form", async () => {
    const editor = await import("@/app/lab/reports/[campaignId]/page");
    session.viewer = { id: host, email: "host@harbor-street.example", name: "Eli", role: "host" };
    const html = renderToStaticMarkup(await editor.default(editorParams(asaCampaign)));
    expect(html).toContain("Sample B (black) held its corners");
    expect(html).toContain("Post and e-mail backers");
    expect(html).toContain("Publish report");
    // db/seed-reports.ts scores sample B +1 on dimensional accuracy: its select shows that option chosen.
    expect(html).toMatch(/aria-label="Dimensional accuracy, ASA sample B \(black\)"[^>]*>(?:(?!<\/select>).)*<option value="1" selected=""/);
  });
});

describe("the campaign page's report and notes panel", () => {
  it("lists lab notes newest first and shows the lab's way in only to hosts", async () => {
    const { CampaignReportAndNotes } = await import("@/components/reports/campaign-report-notes");
    const campaign = { id: seedId("campaign", "petg-bridging"), slug: "petg-bridging-with-100-percent-fan", state: "printing" as const };
    const forVisitor = renderToStaticMarkup(CampaignReportAndNotes({ campaign, viewerRole: null, timeZone: "UTC" }));
    // db/seed-reports.ts: the failed-print note (1 day ago) is newer than the start note (3 days ago).
    expect(forVisitor.indexOf("One failed print.")).toBeGreaterThan(-1);
    expect(forVisitor.indexOf("One failed print.")).toBeLessThan(forVisitor.indexOf("Printing has started"));
    expect(forVisitor).not.toContain("/lab/reports/");
    const forHost = renderToStaticMarkup(CampaignReportAndNotes({ campaign, viewerRole: "host", timeZone: "UTC" }));
    expect(forHost).toContain(`/lab/reports/${campaign.id}`);
    const reported = renderToStaticMarkup(
      CampaignReportAndNotes({ campaign: { id: seedId("campaign", "wide-mouth"), slug: "wide-mouth-blower-duct-for-the-wren", state: "reported" }, viewerRole: null, timeZone: "UTC" }),
    );
    expect(reported).toContain('href="/reports/wide-mouth-blower-duct-for-the-wren"');
  });
});

describe("photos of a report", () => {
  it("are public once the report is published, and only the lab's while it is a draft", async () => {
    const { GET } = (await import("@/app/api/uploads/[id]/route")) as unknown as {
      GET: (request: Request, segment: { params: Promise<{ id: string }> }) => Promise<Response>;
    };
    const bytes = Buffer.from("RIFF0000WEBPVP8 fake");
    const sha256 = "ab".repeat(32);
    mkdirSync(path.dirname(uploadPath(sha256, uploadsDir)), { recursive: true });
    writeFileSync(uploadPath(sha256, uploadsDir), bytes);
    const uploadId = db
      .insert(uploads)
      .values({ sha256, kind: "photo", mimeType: "image/webp", sizeBytes: bytes.length, originalName: "draft.webp", ownerId: host })
      .returning()
      .get().id;
    const draftReport = seedId("report", "asa-warp");
    db.insert(reportPhotos).values({ reportId: draftReport, pieceId: seedId("piece", "asa-warp:1"), variantId: seedId("variant", "asa-warp:1"), uploadId }).run();
    const get = () => GET(new Request(`http://localhost/api/uploads/${uploadId}`), { params: Promise.resolve({ id: uploadId }) });

    session.viewer = null;
    expect((await get()).status).toBe(401);
    session.viewer = { id: seedId("user", "supporter"), email: "supporter@harbor-street.example", name: "Jules", role: "supporter" };
    expect((await get()).status).toBe(403);

    db.update(reports).set({ state: "published", publishedAt: new Date() }).where(eq(reports.id, draftReport)).run();
    session.viewer = null;
    const response = await get();
    expect(response.status).toBe(200);
    expect(Buffer.from(await response.arrayBuffer())).toEqual(bytes);
  });
});

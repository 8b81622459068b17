import { createHash } from "node:crypto";
import { mkdir, rename, stat, writeFile } from "node:fs/promises";
import path from "node:path";
import { and, eq, isNull } from "drizzle-orm";
import sharp from "sharp";
import { uploadPath } from "../lib/uploads/paths";
import type { Db } from "./client";
import { campaignRunCost } from "./queries/reports";
import * as s from "./schema";

/*
 * The demo's report extras: the published report's scorecard, a report draft a host can finish
 * and publish, and lab notes on campaigns in progress. Fixed ids and insert-or-skip, like the rest
 * of the seed. Photos need files, so they are a separate, asynchronous step (seedReportPhotos).
 */

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

const DAY = 86_400_000;

/** The same name-based ids db/seed.ts uses, passed in so this module does not import it back. */
type SeedId = (kind: string, key: string) => string;

/** The published report on the wide-mouth ducts: its write-up's table, on the −2…+2 scale (db/seed-data.ts). */
const WIDE_MOUTH_SCORES: { variant: number; criterion: string; score: number; note: string }[] = [
  { variant: 2, criterion: "overhang-finish", score: 1, note: "less curl on the far side" },
  { variant: 3, criterion: "overhang-finish", score: 2, note: "far-side 70° step clean" },
  { variant: 2, criterion: "bridge-sag", score: -1, note: "60 mm span sags about 0.4 mm more" },
  { variant: 3, criterion: "bridge-sag", score: 2, note: "" },
  { variant: 2, criterion: "surface", score: 1, note: "" },
  { variant: 3, criterion: "surface", score: 1, note: "" },
  { variant: 2, criterion: "dimensional-accuracy", score: 0, note: "" },
  { variant: 3, criterion: "dimensional-accuracy", score: 0, note: "" },
  { variant: 2, criterion: "part-cooling-overall", score: 1, note: "" },
  { variant: 3, criterion: "part-cooling-overall", score: 2, note: "" },
  { variant: 2, criterion: "noise", score: 0, note: "" },
  { variant: 3, criterion: "noise", score: -1, note: "splitter whistles a little at 100 %" },
];

const DRAFT_BODY = `## What we tested
Two ASA samples against the reference spool in the enclosed Heron at 20 % fan: the corner-lift tab set,
the 200 mm flat bar and the hole-and-peg gauge, three repeats each.

## First results
- Sample A lifted on two of twelve corners; sample B on none.
- The flat bar bowed least with sample B (0.3 mm over 200 mm).

_Draft: the gauge measurements are still being written up._`;

/** Returns the report rows it holds and wrote, for the seed summary (`report` is a seed table). */
export function seedReportExtras(tx: Tx, now: Date, seedId: SeedId, userId: (key: string) => string): { reports: number; reportsInserted: number } {
  let reports = 0;
  let reportsInserted = 0;
  const t = now.getTime();
  const host = userId("host");

  const wideMouthReport = seedId("report", "wide-mouth");
  if (tx.select({ id: s.reports.id }).from(s.reports).where(eq(s.reports.id, wideMouthReport)).get()) {
    // What the run cost, from its logged jobs, as publishing would have recorded it.
    const cost = campaignRunCost(tx, seedId("campaign", "wide-mouth"));
    if (cost) {
      tx.update(s.reports)
        .set({ actualCostMinor: cost.totalMinor, actualCostSource: "run_log", authorId: host })
        .where(and(eq(s.reports.id, wideMouthReport), isNull(s.reports.actualCostMinor)))
        .run();
    }
    tx.insert(s.reportScores)
      .values(
        WIDE_MOUTH_SCORES.map((row) => ({
          id: seedId("report_score", `wide-mouth:${row.variant}:${row.criterion}`),
          reportId: wideMouthReport,
          pieceId: null,
          variantId: seedId("variant", `wide-mouth:${row.variant}`),
          criterion: row.criterion,
          score: row.score,
          note: row.note,
        })),
      )
      .onConflictDoNothing()
      .run();
  }

  // A draft for the queued ASA campaign: what the e2e test and the demo publish.
  const asaCampaign = seedId("campaign", "asa-warp");
  const asa = tx.select({ state: s.campaigns.state }).from(s.campaigns).where(eq(s.campaigns.id, asaCampaign)).get();
  if (asa && (asa.state === "funded" || asa.state === "queued" || asa.state === "printing")) {
    const draftId = seedId("report", "asa-warp");
    reports += 1;
    reportsInserted += tx
      .insert(s.reports)
      .values({
        id: draftId,
        campaignId: asaCampaign,
        state: "draft",
        summary: "Sample B (black) held its corners and stayed flattest; sample A lifted on two corners of twelve.",
        bodyMd: DRAFT_BODY,
        videoUrl: null,
        authorId: host,
        createdAt: new Date(t - 2 * DAY),
        updatedAt: new Date(t - DAY),
      })
      .onConflictDoNothing()
      .run().changes;
    tx.insert(s.reportScores)
      .values([
        { id: seedId("report_score", "asa-warp:2:dimensional-accuracy"), reportId: draftId, pieceId: null, variantId: seedId("variant", "asa-warp:2"), criterion: "dimensional-accuracy", score: -1, note: "corner lift" },
        { id: seedId("report_score", "asa-warp:3:dimensional-accuracy"), reportId: draftId, pieceId: null, variantId: seedId("variant", "asa-warp:3"), criterion: "dimensional-accuracy", score: 1, note: "" },
        { id: seedId("report_score", "asa-warp:3:surface"), reportId: draftId, pieceId: null, variantId: seedId("variant", "asa-warp:3"), criterion: "surface", score: 0, note: "" },
      ])
      .onConflictDoNothing()
      .run();
  }

  const notes: { key: string; campaign: string; daysAgo: number; bodyMd: string }[] = [
    {
      key: "petg-bridging:1",
      campaign: "petg-bridging",
      daysAgo: 3,
      bodyMd: "Printing has started on the Kestrel. The first bridge sets of the reference spool look clean at 100 % fan.",
    },
    {
      key: "petg-bridging:2",
      campaign: "petg-bridging",
      daysAgo: 1,
      bodyMd:
        "**One failed print.** Sample A's thin towers let go of the bed on the second repeat; we re-levelled and reprinted it — the lab fund's spare spool covered it. No change to the results date.",
    },
  ];
  tx.insert(s.labNotes)
    .values(
      notes.map((note) => ({
        id: seedId("lab_note", note.key),
        campaignId: seedId("campaign", note.campaign),
        authorId: host,
        bodyMd: note.bodyMd,
        createdAt: new Date(t - note.daysAgo * DAY),
        publishedAt: new Date(t - note.daysAgo * DAY),
      })),
    )
    .onConflictDoNothing()
    .run();
  return { reports, reportsInserted };
}

/* ---------- Photos for the published report ---------- */

/** One light box for every variant: in blind pairs only the print itself may differ. */
const LIGHT_BOX_EDGE = "#d9d4c7";
const PIECE_KINDS = ["overhang", "bridge", "block", "plaque"] as const;

/**
 * A generated "light box" shot of a printed piece: the same drawing for every variant of a piece,
 * with the defect the scorecard describes (curl, sag) drawn bigger or smaller per variant.
 */
function pieceSvg(kind: (typeof PIECE_KINDS)[number], variantIndex: number, lightIndex: number): string {
  const defect = [1, 0.7, 0.3][variantIndex] ?? 1;
  const light = lightIndex === 0 ? "#f4f2ec" : "#ebe7dc";
  const plastic = "#3f6f8f";
  let shape = "";
  if (kind === "overhang") {
    shape = [0, 1, 2, 3, 4]
      .map((step) => `<rect x="${140 + step * 90}" y="${420 - step * 60}" width="${120 + step * 10}" height="40" fill="${plastic}" transform="rotate(${-step * defect * 2} ${140 + step * 90} ${420 - step * 60})"/>`)
      .join("");
  } else if (kind === "bridge") {
    const sag = 10 + 50 * defect;
    shape = `<rect x="120" y="200" width="60" height="260" fill="${plastic}"/><rect x="620" y="200" width="60" height="260" fill="${plastic}"/><path d="M180 210 Q400 ${210 + sag * 2} 620 210 L620 240 Q400 ${240 + sag * 2} 180 240 Z" fill="${plastic}"/>`;
  } else if (kind === "block") {
    shape = `<rect x="280" y="160" width="240" height="240" rx="${4 + 18 * defect}" fill="${plastic}"/><rect x="280" y="160" width="240" height="24" fill="#5d8aa8" opacity="${1 - 0.5 * defect}"/>`;
  } else {
    shape = `<rect x="160" y="200" width="480" height="200" fill="${plastic}"/>${[0, 1, 2, 3, 4, 5]
      .map((i) => `<rect x="${200 + i * 72}" y="250" width="${40 - 14 * defect}" height="100" fill="#2b4f66"/>`)
      .join("")}`;
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" width="800" height="600"><defs><radialGradient id="g" cx="50%" cy="35%" r="75%"><stop offset="0" stop-color="${light}"/><stop offset="1" stop-color="${LIGHT_BOX_EDGE}"/></radialGradient></defs><rect width="800" height="600" fill="url(#g)"/><ellipse cx="400" cy="520" rx="320" ry="30" fill="#000" opacity="0.08"/>${shape}</svg>`;
}

async function storeFile(root: string, bytes: Buffer): Promise<string> {
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const target = uploadPath(sha256, root);
  try {
    await stat(target);
    return sha256;
  } catch {
    await mkdir(path.dirname(target), { recursive: true, mode: 0o750 });
    const temp = `${target}.tmp-${process.pid}`;
    await writeFile(temp, bytes, { mode: 0o600 });
    await rename(temp, target);
    return sha256;
  }
}

/**
 * Adds generated photos (WebP, with a 480 px WebP thumbnail, as the upload pipeline stores them)
 * to the published wide-mouth report: two shots per piece and variant, in two light sets, so the
 * report page has a comparison to show. Safe to re-run: rows have fixed ids and files are
 * content-addressed.
 */
export async function seedReportPhotos(db: Db, uploadsDir: string, seedId: SeedId, now = new Date()): Promise<number> {
  const reportId = seedId("report", "wide-mouth");
  const report = db.select({ id: s.reports.id }).from(s.reports).where(eq(s.reports.id, reportId)).get();
  const host = db.select({ id: s.users.id }).from(s.users).where(eq(s.users.email, "host@harbor-street.example")).get();
  if (!report || !host) return 0;

  const rows: { upload: typeof s.uploads.$inferInsert; photo: typeof s.reportPhotos.$inferInsert }[] = [];
  for (const [pieceIndex, kind] of PIECE_KINDS.entries()) {
    for (let variantIndex = 0; variantIndex < 3; variantIndex++) {
      for (let lightIndex = 0; lightIndex < 2; lightIndex++) {
        const key = `wide-mouth:${pieceIndex + 1}:${variantIndex + 1}:${lightIndex + 1}`;
        const image = await sharp(Buffer.from(pieceSvg(kind, variantIndex, lightIndex))).webp({ quality: 82 }).toBuffer();
        const thumbnail = await sharp(image).resize({ width: 480, height: 480, fit: "inside" }).webp({ quality: 80 }).toBuffer();
        const [sha256, thumbnailSha256] = [await storeFile(uploadsDir, image), await storeFile(uploadsDir, thumbnail)];
        const uploadId = seedId("upload", `report-photo:${key}`);
        rows.push({
          upload: {
            id: uploadId,
            sha256,
            kind: "photo",
            mimeType: "image/webp",
            sizeBytes: image.length,
            originalName: `light-box-${key.replace(/:/g, "-")}.webp`,
            ownerId: host.id,
            thumbnailSha256,
            widthPx: 800,
            heightPx: 600,
            createdAt: new Date(now.getTime() - 21 * DAY),
          },
          photo: {
            id: seedId("report_photo", key),
            reportId,
            pieceId: seedId("piece", `wide-mouth:${pieceIndex + 1}`),
            variantId: seedId("variant", `wide-mouth:${variantIndex + 1}`),
            uploadId,
            caption: lightIndex === 0 ? "Light box, front" : "Light box, raking light from the left",
            position: lightIndex,
            lightSetKey: lightIndex === 0 ? "box-front" : "box-raking",
            createdAt: new Date(now.getTime() - 21 * DAY),
          },
        });
      }
    }
  }
  return db.transaction((tx) => {
    let written = 0;
    for (const row of rows) {
      // An upload for the same content may exist (unique per owner and hash): reuse it.
      tx.insert(s.uploads).values(row.upload).onConflictDoNothing().run();
      const stored = tx
        .select({ id: s.uploads.id })
        .from(s.uploads)
        .where(and(eq(s.uploads.ownerId, host.id), eq(s.uploads.sha256, row.upload.sha256)))
        .get();
      if (!stored) continue;
      written += tx
        .insert(s.reportPhotos)
        .values({ ...row.photo, uploadId: stored.id })
        .onConflictDoNothing()
        .run().changes;
    }
    return written;
  });
}

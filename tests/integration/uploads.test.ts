// POST /api/uploads and GET /api/uploads/[id](/thumbnail), called as functions with real Requests,
// against a temporary database and a temporary uploads directory. Models are measured by the real
// mesh worker, compiled for this file alone (so it never races another file's `build:worker`).
//
// Authentication: Auth.js's `auth()` reads the session cookie through next/headers, which only
// exists inside Next's request scope, so the viewer is provided by mocking `@/server/auth`'s
// getViewer (the function requireRole and the GET handlers call); everything behind it is real.
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import sharp from "sharp";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { attachUploads, insertUpload, listProposalUploads } from "@/db/queries/uploads";
import { proposals, uploads, users } from "@/db/schema";
import { contentDisposition } from "@/lib/uploads/content-disposition";
import { classifyUpload } from "@/lib/uploads/classify";
import { nameWithExtension, PHOTO_UPLOAD_LIMIT_BYTES } from "@/lib/uploads/kinds";
import type { UploadResponse } from "@/lib/uploads/api";
import { uploadPath } from "@/lib/uploads/paths";
import { MODEL_UPLOAD_LIMIT_BYTES } from "@/lib/validation/model-analysis";
import type { Viewer } from "@/server/auth";
import { createTempDb } from "../helpers/temp-db";
import { asciiStl, binaryStl, pseudoRandomBytes, threeMf } from "../unit/estimate/helpers/mesh-files";
import { cube } from "../unit/estimate/helpers/meshes";

const signedIn = vi.hoisted(() => ({ viewer: null as Viewer | null }));
vi.mock("@/server/auth", () => ({ getViewer: async () => signedIn.viewer }));

const temp = createTempDb();
const uploadsDir = mkdtempSync(path.join(tmpdir(), "proofbay-uploads-test-"));
const workerDir = mkdtempSync(path.join(tmpdir(), "proofbay-uploads-worker-"));
process.env.DATABASE_PATH = temp.file;
process.env.UPLOADS_DIR = uploadsDir;

type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string> } };
let POST: Handler;
let GET_FILE: Handler;
let GET_THUMBNAIL: Handler;
let closePool: () => Promise<void>;

/* ---------- People and proposals (invented for this file) ---------- */

const people = {
  alice: { id: "u-alice", email: "alice@uploads.example", name: "Alice Upload", role: "supporter" },
  bob: { id: "u-bob", email: "bob@uploads.example", name: "Bob Upload", role: "supporter" },
  hana: { id: "u-hana", email: "hana@uploads.example", name: "Hana Host", role: "host" },
} as const satisfies Record<string, Viewer>;
const PROPOSALS = {
  aliceDraft: "p-alice-draft",
  aliceSubmitted: "p-alice-submitted",
  aliceReviewed: "p-alice-reviewed",
  bobDraft: "p-bob-draft",
};

function seedPeople(): void {
  temp.db.insert(users).values(Object.values(people).map(({ id, email, name, role }) => ({ id, email, name, role }))).run();
  const proposal = (id: string, proposerId: string, state: "draft" | "submitted", reviewStartedAt: Date | null = null) => ({
    id,
    slug: id,
    title: `Proposal ${id}`,
    kind: "part" as const,
    printerType: "corexy" as const,
    why: "For the upload tests.",
    state,
    proposerId,
    reviewStartedAt,
  });
  temp.db
    .insert(proposals)
    .values([
      proposal(PROPOSALS.aliceDraft, people.alice.id, "draft"),
      proposal(PROPOSALS.aliceSubmitted, people.alice.id, "submitted"),
      proposal(PROPOSALS.aliceReviewed, people.alice.id, "submitted", new Date()),
      proposal(PROPOSALS.bobDraft, people.bob.id, "draft"),
    ])
    .run();
}

beforeAll(async () => {
  // The worker is CommonJS importing zod, fflate and fast-xml-parser: give its folder the project's node_modules.
  execFileSync(path.join("node_modules", ".bin", "tsc"), ["-p", "tsconfig.worker.json", "--outDir", workerDir], { stdio: "pipe" });
  writeFileSync(path.join(workerDir, "package.json"), '{"type": "commonjs"}');
  symlinkSync(path.resolve("node_modules"), path.join(workerDir, "node_modules"), "dir");
  const { MeshWorkerPool } = await import("@/server/mesh-worker-pool");
  const pool = new MeshWorkerPool({ size: 1, workerFile: path.join(workerDir, "server", "mesh-worker.js") });
  // getMeshWorkerPool() keeps the app's pool here and creates one only when there is none.
  (globalThis as { proofbayMeshWorkerPool?: unknown }).proofbayMeshWorkerPool = pool;
  closePool = () => pool.close();

  seedPeople();
  ({ POST } = (await import("@/app/api/uploads/route")) as unknown as { POST: Handler });
  ({ GET: GET_FILE } = (await import("@/app/api/uploads/[id]/route")) as unknown as { GET: Handler });
  ({ GET: GET_THUMBNAIL } = (await import("@/app/api/uploads/[id]/thumbnail/route")) as unknown as { GET: Handler });
  const { env } = await import("@/lib/env");
  expect(env.uploadsDir).toBe(uploadsDir); // never the project's data/uploads
}, 60_000);

afterEach(() => {
  signedIn.viewer = null;
  // Every temporary file was either moved into the store or removed.
  const tmp = path.join(uploadsDir, "tmp");
  expect(existsSync(tmp) ? readdirSync(tmp) : []).toEqual([]);
});

afterAll(async () => {
  await closePool?.();
  temp.cleanup();
  rmSync(uploadsDir, { recursive: true, force: true });
  rmSync(workerDir, { recursive: true, force: true });
});

/* ---------- Helpers ---------- */

function as(person: keyof typeof people | null): void {
  signedIn.viewer = person ? people[person] : null;
}

async function upload(bytes: Uint8Array | string, name: string, fields: Record<string, string> = {}, type = "application/octet-stream") {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) form.set(key, value);
  form.set("file", new Blob([bytes as BlobPart], { type }), name);
  const response = await POST(new Request("http://localhost/api/uploads", { method: "POST", body: form }), { params: Promise.resolve({}) });
  return { status: response.status, body: (await response.json()) as UploadResponse & ErrorBody };
}

async function uploaded(bytes: Uint8Array | string, name: string, fields: Record<string, string> = {}) {
  const { status, body } = await upload(bytes, name, fields);
  expect(status, JSON.stringify(body)).toBe(201);
  return body.upload;
}

async function get(id: string, variant: "file" | "thumbnail" = "file", headers: Record<string, string> = {}) {
  const handler = variant === "file" ? GET_FILE : GET_THUMBNAIL;
  const url = `http://localhost/api/uploads/${id}${variant === "thumbnail" ? "/thumbnail" : ""}`;
  return handler(new Request(url, { headers }), { params: Promise.resolve({ id }) });
}

function rowOf(id: string) {
  const row = temp.db.select().from(uploads).all().find((candidate) => candidate.id === id);
  if (!row) throw new Error(`no upload row ${id}`);
  return row;
}

function storedBytes(sha256: string): Buffer {
  return readFileSync(uploadPath(sha256, uploadsDir));
}

function storedFiles(): string[] {
  return readdirSync(uploadsDir, { recursive: true, encoding: "utf8" }).filter((name) => name.endsWith(".bin"));
}

const sha256 = (bytes: Uint8Array | string) => createHash("sha256").update(bytes).digest("hex");

/** The tags of a JPEG's EXIF IFD0 (TIFF 6.0 layout: byte order, IFD offset, 12-byte entries), as hex. */
function ifd0Tags(exif: Buffer): string[] {
  const tiff = exif.subarray(exif.subarray(0, 6).toString("latin1") === "Exif\0\0" ? 6 : 0);
  const little = tiff.toString("latin1", 0, 2) === "II";
  const u16 = (at: number) => (little ? tiff.readUInt16LE(at) : tiff.readUInt16BE(at));
  const u32 = (at: number) => (little ? tiff.readUInt32LE(at) : tiff.readUInt32BE(at));
  const ifd = u32(4);
  return Array.from({ length: u16(ifd) }, (_, i) => u16(ifd + 2 + 12 * i).toString(16));
}

/** A JPEG shot "sideways" (EXIF Orientation 6: rotate 90° clockwise to view) with a GPS position and camera make. */
async function jpegWithGps(width = 640, height = 480): Promise<Buffer> {
  return sharp({ create: { width, height, channels: 3, background: "#808080" } })
    .jpeg()
    .withMetadata({ orientation: 6 })
    .withExifMerge({
      IFD0: { Make: "UploadTestCam" },
      IFD3: { GPSLatitudeRef: "S", GPSLatitude: "36/1 50/1 0/1", GPSLongitudeRef: "E", GPSLongitude: "174/1 45/1 0/1" },
    })
    .toBuffer();
}

// The smallest useful PDF: header and trailer (ISO 32000-1 §7.5).
const PDF = "%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n";

/* ---------- POST ---------- */

describe("POST /api/uploads: photos", () => {
  it("stores a JPEG re-encoded without EXIF or GPS, turned upright, with a WebP thumbnail", async () => {
    const original = await jpegWithGps();
    const before = await sharp(original).metadata();
    // GPS is really there to remove: IFD0 holds the GPSInfo pointer, tag 0x8825 (EXIF 2.3 §4.6.3).
    expect(ifd0Tags(before.exif!)).toContain("8825");
    expect(before.orientation).toBe(6);

    as("alice");
    const photo = await uploaded(original, "holiday.jpg");
    expect(photo).toMatchObject({
      kind: "photo",
      mimeType: "image/jpeg",
      originalName: "holiday.jpg",
      proposalId: null,
      url: `/api/uploads/${photo.id}`,
      thumbnailUrl: `/api/uploads/${photo.id}/thumbnail`,
      // Orientation 6 swaps the axes: 640 × 480 as stored is 480 × 640 upright.
      widthPx: 480,
      heightPx: 640,
    });
    expect(photo.analysis).toBeUndefined();

    const row = rowOf(photo.id);
    const cleaned = storedBytes(row.sha256);
    expect(sha256(cleaned)).toBe(row.sha256);
    expect(cleaned.length).toBe(photo.sizeBytes);
    expect(cleaned.equals(original)).toBe(false);
    const after = await sharp(cleaned).metadata();
    expect(after).toMatchObject({ format: "jpeg", width: 480, height: 640 });
    expect(after.exif).toBeUndefined();
    expect(after.orientation).toBeUndefined();
    expect(after.xmp).toBeUndefined();
    expect(after.iptc).toBeUndefined();
    // The original bytes are stored nowhere.
    for (const name of storedFiles()) expect(readFileSync(path.join(uploadsDir, name)).equals(original)).toBe(false);

    const thumbnail = await sharp(storedBytes(row.thumbnailSha256!)).metadata();
    expect(thumbnail).toMatchObject({ format: "webp", width: 360, height: 480 });
    expect(thumbnail.exif).toBeUndefined();
    expect(storedFiles()).toContain(path.join(row.sha256.slice(0, 2), `${row.sha256}.bin`));
  });

  it.each([
    { format: "png" as const, name: "bench.png", mimeType: "image/png" },
    { format: "webp" as const, name: "bench.webp", mimeType: "image/webp" },
  ])("accepts a $format photo, keeps its format and drops its XMP", async ({ format, name, mimeType }) => {
    const xmp = `<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#"><rdf:Description xmlns:dc="http://purl.org/dc/elements/1.1/"><dc:creator>Someone</dc:creator></rdf:Description></rdf:RDF></x:xmpmeta>`;
    const original = await sharp({ create: { width: 300, height: 200, channels: 4, background: { r: 10, g: 120, b: 200, alpha: 0.5 } } })
      [format]()
      .withXmp(xmp)
      .toBuffer();
    expect((await sharp(original).metadata()).xmp).toBeDefined();
    as("alice");
    const photo = await uploaded(original, name);
    expect(photo).toMatchObject({ kind: "photo", mimeType, widthPx: 300, heightPx: 200 });
    const stored = await sharp(storedBytes(rowOf(photo.id).sha256)).metadata();
    expect(stored).toMatchObject({ format, width: 300, height: 200, hasAlpha: true });
    expect(stored.xmp).toBeUndefined();
  });

  it("scales a photo down to 4096 px on its long side", async () => {
    const wide = await sharp({ create: { width: 5000, height: 100, channels: 3, background: "#336699" } }).png().toBuffer();
    as("alice");
    const photo = await uploaded(wide, "panorama.png");
    // 100 × 4096 / 5000 = 81.92 → 82 px.
    expect(photo).toMatchObject({ widthPx: 4096, heightPx: 82 });
    const thumbnail = await sharp(storedBytes(rowOf(photo.id).thumbnailSha256!)).metadata();
    expect(thumbnail).toMatchObject({ width: 480, height: 10 });
  });

  it("refuses a photo over 15 MB with 422 too_large", async () => {
    const head = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#000" } }).jpeg().toBuffer();
    const bytes = new Uint8Array(PHOTO_UPLOAD_LIMIT_BYTES + 1);
    bytes.set(head);
    as("alice");
    const before = storedFiles().length;
    const { status, body } = await upload(bytes, "huge.jpg");
    expect(status).toBe(422);
    expect(body.error).toEqual({ code: "too_large", message: "Photos can be at most 15 MB.", fields: { file: "Photos can be at most 15 MB." } });
    expect(storedFiles()).toHaveLength(before);
  });

  it("refuses a damaged photo with 422 invalid_image", async () => {
    const whole = await sharp({ create: { width: 64, height: 64, channels: 3, background: "#123456" } }).png().toBuffer();
    as("alice");
    const { status, body } = await upload(whole.subarray(0, 60), "cut.png");
    expect(status).toBe(422);
    expect(body.error.code).toBe("invalid_image");
    expect(body.error.fields?.file).toBe(body.error.message);
  });
});

describe("POST /api/uploads: kinds come from the content", () => {
  it("refuses a PDF named .png as a type mismatch", async () => {
    as("alice");
    const { status, body } = await upload(PDF, "scan.png", {}, "image/png");
    expect(status).toBe(422);
    expect(body.error).toEqual({
      code: "type_mismatch",
      message: "The file's content is a PDF document but its name says .png.",
      fields: { file: "The file's content is a PDF document but its name says .png." },
    });
  });

  it("refuses a PDF under its own name as an unsupported type, naming what is allowed", async () => {
    as("alice");
    const { status, body } = await upload(PDF, "scan.pdf", {}, "application/pdf");
    expect(status).toBe(422);
    expect(body.error.code).toBe("unsupported_type");
    expect(body.error.message).toBe("The file's content is a PDF document. Upload a photo (JPEG, PNG or WebP) or a model (STL or 3MF).");
    expect(body.error.fields?.file).toBe(body.error.message);
  });

  it("refuses a JPEG named .stl as a type mismatch, whatever the browser says", async () => {
    const jpeg = await sharp({ create: { width: 16, height: 16, channels: 3, background: "#fff" } }).jpeg().toBuffer();
    as("alice");
    const { status, body } = await upload(jpeg, "bracket.stl", {}, "model/stl");
    expect(status).toBe(422);
    expect(body.error.code).toBe("type_mismatch");
    expect(body.error.message).toBe("The file's content is a JPEG image but its name says .stl.");
    expect(body.error.fields).toEqual({ file: body.error.message });
  });

  it("refuses a PNG named .jpg (both photos, still a mismatch)", async () => {
    const png = await sharp({ create: { width: 16, height: 16, channels: 3, background: "#fff" } }).png().toBuffer();
    as("alice");
    const { status, body } = await upload(png, "photo.jpg", {}, "image/jpeg");
    expect(status).toBe(422);
    expect(body.error.message).toBe("The file's content is a PNG image but its name says .jpg.");
  });

  it("measures a binary STL cube and stores the file as sent", async () => {
    const stl = binaryStl(cube(20));
    as("alice");
    const model = await uploaded(stl, "cube.stl");
    expect(model).toMatchObject({ kind: "model", mimeType: "model/stl", sizeBytes: 84 + 12 * 50, originalName: "cube.stl" });
    expect(model.thumbnailUrl).toBeUndefined();
    expect(model.widthPx).toBeUndefined();
    // A cube of side a: V = a³, A = 6a² (elementary geometry).
    expect(model.analysis?.volumeMm3).toBeCloseTo(8000, 6);
    expect(model.analysis?.surfaceAreaMm2).toBeCloseTo(2400, 6);
    expect(model.analysis).toMatchObject({ format: "stl", triangleCount: 12, closed: true });
    expect(model.analysis?.settings).toMatchObject({ layerHeightMm: 0.2, material: "PLA", scalePercent: 100 });
    expect(model.analysis).not.toHaveProperty("timingsMs");
    // 20 mm at 0.2 mm layers = 100 layers.
    expect(model.analysis?.layers.count).toBe(100);
    const row = rowOf(model.id);
    expect(row.sha256).toBe(sha256(stl));
    expect(storedBytes(row.sha256).equals(Buffer.from(stl))).toBe(true);
    expect(row.analysis).toEqual(model.analysis);
  });

  it("measures a 3MF package", async () => {
    as("alice");
    const model = await uploaded(threeMf([{ id: 1, positions: cube(10) }], [{ objectId: 1 }]), "small cube.3mf");
    expect(model).toMatchObject({ kind: "model", mimeType: "model/3mf" });
    expect(model.analysis?.volumeMm3).toBeCloseTo(1000, 6);
  });

  it("refuses garbage named .stl with 422 not_a_mesh and stores nothing", async () => {
    as("alice");
    const rowsBefore = temp.db.select().from(uploads).all().length;
    const filesBefore = storedFiles().length;
    const { status, body } = await upload(pseudoRandomBytes(5000), "broken.stl");
    expect(status).toBe(422);
    expect(body.error.code).toBe("not_a_mesh");
    expect(body.error.fields?.file).toBe(body.error.message);
    expect(temp.db.select().from(uploads).all()).toHaveLength(rowsBefore);
    expect(storedFiles()).toHaveLength(filesBefore);
  });

  it("refuses unknown content with no model name as an unsupported type", async () => {
    as("alice");
    const { status, body } = await upload(pseudoRandomBytes(5000, 99), "notes.txt");
    expect(status).toBe(422);
    expect(body.error.code).toBe("unsupported_type");
    expect(body.error.message).toMatch(/JPEG, PNG or WebP.*STL or 3MF/);
  });

  it("refuses an empty file and a form without a file", async () => {
    as("alice");
    const empty = await upload(new Uint8Array(0), "empty.stl");
    expect(empty.status).toBe(422);
    expect(empty.body.error.code).toBe("empty");
    const form = new FormData();
    form.set("proposalId", PROPOSALS.aliceDraft);
    const response = await POST(new Request("http://localhost/api/uploads", { method: "POST", body: form }), { params: Promise.resolve({}) });
    expect(response.status).toBe(422);
    expect(((await response.json()) as ErrorBody).error.fields).toEqual({ file: "Choose a photo (JPEG, PNG or WebP) or a model (STL or 3MF) to upload." });
  });

  it("refuses anything over 64 MB while it streams", async () => {
    as("alice");
    const { status, body } = await upload(new Uint8Array(MODEL_UPLOAD_LIMIT_BYTES + 1), "huge.stl");
    expect(status).toBe(422);
    expect(body.error.code).toBe("too_large");
    expect(body.error.message).toBe("Photos can be at most 15 MB and model files at most 64 MB.");
  });
});

describe("POST /api/uploads: who, and duplicates", () => {
  it("answers a visitor with 401", async () => {
    as(null);
    const { status, body } = await upload(binaryStl(cube(5)), "cube.stl");
    expect(status).toBe(401);
    expect(body.error.code).toBe("unauthenticated");
  });

  it("returns the same row with 200 when the same person sends the same bytes again; others get their own row on the same file", async () => {
    const stl = binaryStl(cube(30));
    as("alice");
    const first = await upload(stl, "cube30.stl");
    const again = await upload(stl, "renamed.stl");
    expect(first.status).toBe(201);
    expect(again.status).toBe(200);
    expect(again.body.upload.id).toBe(first.body.upload.id);
    expect(again.body.upload.originalName).toBe("cube30.stl");

    const photo = await jpegWithGps(100, 80);
    const photoFirst = await upload(photo, "same.jpg");
    const photoAgain = await upload(photo, "same.jpg");
    expect([photoFirst.status, photoAgain.status]).toEqual([201, 200]);
    expect(photoAgain.body.upload.id).toBe(photoFirst.body.upload.id);

    as("bob");
    const bobs = await upload(stl, "bobs.stl");
    expect(bobs.status).toBe(201);
    expect(bobs.body.upload.id).not.toBe(first.body.upload.id);
    expect(rowOf(bobs.body.upload.id).sha256).toBe(rowOf(first.body.upload.id).sha256);
    expect(bobs.body.upload.analysis).toEqual(first.body.upload.analysis);
    expect(storedFiles().filter((name) => name.includes(sha256(stl)))).toHaveLength(1);
  });

  it("attaches to the caller's own proposal, and refuses someone else's (403), an unknown one (404) and one under review (409)", async () => {
    as("alice");
    const attached = await uploaded(binaryStl(cube(12)), "for-draft.stl", { proposalId: PROPOSALS.aliceDraft });
    expect(attached.proposalId).toBe(PROPOSALS.aliceDraft);

    const others = await upload(binaryStl(cube(13)), "x.stl", { proposalId: PROPOSALS.bobDraft });
    expect(others.status).toBe(403);
    expect(others.body.error.code).toBe("forbidden");
    const unknown = await upload(binaryStl(cube(13)), "x.stl", { proposalId: "p-nope" });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe("not_found");
    const reviewed = await upload(binaryStl(cube(13)), "x.stl", { proposalId: PROPOSALS.aliceReviewed });
    expect(reviewed.status).toBe(409);
    expect(reviewed.body.error.code).toBe("not_editable");
    expect(temp.db.select().from(uploads).all().filter((row) => row.originalName === "x.stl")).toEqual([]);
  });
});

/* ---------- GET ---------- */

describe("GET /api/uploads/[id]", () => {
  it("serves a photo inline with its recorded type, length, nosniff and an immutable cache", async () => {
    as("alice");
    const photo = await uploaded(await jpegWithGps(64, 48), "bench.jpg", { proposalId: PROPOSALS.aliceDraft });
    const response = await get(photo.id);
    expect(response.status).toBe(200);
    const bytes = Buffer.from(await response.arrayBuffer());
    expect(response.headers.get("content-type")).toBe("image/jpeg");
    expect(response.headers.get("content-length")).toBe(String(bytes.length));
    expect(bytes.length).toBe(photo.sizeBytes);
    expect(response.headers.get("x-content-type-options")).toBe("nosniff");
    expect(response.headers.get("cache-control")).toBe("private, max-age=31536000, immutable");
    expect(response.headers.get("content-disposition")).toBe('inline; filename="bench.jpg"');
    expect(response.headers.get("etag")).toBe(`"${sha256(bytes)}"`);
    expect(response.headers.get("content-security-policy")).toMatch(/sandbox/);

    const thumbnail = await get(photo.id, "thumbnail");
    expect(thumbnail.status).toBe(200);
    expect(thumbnail.headers.get("content-type")).toBe("image/webp");
    expect(thumbnail.headers.get("content-disposition")).toBe('inline; filename="bench-thumbnail.webp"');
    expect((await sharp(Buffer.from(await thumbnail.arrayBuffer())).metadata()).format).toBe("webp");

    // RFC 9110 §13.1.2: If-None-Match with the current ETag → 304 without a body.
    const again = await get(photo.id, "file", { "if-none-match": response.headers.get("etag")! });
    expect(again.status).toBe(304);
    expect(again.headers.get("etag")).toBe(response.headers.get("etag"));
    expect(await again.text()).toBe("");
  });

  it("serves a model as an attachment, with a non-ASCII name in filename* (RFC 8187) and an ASCII fallback", async () => {
    as("alice");
    const model = await uploaded(binaryStl(cube(14)), "Kühlkanal ø40.stl");
    expect(model.originalName).toBe("Kühlkanal ø40.stl"); // busboy reads the part header as UTF-8
    const response = await get(model.id);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("model/stl");
    expect(response.headers.get("x-content-type-options")).toBe("nosniff");
    expect(response.headers.get("content-disposition")).toBe(
      `attachment; filename="Kuhlkanal _40.stl"; filename*=UTF-8''K%C3%BChlkanal%20%C3%B840.stl`,
    );
    expect(Buffer.from(await response.arrayBuffer()).equals(Buffer.from(binaryStl(cube(14))))).toBe(true);
    expect((await get(model.id, "thumbnail")).status).toBe(404);
  });

  it("keeps quotes, CR and LF out of the header and gives a download the extension of its content", () => {
    expect(contentDisposition("attachment", 'a"b\r\nSet-Cookie: x=1.stl')).toBe('attachment; filename="abSet-Cookie: x=1.stl"');
    expect(contentDisposition("inline", "50% infill.png")).toBe(`inline; filename="50_ infill.png"; filename*=UTF-8''50%25%20infill.png`);
    expect(contentDisposition("inline", "")).toBe('inline; filename="download"');
    expect(nameWithExtension("notes.txt", "stl")).toBe("notes.txt.stl");
    expect(nameWithExtension("IMG_0001.JPEG", "jpeg")).toBe("IMG_0001.JPEG");
    expect(nameWithExtension("", "jpeg")).toBe("upload.jpg");
  });

  it("saves an ASCII STL sent as .txt under a name ending in .stl", async () => {
    as("alice");
    const model = await uploaded(asciiStl(cube(8)), "cube.txt");
    expect(model).toMatchObject({ kind: "model", mimeType: "model/stl", originalName: "cube.txt" });
    expect((await get(model.id)).headers.get("content-disposition")).toBe('attachment; filename="cube.txt.stl"');
  });

  it("serves a draft's upload to its owner and hosts only; a submitted proposal's to everyone", async () => {
    as("alice");
    const draft = await uploaded(binaryStl(cube(15)), "draft.stl", { proposalId: PROPOSALS.aliceDraft });
    const loose = await uploaded(binaryStl(cube(16)), "loose.stl");
    const submitted = await uploaded(binaryStl(cube(17)), "public.stl", { proposalId: PROPOSALS.aliceSubmitted });

    expect((await get(draft.id)).status).toBe(200);
    as("bob");
    const refused = await get(draft.id);
    expect(refused.status).toBe(403);
    expect(((await refused.json()) as ErrorBody).error.code).toBe("forbidden");
    expect((await get(loose.id)).status).toBe(403);
    expect((await get(submitted.id)).status).toBe(200);
    as("hana");
    expect((await get(draft.id)).status).toBe(200);
    expect((await get(loose.id)).status).toBe(200);
    as(null);
    expect((await get(draft.id)).status).toBe(401);
    expect((await get(submitted.id)).status).toBe(200);
  });

  it("answers 404 for an unknown id", async () => {
    as("hana");
    const response = await get("00000000-0000-4000-8000-000000000000");
    expect(response.status).toBe(404);
    expect(((await response.json()) as ErrorBody).error.code).toBe("not_found");
    expect((await get("../../etc/passwd", "thumbnail")).status).toBe(404);
  });
});

/* ---------- Queries and rules ---------- */

describe("upload queries", () => {
  it("attaches only the owner's unattached or same-proposal uploads, and lists a proposal's uploads", () => {
    const row = (key: string, ownerId: string, proposalId: string | null) =>
      insertUpload(temp.db, {
        sha256: sha256(`query-test-${key}`),
        kind: "model",
        mimeType: "model/stl",
        sizeBytes: 1,
        originalName: `${key}.stl`,
        ownerId,
        proposalId,
      }).upload.id;
    const free = row("free", people.alice.id, null);
    const same = row("same", people.alice.id, PROPOSALS.aliceDraft);
    const elsewhere = row("elsewhere", people.alice.id, PROPOSALS.aliceSubmitted);
    const bobs = row("bobs", people.bob.id, null);
    const attached = attachUploads(temp.db, people.alice.id, PROPOSALS.aliceDraft, [free, same, elsewhere, bobs, "missing"]);
    expect(attached).toBe(2);
    expect(rowOf(free).proposalId).toBe(PROPOSALS.aliceDraft);
    expect(rowOf(elsewhere).proposalId).toBe(PROPOSALS.aliceSubmitted);
    expect(rowOf(bobs).proposalId).toBeNull();
    const listed = listProposalUploads(temp.db, PROPOSALS.aliceDraft).map((upload) => upload.id);
    expect(listed).toEqual(expect.arrayContaining([free, same]));
    expect(listed).not.toContain(elsewhere);
    expect(attachUploads(temp.db, people.alice.id, PROPOSALS.aliceDraft, [])).toBe(0);
  });

  it("classifies by content: a binary STL whose header looks like another format is still a model", () => {
    expect(classifyUpload({ detected: { ext: "mp3", mime: "audio/mpeg" }, fileName: "part.stl", binaryStlShape: true })).toMatchObject({
      ok: true,
      kind: "model",
    });
    expect(classifyUpload({ detected: undefined, fileName: "page.html", binaryStlShape: false })).toMatchObject({ ok: false, code: "unsupported_type" });
    expect(classifyUpload({ detected: { ext: "jpg", mime: "image/jpeg" }, fileName: "IMG_0001", binaryStlShape: false })).toMatchObject({
      ok: true,
      kind: "photo",
      format: "jpeg",
    });
    expect(classifyUpload({ detected: { ext: "jpg", mime: "image/jpeg" }, fileName: "x.svg", binaryStlShape: false })).toMatchObject({
      ok: false,
      code: "type_mismatch",
    });
  });
});

// POST /api/models/analyze, called as a function with a real multipart Request; the analysis runs
// in the real compiled worker (built once in beforeAll with `npm run build:worker`).
import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import type { ModelAnalysis } from "@/lib/validation/model-analysis";
import { MODEL_UPLOAD_LIMIT_BYTES } from "@/lib/validation/model-analysis";
import { asciiStl, binaryStl, pseudoRandomBytes, threeMf } from "../unit/estimate/helpers/mesh-files";
import { cube } from "../unit/estimate/helpers/meshes";

vi.mock("server-only", () => ({}));

const { POST } = await import("@/app/api/models/analyze/route");
const { MeshWorkerPool, MeshJobFailure, getMeshWorkerPool } = await import("@/server/mesh-worker-pool");
const { receiveUpload } = await import("@/server/upload-stream");

type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string> } };

const SETTINGS = {
  layerHeightMm: 0.2,
  scalePercent: 100,
  material: "PLA" as const,
  walls: 2,
  lineWidthMm: 0.45,
  infillPercent: 15,
  topBottomLayers: 4,
  maxVolumetricFlowMm3PerS: 20,
  efficiency: 0.55,
};
const LIMITS = { maxTriangles: 2_000_000, filamentDiameterMm: 1.75, maxSeriesPoints: 200 };

function form(file: Uint8Array | string | undefined, fields: Record<string, string> = {}, name = "part.stl"): FormData {
  const data = new FormData();
  for (const [key, value] of Object.entries(fields)) data.set(key, value);
  if (file !== undefined) data.set("file", new Blob([file as BlobPart]), name);
  return data;
}

async function post(body: FormData | Request): Promise<Response> {
  const request = body instanceof Request ? body : new Request("http://localhost/api/models/analyze", { method: "POST", body });
  return POST(request, { params: Promise.resolve({}) });
}

async function analyse(file: Uint8Array | string, fields: Record<string, string> = {}, name?: string): Promise<ModelAnalysis> {
  const response = await post(form(file, fields, name));
  const body = (await response.json()) as ModelAnalysis | ErrorBody;
  expect(response.status, JSON.stringify(body)).toBe(200);
  return body as ModelAnalysis;
}

async function refusal(response: Response | Promise<Response>): Promise<{ status: number; body: ErrorBody }> {
  const awaited = await response;
  return { status: awaited.status, body: (await awaited.json()) as ErrorBody };
}

function leftoverUploads(): string[] {
  return readdirSync(tmpdir()).filter((name) => name.startsWith("proofbay-upload-"));
}

/**
 * Closed torus (R = 40 mm, r = 15 mm) as a binary STL, 2·major·minor triangles, outward winding;
 * neighbouring triangles share bit-identical corners because each grid point is computed once.
 */
function torusStl(majorSegments: number, minorSegments: number): Uint8Array {
  const grid = new Float32Array(majorSegments * minorSegments * 3);
  for (let i = 0; i < majorSegments; i++) {
    const theta = (2 * Math.PI * i) / majorSegments;
    for (let j = 0; j < minorSegments; j++) {
      const phi = (2 * Math.PI * j) / minorSegments;
      const ring = 40 + 15 * Math.cos(phi);
      const k = 3 * (i * minorSegments + j);
      grid[k] = ring * Math.cos(theta);
      grid[k + 1] = ring * Math.sin(theta);
      grid[k + 2] = 15 + 15 * Math.sin(phi);
    }
  }
  const at = (i: number, j: number) => 3 * ((i % majorSegments) * minorSegments + (j % minorSegments));
  const triangleCount = 2 * majorSegments * minorSegments;
  const bytes = Buffer.alloc(84 + 50 * triangleCount);
  bytes.writeUInt32LE(triangleCount, 80);
  let offset = 84;
  const write = (corners: number[]) => {
    offset += 12; // zero normal
    for (const corner of corners) {
      for (let axis = 0; axis < 3; axis++) {
        bytes.writeFloatLE(grid[corner + axis]!, offset);
        offset += 4;
      }
    }
    offset += 2;
  };
  for (let i = 0; i < majorSegments; i++) {
    for (let j = 0; j < minorSegments; j++) {
      write([at(i, j), at(i + 1, j), at(i + 1, j + 1)]);
      write([at(i, j), at(i + 1, j + 1), at(i, j + 1)]);
    }
  }
  return bytes;
}

beforeAll(() => {
  execFileSync("npm", ["run", "--silent", "build:worker"], { cwd: process.cwd(), stdio: "pipe" });
}, 60_000);

afterEach(() => {
  expect(leftoverUploads()).toEqual([]);
});

afterAll(async () => {
  await getMeshWorkerPool().close();
});

describe("POST /api/models/analyze", () => {
  it("measures a 20 mm binary STL cube and estimates its print", async () => {
    const result = await analyse(binaryStl(cube(20)), {}, "cube.stl");
    expect(result.file).toEqual({ name: "cube.stl", bytes: 84 + 12 * 50 });
    expect(result.format).toBe("stl");
    expect(result.triangleCount).toBe(12);
    expect(result.boundingBox).toEqual({ minMm: [0, 0, 0], maxMm: [20, 20, 20], sizeMm: [20, 20, 20] });
    // A cube of side a: V = a³, A = 6a² (elementary geometry).
    expect(result.volumeMm3).toBeCloseTo(8000, 6);
    expect(result.surfaceAreaMm2).toBeCloseTo(2400, 6);
    expect(result).toMatchObject({ closed: true, consistentlyOriented: true, invertedNormals: false, problems: [] });
    expect(result.settings).toEqual(SETTINGS);
    expect(result.layers.count).toBe(100);
    expect(result.layers.series).toHaveLength(100);
    expect(result.layers.series[0]).toMatchObject({ layers: 1 });
    expect(result.layers.series[0]!.zMm).toBeCloseTo(0.1, 9);
    // From the extrusion arithmetic with the defaults (2 walls × 0.45 mm, 15 %, 4 solid layers top
    // and bottom): solid layer 400 mm² × 0.2 mm = 80 mm³; sparse layer walls 80 mm × 2 × 0.45 × 0.2
    // = 14.4 mm³ plus (80 − 14.4) × 0.15 = 9.84 mm³ → 24.24 mm³; 8 × 80 + 92 × 24.24 = 2870.08 mm³.
    expect(result.extrusion.totalVolumeMm3).toBeCloseTo(2870.08, 6);
    // × 1.24 g/cm³ = 3.5589 g; 2870.08 mm³ ÷ (π × 0.875² mm²) = 1193.24 mm of 1.75 mm filament.
    expect(result.filament.grams).toBeCloseTo(3.55890, 4);
    expect(result.filament.metres).toBeCloseTo(1.19324, 4);
    // Average flow 20 mm³/s × 0.55 = 11 mm³/s: the fullest layer takes 80 / 11 = 7.3 s, below the
    // 8 s minimum layer time, so every one of the 100 layers takes 8 s.
    expect(result.printTime).toEqual({ seconds: 800, minLayerTimeSeconds: 8, averageFlowMm3PerS: 11, layersAtMinimumTime: 100 });
    expect(result.layers.series.every((point) => point.seconds === 8)).toBe(true);
  });

  it("reads an ASCII STL", async () => {
    const result = await analyse(asciiStl(cube(20)), { layerHeightMm: "0.25" });
    expect(result.format).toBe("stl");
    expect(result.triangleCount).toBe(12);
    expect(result.volumeMm3).toBeCloseTo(8000, 3);
    expect(result.layers).toMatchObject({ count: 80, heightMm: 0.25 });
  });

  it("reads a 3MF package", async () => {
    const result = await analyse(threeMf([{ id: 1, positions: cube(20) }], [{ objectId: 1 }]), { material: "petg" }, "cube.3mf");
    expect(result.format).toBe("3mf");
    expect(result.triangleCount).toBe(12);
    expect(result.volumeMm3).toBeCloseTo(8000, 6);
    expect(result.settings.material).toBe("PETG");
    // Same plastic as the STL cube, at PETG's 1.27 g/cm³: 2.87008 cm³ × 1.27 = 3.6450 g.
    expect(result.filament.grams).toBeCloseTo(3.645, 3);
  });

  it("scales lengths by 1.5, areas by 1.5² and volume by 1.5³ at 150 %", async () => {
    // source: similar solids — every length scales by k, areas by k², volumes by k³.
    const result = await analyse(binaryStl(cube(20)), { scalePercent: "150" });
    expect(result.boundingBox.sizeMm).toEqual([30, 30, 30]);
    expect(result.volumeMm3).toBeCloseTo(8000 * 1.5 ** 3, 6);
    expect(result.surfaceAreaMm2).toBeCloseTo(2400 * 1.5 ** 2, 6);
    expect(result.layers.count).toBe(150);
  });

  it("reports orientation problems with their counts", async () => {
    const positions = cube(20);
    // Reverse the first triangle (swap its second and third corners): its three edges now run
    // the same way as their neighbours' — three flipped edges.
    const flipped = positions.slice();
    flipped.set(positions.subarray(6, 9), 3);
    flipped.set(positions.subarray(3, 6), 6);
    const result = await analyse(binaryStl(flipped));
    expect(result.consistentlyOriented).toBe(false);
    expect(result.problems).toEqual([{ code: "flipped_faces", count: 3, of: "edges" }]);
  });

  it("sends at most 200 chart points for a tall part, every layer counted once", async () => {
    // 100 mm column at 0.1 mm = 1000 layers.
    const result = await analyse(binaryStl(cube(100)), { layerHeightMm: "0.1", infillPercent: "0" });
    expect(result.layers.count).toBe(1000);
    expect(result.layers.series).toHaveLength(200);
    expect(result.layers.series.reduce((sum, point) => sum + point.layers, 0)).toBe(1000);
    const seconds = result.layers.series.reduce((sum, point) => sum + point.seconds * point.layers, 0);
    expect(seconds).toBeCloseTo(result.printTime.seconds, 6);
    for (const point of result.layers.series) expect(point.areaMm2).toBeCloseTo(10_000, 6);
  });

  it.each([
    { label: "an empty file", bytes: new Uint8Array(0), code: "empty" },
    { label: "a binary STL cut short", bytes: binaryStl(cube(20)).subarray(0, 684 - 20), code: "truncated" },
    { label: "an ASCII STL cut short", bytes: asciiStl(cube(20)).slice(0, 300), code: "truncated" },
    { label: "PNG bytes", bytes: pngBytes(), code: "not_a_mesh" },
    { label: "random bytes", bytes: pseudoRandomBytes(5000), code: "not_a_mesh" },
  ])("refuses $label with 422 $code naming the file field", async ({ bytes, code }) => {
    const { status, body } = await refusal(post(form(bytes)));
    expect(status).toBe(422);
    expect(body.error.code).toBe(code);
    expect(body.error.fields?.file).toBe(body.error.message);
    expect(body.error.message.length).toBeGreaterThan(10);
  });

  it("refuses a file over 64 MiB with 422 too_large", async () => {
    const { status, body } = await refusal(post(form(new Uint8Array(MODEL_UPLOAD_LIMIT_BYTES + 1))));
    expect(status).toBe(422);
    expect(body.error).toEqual({
      code: "too_large",
      message: "Model files can be at most 64 MB.",
      fields: { file: "Model files can be at most 64 MB." },
    });
  });

  it("refuses a declared Content-Length over the limit before reading the body", async () => {
    let pulled = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        pulled++;
        controller.enqueue(new Uint8Array(1024));
      },
    });
    const request = new Request("http://localhost/api/models/analyze", {
      method: "POST",
      headers: { "content-type": "multipart/form-data; boundary=x", "content-length": String(200 * 1024 * 1024) },
      body,
      duplex: "half",
    } as RequestInit);
    const { status, body: error } = await refusal(post(request));
    expect(status).toBe(422);
    expect(error.error.code).toBe("too_large");
    expect(pulled).toBeLessThanOrEqual(1); // the stream's own first pull, nothing read by the handler
  });

  it("asks for the file when there is none", async () => {
    const { status, body } = await refusal(post(form(undefined, { layerHeightMm: "0.2" })));
    expect(status).toBe(422);
    expect(body.error.code).toBe("invalid_input");
    expect(body.error.fields).toEqual({ file: "Choose an STL or 3MF file to analyse." });
  });

  it("asks for the file when the body is not a multipart form", async () => {
    const request = new Request("http://localhost/api/models/analyze", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ layerHeightMm: 0.2 }),
    });
    const { status, body } = await refusal(post(request));
    expect(status).toBe(422);
    expect(Object.keys(body.error.fields ?? {})).toEqual(["file"]);
  });

  it.each([
    ["layerHeightMm", "5"],
    ["layerHeightMm", "0.01"],
    ["layerHeightMm", "thin"],
    ["scalePercent", "0"],
    ["scalePercent", "1001"],
    ["material", "wood"],
    ["walls", "1.5"],
    ["infillPercent", "101"],
    ["topBottomLayers", "-1"],
    ["efficiency", "0"],
    ["maxVolumetricFlowMm3PerS", "0"],
  ])("names %s = %s as invalid", async (field, value) => {
    const { status, body } = await refusal(post(form(binaryStl(cube(20)), { [field]: value })));
    expect(status).toBe(422);
    expect(body.error.code).toBe("invalid_input");
    expect(Object.keys(body.error.fields ?? {})).toEqual([field]);
  });

  it("names both a bad setting and the missing file", async () => {
    const { body } = await refusal(post(form(undefined, { layerHeightMm: "5" })));
    expect(Object.keys(body.error.fields ?? {}).sort()).toEqual(["file", "layerHeightMm"]);
    expect(body.error.fields?.layerHeightMm).toBe("Layer height must be from 0.04 to 1 mm.");
  });

  it("treats empty fields as their defaults", async () => {
    const result = await analyse(binaryStl(cube(20)), { layerHeightMm: "", material: "", walls: " " });
    expect(result.settings).toEqual(SETTINGS);
  });

  it("keeps answering while a large mesh is analysed", async () => {
    // 1,000,000 triangles (50 MB): a few hundred ms in the worker, which would all be one stall
    // of the event loop if the analysis ran on the main thread.
    const large = post(form(torusStl(1000, 500), {}, "torus.stl"));
    const pool = getMeshWorkerPool();
    const waitStarted = performance.now();
    while (pool.stats().busy === 0) {
      expect(performance.now() - waitStarted).toBeLessThan(15_000);
      await new Promise((resolve) => setTimeout(resolve, 5));
    }
    const lags: number[] = [];
    let last = performance.now();
    const ticker = setInterval(() => {
      const now = performance.now();
      lags.push(now - last - 10);
      last = now;
    }, 10);
    // A small request that needs no worker: settings refused while the worker is busy.
    const smallStarted = performance.now();
    const small = await refusal(post(form(binaryStl(cube(20)), { layerHeightMm: "5" })));
    const smallMs = performance.now() - smallStarted;
    const busyWhenSmallDone = pool.stats().busy;
    const response = await large;
    clearInterval(ticker);
    expect(small.status).toBe(422);
    expect(busyWhenSmallDone).toBe(1);
    expect(smallMs).toBeLessThan(200);
    expect(response.status).toBe(200);
    const result = (await response.json()) as ModelAnalysis;
    expect(result.triangleCount).toBe(1_000_000);
    // Torus volume 2π²Rr² (Pappus); the tessellation is a little smaller.
    expect(result.volumeMm3 / (2 * Math.PI ** 2 * 40 * 15 ** 2)).toBeGreaterThan(0.999);
    expect(result.closed && result.consistentlyOriented).toBe(true);
    expect(lags.length).toBeGreaterThan(3);
    expect(Math.max(...lags)).toBeLessThan(150);
  });
});

describe("MeshWorkerPool", () => {
  let directory: string;

  beforeAll(() => {
    directory = mkdtempSync(path.join(tmpdir(), "proofbay-pool-test-"));
  });
  afterAll(() => {
    rmSync(directory, { recursive: true, force: true });
  });

  function meshFile(name: string, bytes: Uint8Array): string {
    const file = path.join(directory, name);
    writeFileSync(file, bytes);
    return file;
  }

  function fakeWorker(name: string, body: string): string {
    const file = path.join(directory, `${name}.cjs`);
    writeFileSync(file, `const { parentPort } = require("node:worker_threads");\n${body}\n`);
    return file;
  }

  it("runs a small job beside a large one when it has two workers", async () => {
    const pool = new MeshWorkerPool({ size: 2 });
    try {
      const large = meshFile("large.stl", torusStl(500, 400));
      const small = meshFile("small.stl", binaryStl(cube(20)));
      const finished: string[] = [];
      const largeJob = pool.run({ filePath: large, settings: SETTINGS, limits: LIMITS }).then(() => finished.push("large"));
      await new Promise((resolve) => setTimeout(resolve, 50));
      const smallJob = pool.run({ filePath: small, settings: SETTINGS, limits: LIMITS }).then(() => finished.push("small"));
      await Promise.all([largeJob, smallJob]);
      expect(finished).toEqual(["small", "large"]);
      expect(pool.stats()).toMatchObject({ size: 2, busy: 0, queued: 0 });
    } finally {
      await pool.close();
    }
  });

  it("queues jobs beyond its size and refuses more than the queue holds", async () => {
    const pool = new MeshWorkerPool({ size: 1, maxQueue: 1 });
    try {
      const file = meshFile("cube.stl", binaryStl(cube(20)));
      const job = { filePath: file, settings: SETTINGS, limits: LIMITS };
      const first = pool.run(job);
      const second = pool.run(job);
      expect(pool.stats()).toMatchObject({ busy: 1, queued: 1 });
      await expect(pool.run(job)).rejects.toMatchObject({ kind: "busy" });
      const results = await Promise.all([first, second]);
      expect(results.map((result) => result.volumeMm3)).toEqual([8000, 8000]);
    } finally {
      await pool.close();
    }
  });

  it("passes a MeshError from the worker through with its code", async () => {
    const pool = new MeshWorkerPool({ size: 1 });
    try {
      const file = meshFile("empty.stl", new Uint8Array(0));
      await expect(pool.run({ filePath: file, settings: SETTINGS, limits: LIMITS })).rejects.toMatchObject({
        name: "MeshError",
        code: "empty",
      });
    } finally {
      await pool.close();
    }
  });

  it("refuses a mesh over the triangle limit as too_large", async () => {
    const pool = new MeshWorkerPool({ size: 1 });
    try {
      const file = meshFile("cube-limit.stl", binaryStl(cube(20)));
      const job = { filePath: file, settings: SETTINGS, limits: { ...LIMITS, maxTriangles: 11 } };
      await expect(pool.run(job)).rejects.toMatchObject({ code: "too_large" });
    } finally {
      await pool.close();
    }
  });

  it("times out a stuck worker and replaces it", async () => {
    const pool = new MeshWorkerPool({ size: 1, timeoutMs: 200, workerFile: fakeWorker("stuck", `parentPort.on("message", () => {});`) });
    try {
      const job = { filePath: "unused", settings: SETTINGS, limits: LIMITS };
      await expect(pool.run(job)).rejects.toMatchObject({ kind: "timeout" });
      await expect(pool.run(job)).rejects.toBeInstanceOf(MeshJobFailure);
      expect(pool.stats().busy).toBe(0);
    } finally {
      await pool.close();
    }
  });

  it("fails the job of a worker that dies and starts a new one for the next", async () => {
    const workerFile = fakeWorker(
      "dies-once",
      `parentPort.on("message", (job) => { if (job.filePath === "die") process.exit(3); parentPort.postMessage({ jobId: job.jobId, ok: false, failure: { kind: "mesh", code: "empty", message: "fake" } }); });`,
    );
    const pool = new MeshWorkerPool({ size: 1, workerFile });
    try {
      await expect(pool.run({ filePath: "die", settings: SETTINGS, limits: LIMITS })).rejects.toMatchObject({ kind: "crashed" });
      await expect(pool.run({ filePath: "ok", settings: SETTINGS, limits: LIMITS })).rejects.toMatchObject({ code: "empty" });
    } finally {
      await pool.close();
    }
  });

  it("drops a queued job whose request is aborted", async () => {
    const pool = new MeshWorkerPool({ size: 1, timeoutMs: 5_000, workerFile: fakeWorker("slow", `parentPort.on("message", () => {});`) });
    try {
      const job = { filePath: "unused", settings: SETTINGS, limits: LIMITS };
      const running = pool.run(job);
      running.catch(() => undefined);
      const controller = new AbortController();
      const queued = pool.run({ ...job, signal: controller.signal });
      expect(pool.stats().queued).toBe(1);
      controller.abort();
      await expect(queued).rejects.toMatchObject({ kind: "aborted" });
      expect(pool.stats().queued).toBe(0);
    } finally {
      await pool.close();
    }
  });

  it("stops a worker that has been idle for a while", async () => {
    const pool = new MeshWorkerPool({ size: 1, idleTimeoutMs: 50 });
    try {
      const file = meshFile("idle.stl", binaryStl(cube(20)));
      await pool.run({ filePath: file, settings: SETTINGS, limits: LIMITS });
      expect(pool.stats().workers).toBe(1);
      await new Promise((resolve) => setTimeout(resolve, 150));
      expect(pool.stats().workers).toBe(0);
      const again = await pool.run({ filePath: file, settings: SETTINGS, limits: LIMITS });
      expect(again.volumeMm3).toBeCloseTo(8000, 6);
    } finally {
      await pool.close();
    }
  });

  it("says how to build the worker when it is missing", () => {
    expect(() => new MeshWorkerPool({ workerFile: path.join(directory, "missing.js") })).toThrow(/npm run build:worker/);
  });
});

describe("receiveUpload", () => {
  const options = { fileField: "file", limitBytes: 1000, tooLargeMessage: "too big" };

  function request(data: FormData): Request {
    return new Request("http://localhost/upload", { method: "POST", body: data });
  }

  it("writes the file to a temporary file and removes it on cleanup", async () => {
    const data = form(new Uint8Array(999).fill(7), { note: "hello" }, "x.stl");
    const upload = await receiveUpload(request(data), options);
    expect(upload.fields).toEqual({ note: "hello" });
    expect(upload.file).toMatchObject({ filename: "x.stl", bytes: 999 });
    expect(leftoverUploads()).toHaveLength(1);
    await upload.cleanup();
    expect(leftoverUploads()).toEqual([]);
  });

  it("stops at the limit, removes the partial file and names the field", async () => {
    await expect(receiveUpload(request(form(new Uint8Array(1001))), options)).rejects.toMatchObject({
      status: 422,
      code: "too_large",
      fields: { file: "too big" },
    });
  });

  it("ignores file parts under other names", async () => {
    const data = new FormData();
    data.set("other", new Blob([new Uint8Array(10)]), "other.bin");
    data.set("file", new Blob([new Uint8Array(20)]), "model.stl");
    const upload = await receiveUpload(request(data), options);
    expect(upload.file).toMatchObject({ filename: "model.stl", bytes: 20 });
    await upload.cleanup();
  });

  it("answers 400 for a body cut off mid-part", async () => {
    const text = `--b\r\ncontent-disposition: form-data; name="file"; filename="a.stl"\r\n\r\nsolid a\nfacet`;
    const cut = new Request("http://localhost/upload", {
      method: "POST",
      headers: { "content-type": "multipart/form-data; boundary=b" },
      body: text,
    });
    await expect(receiveUpload(cut, options)).rejects.toMatchObject({ status: 400, code: "malformed_upload" });
  });
});

// An 8-byte PNG signature, an IHDR chunk and noise: an image, not a mesh.
function pngBytes(): Uint8Array {
  const signature = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  const ihdr = [0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 64, 0, 0, 0, 64, 8, 6, 0, 0, 0, 0x5c, 0x72, 0xa8, 0x66];
  const bytes = new Uint8Array(2000);
  bytes.set(pseudoRandomBytes(2000, 7));
  bytes.set([...signature, ...ihdr]);
  return bytes;
}

// Upload benchmark: a closed torus of 1,000,000 triangles as a binary STL (50 MB) posted to
// POST /api/models/analyze of a running app, while GET /api/health is timed every 50 ms to show
// whether the server keeps answering during the upload and the analysis.
//   npx tsx bench/model-upload.ts http://localhost:3000
import { closeSync, mkdtempSync, openAsBlob, openSync, rmSync, writeSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

const MAJOR_SEGMENTS = 1000;
const MINOR_SEGMENTS = 500;
const MAJOR_RADIUS_MM = 40;
const MINOR_RADIUS_MM = 15;
const TRIANGLES_PER_CHUNK = 20_000;
const STL_TRIANGLE_BYTES = 50;
const HEALTH_INTERVAL_MS = 50;
const IDLE_PROBES = 20;

export interface LatencySummary {
  readonly count: number;
  readonly p50Ms: number;
  readonly maxMs: number;
}

export interface ModelUploadBenchFigures {
  readonly triangleCount: number;
  readonly fileBytes: number;
  readonly status: number;
  /** From sending the request to reading the whole answer: upload + parse + analysis. */
  readonly totalMs: number;
  /** What the worker reported: reading the temporary file, parsing, measuring and slicing. */
  readonly serverTimingsMs: { readonly readFile: number; readonly parse: number; readonly estimate: number } | undefined;
  readonly layerCount: number | undefined;
  readonly healthIdle: LatencySummary;
  readonly healthDuringUpload: LatencySummary;
}

export async function runModelUploadBench(appUrl: string): Promise<ModelUploadBenchFigures> {
  const base = appUrl.replace(/\/$/, "");
  const directory = mkdtempSync(path.join(tmpdir(), "proofbay-upload-bench-"));
  try {
    const file = path.join(directory, "torus.stl");
    const { triangleCount, bytes: fileBytes } = writeTorusStl(file);
    const healthIdle = summarize(await probeHealth(base, () => IDLE_PROBES));

    let uploading = true;
    const probes = probeHealth(base, (done) => (uploading ? done + 1 : 0));
    const form = new FormData();
    form.set("file", await openAsBlob(file), "torus.stl");
    form.set("layerHeightMm", "0.2");
    const started = performance.now();
    let status = 0;
    let body: unknown;
    try {
      const response = await fetch(`${base}/api/models/analyze`, { method: "POST", body: form });
      status = response.status;
      body = await response.json();
    } finally {
      uploading = false;
    }
    const totalMs = performance.now() - started;
    const healthDuringUpload = summarize(await probes);
    const analysis = status === 200 ? (body as { timingsMs: ModelUploadBenchFigures["serverTimingsMs"]; layers: { count: number } }) : undefined;
    if (!analysis) console.error(`upload answered ${status}: ${JSON.stringify(body)}`);
    return {
      triangleCount,
      fileBytes,
      status,
      totalMs,
      serverTimingsMs: analysis?.timingsMs,
      layerCount: analysis?.layers.count,
      healthIdle,
      healthDuringUpload,
    };
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}

/** Times GET /api/health once per interval (or back to back when one takes longer) while `wanted(done)` exceeds `done`. */
async function probeHealth(base: string, wanted: (done: number) => number): Promise<number[]> {
  const latencies: number[] = [];
  while (latencies.length < wanted(latencies.length)) {
    const started = performance.now();
    const response = await fetch(`${base}/api/health`, { cache: "no-store" });
    await response.arrayBuffer(); // 503 without the mail relay is still an answer
    const elapsed = performance.now() - started;
    latencies.push(elapsed);
    if (elapsed < HEALTH_INTERVAL_MS) await new Promise((resolve) => setTimeout(resolve, HEALTH_INTERVAL_MS - elapsed));
  }
  return latencies;
}

function summarize(latencies: readonly number[]): LatencySummary {
  const sorted = [...latencies].sort((a, b) => a - b);
  // Nearest-rank median.
  const p50 = sorted[Math.max(0, Math.ceil(sorted.length / 2) - 1)] ?? Number.NaN;
  return { count: sorted.length, p50Ms: p50, maxMs: sorted.at(-1) ?? Number.NaN };
}

/** Same torus as bench/estimate-mesh.ts: every grid point computed once, outward winding, resting on z = 0. */
function writeTorusStl(file: string): { triangleCount: number; bytes: number } {
  const grid = new Float32Array(MAJOR_SEGMENTS * MINOR_SEGMENTS * 3);
  for (let i = 0; i < MAJOR_SEGMENTS; i++) {
    const theta = (2 * Math.PI * i) / MAJOR_SEGMENTS;
    for (let j = 0; j < MINOR_SEGMENTS; j++) {
      const phi = (2 * Math.PI * j) / MINOR_SEGMENTS;
      const ring = MAJOR_RADIUS_MM + MINOR_RADIUS_MM * Math.cos(phi);
      const k = 3 * (i * MINOR_SEGMENTS + j);
      grid[k] = ring * Math.cos(theta);
      grid[k + 1] = ring * Math.sin(theta);
      grid[k + 2] = MINOR_RADIUS_MM + MINOR_RADIUS_MM * Math.sin(phi);
    }
  }
  const at = (i: number, j: number) => 3 * ((i % MAJOR_SEGMENTS) * MINOR_SEGMENTS + (j % MINOR_SEGMENTS));
  const triangleCount = MAJOR_SEGMENTS * MINOR_SEGMENTS * 2;
  const descriptor = openSync(file, "w");
  try {
    const header = Buffer.alloc(84);
    header.write("proofbay upload benchmark torus", 0, "ascii");
    header.writeUInt32LE(triangleCount, 80);
    writeSync(descriptor, header);
    const chunk = Buffer.alloc(TRIANGLES_PER_CHUNK * STL_TRIANGLE_BYTES);
    let slot = 0;
    const put = (a: number, b: number, c: number) => {
      let offset = slot * STL_TRIANGLE_BYTES;
      chunk.fill(0, offset, offset + 12); // zero normal: readers recompute it from the winding
      offset += 12;
      for (const corner of [a, b, c]) {
        for (let axis = 0; axis < 3; axis++) {
          chunk.writeFloatLE(grid[corner + axis]!, offset);
          offset += 4;
        }
      }
      chunk.writeUInt16LE(0, offset);
      if (++slot === TRIANGLES_PER_CHUNK) {
        writeSync(descriptor, chunk);
        slot = 0;
      }
    };
    for (let i = 0; i < MAJOR_SEGMENTS; i++) {
      for (let j = 0; j < MINOR_SEGMENTS; j++) {
        put(at(i, j), at(i + 1, j), at(i + 1, j + 1));
        put(at(i, j), at(i + 1, j + 1), at(i, j + 1));
      }
    }
    if (slot > 0) writeSync(descriptor, chunk, 0, slot * STL_TRIANGLE_BYTES);
  } finally {
    closeSync(descriptor);
  }
  return { triangleCount, bytes: 84 + triangleCount * STL_TRIANGLE_BYTES };
}

function report(figures: ModelUploadBenchFigures): void {
  const ms = (value: number | undefined) => (value === undefined ? "–" : `${value.toFixed(0)} ms`);
  const latency = (summary: LatencySummary) => `p50 ${ms(summary.p50Ms)}, max ${ms(summary.maxMs)} (${summary.count} probes)`;
  const timings = figures.serverTimingsMs;
  const rows: [string, string][] = [
    ["triangles", figures.triangleCount.toLocaleString("en-US")],
    ["file size", `${(figures.fileBytes / 1e6).toFixed(1)} MB`],
    ["status", String(figures.status)],
    ["upload + analysis", ms(figures.totalMs)],
    ["worker: read / parse / estimate", timings ? `${ms(timings.readFile)} / ${ms(timings.parse)} / ${ms(timings.estimate)}` : "–"],
    ["layers", String(figures.layerCount ?? "–")],
    ["GET /api/health idle", latency(figures.healthIdle)],
    ["GET /api/health during upload", latency(figures.healthDuringUpload)],
  ];
  const width = Math.max(...rows.map(([label]) => label.length));
  for (const [label, value] of rows) console.log(`${label.padEnd(width)}  ${value}`);
}

const invokedDirectly = process.argv[1] !== undefined && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (invokedDirectly) report(await runModelUploadBench(process.argv[2] ?? "http://localhost:3000"));

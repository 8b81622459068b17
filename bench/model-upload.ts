// Upload benchmark: a closed torus of 1,000,000 triangles as a binary STL (50 MB) posted to
// POST /api/models/analyze of a running app, while GET /api/health is timed every 50 ms to show
// whether the server keeps answering during the upload and the analysis.
//   npx tsx bench/model-upload.ts http://localhost:3000
import { mkdtempSync, openAsBlob, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { writeTorusStl } from "./estimate-mesh";

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
    const triangleCount = writeTorusStl(file);
    const fileBytes = 84 + triangleCount * STL_TRIANGLE_BYTES;
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

// Mesh-analysis benchmark: a closed, consistently wound torus of 1,000,000 triangles written as
// a binary STL (~50 MB), then read, parsed, analysed and sliced at 0.2 mm in a fresh child
// process (bench/estimate-mesh-measure.ts) so that its peak RSS belongs to this work alone.
//   npx tsx bench/estimate-mesh.ts
import { spawnSync } from "node:child_process";
import { closeSync, mkdtempSync, openSync, rmSync, writeSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { BENCH_LAYER_HEIGHT_MM, type MeasuredMeshBench } from "./estimate-mesh-measure";
import { transpileForNode } from "./estimate-transpile";

const MAJOR_SEGMENTS = 1000;
const MINOR_SEGMENTS = 500;
const MAJOR_RADIUS_MM = 40;
const MINOR_RADIUS_MM = 15;
const TARGET_SECONDS = 2;
const TARGET_RSS_TO_FILE = 3;
const TRIANGLES_PER_CHUNK = 20_000;
const STL_TRIANGLE_BYTES = 50;

export interface MeshBenchFigures extends MeasuredMeshBench {
  readonly triangleCount: number;
  /** How the measuring child ran. */
  readonly runtime: string;
  readonly expectedVolumeMm3: number;
  readonly meetsTimeTarget: boolean;
  readonly meetsMemoryTarget: boolean;
}

export async function runMeshBench(): Promise<MeshBenchFigures> {
  const directory = mkdtempSync(path.join(tmpdir(), "proofbay-mesh-bench-"));
  try {
    const file = path.join(directory, "torus.stl");
    const triangleCount = writeTorusStl(file);
    const { figures, runtime } = measureInChildProcess(file, directory);
    return {
      ...figures,
      triangleCount,
      runtime,
      // Torus volume 2π²·R·r² (solid of revolution: circle area πr² × centroid path 2πR);
      // the tessellation is slightly smaller.
      expectedVolumeMm3: 2 * Math.PI ** 2 * MAJOR_RADIUS_MM * MINOR_RADIUS_MM ** 2,
      meetsTimeTarget: figures.totalMs < TARGET_SECONDS * 1000,
      meetsMemoryTarget: figures.peakRssToFileRatio < TARGET_RSS_TO_FILE,
    };
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}

/** Writes the benchmark torus as a binary STL; returns its triangle count. Shared with the upload bench. */
export function writeTorusStl(file: string): number {
  const grid = torusGrid();
  const triangleCount = MAJOR_SEGMENTS * MINOR_SEGMENTS * 2;
  const descriptor = openSync(file, "w");
  try {
    const header = Buffer.alloc(84);
    header.write("proofbay benchmark torus", 0, "ascii");
    header.writeUInt32LE(triangleCount, 80);
    writeSync(descriptor, header);
    const chunk = Buffer.alloc(TRIANGLES_PER_CHUNK * STL_TRIANGLE_BYTES);
    let inChunk = 0;
    for (let i = 0; i < MAJOR_SEGMENTS; i++) {
      for (let j = 0; j < MINOR_SEGMENTS; j++) {
        const p00 = gridIndex(i, j);
        const p10 = gridIndex(i + 1, j);
        const p11 = gridIndex(i + 1, j + 1);
        const p01 = gridIndex(i, j + 1);
        // Round the major circle, then the minor one, faces outwards (∂P/∂θ × ∂P/∂φ ∥ normal).
        writeTriangle(chunk, inChunk++, grid, p00, p10, p11);
        writeTriangle(chunk, inChunk++, grid, p00, p11, p01);
        if (inChunk === TRIANGLES_PER_CHUNK) {
          writeSync(descriptor, chunk);
          inChunk = 0;
        }
      }
    }
    if (inChunk > 0) writeSync(descriptor, chunk, 0, inChunk * STL_TRIANGLE_BYTES);
  } finally {
    closeSync(descriptor);
  }
  return triangleCount;
}

// Vertices are computed once per grid point, so neighbouring triangles share bit-identical corners.
function torusGrid(): Float32Array {
  const grid = new Float32Array(MAJOR_SEGMENTS * MINOR_SEGMENTS * 3);
  for (let i = 0; i < MAJOR_SEGMENTS; i++) {
    const theta = (2 * Math.PI * i) / MAJOR_SEGMENTS;
    for (let j = 0; j < MINOR_SEGMENTS; j++) {
      const phi = (2 * Math.PI * j) / MINOR_SEGMENTS;
      const ring = MAJOR_RADIUS_MM + MINOR_RADIUS_MM * Math.cos(phi);
      const k = 3 * (i * MINOR_SEGMENTS + j);
      grid[k] = ring * Math.cos(theta);
      grid[k + 1] = ring * Math.sin(theta);
      grid[k + 2] = MINOR_RADIUS_MM + MINOR_RADIUS_MM * Math.sin(phi); // rests on z = 0
    }
  }
  return grid;
}

function gridIndex(i: number, j: number): number {
  return 3 * ((i % MAJOR_SEGMENTS) * MINOR_SEGMENTS + (j % MINOR_SEGMENTS));
}

function writeTriangle(chunk: Buffer, slot: number, grid: Float32Array, a: number, b: number, c: number): void {
  const start = slot * STL_TRIANGLE_BYTES;
  chunk.fill(0, start, start + 12); // a zero normal is allowed: readers recompute it from the winding
  let offset = start + 12;
  for (const corner of [a, b, c]) {
    for (let axis = 0; axis < 3; axis++) {
      chunk.writeFloatLE(grid[corner + axis]!, offset);
      offset += 4;
    }
  }
  chunk.writeUInt16LE(0, offset);
}

function measureInChildProcess(file: string, directory: string): { figures: MeasuredMeshBench; runtime: string } {
  const projectRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
  const measureSource = path.join(projectRoot, "bench", "estimate-mesh-measure.ts");
  let args: string[];
  let runtime: string;
  try {
    args = [transpileForNode(measureSource, projectRoot, path.join(directory, "js")), file];
    runtime = `node ${process.version}`;
  } catch {
    args = ["--import", "tsx", measureSource, file];
    runtime = `node ${process.version} + tsx loader (its worker thread adds ~45 MB RSS)`;
  }
  const child = spawnSync(process.execPath, args, { cwd: projectRoot, encoding: "utf8", maxBuffer: 1024 * 1024 });
  if (child.status !== 0) throw new Error(`benchmark child failed: ${child.stderr}`);
  const lastLine = child.stdout.trim().split("\n").at(-1) ?? "";
  return { figures: JSON.parse(lastLine) as MeasuredMeshBench, runtime };
}

function report(figures: MeshBenchFigures): void {
  const mb = (bytes: number) => `${(bytes / 1e6).toFixed(1)} MB`;
  const ms = (value: number) => `${value.toFixed(0)} ms`;
  const rows: [string, string][] = [
    ["triangles", figures.triangleCount.toLocaleString("en-US")],
    ["file size", mb(figures.fileBytes)],
    ["read file", ms(figures.readMs)],
    ["parse STL", ms(figures.parseMs)],
    ["analyse (weld, edges, volume, area)", ms(figures.analyzeMs)],
    [`slice at ${BENCH_LAYER_HEIGHT_MM} mm (${figures.layerCount} layers)`, ms(figures.sliceMs)],
    ["per-layer extrusion + time", ms(figures.extrusionMs)],
    ["processing (parse → extrusion)", ms(figures.processingMs)],
    ["total incl. read", `${ms(figures.totalMs)} (target < ${TARGET_SECONDS * 1000} ms)`],
    ["processing ÷ read", `${figures.processingToReadRatio.toFixed(1)}×`],
    ["baseline RSS", mb(figures.baselineRssBytes)],
    ["peak RSS", `${mb(figures.peakRssBytes)} = ${figures.peakRssToFileRatio.toFixed(2)}× file (target < ${TARGET_RSS_TO_FILE}×)`],
    ["peak RSS above baseline", `${figures.addedRssToFileRatio.toFixed(2)}× file`],
    ["volume", `${figures.volumeMm3.toFixed(0)} mm³ (smooth torus ${figures.expectedVolumeMm3.toFixed(0)} mm³)`],
    ["closed and outward", String(figures.closedAndOutward)],
    ["measured on", figures.runtime],
    ["meets targets", `time ${figures.meetsTimeTarget}, memory ${figures.meetsMemoryTarget}`],
  ];
  const width = Math.max(...rows.map(([label]) => label.length));
  for (const [label, value] of rows) console.log(`${label.padEnd(width)}  ${value}`);
}

const invokedDirectly = process.argv[1] !== undefined && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (invokedDirectly) report(await runMeshBench());

// Child process of bench/estimate-mesh.ts: reads, parses, analyses and slices one STL file and
// prints its figures as one JSON line. Kept apart so its peak RSS reflects this work alone.
import { readFileSync, statSync } from "node:fs";
import { analyzeMesh } from "../lib/estimate/mesh/analyze";
import { extrusionByLayer } from "../lib/estimate/mesh/extrusion";
import { sliceMesh } from "../lib/estimate/mesh/slice";
import { parseStl } from "../lib/estimate/mesh/stl";
import { extrusionSecondsForLayers } from "../lib/estimate/print-time";

export const BENCH_LAYER_HEIGHT_MM = 0.2;
const BENCH_MAX_FLOW_MM3_PER_S = 15;

export interface MeasuredMeshBench {
  readonly fileBytes: number;
  readonly readMs: number;
  readonly parseMs: number;
  readonly analyzeMs: number;
  readonly sliceMs: number;
  readonly extrusionMs: number;
  /** Parse + analysis + slicing + per-layer extrusion, excluding the file read. */
  readonly processingMs: number;
  /** Read + processing. */
  readonly totalMs: number;
  readonly processingToReadRatio: number;
  readonly baselineRssBytes: number;
  readonly peakRssBytes: number;
  readonly peakRssToFileRatio: number;
  /** Peak RSS above the process's RSS before reading the file. */
  readonly addedRssToFileRatio: number;
  readonly layerCount: number;
  readonly volumeMm3: number;
  readonly closedAndOutward: boolean;
}

export function measureMeshFile(file: string): MeasuredMeshBench {
  const fileBytes = statSync(file).size;
  const baselineRssBytes = process.memoryUsage().rss;
  const started = performance.now();
  const bytes = readFileSync(file);
  const read = performance.now();
  const { positions } = parseStl(bytes, { reuseInput: true });
  const parsed = performance.now();
  const analysis = analyzeMesh(positions);
  const analysed = performance.now();
  const slices = sliceMesh(positions, { layerHeightMm: BENCH_LAYER_HEIGHT_MM });
  const sliced = performance.now();
  const extrusion = extrusionByLayer(slices);
  extrusionSecondsForLayers(extrusion.layerVolumesMm3, BENCH_MAX_FLOW_MM3_PER_S);
  const extruded = performance.now();
  // maxRSS is in kibibytes.
  const peakRssBytes = process.resourceUsage().maxRSS * 1024;
  const readMs = read - started;
  const processingMs = extruded - read;
  return {
    fileBytes,
    readMs,
    parseMs: parsed - read,
    analyzeMs: analysed - parsed,
    sliceMs: sliced - analysed,
    extrusionMs: extruded - sliced,
    processingMs,
    totalMs: extruded - started,
    processingToReadRatio: processingMs / readMs,
    baselineRssBytes,
    peakRssBytes,
    peakRssToFileRatio: peakRssBytes / fileBytes,
    addedRssToFileRatio: (peakRssBytes - baselineRssBytes) / fileBytes,
    layerCount: slices.layerCount,
    volumeMm3: analysis.volumeMm3,
    closedAndOutward: analysis.closed && analysis.consistentlyOriented && !analysis.invertedNormals,
  };
}

const fileArgument = process.argv[2];
if (fileArgument && process.argv[1]?.includes("estimate-mesh-measure")) {
  console.log(JSON.stringify(measureMeshFile(fileArgument)));
}

// The work one mesh worker does for one upload. Kept free of worker_threads so it can be tested and
// timed on its own; imports are relative because the worker is compiled by plain tsc (see
// tsconfig.worker.json), which does not rewrite the "@/" alias.
import { readFileSync } from "node:fs";
import { DomainInputError } from "../lib/input-checks";
import type { MeshAnalysis } from "../lib/estimate/mesh/analyze";
import { MeshError, type MeshErrorCode } from "../lib/estimate/mesh/mesh-error";
import { estimateMeshPrint } from "../lib/estimate/mesh/mesh-estimate";
import { parseMesh } from "../lib/estimate/mesh/parse-mesh";
import { averageFlowMm3PerS, DEFAULT_MIN_LAYER_TIME_SECONDS, extrusionSecondsForLayers } from "../lib/estimate/print-time";
import type {
  ModelAnalysisSettings,
  ModelLayerPoint,
  ModelMeasurement,
  ModelProblemCount,
  Vector3Mm,
} from "../lib/validation/model-analysis";

export interface MeshAnalysisLimits {
  readonly maxTriangles: number;
  readonly filamentDiameterMm: number;
  readonly maxSeriesPoints: number;
}

export function analyseModelFile(filePath: string, settings: ModelAnalysisSettings, limits: MeshAnalysisLimits): ModelMeasurement {
  const started = performance.now();
  const bytes = readFileSync(filePath);
  const readMs = performance.now() - started;
  const measured = analyseModelBytes(bytes, settings, limits);
  return { ...measured, timingsMs: { ...measured.timingsMs, readFile: readMs } };
}

/** Parses and measures a model. Binary STL is decoded over `bytes`, which must not be used afterwards. */
export function analyseModelBytes(bytes: Uint8Array, settings: ModelAnalysisSettings, limits: MeshAnalysisLimits): ModelMeasurement {
  const started = performance.now();
  const mesh = parseMesh(bytes, { maxTriangles: limits.maxTriangles, reuseInput: true });
  const parsed = performance.now();
  const estimate = estimateMeshPrint({
    positions: mesh.positions,
    scale: settings.scalePercent / 100,
    layerHeightMm: settings.layerHeightMm,
    material: settings.material,
    filamentDiameterMm: limits.filamentDiameterMm,
    extrusion: {
      wallCount: settings.walls,
      lineWidthMm: settings.lineWidthMm,
      infillFraction: settings.infillPercent / 100,
      topSolidLayers: settings.topBottomLayers,
      bottomSolidLayers: settings.topBottomLayers,
    },
  });
  const { analysis, slices, extrusion } = estimate;

  const flow = averageFlowMm3PerS(settings.maxVolumetricFlowMm3PerS, settings.efficiency);
  const layerSeconds = new Float64Array(slices.layerCount);
  let layersAtMinimumTime = 0;
  for (let layer = 0; layer < slices.layerCount; layer++) {
    const volume = extrusion.layerVolumesMm3[layer]!;
    if (volume <= 0) continue;
    const atFlow = volume / flow;
    if (atFlow < DEFAULT_MIN_LAYER_TIME_SECONDS) layersAtMinimumTime++;
    layerSeconds[layer] = Math.max(atFlow, DEFAULT_MIN_LAYER_TIME_SECONDS);
  }
  const seconds = extrusionSecondsForLayers(
    extrusion.layerVolumesMm3,
    settings.maxVolumetricFlowMm3PerS,
    settings.efficiency,
    DEFAULT_MIN_LAYER_TIME_SECONDS,
  );
  const estimated = performance.now();

  const box = analysis.bounds;
  return {
    format: mesh.format,
    triangleCount: analysis.triangleCount,
    vertexCount: analysis.vertexCount,
    boundingBox: { minMm: vector(box.minMm), maxMm: vector(box.maxMm), sizeMm: vector(box.sizeMm) },
    volumeMm3: analysis.volumeMm3,
    surfaceAreaMm2: analysis.surfaceAreaMm2,
    closed: analysis.closed,
    consistentlyOriented: analysis.consistentlyOriented,
    invertedNormals: analysis.invertedNormals,
    problems: problemCounts(analysis),
    layers: {
      count: slices.layerCount,
      heightMm: slices.layerHeightMm,
      series: layerSeries(slices.sampleZMm, slices.areasMm2, slices.perimetersMm, layerSeconds, limits.maxSeriesPoints),
    },
    extrusion: {
      wallVolumeMm3: extrusion.wallVolumeMm3,
      infillVolumeMm3: extrusion.infillVolumeMm3,
      totalVolumeMm3: extrusion.totalVolumeMm3,
    },
    filament: { diameterMm: limits.filamentDiameterMm, grams: estimate.filamentGrams, metres: estimate.filamentMetres },
    printTime: { seconds, minLayerTimeSeconds: DEFAULT_MIN_LAYER_TIME_SECONDS, averageFlowMm3PerS: flow, layersAtMinimumTime },
    timingsMs: { readFile: 0, parse: parsed - started, estimate: estimated - parsed },
  };
}

function vector(v: readonly [number, number, number]): Vector3Mm {
  return [v[0], v[1], v[2]];
}

function problemCounts(analysis: MeshAnalysis): ModelProblemCount[] {
  return analysis.problems.map((code): ModelProblemCount => {
    switch (code) {
      case "open_edges":
        return { code, count: analysis.openEdges, of: "edges" };
      case "non_manifold_edges":
        return { code, count: analysis.nonManifoldEdges, of: "edges" };
      case "flipped_faces":
        return { code, count: analysis.flippedEdges, of: "edges" };
      case "inverted_normals":
        return { code, count: analysis.triangleCount, of: "triangles" };
      case "degenerate_triangles":
        return { code, count: analysis.degenerateTriangles, of: "triangles" };
    }
  });
}

/**
 * At most `maxPoints` points; with more layers than that, point k averages layers
 * ⌊k·n/p⌋ … ⌊(k+1)·n/p⌋ − 1, so every layer lands in exactly one point.
 */
export function layerSeries(
  zMm: ArrayLike<number>,
  areasMm2: ArrayLike<number>,
  perimetersMm: ArrayLike<number>,
  seconds: ArrayLike<number>,
  maxPoints: number,
): ModelLayerPoint[] {
  const count = zMm.length;
  const points = Math.min(count, Math.max(1, Math.floor(maxPoints)));
  const series: ModelLayerPoint[] = [];
  for (let k = 0; k < points; k++) {
    const from = Math.floor((k * count) / points);
    const to = Math.floor(((k + 1) * count) / points);
    let z = 0;
    let area = 0;
    let perimeter = 0;
    let time = 0;
    for (let layer = from; layer < to; layer++) {
      z += zMm[layer]!;
      area += Math.abs(areasMm2[layer]!);
      perimeter += perimetersMm[layer]!;
      time += seconds[layer]!;
    }
    const layers = to - from;
    series.push({ zMm: z / layers, areaMm2: area / layers, perimeterMm: perimeter / layers, seconds: time / layers, layers });
  }
  return series;
}

// ——— Messages between the pool (server/mesh-worker-pool.ts) and the worker (server/mesh-worker.ts).

export interface MeshJobRequest {
  readonly jobId: number;
  readonly filePath: string;
  readonly settings: ModelAnalysisSettings;
  readonly limits: MeshAnalysisLimits;
}

export type MeshJobFailureDetail =
  | { readonly kind: "mesh"; readonly code: MeshErrorCode; readonly message: string }
  | { readonly kind: "input"; readonly field: string; readonly message: string }
  | { readonly kind: "internal"; readonly message: string };

export type MeshJobReply =
  | { readonly jobId: number; readonly ok: true; readonly result: ModelMeasurement }
  | { readonly jobId: number; readonly ok: false; readonly failure: MeshJobFailureDetail };

export function runMeshJob(job: MeshJobRequest): MeshJobReply {
  try {
    return { jobId: job.jobId, ok: true, result: analyseModelFile(job.filePath, job.settings, job.limits) };
  } catch (error) {
    return { jobId: job.jobId, ok: false, failure: describeFailure(error) };
  }
}

function describeFailure(error: unknown): MeshJobFailureDetail {
  if (error instanceof MeshError) return { kind: "mesh", code: error.code, message: error.message };
  if (error instanceof DomainInputError) return { kind: "input", field: error.field, message: error.message };
  if (error instanceof RangeError && /array buffer allocation|invalid typed array length/i.test(error.message)) {
    return { kind: "mesh", code: "too_large", message: "the mesh needs more memory than the analyser has" };
  }
  return { kind: "internal", message: error instanceof Error ? error.message : String(error) };
}

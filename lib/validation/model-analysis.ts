import { z } from "zod";
import { MATERIAL_IDS, type MaterialId } from "../estimate/materials";
import type { MeshProblem } from "../estimate/mesh/analyze";
import type { MeshFileFormat } from "../estimate/mesh/parse-mesh";

/** Largest model file `POST /api/models/analyze` accepts: 64 MiB, about 1.3 million binary-STL triangles. */
export const MODEL_UPLOAD_LIMIT_BYTES = 64 * 1024 * 1024;
export const MODEL_UPLOAD_LIMIT_MESSAGE = "Model files can be at most 64 MB.";
export const MODEL_FILE_REQUIRED_MESSAGE = "Choose an STL or 3MF file to analyse.";
/**
 * Triangle ceiling for an upload. A 64 MiB binary STL holds at most 1,342,176 triangles; a 3MF is
 * compressed and could hold far more, so this bounds what one analysis may allocate (2 million
 * triangles ≈ 72 MB of vertex floats, and at most 400 MB of model XML inflated from the ZIP).
 */
export const MODEL_MAX_TRIANGLES = 2_000_000;
/** Diameter used for the filament length; the common desktop size (common practice). */
export const MODEL_FILAMENT_DIAMETER_MM = 1.75;
/** Upper bound on the chart series: longer parts are averaged over runs of consecutive layers. */
export const MODEL_LAYER_SERIES_MAX_POINTS = 200;

// A multipart form sends every field as text, and an empty input as "": that means "use the default".
function blankAsMissing(value: unknown): unknown {
  return typeof value === "string" && value.trim() === "" ? undefined : value;
}

function numberField(label: string, unit: string, min: number, max: number, fallback: number, options: { integer?: boolean } = {}) {
  const range = `${label} must be ${options.integer ? "a whole number " : ""}from ${min} to ${max}${unit}.`;
  let schema = z.coerce.number({ error: `${label} must be a number.` }).min(min, { error: range }).max(max, { error: range });
  if (options.integer) schema = schema.int({ error: range });
  return z.preprocess(blankAsMissing, schema.default(fallback));
}

const materialField = z.preprocess(
  (value) => {
    const present = blankAsMissing(value);
    return typeof present === "string" ? present.trim().toUpperCase() : present;
  },
  z
    .enum(MATERIAL_IDS as [MaterialId, ...MaterialId[]], { error: `Material must be one of ${MATERIAL_IDS.join(", ")}.` })
    .default("PLA"),
);

/**
 * Settings sent with a model file (as multipart form fields, so numbers arrive as text).
 * Defaults are a slicer's "standard" profile for a 0.4 mm nozzle (common practice), the same as
 * DEFAULT_EXTRUSION_SETTINGS, except that top and bottom share one layer count here.
 */
export const modelAnalysisSettingsSchema = z.object({
  layerHeightMm: numberField("Layer height", " mm", 0.04, 1, 0.2),
  scalePercent: numberField("Scale", " %", 1, 1000, 100),
  material: materialField,
  walls: numberField("Walls", "", 0, 20, 2, { integer: true }),
  lineWidthMm: numberField("Line width", " mm", 0.1, 2, 0.45),
  infillPercent: numberField("Infill", " %", 0, 100, 15),
  topBottomLayers: numberField("Top and bottom layers", "", 0, 100, 4, { integer: true }),
  maxVolumetricFlowMm3PerS: numberField("Maximum volumetric flow", " mm³/s", 0.5, 200, 20),
  efficiency: numberField("Efficiency", "", 0.05, 1, 0.55),
});

export type ModelAnalysisSettings = z.output<typeof modelAnalysisSettingsSchema>;

export type Vector3Mm = [number, number, number];

/** One point of the per-layer chart: the mean over `layers` consecutive layers. */
export interface ModelLayerPoint {
  /** Mean sampling height of the layers, mm (after scale). */
  readonly zMm: number;
  /** Mean cross-section area per layer, mm² (magnitude, also for inside-out meshes). */
  readonly areaMm2: number;
  /** Mean contour length per layer, mm. */
  readonly perimeterMm: number;
  /** Mean print time per layer, s, with the minimum layer time applied. */
  readonly seconds: number;
  /** How many layers the point stands for; Σ layers = layers.count. */
  readonly layers: number;
}

export interface ModelProblemCount {
  readonly code: MeshProblem;
  readonly count: number;
  /** What `count` counts: edges for open/non-manifold/flipped, triangles otherwise. */
  readonly of: "edges" | "triangles";
}

/** The mesh measured in the worker: everything but the file's own name and size. */
export interface ModelMeasurement {
  readonly format: MeshFileFormat;
  readonly triangleCount: number;
  readonly vertexCount: number;
  readonly boundingBox: { readonly minMm: Vector3Mm; readonly maxMm: Vector3Mm; readonly sizeMm: Vector3Mm };
  readonly volumeMm3: number;
  readonly surfaceAreaMm2: number;
  readonly closed: boolean;
  readonly consistentlyOriented: boolean;
  readonly invertedNormals: boolean;
  readonly problems: readonly ModelProblemCount[];
  readonly layers: {
    readonly count: number;
    readonly heightMm: number;
    readonly series: readonly ModelLayerPoint[];
  };
  readonly extrusion: { readonly wallVolumeMm3: number; readonly infillVolumeMm3: number; readonly totalVolumeMm3: number };
  readonly filament: { readonly diameterMm: number; readonly grams: number; readonly metres: number };
  readonly printTime: {
    /** Σ over layers of max(layer volume ÷ average flow, minimum layer time). */
    readonly seconds: number;
    readonly minLayerTimeSeconds: number;
    /** maxVolumetricFlowMm3PerS × efficiency. */
    readonly averageFlowMm3PerS: number;
    readonly layersAtMinimumTime: number;
  };
  readonly timingsMs: { readonly readFile: number; readonly parse: number; readonly estimate: number };
}

/** 200 response of `POST /api/models/analyze`. */
export interface ModelAnalysis extends ModelMeasurement {
  readonly file: { readonly name: string; readonly bytes: number };
  readonly settings: ModelAnalysisSettings;
}

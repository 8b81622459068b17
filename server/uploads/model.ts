import "server-only";
import { MeshError, type MeshErrorCode } from "@/lib/estimate";
import type { StoredModelAnalysis } from "@/lib/uploads/api";
import { ALLOWED_KINDS_TEXT } from "@/lib/uploads/kinds";
import {
  MODEL_FILAMENT_DIAMETER_MM,
  MODEL_LAYER_SERIES_MAX_POINTS,
  MODEL_MAX_TRIANGLES,
  modelAnalysisSettingsSchema,
  type ModelAnalysisSettings,
  type ModelMeasurement,
} from "@/lib/validation/model-analysis";
import { HttpError } from "../http-error";
import { getMeshWorkerPool, MeshJobFailure } from "../mesh-worker-pool";

const MESH_ERROR_LEADS: Readonly<Record<MeshErrorCode, string>> = {
  empty: "The model file is empty",
  truncated: "The model file is incomplete",
  not_a_mesh: "This is not an STL or 3MF model",
  too_large: "The model is too large to analyse",
};

/**
 * Measures a model in the shared worker pool. A refused mesh becomes a 422 with the parser's code
 * on the `file` field; when nothing but the parser's guess pointed at a model (`pointsToModel`
 * false), "not a mesh" is reported as an unsupported type instead.
 */
export async function measureModel(
  filePath: string,
  settings: ModelAnalysisSettings,
  options: { readonly signal?: AbortSignal; readonly pointsToModel?: boolean } = {},
): Promise<ModelMeasurement> {
  try {
    return await getMeshWorkerPool().run({
      filePath,
      settings,
      signal: options.signal,
      limits: {
        maxTriangles: MODEL_MAX_TRIANGLES,
        filamentDiameterMm: MODEL_FILAMENT_DIAMETER_MM,
        maxSeriesPoints: MODEL_LAYER_SERIES_MAX_POINTS,
      },
    });
  } catch (error) {
    throw asHttpError(error, { pointsToModel: options.pointsToModel ?? true });
  }
}

/** An upload's stored analysis: the calculator's default settings (0.2 mm, PLA, 100 %), no timings. */
export async function analyseModel(
  filePath: string,
  options: { readonly signal?: AbortSignal; readonly pointsToModel: boolean },
): Promise<StoredModelAnalysis> {
  const settings = modelAnalysisSettingsSchema.parse({});
  const { timingsMs: _timings, ...rest } = await measureModel(filePath, settings, options);
  return { ...rest, settings };
}

function asHttpError(error: unknown, options: { readonly pointsToModel: boolean }): unknown {
  if (error instanceof MeshError) {
    if (error.code === "not_a_mesh" && !options.pointsToModel) {
      const message = `This file is not a kind Proofbay takes. Upload ${ALLOWED_KINDS_TEXT}.`;
      return new HttpError(422, "unsupported_type", message, { file: message });
    }
    const lead = MESH_ERROR_LEADS[error.code];
    const message = error.message === "the file is empty" ? `${lead}.` : `${lead}: ${error.message}.`;
    return new HttpError(422, error.code, message, { file: message });
  }
  if (!(error instanceof MeshJobFailure)) return error;
  switch (error.kind) {
    case "busy":
      return new HttpError(429, "busy", "The model analyser is busy; try again in a minute.");
    case "timeout": {
      const message = `The model is too complex to analyse here: ${error.message}.`;
      return new HttpError(422, "too_large", message, { file: message });
    }
    case "input": {
      const message = `The model could not be measured: ${error.message}.`;
      return new HttpError(422, "not_a_mesh", message, { file: message });
    }
    case "aborted":
      return new HttpError(400, "aborted", "The request was aborted.");
    default:
      return error;
  }
}

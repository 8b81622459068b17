import type { MeshErrorCode } from "@/lib/estimate";
import { MeshError } from "@/lib/estimate";
import {
  MODEL_FILAMENT_DIAMETER_MM,
  MODEL_FILE_REQUIRED_MESSAGE,
  MODEL_LAYER_SERIES_MAX_POINTS,
  MODEL_MAX_TRIANGLES,
  MODEL_UPLOAD_LIMIT_BYTES,
  MODEL_UPLOAD_LIMIT_MESSAGE,
  modelAnalysisSettingsSchema,
  type ModelAnalysis,
} from "@/lib/validation/model-analysis";
import { apiRoute } from "@/server/api-route";
import { fieldErrors, HttpError } from "@/server/http-error";
import { getMeshWorkerPool, MeshJobFailure } from "@/server/mesh-worker-pool";
import { receiveUpload } from "@/server/upload-stream";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

const MAX_FILE_NAME_LENGTH = 255;

const MESH_ERROR_LEADS: Readonly<Record<MeshErrorCode, string>> = {
  empty: "The model file is empty",
  truncated: "The model file is incomplete",
  not_a_mesh: "This is not an STL or 3MF model",
  too_large: "The model is too large to analyse",
};

/**
 * Analyses an uploaded STL or 3MF (multipart/form-data: `file` plus the optional settings of
 * modelAnalysisSettingsSchema) in a worker thread and answers with a ModelAnalysis. Public: the
 * calculator needs no account.
 */
export const POST = apiRoute({ role: "visitor" }, async ({ request }): Promise<ModelAnalysis> => {
  const upload = await receiveUpload(request, {
    fileField: "file",
    limitBytes: MODEL_UPLOAD_LIMIT_BYTES,
    tooLargeMessage: MODEL_UPLOAD_LIMIT_MESSAGE,
  });
  try {
    const parsed = modelAnalysisSettingsSchema.safeParse(upload.fields);
    const problems = parsed.success ? {} : fieldErrors(parsed.error);
    if (!upload.file) problems.file = MODEL_FILE_REQUIRED_MESSAGE;
    if (!parsed.success || !upload.file) {
      throw new HttpError(422, "invalid_input", `Check these fields: ${Object.keys(problems).join(", ")}`, problems);
    }
    const settings = parsed.data;
    const measurement = await analyse(upload.file.path, settings, request.signal);
    return {
      file: { name: upload.file.filename.slice(0, MAX_FILE_NAME_LENGTH), bytes: upload.file.bytes },
      settings,
      ...measurement,
    };
  } finally {
    await upload.cleanup();
  }
});

async function analyse(filePath: string, settings: ModelAnalysis["settings"], signal: AbortSignal) {
  try {
    return await getMeshWorkerPool().run({
      filePath,
      settings,
      signal,
      limits: {
        maxTriangles: MODEL_MAX_TRIANGLES,
        filamentDiameterMm: MODEL_FILAMENT_DIAMETER_MM,
        maxSeriesPoints: MODEL_LAYER_SERIES_MAX_POINTS,
      },
    });
  } catch (error) {
    throw asHttpError(error);
  }
}

function asHttpError(error: unknown): unknown {
  if (error instanceof MeshError) {
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
      // The settings were checked before, so what the engine refused is a number the mesh produced.
      const message = `The model could not be measured: ${error.message}.`;
      return new HttpError(422, "not_a_mesh", message, { file: message });
    }
    case "aborted":
      return new HttpError(400, "aborted", "The request was aborted.");
    default:
      return error;
  }
}

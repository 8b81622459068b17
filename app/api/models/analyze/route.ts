import {
  MODEL_FILE_REQUIRED_MESSAGE,
  MODEL_UPLOAD_LIMIT_BYTES,
  MODEL_UPLOAD_LIMIT_MESSAGE,
  modelAnalysisSettingsSchema,
  type ModelAnalysis,
} from "@/lib/validation/model-analysis";
import { apiRoute } from "@/server/api-route";
import { fieldErrors, HttpError } from "@/server/http-error";
import { receiveUpload } from "@/server/upload-stream";
import { measureModel } from "@/server/uploads/model";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

const MAX_FILE_NAME_LENGTH = 255;

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
    const measurement = await measureModel(upload.file.path, settings, { signal: request.signal });
    return {
      file: { name: upload.file.filename.slice(0, MAX_FILE_NAME_LENGTH), bytes: upload.file.bytes },
      settings,
      ...measurement,
    };
  } finally {
    await upload.cleanup();
  }
});

import "server-only";
import { NextResponse } from "next/server";
import { z } from "zod";
import type { Db } from "@/db/client";
import {
  attachUploads,
  findModelAnalysisByHash,
  findOwnUploadByHash,
  findProposalForUpload,
  findUpload,
  insertUpload,
  type NewUploadRow,
} from "@/db/queries/uploads";
import type { Upload } from "@/db/schema";
import { assertCanEdit } from "@/lib/proposals/rules";
import { RuleViolation } from "@/lib/rule-violation";
import type { StoredModelAnalysis, UploadJson, UploadResponse } from "@/lib/uploads/api";
import { uploadThumbnailUrl, uploadUrl } from "@/lib/uploads/api";
import {
  cleanUploadName,
  MODEL_MIME_TYPES,
  MODEL_UPLOAD_LIMIT_BYTES,
  PHOTO_UPLOAD_LIMIT_BYTES,
  PHOTO_UPLOAD_LIMIT_MESSAGE,
  UPLOAD_FILE_REQUIRED_MESSAGE,
  UPLOAD_STREAM_LIMIT_MESSAGE,
} from "@/lib/uploads/kinds";
import type { Viewer } from "../auth";
import { HttpError, validationError } from "../http-error";
import { receiveUpload, type ReceivedFile } from "../upload-stream";
import { analyseModel } from "./model";
import { cleanPhoto } from "./photo";
import { sniffUpload } from "./sniff";
import { storeBytes, storeTempFile, uploadsTempDir } from "./storage";

const fieldsSchema = z.object({
  proposalId: z.preprocess(
    (value) => (typeof value === "string" && value.trim() === "" ? undefined : value),
    z.string().trim().max(64, { error: "This is not a proposal id." }).optional(),
  ),
});

/**
 * `POST /api/uploads`: receives one file (streamed to the store's temporary folder, hashed on the
 * way), checks the proposal it is for, decides its kind from its content, cleans photos and
 * measures models, stores the result under its hash and records a row. Answers 201 with the new
 * row, or 200 with the caller's existing row for the same content.
 */
export async function createUpload(db: Db, viewer: Viewer, request: Request): Promise<Response> {
  const received = await receiveUpload(request, {
    fileField: "file",
    limitBytes: MODEL_UPLOAD_LIMIT_BYTES,
    tooLargeMessage: UPLOAD_STREAM_LIMIT_MESSAGE,
    directory: await uploadsTempDir(),
    sha256: true,
  });
  try {
    const fields = fieldsSchema.safeParse(received.fields);
    if (!fields.success) throw validationError(fields.error);
    const file = received.file;
    if (!file) throw new HttpError(422, "invalid_input", UPLOAD_FILE_REQUIRED_MESSAGE, { file: UPLOAD_FILE_REQUIRED_MESSAGE });
    const proposalId = fields.data.proposalId;
    if (proposalId !== undefined) checkProposal(db, viewer, proposalId);
    const { upload, created } = await storeUpload(db, viewer, file, proposalId, request.signal);
    const body: UploadResponse = { upload: toUploadJson(upload) };
    return NextResponse.json(body, { status: created ? 201 : 200 });
  } finally {
    await received.cleanup();
  }
}

function checkProposal(db: Db, viewer: Viewer, proposalId: string): void {
  const proposal = findProposalForUpload(db, proposalId);
  if (!proposal) throw new HttpError(404, "not_found", "No such proposal.", { proposalId: "No such proposal." });
  try {
    assertCanEdit(proposal, viewer.id);
  } catch (error) {
    if (!(error instanceof RuleViolation)) throw error;
    const status = error.status === 403 ? 403 : 409;
    throw new HttpError(status, error.code, error.message, { proposalId: error.message });
  }
}

async function storeUpload(
  db: Db,
  viewer: Viewer,
  file: ReceivedFile,
  proposalId: string | undefined,
  signal: AbortSignal,
): Promise<{ upload: Upload; created: boolean }> {
  const originalName = cleanUploadName(file.filename) || "upload";
  if (file.bytes === 0) {
    const message = "The file is empty.";
    throw new HttpError(422, "empty", message, { file: message });
  }
  const classification = await sniffUpload(file.path, file.bytes, originalName);
  if (!classification.ok) throw new HttpError(422, classification.code, classification.message, { file: classification.message });

  let row: NewUploadRow;
  if (classification.kind === "photo") {
    if (file.bytes > PHOTO_UPLOAD_LIMIT_BYTES) {
      throw new HttpError(422, "too_large", PHOTO_UPLOAD_LIMIT_MESSAGE, { file: PHOTO_UPLOAD_LIMIT_MESSAGE });
    }
    const photo = await cleanPhoto(file.path, classification.format);
    // Only the cleaned image is kept; the original bytes (with their EXIF) are never stored.
    const thumbnailSha256 = await storeBytes(photo.thumbnail);
    const sha256 = await storeBytes(photo.image);
    row = {
      sha256,
      kind: "photo",
      mimeType: classification.mimeType,
      sizeBytes: photo.image.length,
      originalName,
      ownerId: viewer.id,
      proposalId: proposalId ?? null,
      thumbnailSha256,
      widthPx: photo.widthPx,
      heightPx: photo.heightPx,
    };
  } else {
    const sha256 = file.sha256;
    if (!sha256) throw new Error("receiveUpload was asked for the SHA-256 but gave none");
    const own = findOwnUploadByHash(db, viewer.id, sha256);
    if (own) return { upload: attachExisting(db, viewer, own, proposalId), created: false };
    // The same bytes from someone else were measured already (the settings are fixed).
    const known = findModelAnalysisByHash(db, sha256);
    const analysis: StoredModelAnalysis = known?.analysis
      ? (known.analysis as unknown as StoredModelAnalysis)
      : await analyseModel(file.path, { signal, pointsToModel: classification.pointsToModel });
    await storeTempFile(file.path, sha256);
    row = {
      sha256,
      kind: "model",
      mimeType: known?.mimeType ?? MODEL_MIME_TYPES[analysis.format],
      sizeBytes: file.bytes,
      originalName,
      ownerId: viewer.id,
      proposalId: proposalId ?? null,
      analysis: analysis as unknown as Record<string, unknown>,
    };
  }
  const result = insertUpload(db, row);
  if (!result.created) return { upload: attachExisting(db, viewer, result.upload, proposalId), created: false };
  return result;
}

/** The caller's row for this content already exists: attach it to the proposal when it is free. */
function attachExisting(db: Db, viewer: Viewer, existing: Upload, proposalId: string | undefined): Upload {
  if (proposalId === undefined || existing.proposalId !== null) return existing;
  attachUploads(db, viewer.id, proposalId, [existing.id]);
  return findUpload(db, existing.id) ?? existing;
}

export function toUploadJson(upload: Upload): UploadJson {
  return {
    id: upload.id,
    kind: upload.kind,
    mimeType: upload.mimeType,
    sizeBytes: upload.sizeBytes,
    originalName: upload.originalName,
    proposalId: upload.proposalId,
    url: uploadUrl(upload.id),
    ...(upload.thumbnailSha256 ? { thumbnailUrl: uploadThumbnailUrl(upload.id) } : {}),
    ...(upload.widthPx !== null ? { widthPx: upload.widthPx } : {}),
    ...(upload.heightPx !== null ? { heightPx: upload.heightPx } : {}),
    ...(upload.analysis ? { analysis: upload.analysis as unknown as StoredModelAnalysis } : {}),
  };
}

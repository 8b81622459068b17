import type { ModelAnalysisSettings, ModelMeasurement } from "../validation/model-analysis";

/** What `analysis` holds for a model: the worker's measurement (without timings) and the settings used. */
export type StoredModelAnalysis = Omit<ModelMeasurement, "timingsMs"> & { readonly settings: ModelAnalysisSettings };

/** One upload as the API shows it (`POST /api/uploads` answers `{ upload }`). */
export interface UploadJson {
  readonly id: string;
  readonly kind: "photo" | "model";
  /** From the content: image/jpeg, image/png, image/webp, model/stl or model/3mf. */
  readonly mimeType: string;
  /** Of the stored file: the cleaned image for photos, the file as sent for models. */
  readonly sizeBytes: number;
  readonly originalName: string;
  /** The proposal it is attached to, or null while unattached. */
  readonly proposalId: string | null;
  /** `/api/uploads/<id>` */
  readonly url: string;
  /** Photos: `/api/uploads/<id>/thumbnail` (WebP, 480 px on the long side). */
  readonly thumbnailUrl?: string;
  readonly widthPx?: number;
  readonly heightPx?: number;
  /** Models: measured at 0.2 mm layers, PLA, 100 % scale. */
  readonly analysis?: StoredModelAnalysis;
}

export interface UploadResponse {
  readonly upload: UploadJson;
}

export function uploadUrl(id: string): string {
  return `/api/uploads/${encodeURIComponent(id)}`;
}

export function uploadThumbnailUrl(id: string): string {
  return `${uploadUrl(id)}/thumbnail`;
}

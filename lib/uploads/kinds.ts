import { MODEL_UPLOAD_LIMIT_BYTES, MODEL_UPLOAD_LIMIT_MESSAGE } from "../validation/model-analysis";

/*
 * What `POST /api/uploads` takes: limits, formats and their names, safe to import in the browser
 * (the content sniffing that decides an upload's kind is in ./classify.ts, server side).
 */

export { MODEL_UPLOAD_LIMIT_BYTES, MODEL_UPLOAD_LIMIT_MESSAGE };
/** Largest photo accepted, before cleaning: 15 MiB (written "MB" like the model limit). */
export const PHOTO_UPLOAD_LIMIT_BYTES = 15 * 1024 * 1024;
export const PHOTO_UPLOAD_LIMIT_MESSAGE = "Photos can be at most 15 MB.";
/** The stream is cut at the larger of the two limits, before the kind is known. */
export const UPLOAD_STREAM_LIMIT_MESSAGE = "Photos can be at most 15 MB and model files at most 64 MB.";
/** Decoded pixels a photo may have (width × height); a guard against decompression bombs. */
export const PHOTO_MAX_INPUT_PIXELS = 100_000_000;
export const PHOTO_MAX_INPUT_PIXELS_MESSAGE = "Photos can be at most 100 megapixels.";
/** Stored photos are scaled down (never up) to fit this many pixels on their long side. */
export const PHOTO_MAX_EDGE_PX = 4096;
/** Thumbnails are WebP images this many pixels on their long side (or smaller, never enlarged). */
export const THUMBNAIL_EDGE_PX = 480;
/** Longest file name kept (the usual file-system limit). */
export const MAX_UPLOAD_NAME_LENGTH = 255;

export const ALLOWED_KINDS_TEXT = "a photo (JPEG, PNG or WebP) or a model (STL or 3MF)";
export const UPLOAD_FILE_REQUIRED_MESSAGE = `Choose ${ALLOWED_KINDS_TEXT} to upload.`;

export type PhotoFormat = "jpeg" | "png" | "webp";
export type ModelFormat = "stl" | "3mf";

export const PHOTO_MIME_TYPES: Readonly<Record<PhotoFormat, string>> = {
  jpeg: "image/jpeg",
  png: "image/png",
  webp: "image/webp",
};
/** IANA media types registered for the model formats (model/stl 2018, model/3mf 2021). */
export const MODEL_MIME_TYPES: Readonly<Record<ModelFormat, string>> = {
  stl: "model/stl",
  "3mf": "model/3mf",
};
export const THUMBNAIL_MIME_TYPE = "image/webp";

export type UploadFormat = PhotoFormat | ModelFormat;
type Format = UploadFormat;

export const FORMAT_NAMES: Readonly<Record<Format, string>> = {
  jpeg: "a JPEG image",
  png: "a PNG image",
  webp: "a WebP image",
  stl: "an STL model",
  "3mf": "a 3MF model",
};

/** File-name extensions that agree with each format. */
export const FORMAT_EXTENSIONS: Readonly<Record<Format, readonly string[]>> = {
  jpeg: ["jpg", "jpeg", "jpe", "jfif"],
  png: ["png"],
  webp: ["webp"],
  stl: ["stl"],
  "3mf": ["3mf"],
};

/** The extension a download gets when the uploaded name has none that fits. */
export const CANONICAL_EXTENSIONS: Readonly<Record<Format, string>> = {
  jpeg: "jpg",
  png: "png",
  webp: "webp",
  stl: "stl",
  "3mf": "3mf",
};

/** The name as stored: no folders, no control characters, at most MAX_UPLOAD_NAME_LENGTH characters. */
export function cleanUploadName(raw: string): string {
  const base = raw.split(/[/\\]/).pop() ?? "";
  const cleaned = base.replace(/[\u0000-\u001f\u007f-\u009f]/g, "").trim();
  return Array.from(cleaned).slice(0, MAX_UPLOAD_NAME_LENGTH).join("");
}

/** A name whose extension fits the stored format, appending the usual one when it does not. */
export function nameWithExtension(name: string, format: Format): string {
  const extension = /\.([a-z0-9]{1,8})$/i.exec(name)?.[1]?.toLowerCase();
  if (extension && FORMAT_EXTENSIONS[format].includes(extension)) return name;
  return `${name || "upload"}.${CANONICAL_EXTENSIONS[format]}`;
}

export function formatOfMimeType(mimeType: string): Format | undefined {
  const photo = (Object.keys(PHOTO_MIME_TYPES) as PhotoFormat[]).find((format) => PHOTO_MIME_TYPES[format] === mimeType);
  if (photo) return photo;
  return (Object.keys(MODEL_MIME_TYPES) as ModelFormat[]).find((format) => MODEL_MIME_TYPES[format] === mimeType);
}

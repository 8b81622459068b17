import { supportedExtensions } from "file-type/core";
import { ALLOWED_KINDS_TEXT, FORMAT_EXTENSIONS, FORMAT_NAMES, PHOTO_MIME_TYPES, type PhotoFormat, type UploadFormat as Format } from "./kinds";

/*
 * What an upload is, decided by its content (never by its name or the browser's content type):
 * photos are recognised by their magic bytes (file-type), models are whatever the mesh parser can
 * read (STL has no magic). The name only has to agree with the content.
 */

// Text formats file-type cannot recognise but a name may still claim; claiming them for a photo
// or a model is refused rather than stored under a name a browser would run.
const EXTRA_CLAIMED_EXTENSIONS = ["html", "htm", "xhtml", "svg", "xml", "js", "mjs"];

/** What file-type reported for the first bytes (its `ext` and `mime`), or undefined. */
export type DetectedType = { readonly ext: string; readonly mime: string } | undefined;

export type UploadClassification =
  | { readonly ok: true; readonly kind: "photo"; readonly format: PhotoFormat; readonly mimeType: string }
  | {
      readonly ok: true;
      readonly kind: "model";
      /** A parser refusal is reported as `unsupported_type` when nothing pointed to a model. */
      readonly pointsToModel: boolean;
    }
  | { readonly ok: false; readonly code: "unsupported_type" | "type_mismatch"; readonly message: string };

export interface ClassifyInput {
  readonly detected: DetectedType;
  readonly fileName: string;
  /** The size is 84 + 50 × the triangle count stored at byte 80 (with at least one triangle). */
  readonly binaryStlShape: boolean;
}

/** A binary STL: 80-byte header, little-endian uint32 triangle count, 50 bytes per triangle. */
export function hasBinaryStlShape(head: Uint8Array, totalBytes: number): boolean {
  if (head.length < 84) return false;
  const count = new DataView(head.buffer, head.byteOffset, head.byteLength).getUint32(80, true);
  return count > 0 && totalBytes === 84 + 50 * count;
}

/** The lower-cased extension a name claims: only extensions of known formats count as a claim. */
export function claimedExtension(fileName: string): string | undefined {
  const match = /\.([a-z0-9]{1,8})$/i.exec(fileName.trim());
  const extension = match?.[1]?.toLowerCase();
  if (!extension) return undefined;
  const known =
    supportedExtensions.has(extension as never) ||
    EXTRA_CLAIMED_EXTENSIONS.includes(extension) ||
    Object.values(FORMAT_EXTENSIONS).some((list) => list.includes(extension));
  return known ? extension : undefined;
}

function formatOfExtension(extension: string): Format | undefined {
  return (Object.keys(FORMAT_EXTENSIONS) as Format[]).find((format) => FORMAT_EXTENSIONS[format].includes(extension));
}

function describeDetected(detected: NonNullable<DetectedType>): string {
  const known: Record<string, string> = {
    pdf: "a PDF document",
    gif: "a GIF image",
    zip: "a ZIP archive",
    heic: "a HEIC image",
    avif: "an AVIF image",
    tif: "a TIFF image",
    bmp: "a BMP image",
    docx: "a Word document",
    xlsx: "a spreadsheet",
    exe: "a Windows program",
  };
  return known[detected.ext] ?? `a ${detected.ext.toUpperCase()} file (${detected.mime})`;
}

const unsupported = (lead: string) =>
  ({ ok: false, code: "unsupported_type", message: `${lead} Upload ${ALLOWED_KINDS_TEXT}.` }) as const;
const mismatch = (message: string) => ({ ok: false, code: "type_mismatch", message }) as const;

/**
 * Decides what an upload is from its sniffed content, and whether its name agrees. A name whose
 * extension names another known format than the content is refused (`type_mismatch`); content of
 * a kind Proofbay does not take is refused (`unsupported_type`); undetected content goes to the
 * mesh parser, which has the last word on models.
 */
export function classifyUpload({ detected, fileName, binaryStlShape }: ClassifyInput): UploadClassification {
  const claim = claimedExtension(fileName);
  const claimedFormat = claim ? formatOfExtension(claim) : undefined;

  let content: { format: Format | "unknown"; description: string; extensions: readonly string[] } | undefined;
  if (detected?.mime === "image/jpeg") content = { format: "jpeg", description: FORMAT_NAMES.jpeg, extensions: FORMAT_EXTENSIONS.jpeg };
  else if (detected?.mime === "image/png") content = { format: "png", description: FORMAT_NAMES.png, extensions: FORMAT_EXTENSIONS.png };
  else if (detected?.mime === "image/webp") content = { format: "webp", description: FORMAT_NAMES.webp, extensions: FORMAT_EXTENSIONS.webp };
  else if (detected?.mime === "model/3mf") content = { format: "3mf", description: FORMAT_NAMES["3mf"], extensions: ["3mf", "zip"] };
  else if (detected?.ext === "zip") content = { format: "3mf", description: "a ZIP archive", extensions: ["3mf", "zip"] };
  else if (detected?.mime === "model/stl" || binaryStlShape) content = { format: "stl", description: FORMAT_NAMES.stl, extensions: ["stl"] };
  else if (detected === undefined) content = { format: "unknown", description: "", extensions: ["stl"] };

  if (!content) {
    // Recognised, and not a kind Proofbay takes.
    const description = describeDetected(detected!);
    if (claimedFormat) {
      return mismatch(`The file's content is ${description} but its name says .${claim}.`);
    }
    return unsupported(`The file's content is ${description}.`);
  }

  if (claim && !content.extensions.includes(claim)) {
    if (content.format === "unknown") {
      return claimedFormat
        ? mismatch(`The file's name says .${claim} but its content is not ${FORMAT_NAMES[claimedFormat]}.`)
        : unsupported(`Proofbay does not take .${claim} files.`);
    }
    return mismatch(`The file's content is ${content.description} but its name says .${claim}.`);
  }

  if (content.format === "jpeg" || content.format === "png" || content.format === "webp") {
    return { ok: true, kind: "photo", format: content.format, mimeType: PHOTO_MIME_TYPES[content.format] };
  }
  return {
    ok: true,
    kind: "model",
    pointsToModel: content.format !== "unknown" || claimedFormat === "stl" || claimedFormat === "3mf",
  };
}


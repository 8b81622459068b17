import "server-only";
import { Readable } from "node:stream";
import type { Db } from "@/db/client";
import { isInPublishedReport } from "@/db/queries/reports";
import { findUploadForServing } from "@/db/queries/uploads";
import type { Upload } from "@/db/schema";
import { hasRole } from "@/lib/roles";
import { contentDisposition } from "@/lib/uploads/content-disposition";
import { formatOfMimeType, nameWithExtension, THUMBNAIL_MIME_TYPE } from "@/lib/uploads/kinds";
import type { Viewer } from "../auth";
import { HttpError } from "../http-error";
import { openStoredFile } from "./storage";

/** Content-addressed: the bytes behind a URL never change, so the browser may keep them for a year. */
const CACHE_CONTROL = "private, max-age=31536000, immutable";
/** Nothing in a served file may run or load anything, even if a browser were to render it as a page. */
const CONTENT_SECURITY_POLICY = "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox";

/**
 * Who may read an upload: everyone once its proposal is submitted (proposals are public from
 * then on, whatever was decided); a draft's uploads and unattached ones only their owner and hosts.
 */
export function canRead(
  upload: Pick<Upload, "ownerId">,
  proposal: { state: string } | null,
  viewer: Viewer | null,
): "yes" | "sign_in" | "no" {
  if (proposal && proposal.state !== "draft") return "yes";
  if (!viewer) return "sign_in";
  return viewer.id === upload.ownerId || hasRole(viewer.role, "host") ? "yes" : "no";
}

/**
 * `GET /api/uploads/<id>` and `…/thumbnail`: streams the stored file with the type recorded at
 * upload (never guessed from the name), nosniff, and a disposition that shows photos in the page
 * and saves models. The ETag is the content's SHA-256, so a conditional request answers 304.
 */
export async function serveUpload(db: Db, request: Request, id: string, viewer: Viewer | null, variant: "file" | "thumbnail") {
  const found = findUploadForServing(db, id);
  if (!found) throw new HttpError(404, "not_found", "No such upload.");
  const { upload, proposal } = found;
  // A photo in a published report is public like the report itself.
  const granted = canRead(upload, proposal, viewer);
  const access = granted !== "yes" && isInPublishedReport(db, upload.id) ? "yes" : granted;
  if (access === "sign_in") throw new HttpError(401, "unauthenticated", "Sign in to see this file.");
  if (access === "no") throw new HttpError(403, "forbidden", "Only the person who uploaded this file and the lab can see it until its proposal is submitted.");

  const sha256 = variant === "file" ? upload.sha256 : upload.thumbnailSha256;
  if (!sha256) throw new HttpError(404, "not_found", "This upload has no thumbnail.");
  const mimeType = variant === "file" ? upload.mimeType : THUMBNAIL_MIME_TYPE;
  const etag = `"${sha256}"`;
  const common = { ETag: etag, "Cache-Control": CACHE_CONTROL, "X-Content-Type-Options": "nosniff" };

  if (matchesEtag(request.headers.get("if-none-match"), etag)) return new Response(null, { status: 304, headers: common });

  const stored = await openStoredFile(sha256);
  if (!stored) throw new Error(`upload ${upload.id}: stored file ${sha256} is missing`);
  const baseName = upload.originalName.replace(/\.[a-z0-9]{1,8}$/i, "") || "upload";
  const format = formatOfMimeType(upload.mimeType);
  const fileName =
    variant === "thumbnail" ? `${baseName}-thumbnail.webp` : format ? nameWithExtension(upload.originalName, format) : upload.originalName;
  const body = Readable.toWeb(stored.stream()) as ReadableStream<Uint8Array>;
  return new Response(body, {
    status: 200,
    headers: {
      ...common,
      "Content-Type": mimeType,
      "Content-Length": String(stored.sizeBytes),
      "Content-Disposition": contentDisposition(upload.kind === "photo" ? "inline" : "attachment", fileName),
      "Content-Security-Policy": CONTENT_SECURITY_POLICY,
    },
  });
}

/** RFC 9110 §13.1.2: a list of entity tags or "*", compared weakly. */
function matchesEtag(header: string | null, etag: string): boolean {
  if (!header) return false;
  if (header.trim() === "*") return true;
  return header.split(",").some((candidate) => candidate.trim().replace(/^W\//, "") === etag);
}

import "server-only";
import { Readable } from "node:stream";
import type { Db } from "@/db/client";
import { findPhotoFile } from "@/db/queries/blind-pairs";
import { openImageToken } from "@/lib/judging/tickets";
import { judgingSecret } from "./blind-pairs";
import { HttpError } from "./http-error";
import { openStoredFile } from "./uploads/storage";

/*
 * The blind image route sends only the bytes: photos were re-encoded without metadata at upload
 * (EXIF/GPS gone, lib/uploads), and the response carries no file name (no Content-Disposition),
 * no ETag (the content hash would match the public report's copy) and is not cached, so the URL
 * and headers say nothing about which variant is shown.
 */
export async function serveBlindPairImage(db: Db, token: string, userId: string, now: Date): Promise<Response> {
  const claim = openImageToken(token, judgingSecret());
  if (!claim) throw new HttpError(404, "not_found", "No such image.");
  if (claim.userId !== userId) throw new HttpError(403, "forbidden", "This image link was issued to someone else.");
  if (claim.expiresAt < now.getTime()) throw new HttpError(404, "not_found", "This image link has expired; load the pair again.");
  const photo = findPhotoFile(db, claim.photoId);
  if (!photo || photo.kind !== "photo") throw new HttpError(404, "not_found", "This photo is no longer part of the report.");
  const stored = await openStoredFile(photo.sha256);
  if (!stored) throw new Error(`blind pair photo ${claim.photoId}: stored file is missing`);
  return new Response(Readable.toWeb(stored.stream()) as ReadableStream<Uint8Array>, {
    status: 200,
    headers: {
      "Content-Type": photo.mimeType,
      "Content-Length": String(stored.sizeBytes),
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
      "Content-Security-Policy": "default-src 'none'; sandbox",
      "Referrer-Policy": "no-referrer",
    },
  });
}

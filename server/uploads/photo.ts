import "server-only";
import sharp from "sharp";
import {
  PHOTO_MAX_EDGE_PX,
  PHOTO_MAX_INPUT_PIXELS,
  PHOTO_MAX_INPUT_PIXELS_MESSAGE,
  THUMBNAIL_EDGE_PX,
  type PhotoFormat,
} from "@/lib/uploads/kinds";
import { HttpError } from "../http-error";

export interface CleanedPhoto {
  /** The re-encoded image: EXIF orientation applied, every metadata block (EXIF, GPS, XMP, IPTC) dropped. */
  readonly image: Buffer;
  readonly widthPx: number;
  readonly heightPx: number;
  readonly thumbnail: Buffer;
}

/**
 * Re-encodes a photo in its own format so nothing of the original file but its pixels is kept.
 * sharp writes no metadata unless asked to (keepMetadata/withMetadata/keepExif, none used here),
 * so location and camera details go; `.autoOrient()` first turns the pixels the way the
 * Orientation tag said, since that tag goes too. Large photos are scaled down to
 * PHOTO_MAX_EDGE_PX on the long side. The thumbnail is a WebP made from the cleaned image.
 */
export async function cleanPhoto(filePath: string, format: PhotoFormat): Promise<CleanedPhoto> {
  const input = { limitInputPixels: PHOTO_MAX_INPUT_PIXELS, failOn: "error" } as const;
  const metadata = await sharp(filePath, input)
    .metadata()
    .catch(() => {
      throw unreadable();
    });
  if (metadata.format !== format) throw unreadable();
  if ((metadata.width ?? 0) * (metadata.height ?? 0) > PHOTO_MAX_INPUT_PIXELS) {
    throw new HttpError(422, "too_large", PHOTO_MAX_INPUT_PIXELS_MESSAGE, { file: PHOTO_MAX_INPUT_PIXELS_MESSAGE });
  }

  try {
    const pipeline = sharp(filePath, input)
      .autoOrient()
      .resize({ width: PHOTO_MAX_EDGE_PX, height: PHOTO_MAX_EDGE_PX, fit: "inside", withoutEnlargement: true });
    const encoded =
      format === "jpeg"
        ? pipeline.jpeg({ quality: 90 })
        : format === "png"
          ? pipeline.png()
          : pipeline.webp({ quality: 90 });
    const { data: image, info } = await encoded.toBuffer({ resolveWithObject: true });
    const thumbnail = await sharp(image)
      .resize({ width: THUMBNAIL_EDGE_PX, height: THUMBNAIL_EDGE_PX, fit: "inside", withoutEnlargement: true })
      .webp({ quality: 80 })
      .toBuffer();
    return { image, widthPx: info.width, heightPx: info.height, thumbnail };
  } catch {
    throw unreadable();
  }
}

function unreadable(): HttpError {
  const message = "The photo could not be read: it is damaged or incomplete.";
  return new HttpError(422, "invalid_image", message, { file: message });
}

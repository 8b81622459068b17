import "server-only";
import { fileTypeFromBuffer } from "file-type";
import { open } from "node:fs/promises";
import { classifyUpload, hasBinaryStlShape, type UploadClassification } from "@/lib/uploads/classify";

/** file-type reads at most this many bytes for its signatures (its own `reasonableDetectionSizeInBytes`). */
const SNIFF_BYTES = 4100;

/** Reads the first bytes of a received file and decides, from its content, what it is. */
export async function sniffUpload(filePath: string, sizeBytes: number, fileName: string): Promise<UploadClassification> {
  const head = await readHead(filePath, SNIFF_BYTES);
  const detected = await fileTypeFromBuffer(head);
  return classifyUpload({
    detected: detected ? { ext: detected.ext, mime: detected.mime } : undefined,
    fileName,
    binaryStlShape: hasBinaryStlShape(head, sizeBytes),
  });
}

async function readHead(filePath: string, length: number): Promise<Uint8Array> {
  const handle = await open(filePath, "r");
  try {
    const buffer = Buffer.alloc(length);
    const { bytesRead } = await handle.read(buffer, 0, length, 0);
    return buffer.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
}

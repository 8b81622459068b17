import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { createReadStream, type ReadStream } from "node:fs";
import { mkdir, open, rename, rm, stat } from "node:fs/promises";
import path from "node:path";
import { env } from "@/lib/env";
import { uploadPath } from "@/lib/uploads/paths";

/*
 * The content-addressed store: every file is named by the SHA-256 of its bytes under
 * env.uploadsDir (`ab/abcdef….bin`), so identical content is kept once however many rows point
 * at it. Files arrive in `<uploadsDir>/tmp` and are renamed into place (same file system, so the
 * rename is atomic: a reader sees the whole file or none). Nothing here is ever served by path;
 * the route handlers stream it after their access check.
 */

const FILE_MODE = 0o600;
const DIRECTORY_MODE = 0o750;

/** The uploads directory, resolved; refused inside public/, where Next would serve it to anyone. */
export function uploadsRoot(): string {
  const root = path.resolve(env.uploadsDir);
  const publicDir = path.resolve("public");
  if (root === publicDir || root.startsWith(publicDir + path.sep)) {
    throw new Error(`UPLOADS_DIR must be outside public/ (it is ${root})`);
  }
  return root;
}

export function storedFilePath(sha256: string): string {
  return uploadPath(sha256, uploadsRoot());
}

/** Where uploads stream to before they are checked; on the store's file system. */
export async function uploadsTempDir(): Promise<string> {
  const directory = path.join(uploadsRoot(), "tmp");
  await mkdir(directory, { recursive: true, mode: DIRECTORY_MODE });
  return directory;
}

/**
 * Moves a checked temporary file into the store under its hash. When the content is stored
 * already the temporary file is dropped instead. The file is flushed to disk first, so a row
 * committed afterwards (synchronous=FULL) never points at a file a power cut took.
 */
export async function storeTempFile(tempPath: string, sha256: string): Promise<void> {
  const target = storedFilePath(sha256);
  if (await exists(target)) {
    await rm(tempPath, { force: true });
    return;
  }
  await flush(tempPath);
  await mkdir(path.dirname(target), { recursive: true, mode: DIRECTORY_MODE });
  await rename(tempPath, target);
  await flushDirectory(path.dirname(target));
}

/** Stores bytes made here (a cleaned photo, a thumbnail) and returns their hash. */
export async function storeBytes(bytes: Uint8Array): Promise<string> {
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  if (await exists(storedFilePath(sha256))) return sha256;
  const tempPath = path.join(await uploadsTempDir(), `proofbay-store-${randomUUID()}`);
  try {
    const handle = await open(tempPath, "wx", FILE_MODE);
    try {
      await handle.writeFile(bytes);
      await handle.sync();
    } finally {
      await handle.close();
    }
    await storeTempFile(tempPath, sha256);
  } finally {
    await rm(tempPath, { force: true });
  }
  return sha256;
}

/** Opens a stored file for streaming; undefined when it is missing. */
export async function openStoredFile(sha256: string): Promise<{ sizeBytes: number; stream: () => ReadStream } | undefined> {
  const file = storedFilePath(sha256);
  try {
    const info = await stat(file);
    return { sizeBytes: info.size, stream: () => createReadStream(file) };
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return undefined;
    throw error;
  }
}

async function exists(file: string): Promise<boolean> {
  try {
    await stat(file);
    return true;
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return false;
    throw error;
  }
}

async function flush(file: string): Promise<void> {
  const handle = await open(file, "r");
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}

/** Makes the rename itself durable (POSIX: the new directory entry is written by fsync on the directory). */
async function flushDirectory(directory: string): Promise<void> {
  try {
    await flush(directory);
  } catch {
    // Some file systems do not allow opening a directory for fsync; the rename is still atomic.
  }
}

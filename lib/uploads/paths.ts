import path from "node:path";

const SHA256_HEX = /^[0-9a-f]{64}$/;

export function isSha256Hex(value: string): boolean {
  return SHA256_HEX.test(value);
}

/**
 * Where a stored file lives, relative to the uploads directory: sharded by the first two hex
 * digits of its SHA-256 (at most 256 folders, so none grows huge), `ab/abcdef….bin`. The name is
 * the hash alone, never anything the client sent.
 */
export function uploadRelativePath(sha256: string): string {
  if (!isSha256Hex(sha256)) throw new Error(`not a lower-case SHA-256 hex digest: ${JSON.stringify(sha256)}`);
  return path.join(sha256.slice(0, 2), `${sha256}.bin`);
}

/** The stored file's absolute path under `root` (pure path math; nothing is read or created). */
export function uploadPath(sha256: string, root: string): string {
  return path.join(path.resolve(root), uploadRelativePath(sha256));
}

export type MeshErrorCode = "empty" | "truncated" | "not_a_mesh" | "too_large";

export class MeshError extends Error {
  readonly code: MeshErrorCode;

  constructor(code: MeshErrorCode, message: string) {
    super(message);
    this.name = "MeshError";
    this.code = code;
  }
}

// 20 million triangles ≈ a 1 GB binary STL and 720 MB of vertex floats.
export const DEFAULT_MAX_TRIANGLES = 20_000_000;

export interface MeshParseOptions {
  readonly maxTriangles?: number;
  /**
   * Binary STL only: decode into the input's own memory instead of a copy, so a large upload
   * is not held twice. The input bytes are overwritten and must not be used afterwards; the
   * returned positions keep the input's buffer alive.
   */
  readonly reuseInput?: boolean;
}

export function requireWithinLimit(triangleCount: number, options: MeshParseOptions | undefined): void {
  const limit = options?.maxTriangles ?? DEFAULT_MAX_TRIANGLES;
  if (triangleCount > limit) {
    throw new MeshError("too_large", `mesh has ${triangleCount} triangles; the limit is ${limit}`);
  }
}

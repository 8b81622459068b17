/**
 * 3MF transform: the 12 numbers "m00 m01 m02 m10 m11 m12 m20 m21 m22 m30 m31 m32" of a 4×3
 * matrix applied to row vectors, p' = [x y z 1] · M (3MF core specification, chapter 3.3).
 */
export type Affine = readonly [number, number, number, number, number, number, number, number, number, number, number, number];

export const IDENTITY: Affine = [1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0];

export function parseAffine(text: string): Affine | undefined {
  const parts = text.trim().split(/\s+/).map(Number);
  if (parts.length !== 12 || !parts.every(Number.isFinite)) return undefined;
  return parts as unknown as Affine;
}

/** The transform that applies `first`, then `second`. */
export function thenApply(first: Affine, second: Affine): Affine {
  const [a00, a01, a02, a10, a11, a12, a20, a21, a22, a30, a31, a32] = first;
  const [b00, b01, b02, b10, b11, b12, b20, b21, b22, b30, b31, b32] = second;
  return [
    a00 * b00 + a01 * b10 + a02 * b20,
    a00 * b01 + a01 * b11 + a02 * b21,
    a00 * b02 + a01 * b12 + a02 * b22,
    a10 * b00 + a11 * b10 + a12 * b20,
    a10 * b01 + a11 * b11 + a12 * b21,
    a10 * b02 + a11 * b12 + a12 * b22,
    a20 * b00 + a21 * b10 + a22 * b20,
    a20 * b01 + a21 * b11 + a22 * b21,
    a20 * b02 + a21 * b12 + a22 * b22,
    a30 * b00 + a31 * b10 + a32 * b20 + b30,
    a30 * b01 + a31 * b11 + a32 * b21 + b31,
    a30 * b02 + a31 * b12 + a32 * b22 + b32,
  ];
}

export function scaled(transform: Affine, factor: number): Affine {
  return thenApply(transform, [factor, 0, 0, 0, factor, 0, 0, 0, factor, 0, 0, 0]);
}

/** A negative determinant mirrors the part, which turns its winding inside out. */
export function isMirroring(m: Affine): boolean {
  const determinant =
    m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
  return determinant < 0;
}

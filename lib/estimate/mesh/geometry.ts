export type Vector3 = readonly [number, number, number];

export interface BoundingBox {
  readonly minMm: Vector3;
  readonly maxMm: Vector3;
  readonly sizeMm: Vector3;
}

export function boundingBox(positions: Float32Array): BoundingBox {
  let minX = Infinity;
  let minY = Infinity;
  let minZ = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  let maxZ = -Infinity;
  for (let i = 0; i + 2 < positions.length; i += 3) {
    const x = positions[i]!;
    const y = positions[i + 1]!;
    const z = positions[i + 2]!;
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
    if (z < minZ) minZ = z;
    if (z > maxZ) maxZ = z;
  }
  if (minX > maxX) return { minMm: [0, 0, 0], maxMm: [0, 0, 0], sizeMm: [0, 0, 0] };
  return { minMm: [minX, minY, minZ], maxMm: [maxX, maxY, maxZ], sizeMm: [maxX - minX, maxY - minY, maxZ - minZ] };
}

export function scaleBoundingBox(box: BoundingBox, scale: number): BoundingBox {
  const times = (v: Vector3): Vector3 => [v[0] * scale, v[1] * scale, v[2] * scale];
  return { minMm: times(box.minMm), maxMm: times(box.maxMm), sizeMm: times(box.sizeMm) };
}

export interface VolumeAndArea {
  /** Positive for outward-facing (counter-clockwise seen from outside) winding. */
  readonly signedVolumeMm3: number;
  readonly surfaceAreaMm2: number;
}

/**
 * Divergence theorem: V = Σ (a · (b × c)) / 6 over triangles (signed tetrahedra to a common
 * apex). The apex is the box centre rather than the origin so that far-off parts lose no
 * precision; for a closed surface the result does not depend on the apex.
 */
export function volumeAndArea(positions: Float32Array, apex: Vector3): VolumeAndArea {
  const [ox, oy, oz] = apex;
  let sixVolume = 0;
  let twiceArea = 0;
  for (let i = 0; i + 8 < positions.length; i += 9) {
    const ax = positions[i]! - ox;
    const ay = positions[i + 1]! - oy;
    const az = positions[i + 2]! - oz;
    const bx = positions[i + 3]! - ox;
    const by = positions[i + 4]! - oy;
    const bz = positions[i + 5]! - oz;
    const cx = positions[i + 6]! - ox;
    const cy = positions[i + 7]! - oy;
    const cz = positions[i + 8]! - oz;
    sixVolume += ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
    const ux = bx - ax;
    const uy = by - ay;
    const uz = bz - az;
    const vx = cx - ax;
    const vy = cy - ay;
    const vz = cz - az;
    const nx = uy * vz - uz * vy;
    const ny = uz * vx - ux * vz;
    const nz = ux * vy - uy * vx;
    twiceArea += Math.sqrt(nx * nx + ny * ny + nz * nz);
  }
  return { signedVolumeMm3: sixVolume / 6, surfaceAreaMm2: twiceArea / 2 };
}

export function boxCentre(box: BoundingBox): Vector3 {
  return [
    (box.minMm[0] + box.maxMm[0]) / 2,
    (box.minMm[1] + box.maxMm[1]) / 2,
    (box.minMm[2] + box.maxMm[2]) / 2,
  ];
}

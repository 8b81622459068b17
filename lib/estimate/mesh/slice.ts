import { requirePositive } from "../../input-checks";
import { boundingBox } from "./geometry";

export interface SliceOptions {
  readonly layerHeightMm: number;
  /** Uniform scale about the origin applied before slicing (1.5 = 150 %). */
  readonly scale?: number;
}

export interface MeshSlices {
  readonly layerHeightMm: number;
  readonly layerCount: number;
  readonly bottomZMm: number;
  /** Height (scaled) at which each layer was sampled. */
  readonly sampleZMm: Float64Array;
  /** Enclosed cross-section area per layer (negative for inside-out meshes). */
  readonly areasMm2: Float64Array;
  /** Total contour length per layer, outer and inner contours together. */
  readonly perimetersMm: Float64Array;
}

// Tolerates the rounding in heights such as 0.3 / 0.1 = 2.9999999999999996 layers.
const LAYER_COUNT_TOLERANCE = 1e-9;

export function layerCountForHeight(heightMm: number, layerHeightMm: number): number {
  if (heightMm <= 0) return 0;
  return Math.max(1, Math.ceil(heightMm / layerHeightMm - LAYER_COUNT_TOLERANCE));
}

/**
 * Cross-section of every layer, sampled at the layer's mid-height (the last layer at the middle
 * of what remains of the part). Each triangle crossing a sampling plane adds one segment,
 * oriented by the triangle's winding so that outer contours run counter-clockwise seen from +z
 * and holes clockwise. Summing the shoelace terms (x1·y2 − x2·y1) / 2 of all segments gives the
 * enclosed area without assembling the segments into loops.
 */
export function sliceMesh(positions: Float32Array, options: SliceOptions): MeshSlices {
  const layerHeightMm = requirePositive("layerHeightMm", options.layerHeightMm);
  const scale = requirePositive("scale", options.scale ?? 1);
  const box = boundingBox(positions);
  const layerCount = layerCountForHeight(box.sizeMm[2] * scale, layerHeightMm);
  const planes = samplingPlanes(box.minMm[2], box.maxMm[2], layerHeightMm / scale, layerCount);
  const twiceAreas = new Float64Array(layerCount);
  const perimeters = new Float64Array(layerCount);
  const centreX = (box.minMm[0] + box.maxMm[0]) / 2;
  const centreY = (box.minMm[1] + box.maxMm[1]) / 2;
  const layerStep = layerHeightMm / scale;

  for (let i = 0; i + 8 < positions.length; i += 9) {
    const z0 = positions[i + 2]!;
    const z1 = positions[i + 5]!;
    const z2 = positions[i + 8]!;
    const zLow = Math.min(z0, z1, z2);
    const zHigh = Math.max(z0, z1, z2);
    if (zHigh === zLow) continue;
    let layer = firstPlaneAbove(planes, zLow, box.minMm[2], layerStep);
    for (; layer < layerCount && planes[layer]! <= zHigh; layer++) {
      addCrossing(positions, i, planes[layer]!, centreX, centreY, twiceAreas, perimeters, layer);
    }
  }

  const areasMm2 = new Float64Array(layerCount);
  const sampleZMm = new Float64Array(layerCount);
  for (let layer = 0; layer < layerCount; layer++) {
    areasMm2[layer] = (twiceAreas[layer]! / 2) * scale * scale;
    perimeters[layer] = perimeters[layer]! * scale;
    sampleZMm[layer] = planes[layer]! * scale;
  }
  return { layerHeightMm, layerCount, bottomZMm: box.minMm[2] * scale, sampleZMm, areasMm2, perimetersMm: perimeters };
}

function samplingPlanes(zMin: number, zMax: number, layerStep: number, layerCount: number): Float64Array {
  const planes = new Float64Array(layerCount);
  for (let layer = 0; layer < layerCount; layer++) planes[layer] = zMin + (layer + 0.5) * layerStep;
  if (layerCount > 0) planes[layerCount - 1] = (zMin + (layerCount - 1) * layerStep + zMax) / 2;
  return planes;
}

// Smallest layer whose plane lies strictly above zLow. The estimate from arithmetic is exact
// or one off; the comparisons against the stored planes make it consistent with addCrossing.
function firstPlaneAbove(planes: Float64Array, zLow: number, zMin: number, layerStep: number): number {
  const count = planes.length;
  let layer = Math.floor((zLow - zMin) / layerStep - 0.5);
  if (layer < 0) layer = 0;
  if (layer > count) layer = count;
  while (layer < count && planes[layer]! <= zLow) layer++;
  while (layer > 0 && planes[layer - 1]! > zLow) layer--;
  return layer;
}

/**
 * A vertex counts as above the plane when z ≥ plane, so a plane through a vertex is handled
 * the same way by every triangle sharing it and the contour stays closed; a plane lying on a
 * horizontal face sees the part just below it. Walking the
 * triangle's corners in winding order, the segment runs from the crossing of the edge that
 * goes down through the plane to the crossing of the edge that comes back up.
 */
function addCrossing(
  positions: Float32Array,
  i: number,
  plane: number,
  centreX: number,
  centreY: number,
  twiceAreas: Float64Array,
  perimeters: Float64Array,
  layer: number,
): void {
  const above0 = positions[i + 2]! >= plane;
  const above1 = positions[i + 5]! >= plane;
  const above2 = positions[i + 8]! >= plane;
  let down: number;
  let up: number;
  // Corner index k names the edge k → k+1.
  if (above0 && !above1) down = 0;
  else if (above1 && !above2) down = 1;
  else down = 2;
  if (!above0 && above1) up = 0;
  else if (!above1 && above2) up = 1;
  else up = 2;

  const downStart = i + 3 * down;
  const downEnd = i + 3 * ((down + 1) % 3);
  const upStart = i + 3 * up;
  const upEnd = i + 3 * ((up + 1) % 3);
  // Interpolate from the vertex below to the vertex above, whichever way the edge runs, so the
  // two triangles sharing an edge compute the identical point.
  const dx = crossingCoordinate(positions, downEnd, downStart, plane, 0) - centreX;
  const dy = crossingCoordinate(positions, downEnd, downStart, plane, 1) - centreY;
  const ux = crossingCoordinate(positions, upStart, upEnd, plane, 0) - centreX;
  const uy = crossingCoordinate(positions, upStart, upEnd, plane, 1) - centreY;
  twiceAreas[layer]! += dx * uy - ux * dy;
  const sx = ux - dx;
  const sy = uy - dy;
  perimeters[layer]! += Math.sqrt(sx * sx + sy * sy);
}

function crossingCoordinate(positions: Float32Array, below: number, above: number, plane: number, axis: number): number {
  const zBelow = positions[below + 2]!;
  const t = (plane - zBelow) / (positions[above + 2]! - zBelow);
  const from = positions[below + axis]!;
  return from + t * (positions[above + axis]! - from);
}

export interface WeldedMesh {
  readonly vertexCount: number;
  /** Vertex id of each triangle corner, 3 per triangle. */
  readonly cornerVertexIds: Int32Array;
}

const NEGATIVE_ZERO_BITS = 0x80000000;
const EMPTY = -1;
const MAX_LOAD = 0.5;

/**
 * Merges corners with bit-identical coordinates (−0 and +0 count as equal) into vertices.
 * Open addressing over an Int32Array of representative corners: no per-vertex objects.
 */
export function weldVertices(positions: Float32Array): WeldedMesh {
  const bits = new Uint32Array(positions.buffer, positions.byteOffset, positions.length);
  const cornerCount = Math.floor(positions.length / 3);
  const cornerVertexIds = new Int32Array(cornerCount);
  // A closed triangle mesh has about one vertex per two triangles, i.e. corners / 6.
  let capacity = nextPowerOfTwo(Math.max(64, Math.ceil(cornerCount / 3)));
  let slots = new Int32Array(capacity).fill(EMPTY);
  let representatives = new Int32Array(Math.max(64, Math.ceil(cornerCount / 6)));
  let vertexCount = 0;

  for (let corner = 0; corner < cornerCount; corner++) {
    const base = corner * 3;
    const x = normalizedBits(bits[base]!);
    const y = normalizedBits(bits[base + 1]!);
    const z = normalizedBits(bits[base + 2]!);
    const mask = capacity - 1;
    let slot = hashBits(x, y, z) & mask;
    for (;;) {
      const representative = slots[slot]!;
      if (representative === EMPTY) {
        if (vertexCount === representatives.length) representatives = grow(representatives);
        representatives[vertexCount] = corner;
        slots[slot] = vertexCount;
        cornerVertexIds[corner] = vertexCount++;
        break;
      }
      const other = representatives[representative]! * 3;
      if (
        normalizedBits(bits[other]!) === x &&
        normalizedBits(bits[other + 1]!) === y &&
        normalizedBits(bits[other + 2]!) === z
      ) {
        cornerVertexIds[corner] = representative;
        break;
      }
      slot = (slot + 1) & mask;
    }
    if (vertexCount > capacity * MAX_LOAD) {
      capacity *= 2;
      slots = rehash(bits, representatives, vertexCount, capacity);
    }
  }
  return { vertexCount, cornerVertexIds };
}

function rehash(
  bits: Uint32Array,
  representatives: Int32Array,
  vertexCount: number,
  capacity: number,
): Int32Array<ArrayBuffer> {
  const slots = new Int32Array(capacity).fill(EMPTY);
  const mask = capacity - 1;
  for (let vertex = 0; vertex < vertexCount; vertex++) {
    const base = representatives[vertex]! * 3;
    let slot =
      hashBits(normalizedBits(bits[base]!), normalizedBits(bits[base + 1]!), normalizedBits(bits[base + 2]!)) & mask;
    while (slots[slot] !== EMPTY) slot = (slot + 1) & mask;
    slots[slot] = vertex;
  }
  return slots;
}

function normalizedBits(value: number): number {
  return value === NEGATIVE_ZERO_BITS ? 0 : value;
}

function hashBits(x: number, y: number, z: number): number {
  let h = Math.imul(x, 0x9e3779b1) ^ Math.imul(y, 0x85ebca77) ^ Math.imul(z, 0xc2b2ae3d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x2c1b3c6d);
  h ^= h >>> 13;
  return h;
}

function grow(array: Int32Array): Int32Array<ArrayBuffer> {
  const grown = new Int32Array(array.length * 2);
  grown.set(array);
  return grown;
}

function nextPowerOfTwo(value: number): number {
  let power = 1;
  while (power < value) power *= 2;
  return power;
}

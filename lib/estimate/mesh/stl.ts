import { bytesEqualAscii, isWhitespace, parseDecimal } from "./byte-text";
import { MeshError, requireWithinLimit, type MeshParseOptions } from "./mesh-error";

const BINARY_HEADER_BYTES = 80;
const BINARY_PREAMBLE_BYTES = 84;
const BINARY_TRIANGLE_BYTES = 50;
export const FLOATS_PER_TRIANGLE = 9;
// Triangles inspected to tell a damaged binary STL from bytes that are no mesh at all.
const PLAUSIBILITY_SAMPLE_TRIANGLES = 64;
const PLAUSIBLE_COORDINATE_LIMIT = 1e9;
const PLAUSIBLE_SHARE = 0.9;
const ASCII_PROBE_BYTES = 1024;

export type StlFormat = "binary" | "ascii";

export interface ParsedMesh {
  /** 9 floats per triangle: x0 y0 z0 x1 y1 z1 x2 y2 z2, in the file's units (mm for STL). */
  readonly positions: Float32Array;
  readonly triangleCount: number;
}

export interface ParsedStl extends ParsedMesh {
  readonly format: StlFormat;
}

export function parseStl(bytes: Uint8Array, options?: MeshParseOptions): ParsedStl {
  if (bytes.length === 0 || isAllWhitespace(bytes)) throw new MeshError("empty", "the file is empty");
  if (hasExactBinarySize(bytes)) return parseBinaryStl(bytes, options);
  if (looksLikeAsciiStl(bytes)) return parseAsciiStl(bytes, options);
  return parseDamagedBinaryStl(bytes, options);
}

export function detectStlFormat(bytes: Uint8Array): StlFormat | undefined {
  if (hasExactBinarySize(bytes)) return "binary";
  if (looksLikeAsciiStl(bytes)) return "ascii";
  return undefined;
}

function declaredTriangleCount(bytes: Uint8Array): number {
  return new DataView(bytes.buffer, bytes.byteOffset + BINARY_HEADER_BYTES, 4).getUint32(0, true);
}

// A binary header may itself begin with "solid", so the size rule 84 + 50·n decides first.
function hasExactBinarySize(bytes: Uint8Array): boolean {
  if (bytes.length < BINARY_PREAMBLE_BYTES) return false;
  return BINARY_PREAMBLE_BYTES + BINARY_TRIANGLE_BYTES * declaredTriangleCount(bytes) === bytes.length;
}

function looksLikeAsciiStl(bytes: Uint8Array): boolean {
  let start = 0;
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) start = 3; // UTF-8 byte-order mark
  while (start < bytes.length && isWhitespace(bytes[start]!)) start++;
  if (!bytesEqualAscii(bytes, start, Math.min(start + 5, bytes.length), "solid")) return false;
  const probeEnd = Math.min(bytes.length, start + ASCII_PROBE_BYTES);
  for (let i = start; i < probeEnd; i++) {
    const byte = bytes[i]!;
    if (byte < 0x20 && !isWhitespace(byte)) return false;
  }
  return true;
}

function parseBinaryStl(bytes: Uint8Array, options: MeshParseOptions | undefined): ParsedStl {
  const triangleCount = declaredTriangleCount(bytes);
  if (triangleCount === 0) throw new MeshError("empty", "the binary STL declares no triangles");
  requireWithinLimit(triangleCount, options);
  return { format: "binary", triangleCount, positions: readBinaryTriangles(bytes, triangleCount, options) };
}

function parseDamagedBinaryStl(bytes: Uint8Array, options: MeshParseOptions | undefined): ParsedStl {
  if (bytes.length < BINARY_PREAMBLE_BYTES) {
    throw new MeshError("not_a_mesh", "too short for a binary STL and not an ASCII STL");
  }
  const declared = declaredTriangleCount(bytes);
  const present = Math.floor((bytes.length - BINARY_PREAMBLE_BYTES) / BINARY_TRIANGLE_BYTES);
  if (declared === 0 || present === 0 || !hasPlausibleTriangles(bytes, Math.min(present, declared))) {
    throw new MeshError("not_a_mesh", "neither a binary STL nor an ASCII STL");
  }
  requireWithinLimit(declared, options);
  if (present < declared) {
    throw new MeshError(
      "truncated",
      `the binary STL declares ${declared} triangles but holds only ${present} (${bytes.length} bytes)`,
    );
  }
  // Some exporters pad the file; the declared triangles are all there, so the extra bytes are ignored.
  return { format: "binary", triangleCount: declared, positions: readBinaryTriangles(bytes, declared, options) };
}

// Exporters write a unit normal (or all zeros) before each triangle, and coordinates of sane
// magnitude; arbitrary bytes read as floats almost never look like that for long.
function hasPlausibleTriangles(bytes: Uint8Array, available: number): boolean {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const sample = Math.min(available, PLAUSIBILITY_SAMPLE_TRIANGLES);
  let plausible = 0;
  for (let t = 0; t < sample; t++) {
    if (isPlausibleTriangle(view, BINARY_PREAMBLE_BYTES + t * BINARY_TRIANGLE_BYTES)) plausible++;
  }
  return plausible >= sample * PLAUSIBLE_SHARE;
}

function isPlausibleTriangle(view: DataView, offset: number): boolean {
  let normalLengthSquared = 0;
  for (let k = 0; k < 12; k++) {
    const value = view.getFloat32(offset + 4 * k, true);
    if (!(Math.abs(value) < PLAUSIBLE_COORDINATE_LIMIT)) return false;
    if (k < 3) normalLengthSquared += value * value;
  }
  return normalLengthSquared === 0 || Math.abs(normalLengthSquared - 1) < 0.1;
}

function readBinaryTriangles(bytes: Uint8Array, triangleCount: number, options: MeshParseOptions | undefined): Float32Array {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const positions = decodingTarget(bytes, triangleCount, options);
  let offset = BINARY_PREAMBLE_BYTES + 12; // skip the stored normal: it is recomputed from the winding
  let out = 0;
  for (let t = 0; t < triangleCount; t++) {
    let check = 0;
    for (let k = 0; k < FLOATS_PER_TRIANGLE; k++) {
      const value = view.getFloat32(offset + 4 * k, true);
      positions[out++] = value;
      check += value;
    }
    // Any NaN or infinity makes the sum non-finite, and a non-finite number times 0 is NaN.
    if (check * 0 !== 0) throw new MeshError("not_a_mesh", `triangle ${t} has a non-finite coordinate`);
    offset += BINARY_TRIANGLE_BYTES;
  }
  return positions;
}

// Triangle t is read from bytes 96 + 50t onwards and written to bytes 36t … 36t + 35, which lie
// before anything not yet read, so decoding over the input in place loses nothing.
function decodingTarget(bytes: Uint8Array, triangleCount: number, options: MeshParseOptions | undefined): Float32Array {
  const floatCount = triangleCount * FLOATS_PER_TRIANGLE;
  if (options?.reuseInput && bytes.byteOffset % Float32Array.BYTES_PER_ELEMENT === 0) {
    return new Float32Array(bytes.buffer, bytes.byteOffset, floatCount);
  }
  return new Float32Array(floatCount);
}

function isAllWhitespace(bytes: Uint8Array): boolean {
  for (let i = 0; i < bytes.length; i++) if (!isWhitespace(bytes[i]!)) return false;
  return true;
}

export function parseAsciiStl(bytes: Uint8Array, options?: MeshParseOptions): ParsedStl {
  const reader = new AsciiStlReader(bytes, options);
  reader.read();
  return reader.result();
}

class AsciiStlReader {
  private position = 0;
  private wordStart = 0;
  private floats: Float32Array;
  private floatCount = 0;
  private solidsOpen = 0;
  private solidsClosed = 0;

  constructor(
    private readonly bytes: Uint8Array,
    private readonly options: MeshParseOptions | undefined,
  ) {
    // About 250 bytes of text per facet; start there and grow by doubling.
    this.floats = new Float32Array(Math.max(FLOATS_PER_TRIANGLE * 64, Math.ceil(bytes.length / 250) * FLOATS_PER_TRIANGLE));
  }

  read(): void {
    while (this.nextWord()) {
      if (this.wordIs("vertex")) this.readVertex();
      else if (this.wordIs("solid")) this.openSolid();
      else if (this.wordIs("endsolid")) this.closeSolid();
    }
  }

  result(): ParsedStl {
    if (this.floatCount % FLOATS_PER_TRIANGLE !== 0) {
      throw new MeshError("truncated", "the ASCII STL ends in the middle of a facet");
    }
    if (this.solidsClosed < this.solidsOpen) {
      throw new MeshError("truncated", "the ASCII STL has no closing endsolid");
    }
    const triangleCount = this.floatCount / FLOATS_PER_TRIANGLE;
    if (triangleCount === 0) throw new MeshError("empty", "the ASCII STL has no facets");
    requireWithinLimit(triangleCount, this.options);
    return { format: "ascii", triangleCount, positions: this.floats.slice(0, this.floatCount) };
  }

  private openSolid(): void {
    this.solidsOpen++;
    this.skipRestOfLine(); // the solid's name may be any text, even "vertex"
  }

  private closeSolid(): void {
    this.solidsClosed++;
    this.skipRestOfLine();
  }

  private readVertex(): void {
    if (this.solidsOpen === 0) throw new MeshError("not_a_mesh", "vertex outside of a solid");
    this.ensureRoom();
    for (let axis = 0; axis < 3; axis++) {
      if (!this.nextWord()) throw new MeshError("truncated", "the ASCII STL ends inside a vertex");
      const value = parseDecimal(this.bytes, this.wordStart, this.position);
      if (!Number.isFinite(value)) {
        throw new MeshError("not_a_mesh", `bad vertex coordinate at byte ${this.wordStart}`);
      }
      this.floats[this.floatCount++] = value;
    }
  }

  private ensureRoom(): void {
    if (this.floatCount + 3 <= this.floats.length) return;
    requireWithinLimit(Math.floor(this.floatCount / FLOATS_PER_TRIANGLE) + 1, this.options);
    const grown = new Float32Array(this.floats.length * 2);
    grown.set(this.floats);
    this.floats = grown;
  }

  private nextWord(): boolean {
    const { bytes } = this;
    let i = this.position;
    while (i < bytes.length && isWhitespace(bytes[i]!)) i++;
    if (i >= bytes.length) {
      this.position = i;
      return false;
    }
    this.wordStart = i;
    while (i < bytes.length && !isWhitespace(bytes[i]!)) i++;
    this.position = i;
    return true;
  }

  private wordIs(word: string): boolean {
    return bytesEqualAscii(this.bytes, this.wordStart, this.position, word);
  }

  private skipRestOfLine(): void {
    const { bytes } = this;
    let i = this.position;
    while (i < bytes.length && bytes[i] !== 0x0a && bytes[i] !== 0x0d) i++;
    this.position = i;
  }
}

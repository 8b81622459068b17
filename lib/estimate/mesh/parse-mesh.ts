import { MeshError, type MeshParseOptions } from "./mesh-error";
import { parseStl, type ParsedMesh } from "./stl";
import { parse3mf } from "./three-mf";

export type MeshFileFormat = "stl" | "3mf";

const ZIP_SIGNATURE = [0x50, 0x4b, 0x03, 0x04];

/** Parses an uploaded mesh by its content: a ZIP container is read as 3MF, anything else as STL. */
export function parseMesh(bytes: Uint8Array, options?: MeshParseOptions): ParsedMesh & { format: MeshFileFormat } {
  if (bytes.length === 0) throw new MeshError("empty", "the file is empty");
  if (ZIP_SIGNATURE.every((byte, i) => bytes[i] === byte)) return { ...parse3mf(bytes, options), format: "3mf" };
  return { ...parseStl(bytes, options), format: "stl" };
}

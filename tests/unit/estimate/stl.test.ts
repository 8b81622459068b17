import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { MeshError, type MeshErrorCode } from "@/lib/estimate/mesh/mesh-error";
import { detectStlFormat, parseStl } from "@/lib/estimate/mesh/stl";
import { asciiStl, binaryStl, pseudoRandomBytes } from "./helpers/mesh-files";
import { cornerTetrahedron, cube, regularPrism } from "./helpers/meshes";

const encode = (text: string) => new TextEncoder().encode(text);

function errorCode(run: () => unknown): MeshErrorCode | "no error" | "other error" {
  try {
    run();
    return "no error";
  } catch (error) {
    return error instanceof MeshError ? error.code : "other error";
  }
}

describe("binary STL", () => {
  it("reads back every coordinate it was written with", () => {
    const mesh = regularPrism(7, 3.5, 2);
    const parsed = parseStl(binaryStl(mesh));
    expect(parsed.format).toBe("binary");
    expect(parsed.triangleCount).toBe(mesh.length / 9);
    expect(Array.from(parsed.positions)).toEqual(Array.from(mesh));
  });

  it("is binary by its size even when the header starts with 'solid'", () => {
    // source: binary STL layout — 80-byte header, uint32 count, 50 bytes per triangle; many
    // exporters write "solid …" into the header, so the text prefix alone proves nothing.
    const bytes = binaryStl(cube(1), "solid exported by a tool that starts headers with solid");
    expect(bytes.length).toBe(84 + 50 * 12);
    expect(detectStlFormat(bytes)).toBe("binary");
    expect(parseStl(bytes).triangleCount).toBe(12);
  });

  it("ignores padding after the declared triangles", () => {
    const bytes = binaryStl(cube(2));
    const padded = new Uint8Array(bytes.length + 16);
    padded.set(bytes);
    expect(parseStl(padded).triangleCount).toBe(12);
  });

  it("can decode into the input's own memory", () => {
    const mesh = cube(3, [1, 2, 3]);
    const bytes = binaryStl(mesh);
    const parsed = parseStl(bytes, { reuseInput: true });
    expect(parsed.positions.buffer).toBe(bytes.buffer);
    expect(Array.from(parsed.positions)).toEqual(Array.from(mesh));
  });

  it("reports a truncated file", () => {
    const bytes = binaryStl(cube(1));
    expect(errorCode(() => parseStl(bytes.subarray(0, bytes.length - 20)))).toBe("truncated");
    expect(errorCode(() => parseStl(bytes.subarray(0, 84 + 50 * 5)))).toBe("truncated");
    const solidHeader = binaryStl(cube(1), "solid but binary");
    expect(errorCode(() => parseStl(solidHeader.subarray(0, solidHeader.length - 50)))).toBe("truncated");
  });

  it("reports an empty mesh and an empty file", () => {
    expect(errorCode(() => parseStl(new Uint8Array(0)))).toBe("empty");
    expect(errorCode(() => parseStl(encode("  \n\t  ")))).toBe("empty");
    expect(errorCode(() => parseStl(binaryStl(new Float32Array(0))))).toBe("empty");
  });

  it("reports garbage as not a mesh", () => {
    expect(errorCode(() => parseStl(pseudoRandomBytes(5000)))).toBe("not_a_mesh");
    expect(errorCode(() => parseStl(pseudoRandomBytes(84 + 50 * 40, 7)))).toBe("not_a_mesh");
    expect(errorCode(() => parseStl(encode("hello, this is not a mesh")))).toBe("not_a_mesh");
    expect(errorCode(() => parseStl(encode("0.125,0.25,0.5\n".repeat(200))))).toBe("not_a_mesh");
  });

  it("rejects non-finite coordinates", () => {
    const bytes = binaryStl(cube(1));
    new DataView(bytes.buffer).setFloat32(84 + 50 * 3 + 12 + 4, Number.NaN, true);
    expect(errorCode(() => parseStl(bytes))).toBe("not_a_mesh");
  });

  it("enforces the triangle limit", () => {
    expect(errorCode(() => parseStl(binaryStl(cube(1)), { maxTriangles: 11 }))).toBe("too_large");
    expect(errorCode(() => parseStl(binaryStl(cube(1)), { maxTriangles: 12 }))).toBe("no error");
  });
});

describe("ASCII STL", () => {
  it("reads what it was written with, in several styles", () => {
    const mesh = cornerTetrahedron(2.5);
    const styles = [
      {},
      { lineEnd: "\r\n" as const, indent: "\t" },
      { format: (value: number) => value.toFixed(4), indent: "" },
      { name: "vertex named like a keyword" },
    ];
    for (const style of styles) {
      const parsed = parseStl(encode(asciiStl(mesh, style)));
      expect(parsed.format).toBe("ascii");
      expect(Array.from(parsed.positions)).toEqual(Array.from(mesh));
    }
  });

  it("reads a hand-written fixture with odd spacing, exponents and two solids", () => {
    const bytes = readFileSync(path.join(import.meta.dirname, "../../fixtures/meshes/two-tetrahedra-ascii.stl"));
    const parsed = parseStl(bytes);
    expect(parsed.triangleCount).toBe(8);
    // The second solid is the first moved by +10 in x: its first vertex is (10, 0, 0).
    expect(Array.from(parsed.positions.subarray(36, 39))).toEqual([10, 0, 0]);
    expect(parsed.positions[8]).toBeCloseTo(0, 12); // "-0.0e0"
    expect(parsed.positions[4]).toBeCloseTo(1, 6); // "1.000000E+00"
  });

  it("reports truncation inside a facet and a missing endsolid", () => {
    const text = asciiStl(cube(1));
    const cutInVertex = text.slice(0, text.indexOf("vertex", 400) + 12);
    expect(errorCode(() => parseStl(encode(cutInVertex)))).toBe("truncated");
    const cutAfterFacet = text.slice(0, text.lastIndexOf("endsolid"));
    expect(errorCode(() => parseStl(encode(cutAfterFacet)))).toBe("truncated");
  });

  it("reports an ASCII file without facets as empty and bad numbers as not a mesh", () => {
    expect(errorCode(() => parseStl(encode("solid nothing\nendsolid nothing\n")))).toBe("empty");
    const bad = asciiStl(cornerTetrahedron(1)).replace("vertex 0.000000e+0", "vertex zero");
    expect(errorCode(() => parseStl(encode(bad)))).toBe("not_a_mesh");
    const infinite = asciiStl(cornerTetrahedron(1)).replace("vertex 0.000000e+0", "vertex inf");
    expect(errorCode(() => parseStl(encode(infinite)))).toBe("not_a_mesh");
  });

  it("enforces the triangle limit", () => {
    expect(errorCode(() => parseStl(encode(asciiStl(cube(1))), { maxTriangles: 4 }))).toBe("too_large");
  });
});

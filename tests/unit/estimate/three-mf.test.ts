import { strToU8, zipSync } from "fflate";
import { describe, expect, it } from "vitest";
import { analyzeMesh } from "@/lib/estimate/mesh/analyze";
import { MeshError, type MeshErrorCode } from "@/lib/estimate/mesh/mesh-error";
import { parseMesh } from "@/lib/estimate/mesh/parse-mesh";
import { parse3mf } from "@/lib/estimate/mesh/three-mf";
import { binaryStl, pseudoRandomBytes, threeMf } from "./helpers/mesh-files";
import { cornerTetrahedron, cube } from "./helpers/meshes";

function errorCode(run: () => unknown): MeshErrorCode | "no error" | "other error" {
  try {
    run();
    return "no error";
  } catch (error) {
    return error instanceof MeshError ? error.code : "other error";
  }
}

// 3MF transforms are "m00 m01 m02 m10 m11 m12 m20 m21 m22 m30 m31 m32" with the translation
// last (3MF core specification, 3.3 "3D Matrices").
const translation = (x: number, y: number, z: number) => `1 0 0 0 1 0 0 0 1 ${x} ${y} ${z}`;
const uniformScale = (s: number) => `${s} 0 0 0 ${s} 0 0 0 ${s} 0 0 0`;

describe("3MF", () => {
  it("reads a single cube with shared vertices as a closed mesh", () => {
    const parsed = parse3mf(threeMf([{ id: 1, positions: cube(10) }], [{ objectId: 1 }]));
    expect(parsed.triangleCount).toBe(12);
    const analysis = analyzeMesh(parsed.positions);
    expect(analysis.volumeMm3).toBeCloseTo(1000, 6);
    expect(analysis.closed).toBe(true);
    expect(analysis.vertexCount).toBe(8);
  });

  it("applies build item transforms and prints every item", () => {
    const bytes = threeMf(
      [{ id: 1, positions: cube(10) }],
      [{ objectId: 1 }, { objectId: 1, transform: translation(30, 0, 0) }, { objectId: 1, transform: uniformScale(2) }],
    );
    const analysis = analyzeMesh(parse3mf(bytes).positions);
    // Two 10 mm cubes plus one scaled ×2 (volume ×8): 1000 + 1000 + 8000 mm³.
    expect(analysis.triangleCount).toBe(36);
    expect(analysis.volumeMm3).toBeCloseTo(10_000, 4);
    expect(analysis.bounds.maxMm[0]).toBeCloseTo(40, 9);
  });

  it("resolves components with their own transforms under the item's", () => {
    const bytes = threeMf(
      [
        { id: 1, positions: cornerTetrahedron(6) },
        { id: 2, components: [{ objectId: 1 }, { objectId: 1, transform: translation(10, 0, 0) }] },
      ],
      [{ objectId: 2, transform: translation(0, 0, 5) }],
    );
    const analysis = analyzeMesh(parse3mf(bytes).positions);
    // Two corner tetrahedra of legs 6: 2 × 6³ / 6 = 72 mm³, lifted to z = 5.
    expect(analysis.volumeMm3).toBeCloseTo(72, 6);
    expect(analysis.bounds.minMm).toEqual([0, 0, 5]);
    expect(analysis.bounds.maxMm).toEqual([16, 6, 11]);
  });

  it("keeps normals outward under a mirroring transform", () => {
    const mirrorX = "-1 0 0 0 1 0 0 0 1 0 0 0";
    const analysis = analyzeMesh(parse3mf(threeMf([{ id: 1, positions: cube(3) }], [{ objectId: 1, transform: mirrorX }])).positions);
    expect(analysis.signedVolumeMm3).toBeCloseTo(27, 6);
    expect(analysis.invertedNormals).toBe(false);
  });

  it("converts model units to millimetres", () => {
    // source: 3MF core specification, model unit attribute (1 cm = 10 mm, 1 in = 25.4 mm).
    const inCentimetres = parse3mf(threeMf([{ id: 1, positions: cube(2) }], [{ objectId: 1 }], { unit: "centimeter" }));
    expect(analyzeMesh(inCentimetres.positions).volumeMm3).toBeCloseTo(20 ** 3, 3);
    const inInches = parse3mf(threeMf([{ id: 1, positions: cube(1) }], [{ objectId: 1 }], { unit: "inch" }));
    expect(analyzeMesh(inInches.positions).bounds.sizeMm[0]).toBeCloseTo(25.4, 5);
  });

  it("follows the package relationship to a model stored elsewhere, with prefixed elements", () => {
    const bytes = threeMf([{ id: 7, positions: cube(4) }], [{ objectId: 7 }], { modelPath: "3D/other.model", prefixed: true });
    expect(analyzeMesh(parse3mf(bytes).positions).volumeMm3).toBeCloseTo(64, 6);
  });

  it("reads all objects when the build lists none", () => {
    const bytes = threeMf([{ id: 1, positions: cube(1) }, { id: 2, positions: cornerTetrahedron(3) }], []);
    expect(parse3mf(bytes).triangleCount).toBe(16);
  });

  it("is chosen by content in parseMesh, STL otherwise", () => {
    const zip = threeMf([{ id: 1, positions: cube(1) }], [{ objectId: 1 }]);
    expect(parseMesh(zip).format).toBe("3mf");
    expect(parseMesh(binaryStl(cube(1))).format).toBe("stl");
  });

  it("reports broken packages with mesh error codes", () => {
    expect(errorCode(() => parse3mf(new Uint8Array(0)))).toBe("empty");
    expect(errorCode(() => parse3mf(pseudoRandomBytes(300)))).toBe("not_a_mesh");
    expect(errorCode(() => parse3mf(zipSync({ "readme.txt": strToU8("no model here") })))).toBe("not_a_mesh");
    expect(errorCode(() => parse3mf(threeMf([{ id: 1, positions: new Float32Array(0) }], [{ objectId: 1 }])))).toBe("empty");
    expect(errorCode(() => parse3mf(threeMf([{ id: 1, positions: cube(1) }], [{ objectId: 9 }])))).toBe("not_a_mesh");
    expect(errorCode(() => parse3mf(threeMf([{ id: 1, positions: cube(1) }], [{ objectId: 1 }]), { maxTriangles: 6 }))).toBe(
      "too_large",
    );
    // A model part that expands to more text than the triangle limit could need is refused unread.
    expect(errorCode(() => parse3mf(threeMf([{ id: 1, positions: cube(1) }], [{ objectId: 1 }]), { maxTriangles: 1 }))).toBe(
      "too_large",
    );
  });

  it("rejects triangles that point at missing vertices and cyclic components", () => {
    const model = `<?xml version="1.0"?><model xmlns="http://schemas.microsoft.com/3dmanufacturing/core/2015/02">
      <resources><object id="1"><mesh><vertices><vertex x="0" y="0" z="0"/><vertex x="1" y="0" z="0"/>
      <vertex x="0" y="1" z="0"/></vertices><triangles><triangle v1="0" v2="1" v3="3"/></triangles></mesh></object>
      </resources><build><item objectid="1"/></build></model>`;
    expect(errorCode(() => parse3mf(zipSync({ "3D/3dmodel.model": strToU8(model) })))).toBe("not_a_mesh");
    const cyclic = threeMf([{ id: 1, components: [{ objectId: 2 }] }, { id: 2, components: [{ objectId: 1 }] }], [{ objectId: 1 }]);
    expect(errorCode(() => parse3mf(cyclic))).toBe("not_a_mesh");
  });
});

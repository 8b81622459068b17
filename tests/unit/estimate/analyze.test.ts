import { describe, expect, it } from "vitest";
import { analyzeMesh } from "@/lib/estimate/mesh/analyze";
import { DomainInputError } from "@/lib/input-checks";
import {
  concat,
  cornerTetrahedron,
  cube,
  cubeWithFlippedTop,
  cubeWithoutTop,
  insideOutCube,
  regularPrism,
  squareTube,
  stairs,
  toPositions,
  translate,
} from "./helpers/meshes";

// Closed forms used below (standard solid geometry):
//   cube of side a: V = a³, A = 6a²
//   corner tetrahedron with legs a: V = a³/6, A = 3·a²/2 + (√3/2)·a²
//   prism over a regular N-gon of circumradius r, height h: base area (N/2)·r²·sin(2π/N),
//     side length 2r·sin(π/N), so V = base·h and A = 2·base + N·side·h
//   cylinder: V = π r² h (the N-gon prism converges to it as N grows)
function regularPolygonArea(sides: number, radius: number): number {
  return (sides / 2) * radius * radius * Math.sin((2 * Math.PI) / sides);
}

describe("mesh analysis of closed solids", () => {
  it("measures a cube: V = a³, A = 6a², 8 vertices, 18 edges", () => {
    const a = 20;
    const analysis = analyzeMesh(cube(a));
    expect(analysis.triangleCount).toBe(12);
    expect(analysis.volumeMm3).toBeCloseTo(a ** 3, 9);
    expect(analysis.signedVolumeMm3).toBeGreaterThan(0);
    expect(analysis.surfaceAreaMm2).toBeCloseTo(6 * a ** 2, 9);
    // Polyhedron formula for a closed surface without holes: V − E + F = 2 → 8 − 18 + 12 = 2.
    expect(analysis.vertexCount).toBe(8);
    expect(analysis.edgeCount).toBe(18);
    expect(analysis.vertexCount - analysis.edgeCount + analysis.triangleCount).toBe(2);
    expect(analysis.closed).toBe(true);
    expect(analysis.consistentlyOriented).toBe(true);
    expect(analysis.invertedNormals).toBe(false);
    expect(analysis.problems).toEqual([]);
    expect(analysis.bounds.sizeMm).toEqual([a, a, a]);
  });

  it("measures a corner tetrahedron", () => {
    const a = 3;
    const analysis = analyzeMesh(cornerTetrahedron(a));
    expect(analysis.volumeMm3).toBeCloseTo(a ** 3 / 6, 6);
    expect(analysis.surfaceAreaMm2).toBeCloseTo((3 * a * a) / 2 + (Math.sqrt(3) / 2) * a * a, 5);
    expect(analysis.closed).toBe(true);
  });

  it("measures a regular prism by the N-gon formulas", () => {
    const [sides, radius, height] = [6, 5, 12];
    const base = regularPolygonArea(sides, radius);
    const analysis = analyzeMesh(regularPrism(sides, radius, height));
    expect(analysis.volumeMm3).toBeCloseTo(base * height, 4);
    expect(analysis.surfaceAreaMm2).toBeCloseTo(2 * base + sides * 2 * radius * Math.sin(Math.PI / sides) * height, 4);
    expect(analysis.closed).toBe(true);
  });

  it("approaches the cylinder volume π r² h as the prism gets more sides", () => {
    const [radius, height] = [10, 5];
    const cylinder = Math.PI * radius ** 2 * height;
    let previousError = Infinity;
    for (const sides of [8, 32, 128, 512]) {
      const error = (cylinder - analyzeMesh(regularPrism(sides, radius, height)).volumeMm3) / cylinder;
      // Relative shortfall 1 − sin(x)/x with x = 2π/N; its alternating power series
      // x²/6 − x⁴/120 + … lies between x²/6 − x⁴/120 and x²/6.
      const x = (2 * Math.PI) / sides;
      expect(error).toBeGreaterThan(x ** 2 / 6 - x ** 4 / 120 - 1e-6);
      expect(error).toBeLessThan(x ** 2 / 6 + 1e-6);
      expect(error).toBeLessThan(previousError);
      previousError = error;
    }
    expect(previousError).toBeLessThan(3e-5);
  });

  it("measures a tube (a solid with a through-hole) and stairs", () => {
    expect(analyzeMesh(squareTube(10, 6, 4)).volumeMm3).toBeCloseTo((100 - 36) * 4, 4);
    // Genus 1: V − E + F = 0.
    const tube = analyzeMesh(squareTube(10, 6, 4));
    expect(tube.vertexCount - tube.edgeCount + tube.triangleCount).toBe(0);
    // Three steps, run 2, rise 1, width 5: (6 + 4 + 2) × 1 × 5 = 60 mm³.
    const steps = analyzeMesh(stairs(3, 2, 1, 5));
    expect(steps.volumeMm3).toBeCloseTo(60, 5);
    expect(steps.closed).toBe(true);
    expect(steps.consistentlyOriented).toBe(true);
  });

  it("scales volume by s³, area by s² and the box by s", () => {
    const analysis = analyzeMesh(cube(10), { scale: 1.5 });
    expect(analysis.volumeMm3).toBeCloseTo(15 ** 3, 6);
    expect(analysis.surfaceAreaMm2).toBeCloseTo(6 * 15 ** 2, 6);
    expect(analysis.bounds.sizeMm[2]).toBeCloseTo(15, 12);
    expect(() => analyzeMesh(cube(1), { scale: 0 })).toThrow(DomainInputError);
  });

  it("keeps precision far from the origin", () => {
    const far = analyzeMesh(cube(2, [10_000, -20_000, 5_000]));
    expect(far.volumeMm3).toBeCloseTo(8, 6);
  });

  it("treats a -0 coordinate as the same vertex as +0", () => {
    const mesh = cube(1);
    for (let i = 0; i < mesh.length; i += 7) if (mesh[i] === 0) mesh[i] = -0;
    expect(analyzeMesh(mesh).closed).toBe(true);
  });
});

describe("mesh defects", () => {
  it("finds a flipped face: its four outer edges run the same way as their neighbours'", () => {
    const analysis = analyzeMesh(cubeWithFlippedTop(1));
    expect(analysis.closed).toBe(true);
    expect(analysis.consistentlyOriented).toBe(false);
    expect(analysis.flippedEdges).toBe(4);
    expect(analysis.problems).toContain("flipped_faces");
    // The flipped square's tetrahedra now count negatively, so the volume is no longer a³.
    expect(analysis.volumeMm3).not.toBeCloseTo(1, 3);
  });

  it("finds a missing face: four open edges, not closed", () => {
    const analysis = analyzeMesh(cubeWithoutTop(1));
    expect(analysis.closed).toBe(false);
    expect(analysis.openEdges).toBe(4);
    expect(analysis.problems).toContain("open_edges");
  });

  it("finds inverted normals from the negative volume", () => {
    const analysis = analyzeMesh(insideOutCube(2));
    expect(analysis.signedVolumeMm3).toBeCloseTo(-8, 9);
    expect(analysis.volumeMm3).toBeCloseTo(8, 9);
    expect(analysis.closed).toBe(true);
    expect(analysis.consistentlyOriented).toBe(true);
    expect(analysis.invertedNormals).toBe(true);
    expect(analysis.problems).toEqual(["inverted_normals"]);
  });

  it("finds non-manifold edges where two cubes touch along an edge", () => {
    // Cubes [0,1]³ and [1,2]×[1,2]×[0,1] share the vertical edge x = 1, y = 1: four faces meet there.
    const analysis = analyzeMesh(concat(cube(1), cube(1, [1, 1, 0])));
    expect(analysis.nonManifoldEdges).toBe(1);
    expect(analysis.closed).toBe(false);
    expect(analysis.volumeMm3).toBeCloseTo(2, 9);
  });

  it("counts degenerate triangles and leaves them out of the edge checks", () => {
    const sliver = toPositions([[[0, 0, 0], [0, 0, 0], [1, 0, 0]]]);
    const analysis = analyzeMesh(concat(cube(1), sliver));
    expect(analysis.degenerateTriangles).toBe(1);
    expect(analysis.closed).toBe(true);
    expect(analysis.problems).toEqual(["degenerate_triangles"]);
  });

  it("treats separate closed parts as closed", () => {
    const analysis = analyzeMesh(concat(cube(1), translate(cornerTetrahedron(1), [5, 5, 5])));
    expect(analysis.closed).toBe(true);
    expect(analysis.volumeMm3).toBeCloseTo(1 + 1 / 6, 6);
  });

  it("gives an empty mesh zero everything and calls it not closed", () => {
    const analysis = analyzeMesh(new Float32Array(0));
    expect(analysis.triangleCount).toBe(0);
    expect(analysis.volumeMm3).toBe(0);
    expect(analysis.closed).toBe(false);
  });
});

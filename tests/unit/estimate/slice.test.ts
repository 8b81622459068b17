import { describe, expect, it } from "vitest";
import { analyzeMesh } from "@/lib/estimate/mesh/analyze";
import { layerCountForHeight, sliceMesh } from "@/lib/estimate/mesh/slice";
import { DomainInputError } from "@/lib/input-checks";
import { boxTriangles, cube, insideOutCube, regularPrism, squareTube, stairs, toPositions } from "./helpers/meshes";

const sum = (values: ArrayLike<number>) => Array.from(values).reduce((a, b) => a + b, 0);

describe("layer count", () => {
  it.each([
    // Layer count = ⌈height / layer height⌉.
    [10, 0.2, 50],
    [10.1, 0.2, 51],
    [0.3, 0.1, 3], // 0.3 / 0.1 is 2.9999999999999996 in binary floating point
    [0.05, 0.2, 1],
    [0, 0.2, 0],
  ])("%f mm at %f mm → %i layers", (height, layerHeight, layers) => {
    expect(layerCountForHeight(height, layerHeight)).toBe(layers);
  });
});

describe("slicing", () => {
  it("cuts a cube into squares: area a² and perimeter 4a on every layer", () => {
    const a = 10;
    const slices = sliceMesh(cube(a), { layerHeightMm: 0.2 });
    expect(slices.layerCount).toBe(Math.ceil(a / 0.2));
    for (let layer = 0; layer < slices.layerCount; layer++) {
      expect(slices.areasMm2[layer]).toBeCloseTo(a * a, 9);
      expect(slices.perimetersMm[layer]).toBeCloseTo(4 * a, 9);
    }
    expect(slices.sampleZMm[0]).toBeCloseTo(0.1, 12);
  });

  it("stays exact when the sampling planes pass through vertices", () => {
    // Walls cut at z = 0.5 and 1.5, which are exactly the mid-heights of 1 mm layers.
    const box = toPositions(boxTriangles([0, 0, 0], [4, 3, 2], [0.5, 1, 1.5]));
    const slices = sliceMesh(box, { layerHeightMm: 1 });
    expect(Array.from(slices.sampleZMm)).toEqual([0.5, 1.5]);
    expect(Array.from(slices.areasMm2)).toEqual([12, 12]);
    expect(Array.from(slices.perimetersMm)).toEqual([14, 14]);
  });

  it("takes the part just below a plane that lies exactly on a step's tread", () => {
    // Stairs with rise 0.375 and layers of 0.25: planes at 0.125, 0.375 (exactly on the first
    // tread), 0.625, 0.875 and 1.0625 (the last, partial layer samples the middle of what is left).
    const slices = sliceMesh(stairs(3, 2, 0.375, 5), { layerHeightMm: 0.25 });
    expect(slices.layerCount).toBe(Math.ceil(1.125 / 0.25));
    expect(Array.from(slices.sampleZMm)).toEqual([0.125, 0.375, 0.625, 0.875, 1.0625]);
    // Step widths 6, 6 (the limit from below at the tread), 4, 2, 2 — times the 5 mm depth;
    // contours 2 × (width + 5).
    const widths = [6, 6, 4, 2, 2];
    widths.forEach((width, layer) => {
      expect(slices.areasMm2[layer]).toBeCloseTo(width * 5, 9);
      expect(slices.perimetersMm[layer]).toBeCloseTo(2 * (width + 5), 9);
    });
  });

  it("subtracts holes: a square tube gives outer² − inner² and both contours' length", () => {
    const slices = sliceMesh(squareTube(10, 6, 3), { layerHeightMm: 0.5 });
    for (let layer = 0; layer < slices.layerCount; layer++) {
      expect(slices.areasMm2[layer]).toBeCloseTo(100 - 36, 9);
      expect(slices.perimetersMm[layer]).toBeCloseTo(40 + 24, 9);
    }
  });

  it("cuts a regular prism into regular polygons", () => {
    const [sides, radius] = [12, 8];
    const slices = sliceMesh(regularPrism(sides, radius, 4), { layerHeightMm: 0.3 });
    // Regular N-gon of circumradius r: area (N/2) r² sin(2π/N), perimeter 2N r sin(π/N).
    const area = (sides / 2) * radius ** 2 * Math.sin((2 * Math.PI) / sides);
    const perimeter = 2 * sides * radius * Math.sin(Math.PI / sides);
    expect(slices.layerCount).toBe(14);
    for (let layer = 0; layer < slices.layerCount; layer++) {
      expect(slices.areasMm2[layer]).toBeCloseTo(area, 4);
      expect(slices.perimetersMm[layer]).toBeCloseTo(perimeter, 4);
    }
  });

  it("sums layer areas × layer height to the volume when the height divides evenly", () => {
    const mesh = regularPrism(40, 6, 7);
    const slices = sliceMesh(mesh, { layerHeightMm: 0.25 });
    expect(sum(slices.areasMm2) * 0.25).toBeCloseTo(analyzeMesh(mesh).volumeMm3, 3);
  });

  it("scales before slicing: 150 % gives 2.25 × the area, 1.5 × the perimeter and more layers", () => {
    const slices = sliceMesh(cube(10, [0, 0, 4]), { layerHeightMm: 0.2, scale: 1.5 });
    expect(slices.layerCount).toBe(75);
    expect(slices.bottomZMm).toBeCloseTo(6, 12);
    expect(slices.areasMm2[40]).toBeCloseTo(225, 6);
    expect(slices.perimetersMm[40]).toBeCloseTo(60, 6);
  });

  it("gives negative areas for an inside-out mesh", () => {
    const slices = sliceMesh(insideOutCube(5), { layerHeightMm: 1 });
    expect(slices.areasMm2[2]).toBeCloseTo(-25, 9);
    expect(slices.perimetersMm[2]).toBeCloseTo(20, 9);
  });

  it("rejects a zero layer height", () => {
    expect(() => sliceMesh(cube(1), { layerHeightMm: 0 })).toThrow(DomainInputError);
  });
});

import { describe, expect, it } from "vitest";
import { estimateMeshPrint, parseStl } from "@/lib/estimate";
import { binaryStl } from "./helpers/mesh-files";
import { cube } from "./helpers/meshes";

describe("mesh print estimate", () => {
  it("turns a 20 mm cube STL into grams and metres of filament", () => {
    const { positions } = parseStl(binaryStl(cube(20)));
    const estimate = estimateMeshPrint({
      positions,
      layerHeightMm: 0.2,
      material: "PLA",
      extrusion: { wallCount: 2, lineWidthMm: 0.45, infillFraction: 0.15, topSolidLayers: 4, bottomSolidLayers: 3 },
    });
    // From the extrusion arithmetic: 7 solid layers × 80 mm³ + 93 sparse × 24.24 mm³ = 2814.32 mm³;
    // × 1.24 g/cm³ = 3.4898 g; 2814.32 mm³ ÷ (π × 0.875² mm²) = 1170.06 mm of 1.75 mm filament.
    expect(estimate.analysis.volumeMm3).toBeCloseTo(8000, 6);
    expect(estimate.extrusion.totalVolumeMm3).toBeCloseTo(2814.32, 6);
    expect(estimate.filamentGrams).toBeCloseTo(3.4898, 4);
    expect(estimate.filamentMetres).toBeCloseTo(1.17006, 5);
  });

  it("scales the whole estimate", () => {
    const positions = cube(10);
    const full = estimateMeshPrint({ positions, layerHeightMm: 0.2, material: "PETG", scale: 2 });
    expect(full.analysis.volumeMm3).toBeCloseTo(8000, 6);
    expect(full.slices.layerCount).toBe(100);
  });
});

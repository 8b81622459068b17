import { describe, expect, it } from "vitest";
import { DEFAULT_EXTRUSION_SETTINGS, extrusionByLayer, type ExtrusionSettings } from "@/lib/estimate/mesh/extrusion";
import { sliceMesh } from "@/lib/estimate/mesh/slice";
import { extrusionSecondsForLayers } from "@/lib/estimate/print-time";
import { cube, insideOutCube } from "./helpers/meshes";

const settings: ExtrusionSettings = {
  wallCount: 2,
  lineWidthMm: 0.45,
  infillFraction: 0.15,
  topSolidLayers: 4,
  bottomSolidLayers: 3,
};

describe("per-layer extrusion", () => {
  it("adds walls, sparse infill and solid top/bottom layers for a 20 mm cube", () => {
    const slices = sliceMesh(cube(20), { layerHeightMm: 0.2 });
    const extrusion = extrusionByLayer(slices, settings);
    // Arithmetic per 0.2 mm layer: whole layer 20 × 20 × 0.2 = 80 mm³;
    // walls 80 mm perimeter × 2 × 0.45 mm × 0.2 mm = 14.4 mm³;
    // sparse layer 14.4 + (80 − 14.4) × 0.15 = 24.24 mm³; solid layers 80 mm³.
    expect(slices.layerCount).toBe(100);
    expect(extrusion.layerVolumesMm3[0]).toBeCloseTo(80, 9);
    expect(extrusion.layerVolumesMm3[2]).toBeCloseTo(80, 9);
    expect(extrusion.layerVolumesMm3[3]).toBeCloseTo(24.24, 9);
    expect(extrusion.layerVolumesMm3[95]).toBeCloseTo(24.24, 9);
    expect(extrusion.layerVolumesMm3[96]).toBeCloseTo(80, 9);
    // 7 solid layers + 93 sparse layers.
    expect(extrusion.totalVolumeMm3).toBeCloseTo(7 * 80 + 93 * 24.24, 6);
    expect(extrusion.wallVolumeMm3).toBeCloseTo(100 * 14.4, 6);
    expect(extrusion.wallVolumeMm3 + extrusion.infillVolumeMm3).toBeCloseTo(extrusion.totalVolumeMm3, 9);
  });

  it("makes a solid print equal to the part's volume", () => {
    const slices = sliceMesh(cube(10), { layerHeightMm: 0.25 });
    const solid = extrusionByLayer(slices, { ...settings, infillFraction: 1 });
    expect(solid.totalVolumeMm3).toBeCloseTo(1000, 6);
  });

  it("caps the walls at the layer's area for thin parts", () => {
    // A 1 mm square: 4 mm perimeter × 2 walls × 0.45 mm = 3.6 mm² of wall > 1 mm² of section.
    const slices = sliceMesh(cube(1), { layerHeightMm: 0.2 });
    const extrusion = extrusionByLayer(slices, { ...settings, infillFraction: 0, topSolidLayers: 0, bottomSolidLayers: 0 });
    for (const volume of extrusion.layerVolumesMm3) expect(volume).toBeCloseTo(1 * 0.2, 9);
  });

  it("gives an inside-out mesh the same plastic as the right way round", () => {
    const right = extrusionByLayer(sliceMesh(cube(8), { layerHeightMm: 0.2 }), settings);
    const inverted = extrusionByLayer(sliceMesh(insideOutCube(8), { layerHeightMm: 0.2 }), settings);
    expect(inverted.totalVolumeMm3).toBeCloseTo(right.totalVolumeMm3, 9);
  });

  it("feeds the minimum layer time: small layers print slower than their volume says", () => {
    const extrusion = extrusionByLayer(sliceMesh(cube(5), { layerHeightMm: 0.2 }), DEFAULT_EXTRUSION_SETTINGS);
    const unfloored = extrusion.totalVolumeMm3 / (15 * 0.55);
    const floored = extrusionSecondsForLayers(extrusion.layerVolumesMm3, 15, 0.55, 8);
    // 25 layers of at most 5 mm³ (≈ 0.6 s each) all hit the 8 s floor: 25 × 8 = 200 s.
    expect(floored).toBeCloseTo(25 * 8, 9);
    expect(floored).toBeGreaterThan(unfloored);
  });

  it("rejects impossible settings", () => {
    const slices = sliceMesh(cube(2), { layerHeightMm: 0.2 });
    expect(() => extrusionByLayer(slices, { ...settings, infillFraction: 1.5 })).toThrow();
    expect(() => extrusionByLayer(slices, { ...settings, wallCount: 1.5 })).toThrow();
  });
});

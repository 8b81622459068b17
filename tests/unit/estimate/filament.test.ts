import { describe, expect, it } from "vitest";
import {
  filamentCrossSectionMm2,
  filamentMetresToGrams,
  filamentMetresToVolumeMm3,
  gramsToFilamentMetres,
  gramsToVolumeMm3,
  volumeMm3ToFilamentMetres,
  volumeMm3ToGrams,
} from "@/lib/estimate/filament";
import { MATERIALS } from "@/lib/estimate/materials";
import { DomainInputError } from "@/lib/input-checks";

describe("filament conversions", () => {
  it("1 kg of 1.75 mm PLA at 1.24 g/cm³ is about 335 m", () => {
    // source: common practice — spool labels and calculators give ≈ 330–340 m per kg of 1.75 mm PLA.
    // Arithmetic: volume = 1000 g ÷ 1.24 g/cm³ = 806.45 cm³ = 806 452 mm³;
    // cross-section = π × (1.75 / 2)² = π × 0.765625 = 2.405282 mm²;
    // length = 806 452 / 2.405282 = 335 284 mm ≈ 335.3 m.
    const volumeMm3 = (1000 / 1.24) * 1000;
    const crossSectionMm2 = Math.PI * 0.875 ** 2;
    expect(crossSectionMm2).toBeCloseTo(2.405282, 6);
    const expectedMetres = volumeMm3 / crossSectionMm2 / 1000;
    expect(expectedMetres).toBeCloseTo(335.28, 2);
    expect(Math.round(expectedMetres)).toBe(335);

    expect(gramsToFilamentMetres(1000, 1.75, MATERIALS.PLA.densityGPerCm3)).toBeCloseTo(expectedMetres, 9);
  });

  it("1 kg of 2.85 mm PLA is about 126 m", () => {
    // Arithmetic: π × 1.425² = 6.379397 mm²; 806 452 mm³ / 6.379397 mm² = 126 415 mm.
    expect(filamentCrossSectionMm2(2.85)).toBeCloseTo(6.379397, 6);
    expect(gramsToFilamentMetres(1000, 2.85, 1.24)).toBeCloseTo(126.415, 3);
  });

  it("converts grams and volume by density: 1 cm³ of water-dense plastic weighs 1 g", () => {
    // source: definition of density, 1 g/cm³ = 1 g per 1000 mm³.
    expect(gramsToVolumeMm3(1, 1)).toBe(1000);
    expect(volumeMm3ToGrams(1000, 1.24)).toBeCloseTo(1.24, 12);
    expect(volumeMm3ToGrams(gramsToVolumeMm3(37.5, 1.27), 1.27)).toBeCloseTo(37.5, 12);
  });

  it("converts metres to volume as length × cross-section and back", () => {
    // 1 m of 1.75 mm filament: 1000 mm × 2.405282 mm² = 2405.282 mm³.
    expect(filamentMetresToVolumeMm3(1, 1.75)).toBeCloseTo(2405.282, 3);
    expect(volumeMm3ToFilamentMetres(filamentMetresToVolumeMm3(12.5, 1.75), 1.75)).toBeCloseTo(12.5, 12);
    // 1 m weighs 2.405282 cm³ × 1.24 g/cm³ = 2.98255 g.
    expect(filamentMetresToGrams(1, 1.75, 1.24)).toBeCloseTo(2.98255, 5);
  });

  it("rejects impossible inputs", () => {
    expect(() => gramsToFilamentMetres(10, 0, 1.24)).toThrow(DomainInputError);
    expect(() => gramsToVolumeMm3(-1, 1.24)).toThrow(DomainInputError);
    expect(() => gramsToVolumeMm3(1, Number.NaN)).toThrow(DomainInputError);
  });
});

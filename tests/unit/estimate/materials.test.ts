import { describe, expect, it } from "vitest";
import { getMaterial, isMaterialId, MATERIAL_IDS, MATERIALS, STANDARD_FILAMENT_DIAMETERS_MM } from "@/lib/estimate/materials";

// Density ranges of the unfilled polymers (from memory, handbook and resin-datasheet ranges;
// ISO 1183-1 / ASTM D792 densities at 23 °C). Each table value must fall inside its range.
const PUBLISHED_DENSITY_RANGES: Record<string, [number, number]> = {
  PLA: [1.21, 1.26],
  PETG: [1.26, 1.29],
  ABS: [1.03, 1.08],
  ASA: [1.05, 1.09],
  TPU: [1.1, 1.25],
  PC: [1.19, 1.22],
  PA: [1.08, 1.15],
};

describe("materials", () => {
  it("covers the seven common filament polymers", () => {
    expect([...MATERIAL_IDS].sort()).toEqual(["ABS", "ASA", "PA", "PC", "PETG", "PLA", "TPU"]);
  });

  it.each(Object.entries(PUBLISHED_DENSITY_RANGES))("%s density lies in its published range", (id, [low, high]) => {
    expect(isMaterialId(id)).toBe(true);
    if (!isMaterialId(id)) return;
    expect(getMaterial(id).densityGPerCm3).toBeGreaterThanOrEqual(low);
    expect(getMaterial(id).densityGPerCm3).toBeLessThanOrEqual(high);
  });

  it("flags enclosure and fumes as common practice says", () => {
    // common practice: ABS, ASA, PC and nylon warp without an enclosure; styrenics smell strongly.
    const enclosed = MATERIAL_IDS.filter((id) => MATERIALS[id].needsEnclosure).sort();
    expect(enclosed).toEqual(["ABS", "ASA", "PA", "PC"]);
    const strongFumes = MATERIAL_IDS.filter((id) => MATERIALS[id].fumeCaution === "strong").sort();
    expect(strongFumes).toEqual(["ABS", "ASA"]);
  });

  it("gives ordered nozzle ranges, PC hottest and PLA coolest", () => {
    for (const id of MATERIAL_IDS) {
      const { min, max } = MATERIALS[id].nozzleTemperatureCelsius;
      expect(min).toBeLessThan(max);
    }
    const lowest = MATERIAL_IDS.reduce((a, b) => (MATERIALS[a].nozzleTemperatureCelsius.min <= MATERIALS[b].nozzleTemperatureCelsius.min ? a : b));
    const highest = MATERIAL_IDS.reduce((a, b) => (MATERIALS[a].nozzleTemperatureCelsius.max >= MATERIALS[b].nozzleTemperatureCelsius.max ? a : b));
    expect(lowest).toBe("PLA");
    expect(highest).toBe("PC");
  });

  it("lists the two standard filament diameters", () => {
    // common practice: filament is sold as 1.75 mm and 2.85 mm.
    expect(STANDARD_FILAMENT_DIAMETERS_MM).toEqual([1.75, 2.85]);
    expect(isMaterialId("PVC")).toBe(false);
  });
});

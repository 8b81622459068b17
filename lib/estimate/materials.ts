export type MaterialId = "PLA" | "PETG" | "ABS" | "ASA" | "TPU" | "PC" | "PA";

export interface TemperatureRangeCelsius {
  readonly min: number;
  readonly max: number;
}

export interface Material {
  readonly id: MaterialId;
  readonly name: string;
  readonly densityGPerCm3: number;
  readonly needsEnclosure: boolean;
  /** "strong" for styrenics, whose printing releases styrene-based fumes. */
  readonly fumeCaution: "none" | "moderate" | "strong";
  readonly nozzleTemperatureCelsius: TemperatureRangeCelsius;
}

// Densities are typical unfilled-resin values at room temperature as measured by the
// standard plastics density methods (ISO 1183-1, ASTM D792). Filled or foamed grades differ.
// Nozzle ranges are common practice for direct-drive / bowden hot ends, not a datasheet.
export const MATERIALS: Readonly<Record<MaterialId, Material>> = {
  PLA: {
    id: "PLA",
    name: "Polylactic acid",
    // source: typical PLA resin datasheet specific gravity 1.24 (from memory); printed-material
    // property compilations give 1.22–1.26 g/cm³.
    densityGPerCm3: 1.24,
    needsEnclosure: false,
    fumeCaution: "none",
    nozzleTemperatureCelsius: { min: 190, max: 220 }, // common practice
  },
  PETG: {
    id: "PETG",
    name: "Glycol-modified polyethylene terephthalate",
    // source: typical PETG copolyester datasheet density 1.27 g/cm³ (from memory); amorphous
    // PET is 1.33–1.37, glycol modification lowers it.
    densityGPerCm3: 1.27,
    needsEnclosure: false,
    fumeCaution: "none",
    nozzleTemperatureCelsius: { min: 220, max: 250 }, // common practice
  },
  ABS: {
    id: "ABS",
    name: "Acrylonitrile butadiene styrene",
    // source: typical ABS filament datasheet density 1.04 g/cm³ (from memory); general-purpose
    // ABS resin handbook range 1.03–1.08 g/cm³.
    densityGPerCm3: 1.04,
    needsEnclosure: true,
    fumeCaution: "strong",
    nozzleTemperatureCelsius: { min: 230, max: 260 }, // common practice
  },
  ASA: {
    id: "ASA",
    name: "Acrylonitrile styrene acrylate",
    // source: typical ASA resin datasheet density 1.07 g/cm³ (from memory).
    densityGPerCm3: 1.07,
    needsEnclosure: true,
    fumeCaution: "strong",
    nozzleTemperatureCelsius: { min: 235, max: 260 }, // common practice
  },
  TPU: {
    id: "TPU",
    name: "Thermoplastic polyurethane (shore 95A class)",
    // source: typical 95A TPU filament datasheet density 1.21 g/cm³ (from memory); TPU grades
    // span about 1.10–1.25 g/cm³ depending on hardness.
    densityGPerCm3: 1.21,
    needsEnclosure: false,
    fumeCaution: "moderate",
    nozzleTemperatureCelsius: { min: 210, max: 240 }, // common practice
  },
  PC: {
    id: "PC",
    name: "Polycarbonate",
    // source: bisphenol-A polycarbonate handbook density 1.20–1.22 g/cm³ (from memory).
    densityGPerCm3: 1.2,
    needsEnclosure: true,
    fumeCaution: "moderate",
    nozzleTemperatureCelsius: { min: 260, max: 300 }, // common practice
  },
  PA: {
    id: "PA",
    name: "Polyamide 6 (nylon)",
    // source: dry PA6 resin datasheet density 1.13–1.14 g/cm³ (from memory); encyclopedia
    // infoboxes give 1.084–1.15 depending on crystallinity.
    densityGPerCm3: 1.14,
    needsEnclosure: true,
    fumeCaution: "moderate",
    nozzleTemperatureCelsius: { min: 240, max: 270 }, // common practice
  },
};

export const MATERIAL_IDS = Object.keys(MATERIALS) as MaterialId[];

// The two filament diameters sold for desktop extrusion printers (common practice).
export const STANDARD_FILAMENT_DIAMETERS_MM = [1.75, 2.85] as const;
export type StandardFilamentDiameterMm = (typeof STANDARD_FILAMENT_DIAMETERS_MM)[number];

export function isMaterialId(value: string): value is MaterialId {
  return Object.prototype.hasOwnProperty.call(MATERIALS, value);
}

export function getMaterial(id: MaterialId): Material {
  return MATERIALS[id];
}

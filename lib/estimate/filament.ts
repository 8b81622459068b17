import { requireNonNegative, requirePositive } from "../input-checks";

const MM3_PER_CM3 = 1000;
const MM_PER_M = 1000;

export function filamentCrossSectionMm2(diameterMm: number): number {
  const radiusMm = requirePositive("diameterMm", diameterMm) / 2;
  return Math.PI * radiusMm * radiusMm;
}

export function gramsToVolumeMm3(grams: number, densityGPerCm3: number): number {
  requireNonNegative("grams", grams);
  return (grams / requirePositive("densityGPerCm3", densityGPerCm3)) * MM3_PER_CM3;
}

export function volumeMm3ToGrams(volumeMm3: number, densityGPerCm3: number): number {
  requireNonNegative("volumeMm3", volumeMm3);
  return (volumeMm3 / MM3_PER_CM3) * requirePositive("densityGPerCm3", densityGPerCm3);
}

export function volumeMm3ToFilamentMetres(volumeMm3: number, diameterMm: number): number {
  requireNonNegative("volumeMm3", volumeMm3);
  return volumeMm3 / filamentCrossSectionMm2(diameterMm) / MM_PER_M;
}

export function filamentMetresToVolumeMm3(metres: number, diameterMm: number): number {
  requireNonNegative("metres", metres);
  return metres * MM_PER_M * filamentCrossSectionMm2(diameterMm);
}

export function gramsToFilamentMetres(grams: number, diameterMm: number, densityGPerCm3: number): number {
  return volumeMm3ToFilamentMetres(gramsToVolumeMm3(grams, densityGPerCm3), diameterMm);
}

export function filamentMetresToGrams(metres: number, diameterMm: number, densityGPerCm3: number): number {
  return volumeMm3ToGrams(filamentMetresToVolumeMm3(metres, diameterMm), densityGPerCm3);
}

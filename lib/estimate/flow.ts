import { requirePositive } from "../input-checks";

/** Volumetric flow of one extruded line: its cross-section (height × width) times its speed. */
export function volumetricFlowMm3PerS(layerHeightMm: number, extrusionWidthMm: number, speedMmPerS: number): number {
  return (
    requirePositive("layerHeightMm", layerHeightMm) *
    requirePositive("extrusionWidthMm", extrusionWidthMm) *
    requirePositive("speedMmPerS", speedMmPerS)
  );
}

/** Print speed that produces a given volumetric flow for a line of this cross-section. */
export function speedForFlowMmPerS(flowMm3PerS: number, layerHeightMm: number, extrusionWidthMm: number): number {
  return (
    requirePositive("flowMm3PerS", flowMm3PerS) /
    (requirePositive("layerHeightMm", layerHeightMm) * requirePositive("extrusionWidthMm", extrusionWidthMm))
  );
}

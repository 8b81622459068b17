import { gramsToFilamentMetres, volumeMm3ToGrams } from "../filament";
import { getMaterial, type MaterialId } from "../materials";
import { analyzeMesh, type MeshAnalysis } from "./analyze";
import { DEFAULT_EXTRUSION_SETTINGS, extrusionByLayer, type ExtrusionSettings, type LayerExtrusion } from "./extrusion";
import { sliceMesh, type MeshSlices } from "./slice";

export interface MeshPrintInput {
  readonly positions: Float32Array;
  readonly scale?: number;
  readonly layerHeightMm: number;
  readonly material: MaterialId;
  readonly filamentDiameterMm?: number;
  readonly extrusion?: ExtrusionSettings;
}

export interface MeshPrintEstimate {
  readonly analysis: MeshAnalysis;
  readonly slices: MeshSlices;
  readonly extrusion: LayerExtrusion;
  readonly filamentGrams: number;
  readonly filamentMetres: number;
}

/** Analysis, slicing and per-layer extrusion of one piece: what a test plan needs from a mesh. */
export function estimateMeshPrint(input: MeshPrintInput): MeshPrintEstimate {
  const analysis = analyzeMesh(input.positions, { scale: input.scale });
  const slices = sliceMesh(input.positions, { layerHeightMm: input.layerHeightMm, scale: input.scale });
  const extrusion = extrusionByLayer(slices, input.extrusion ?? DEFAULT_EXTRUSION_SETTINGS);
  const density = getMaterial(input.material).densityGPerCm3;
  const filamentGrams = volumeMm3ToGrams(extrusion.totalVolumeMm3, density);
  return {
    analysis,
    slices,
    extrusion,
    filamentGrams,
    filamentMetres: gramsToFilamentMetres(filamentGrams, input.filamentDiameterMm ?? 1.75, density),
  };
}

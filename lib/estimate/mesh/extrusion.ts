import {
  requireNonNegativeInteger,
  requirePositive,
  requireUnitInterval,
} from "../../input-checks";

export interface ExtrusionSettings {
  readonly wallCount: number;
  readonly lineWidthMm: number;
  /** Sparse infill density as a fraction, 0 (hollow) to 1 (solid). */
  readonly infillFraction: number;
  readonly topSolidLayers: number;
  readonly bottomSolidLayers: number;
}

// common practice: a slicer's "standard" profile for a 0.4 mm nozzle.
export const DEFAULT_EXTRUSION_SETTINGS: ExtrusionSettings = {
  wallCount: 2,
  lineWidthMm: 0.45,
  infillFraction: 0.15,
  topSolidLayers: 4,
  bottomSolidLayers: 3,
};

export interface LayerCrossSections {
  readonly layerHeightMm: number;
  readonly areasMm2: ArrayLike<number>;
  readonly perimetersMm: ArrayLike<number>;
}

export interface LayerExtrusion {
  readonly layerVolumesMm3: Float64Array;
  readonly wallVolumeMm3: number;
  readonly infillVolumeMm3: number;
  readonly totalVolumeMm3: number;
}

/**
 * Plastic laid down per layer: walls (perimeter × walls × line width × layer height, never more
 * than the whole layer) plus the remaining area × layer height at infill density, or solid for
 * top and bottom layers. Top and bottom are approximated by the first and last N layers of the
 * part; surfaces facing up or down part-way up (steps, overhang roofs) are not detected, so
 * parts with such surfaces come out somewhat light.
 */
export function extrusionByLayer(layers: LayerCrossSections, settings: ExtrusionSettings = DEFAULT_EXTRUSION_SETTINGS): LayerExtrusion {
  const layerHeightMm = requirePositive("layerHeightMm", layers.layerHeightMm);
  const wallCount = requireNonNegativeInteger("wallCount", settings.wallCount);
  const lineWidthMm = requirePositive("lineWidthMm", settings.lineWidthMm);
  const infillFraction = requireUnitInterval("infillFraction", settings.infillFraction);
  const bottomSolid = requireNonNegativeInteger("bottomSolidLayers", settings.bottomSolidLayers);
  const topSolid = requireNonNegativeInteger("topSolidLayers", settings.topSolidLayers);
  const layerCount = layers.areasMm2.length;
  const layerVolumesMm3 = new Float64Array(layerCount);
  let wallVolumeMm3 = 0;
  let infillVolumeMm3 = 0;
  for (let layer = 0; layer < layerCount; layer++) {
    // An inside-out mesh yields negative areas of the right size, so the magnitude is used.
    const layerVolume = Math.abs(layers.areasMm2[layer] ?? 0) * layerHeightMm;
    const perimeterMm = layers.perimetersMm[layer] ?? 0;
    const wallVolume = Math.min(perimeterMm * wallCount * lineWidthMm * layerHeightMm, layerVolume);
    const solid = layer < bottomSolid || layer >= layerCount - topSolid;
    const infillVolume = (layerVolume - wallVolume) * (solid ? 1 : infillFraction);
    layerVolumesMm3[layer] = wallVolume + infillVolume;
    wallVolumeMm3 += wallVolume;
    infillVolumeMm3 += infillVolume;
  }
  return { layerVolumesMm3, wallVolumeMm3, infillVolumeMm3, totalVolumeMm3: wallVolumeMm3 + infillVolumeMm3 };
}

import {
  requireFraction,
  requireNonNegative,
  requireNonNegativeInteger,
  requirePositive,
} from "../input-checks";

// Share of the rated maximum volumetric flow a whole job really averages once acceleration,
// travel moves, retractions and slow features (small perimeters, bridges) are counted.
// common practice: 0.5–0.6 for typical test pieces on a tuned machine.
export const DEFAULT_PRINT_EFFICIENCY = 0.55;

// Slicers slow down short layers so the plastic can cool before the next one; common practice
// default is in the 5–10 s range.
export const DEFAULT_MIN_LAYER_TIME_SECONDS = 8;

const SECONDS_PER_MINUTE = 60;
const MINUTES_PER_HOUR = 60;

export interface PrinterTimeProfile {
  readonly maxVolumetricFlowMm3PerS: number;
  /** Fraction (0, 1]; defaults to DEFAULT_PRINT_EFFICIENCY. */
  readonly efficiency?: number;
  readonly heatUpMinutes: number;
  /** Time to swap the part under test (e.g. a duct) between variants. */
  readonly changeoverMinutes: number;
  /** Bed clearing, part removal and labelling per job. */
  readonly handlingMinutesPerJob: number;
  readonly minLayerTimeSeconds?: number;
}

/** Either the job's total extruded volume, or its per-layer volumes (enables the layer-time floor). */
export type ExtrusionAmount =
  | { readonly volumeMm3: number }
  | { readonly layerVolumesMm3: ArrayLike<number> };

export interface PrintTimeBreakdown {
  readonly extrusionMinutes: number;
  readonly heatUpMinutes: number;
  readonly changeoverMinutes: number;
  readonly handlingMinutes: number;
  readonly totalMinutes: number;
  readonly totalHours: number;
}

export function averageFlowMm3PerS(maxVolumetricFlowMm3PerS: number, efficiency: number): number {
  return requirePositive("maxVolumetricFlowMm3PerS", maxVolumetricFlowMm3PerS) * requireFraction("efficiency", efficiency);
}

export function extrusionSecondsForVolume(
  volumeMm3: number,
  maxVolumetricFlowMm3PerS: number,
  efficiency: number = DEFAULT_PRINT_EFFICIENCY,
): number {
  return requireNonNegative("volumeMm3", volumeMm3) / averageFlowMm3PerS(maxVolumetricFlowMm3PerS, efficiency);
}

/** Σ max(layer volume / average flow, floor); empty layers (no plastic) take no time. */
export function extrusionSecondsForLayers(
  layerVolumesMm3: ArrayLike<number>,
  maxVolumetricFlowMm3PerS: number,
  efficiency: number = DEFAULT_PRINT_EFFICIENCY,
  minLayerTimeSeconds: number = DEFAULT_MIN_LAYER_TIME_SECONDS,
): number {
  const flow = averageFlowMm3PerS(maxVolumetricFlowMm3PerS, efficiency);
  requireNonNegative("minLayerTimeSeconds", minLayerTimeSeconds);
  let seconds = 0;
  for (let i = 0; i < layerVolumesMm3.length; i++) {
    const volume = requireNonNegative(`layerVolumesMm3[${i}]`, layerVolumesMm3[i] ?? Number.NaN);
    if (volume > 0) seconds += Math.max(volume / flow, minLayerTimeSeconds);
  }
  return seconds;
}

export function extrusionSeconds(amount: ExtrusionAmount, printer: PrinterTimeProfile): number {
  const efficiency = printer.efficiency ?? DEFAULT_PRINT_EFFICIENCY;
  if ("layerVolumesMm3" in amount) {
    return extrusionSecondsForLayers(
      amount.layerVolumesMm3,
      printer.maxVolumetricFlowMm3PerS,
      efficiency,
      printer.minLayerTimeSeconds ?? DEFAULT_MIN_LAYER_TIME_SECONDS,
    );
  }
  return extrusionSecondsForVolume(amount.volumeMm3, printer.maxVolumetricFlowMm3PerS, efficiency);
}

export interface JobOverheadCounts {
  readonly jobs: number;
  /** Defaults to one heat-up per job. */
  readonly heatUps?: number;
  readonly changeovers?: number;
}

export function printTimeBreakdown(
  extrusionSecondsTotal: number,
  printer: PrinterTimeProfile,
  counts: JobOverheadCounts,
): PrintTimeBreakdown {
  const jobs = requireNonNegativeInteger("jobs", counts.jobs);
  const heatUps = requireNonNegativeInteger("heatUps", counts.heatUps ?? jobs);
  const changeovers = requireNonNegativeInteger("changeovers", counts.changeovers ?? 0);
  const extrusionMinutes = requireNonNegative("extrusionSeconds", extrusionSecondsTotal) / SECONDS_PER_MINUTE;
  const heatUpMinutes = heatUps * requireNonNegative("heatUpMinutes", printer.heatUpMinutes);
  const changeoverMinutes = changeovers * requireNonNegative("changeoverMinutes", printer.changeoverMinutes);
  const handlingMinutes = jobs * requireNonNegative("handlingMinutesPerJob", printer.handlingMinutesPerJob);
  const totalMinutes = extrusionMinutes + heatUpMinutes + changeoverMinutes + handlingMinutes;
  return {
    extrusionMinutes,
    heatUpMinutes,
    changeoverMinutes,
    handlingMinutes,
    totalMinutes,
    totalHours: totalMinutes / MINUTES_PER_HOUR,
  };
}

/** Time for `jobs` identical jobs of the given extrusion amount each. */
export function estimatePrintTime(
  amountPerJob: ExtrusionAmount,
  printer: PrinterTimeProfile,
  counts: JobOverheadCounts = { jobs: 1 },
): PrintTimeBreakdown {
  const jobs = requireNonNegativeInteger("jobs", counts.jobs);
  return printTimeBreakdown(extrusionSeconds(amountPerJob, printer) * jobs, printer, counts);
}

export function sumPrintTimes(parts: readonly PrintTimeBreakdown[]): PrintTimeBreakdown {
  let extrusionMinutes = 0;
  let heatUpMinutes = 0;
  let changeoverMinutes = 0;
  let handlingMinutes = 0;
  for (const part of parts) {
    extrusionMinutes += part.extrusionMinutes;
    heatUpMinutes += part.heatUpMinutes;
    changeoverMinutes += part.changeoverMinutes;
    handlingMinutes += part.handlingMinutes;
  }
  const totalMinutes = extrusionMinutes + heatUpMinutes + changeoverMinutes + handlingMinutes;
  return {
    extrusionMinutes,
    heatUpMinutes,
    changeoverMinutes,
    handlingMinutes,
    totalMinutes,
    totalHours: totalMinutes / MINUTES_PER_HOUR,
  };
}

import { estimateTestPlanCost, type CostBreakdown, type PaymentFee } from "./cost";
import { gramsToVolumeMm3, volumeMm3ToFilamentMetres, volumeMm3ToGrams } from "./filament";
import { getMaterial, type MaterialId } from "./materials";
import type { CurrencyCode } from "../money";
import {
  extrusionSeconds,
  printTimeBreakdown,
  sumPrintTimes,
  type PrintTimeBreakdown,
  type PrinterTimeProfile,
} from "./print-time";
import { DomainInputError, requireNonNegative, requirePositive, requirePositiveInteger } from "../input-checks";

export interface PlanPiece {
  readonly id: string;
  readonly name: string;
  /** Filament for one print in the protocol's material, at the scale to be printed. */
  readonly filamentGrams: number;
  /** Extruded volume per layer, when the piece was sliced; enables the minimum layer time. */
  readonly layerVolumesMm3?: ArrayLike<number>;
}

export interface PlanVariant {
  readonly id: string;
  readonly name: string;
  readonly role: "reference" | "under_test";
  /** For filament tests: prints this variant in another material (same volume). */
  readonly material?: MaterialId;
}

export interface PlanProtocol {
  readonly material: MaterialId;
  readonly layerHeightMm: number;
  readonly maxVolumetricFlowMm3PerS: number;
  readonly fanPercent: number;
  readonly filamentDiameterMm?: number;
}

export interface PlanPrinter extends PrinterTimeProfile {
  readonly id: string;
  readonly name: string;
  readonly hourlyRateMinor: number;
}

export interface PlanPricing {
  readonly currency: CurrencyCode;
  readonly filamentPricePerKgMinor: Partial<Record<MaterialId, number>>;
  readonly labourRatePerHourMinor: number;
  /** Lab time beyond printing, e.g. measuring and writing up the results. */
  readonly extraLabourHours?: number;
  readonly contingencyBasisPoints?: number;
  readonly paymentFee?: PaymentFee;
  readonly roundUpToMinor?: number;
  readonly locale?: string;
}

export interface TestPlanInput {
  readonly pieces: readonly PlanPiece[];
  readonly variants: readonly PlanVariant[];
  readonly repeats: number;
  readonly protocol: PlanProtocol;
  readonly printer: PlanPrinter;
  readonly pricing: PlanPricing;
}

export interface PlanJob {
  readonly variantId: string;
  readonly pieceId: string;
  /** 1-based repeat number. */
  readonly repeat: number;
  readonly material: MaterialId;
  readonly volumeMm3: number;
  readonly filamentMetres: number;
  readonly filamentGrams: number;
  /** Includes the changeover to this job's variant when the job is the variant's first. */
  readonly time: PrintTimeBreakdown;
}

export interface TestPlanEstimate {
  readonly jobs: readonly PlanJob[];
  readonly variantSwitches: number;
  readonly volumeMm3: number;
  readonly filamentMetres: number;
  readonly filamentGrams: number;
  readonly filamentGramsByMaterial: Partial<Record<MaterialId, number>>;
  readonly time: PrintTimeBreakdown;
  /** Extrusion + heat-up: the time the printer is running. */
  readonly machineHours: number;
  /** Changeovers + handling + extra lab time: the time a person is busy. */
  readonly labourHours: number;
  readonly cost: CostBreakdown;
}

const DEFAULT_FILAMENT_DIAMETER_MM = 1.75;
const MINUTES_PER_HOUR = 60;

/**
 * Every piece × every variant × repeats, grouped by variant so that the part under test is
 * swapped once per variant switch (variants − 1 changeovers; the first variant is assumed
 * mounted when the plan starts). Each job heats up once and is handled once.
 */
export function estimateTestPlan(input: TestPlanInput): TestPlanEstimate {
  validatePlan(input);
  const printer = printerAtProtocolFlow(input.printer, input.protocol);
  const jobs: PlanJob[] = [];
  input.variants.forEach((variant, variantIndex) => {
    let firstOfVariant = true;
    for (const piece of input.pieces) {
      for (let repeat = 1; repeat <= input.repeats; repeat++) {
        const changeovers = firstOfVariant && variantIndex > 0 ? 1 : 0;
        jobs.push(planJob(input, printer, variant, piece, repeat, changeovers));
        firstOfVariant = false;
      }
    }
  });

  const time = sumPrintTimes(jobs.map((job) => job.time));
  const machineHours = (time.extrusionMinutes + time.heatUpMinutes) / MINUTES_PER_HOUR;
  const labourHours =
    (time.changeoverMinutes + time.handlingMinutes) / MINUTES_PER_HOUR + (input.pricing.extraLabourHours ?? 0);
  const filamentGramsByMaterial = gramsByMaterial(jobs);
  const cost = estimateTestPlanCost({
    currency: input.pricing.currency,
    filament: Object.entries(filamentGramsByMaterial).map(([material, grams]) => ({
      material: material as MaterialId,
      grams: grams ?? 0,
      pricePerKgMinor: filamentPrice(input.pricing, material as MaterialId),
    })),
    machineHours,
    machineRatePerHourMinor: input.printer.hourlyRateMinor,
    labourHours,
    labourRatePerHourMinor: input.pricing.labourRatePerHourMinor,
    contingencyBasisPoints: input.pricing.contingencyBasisPoints,
    paymentFee: input.pricing.paymentFee,
    roundUpToMinor: input.pricing.roundUpToMinor,
    locale: input.pricing.locale,
  });

  return {
    jobs,
    variantSwitches: input.variants.length - 1,
    volumeMm3: sum(jobs, (job) => job.volumeMm3),
    filamentMetres: sum(jobs, (job) => job.filamentMetres),
    filamentGrams: sum(jobs, (job) => job.filamentGrams),
    filamentGramsByMaterial,
    time,
    machineHours,
    labourHours,
    cost,
  };
}

function planJob(
  input: TestPlanInput,
  printer: PlanPrinter,
  variant: PlanVariant,
  piece: PlanPiece,
  repeat: number,
  changeovers: number,
): PlanJob {
  const material = variant.material ?? input.protocol.material;
  // The piece's geometry is fixed; a variant in another material keeps the volume, not the mass.
  const volumeMm3 = gramsToVolumeMm3(piece.filamentGrams, getMaterial(input.protocol.material).densityGPerCm3);
  const seconds = extrusionSeconds(
    piece.layerVolumesMm3 ? { layerVolumesMm3: piece.layerVolumesMm3 } : { volumeMm3 },
    printer,
  );
  return {
    variantId: variant.id,
    pieceId: piece.id,
    repeat,
    material,
    volumeMm3,
    filamentMetres: volumeMm3ToFilamentMetres(volumeMm3, input.protocol.filamentDiameterMm ?? DEFAULT_FILAMENT_DIAMETER_MM),
    filamentGrams: volumeMm3ToGrams(volumeMm3, getMaterial(material).densityGPerCm3),
    time: printTimeBreakdown(seconds, printer, { jobs: 1, changeovers }),
  };
}

// The protocol may cap the flow below what the printer could do (e.g. for a fair comparison).
function printerAtProtocolFlow(printer: PlanPrinter, protocol: PlanProtocol): PlanPrinter {
  const cap = requirePositive("protocol.maxVolumetricFlowMm3PerS", protocol.maxVolumetricFlowMm3PerS);
  return { ...printer, maxVolumetricFlowMm3PerS: Math.min(printer.maxVolumetricFlowMm3PerS, cap) };
}

function validatePlan(input: TestPlanInput): void {
  if (input.pieces.length === 0) throw new DomainInputError("pieces", "a plan needs at least one piece");
  const references = input.variants.filter((variant) => variant.role === "reference").length;
  if (references !== 1) throw new DomainInputError("variants", `needs exactly one reference variant, got ${references}`);
  requirePositiveInteger("repeats", input.repeats);
  requirePositive("protocol.layerHeightMm", input.protocol.layerHeightMm);
  const fan = requireNonNegative("protocol.fanPercent", input.protocol.fanPercent);
  if (fan > 100) throw new DomainInputError("protocol.fanPercent", `must be 0–100, got ${fan}`);
  for (const piece of input.pieces) requireNonNegative(`pieces.${piece.id}.filamentGrams`, piece.filamentGrams);
}

function filamentPrice(pricing: PlanPricing, material: MaterialId): number {
  const price = pricing.filamentPricePerKgMinor[material];
  if (price === undefined) throw new DomainInputError("filamentPricePerKgMinor", `no price for ${material}`);
  return price;
}

function gramsByMaterial(jobs: readonly PlanJob[]): Partial<Record<MaterialId, number>> {
  const totals: Partial<Record<MaterialId, number>> = {};
  for (const job of jobs) totals[job.material] = (totals[job.material] ?? 0) + job.filamentGrams;
  return totals;
}

function sum<T>(items: readonly T[], value: (item: T) => number): number {
  return items.reduce((total, item) => total + value(item), 0);
}

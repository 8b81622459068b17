import { DomainInputError } from "../input-checks";
import { filamentMetresToGrams } from "./filament";
import { volumetricFlowMm3PerS } from "./flow";
import { getMaterial, type MaterialId } from "./materials";
import { estimateTestPlan, type PlanPricing, type PlanPrinter, type TestPlanEstimate } from "./plan";
import { DEFAULT_PRINT_EFFICIENCY } from "./print-time";

/** What the calculator is asked: a protocol, pieces and a plan shape, on one of the lab's printers. */
export type CalculatorRequest = {
  printer?: Partial<Omit<PlanPrinter, "id" | "name">>;
  material: MaterialId;
  filamentDiameterMm: number;
  layerHeightMm: number;
  flow?: { mm3PerS: number } | { lineWidthMm: number; speedMmPerS: number };
  fanPercent: number;
  pieces: { name: string; filamentGrams?: number; filamentMetres?: number }[];
  variantCount: number;
  repeats: number;
};

export type CalculatorResult = {
  printer: { id: string; name: string; maxVolumetricFlowMm3PerS: number; efficiency: number; averageFlowMm3PerS: number };
  protocolFlowMm3PerS: number;
  estimate: TestPlanEstimate;
};

function protocolFlow(request: CalculatorRequest, printerMax: number): number {
  if (!request.flow) return printerMax;
  if ("mm3PerS" in request.flow) return request.flow.mm3PerS;
  return volumetricFlowMm3PerS(request.layerHeightMm, request.flow.lineWidthMm, request.flow.speedMmPerS);
}

/**
 * Turns a calculator request into a test plan on the given printer: pieces in grams (metres are
 * converted with the material's density and the filament diameter), one reference variant plus
 * (variantCount − 1) under test, each printed `repeats` times.
 */
export function estimateForCalculator(request: CalculatorRequest, labPrinter: PlanPrinter, pricing: PlanPricing): CalculatorResult {
  const printer: PlanPrinter = { ...labPrinter, ...request.printer };
  const density = getMaterial(request.material).densityGPerCm3;
  const pieces = request.pieces.map((piece, index) => {
    const grams =
      piece.filamentGrams ??
      (piece.filamentMetres !== undefined ? filamentMetresToGrams(piece.filamentMetres, request.filamentDiameterMm, density) : undefined);
    if (grams === undefined) throw new DomainInputError(`pieces.${index}.filamentGrams`, "give grams or metres");
    return { id: `piece-${index + 1}`, name: piece.name, filamentGrams: grams };
  });
  const variants = Array.from({ length: request.variantCount }, (_, index) => ({
    id: `variant-${index + 1}`,
    name: index === 0 ? "Reference" : `Under test ${index}`,
    role: index === 0 ? ("reference" as const) : ("under_test" as const),
  }));
  const flow = protocolFlow(request, printer.maxVolumetricFlowMm3PerS);
  const estimate = estimateTestPlan({
    pieces,
    variants,
    repeats: request.repeats,
    protocol: {
      material: request.material,
      layerHeightMm: request.layerHeightMm,
      maxVolumetricFlowMm3PerS: flow,
      fanPercent: request.fanPercent,
      filamentDiameterMm: request.filamentDiameterMm,
    },
    printer,
    pricing,
  });
  const efficiency = printer.efficiency ?? DEFAULT_PRINT_EFFICIENCY;
  const usedFlow = Math.min(flow, printer.maxVolumetricFlowMm3PerS);
  return {
    printer: {
      id: printer.id,
      name: printer.name,
      maxVolumetricFlowMm3PerS: printer.maxVolumetricFlowMm3PerS,
      efficiency,
      averageFlowMm3PerS: usedFlow * efficiency,
    },
    protocolFlowMm3PerS: flow,
    estimate,
  };
}

/** The JSON the estimate API returns and the calculator page shows. */
export type CalculatorSummary = {
  printer: CalculatorResult["printer"];
  protocolFlowMm3PerS: number;
  jobs: number;
  variantSwitches: number;
  volumeMm3: number;
  filamentMetres: number;
  filamentGrams: number;
  hours: { extrusion: number; heatUp: number; changeover: number; handling: number; machine: number; labour: number; total: number };
  cost: { currency: string; lines: { kind: string; label: string; quantity: string; amountMinor: number }[]; totalMinor: number };
};

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places;

export function calculatorSummary(result: CalculatorResult): CalculatorSummary {
  const { estimate } = result;
  const hours = (minutes: number) => round(minutes / 60, 3);
  return {
    printer: { ...result.printer, averageFlowMm3PerS: round(result.printer.averageFlowMm3PerS, 3) },
    protocolFlowMm3PerS: round(result.protocolFlowMm3PerS, 3),
    jobs: estimate.jobs.length,
    variantSwitches: estimate.variantSwitches,
    volumeMm3: round(estimate.volumeMm3, 1),
    filamentMetres: round(estimate.filamentMetres, 3),
    filamentGrams: round(estimate.filamentGrams, 2),
    hours: {
      extrusion: hours(estimate.time.extrusionMinutes),
      heatUp: hours(estimate.time.heatUpMinutes),
      changeover: hours(estimate.time.changeoverMinutes),
      handling: hours(estimate.time.handlingMinutes),
      machine: round(estimate.machineHours, 3),
      labour: round(estimate.labourHours, 3),
      total: hours(estimate.time.totalMinutes),
    },
    cost: {
      currency: estimate.cost.currency,
      lines: estimate.cost.lines.map(({ kind, label, quantity, amountMinor }) => ({ kind, label, quantity, amountMinor })),
      totalMinor: estimate.cost.totalMinor,
    },
  };
}

import type { MaterialId } from "@/lib/estimate/materials";

/** What the calculator needs to know about one of the lab's printers (plain data, passed from the page). */
export type CalculatorPrinter = {
  slug: string;
  name: string;
  model: string;
  maxFlowMm3PerS: number;
  materials: string[];
};

/** A material as the calculator lists it. */
export type CalculatorMaterial = {
  id: MaterialId;
  name: string;
  densityGPerCm3: number;
  nozzleMinCelsius: number;
  nozzleMaxCelsius: number;
};

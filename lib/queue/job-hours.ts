import { gramsToVolumeMm3 } from "../estimate/filament";
import { getMaterial, type MaterialId } from "../estimate/materials";
import { extrusionSeconds, printTimeBreakdown, type PrinterTimeProfile } from "../estimate/print-time";

export type JobProtocol = { material: MaterialId; maxFlowMm3PerS: number };

/**
 * Hours one job (one piece, one repeat) keeps a printer busy: extrusion at the protocol's flow
 * cap and the printer's efficiency, one heat-up, one handling. Changeovers are left out: the
 * scheduler adds one only where the printer really switches variant or material.
 */
export function jobHoursOnPrinter(pieceFilamentGrams: number, protocol: JobProtocol, printer: PrinterTimeProfile): number {
  const capped = { ...printer, maxVolumetricFlowMm3PerS: Math.min(printer.maxVolumetricFlowMm3PerS, protocol.maxFlowMm3PerS) };
  const volumeMm3 = gramsToVolumeMm3(pieceFilamentGrams, getMaterial(protocol.material).densityGPerCm3);
  return printTimeBreakdown(extrusionSeconds({ volumeMm3 }, capped), capped, { jobs: 1, changeovers: 0 }).totalHours;
}

import type { Ineligibility, ScheduleJob, SchedulePrinter, SizeMm } from "./types";

/** Materials compare without regard to case or surrounding spaces ("petg" is PETG). */
export function materialKey(material: string): string {
  return material.trim().toUpperCase();
}

/**
 * Whether a part fits a build volume. The height (z) is fixed — the test prints the part in one
 * orientation, since layer direction changes its strength and airflow — but it may be turned a
 * quarter turn on the bed, so x and y may swap.
 */
export function fitsBuildVolume(part: SizeMm, build: SizeMm): boolean {
  if (part.z > build.z) return false;
  return (part.x <= build.x && part.y <= build.y) || (part.x <= build.y && part.y <= build.x);
}

/** The job's estimated hours on a printer, when it has a usable (finite, positive) one. */
export function estimatedHours(job: ScheduleJob, printerId: string): number | undefined {
  if (!Object.hasOwn(job.hoursByPrinter, printerId)) return undefined;
  const hours = job.hoursByPrinter[printerId];
  return hours !== undefined && Number.isFinite(hours) && hours > 0 ? hours : undefined;
}

const size = (mm: SizeMm) => `${mm.x} × ${mm.y} × ${mm.z} mm`;

/** Why a printer cannot take a job (the first reason, in this order), or null when it can. */
export function ineligibility(job: ScheduleJob, printer: SchedulePrinter): Ineligibility | null {
  if (!printer.available) return { code: "printer_unavailable", message: "The printer is down or in maintenance." };
  const wanted = materialKey(job.material);
  if (!printer.materials.some((material) => materialKey(material) === wanted)) {
    const list = printer.materials.length ? printer.materials.join(", ") : "no materials";
    return { code: "material", message: `The printer takes ${list}, not ${job.material}.` };
  }
  if (job.needsEnclosure && !printer.enclosed) return { code: "enclosure", message: `${job.material} needs an enclosed printer.` };
  if (!fitsBuildVolume(job.sizeMm, printer.buildMm)) {
    return { code: "build_volume", message: `A ${size(job.sizeMm)} part does not fit the ${size(printer.buildMm)} build volume (height fixed).` };
  }
  if (estimatedHours(job, printer.id) === undefined) return { code: "no_estimate", message: "There is no time estimate for this job on this printer." };
  return null;
}

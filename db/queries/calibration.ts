import { and, asc, eq, isNotNull } from "drizzle-orm";
import { calibrate, type LoggedRun } from "../../lib/run-log/calibration";
import { RuleViolation } from "../../lib/rule-violation";
import { MIN_CALIBRATION_RUNS } from "../../lib/schedule/calibration";
import type { Db } from "../client";
import { jobRuns, printers, type Printer } from "../schema";
import { forgetCachedLabRates } from "./pricing";

/** Runs that printed to the end, with the estimate they started with: the evidence for a fit. */
export function loggedRuns(db: Db, printerId: string): (LoggedRun & { id: string; finishedAt: Date | null })[] {
  return db
    .select({
      id: jobRuns.id,
      estimatedHoursAtStart: jobRuns.estimatedHoursAtStart,
      efficiencyAtStart: jobRuns.efficiencyAtStart,
      actualHours: jobRuns.actualHours,
      finishedAt: jobRuns.finishedAt,
    })
    .from(jobRuns)
    .where(and(eq(jobRuns.printerId, printerId), eq(jobRuns.outcome, "done"), isNotNull(jobRuns.actualHours)))
    .orderBy(asc(jobRuns.finishedAt))
    .all()
    .map((run) => ({ ...run, actualHours: run.actualHours ?? 0 }));
}

export function printerCalibration(db: Db, printer: Printer) {
  return { printer, ...calibrate(loggedRuns(db, printer.id), printer.efficiency) };
}

/**
 * Stores the fitted efficiency on the printer; new estimates and the queue use it. The fit is
 * recomputed here from the stored runs, never taken from the request, and applying it twice
 * changes nothing the second time (the runs are restated at the new efficiency).
 */
export function applyCalibration(db: Db, printerId: string): { printer: Printer; previous: number; runs: number } {
  return db.transaction((tx) => {
    const printer = tx.select().from(printers).where(eq(printers.id, printerId)).get();
    if (!printer) throw new RuleViolation(404, "not_found", "That printer does not exist.", "printerId");
    const { fit } = calibrate(loggedRuns(tx as unknown as Db, printer.id), printer.efficiency);
    if (fit.runs < MIN_CALIBRATION_RUNS) {
      throw new RuleViolation(409, "too_few_runs", `A fit needs at least ${MIN_CALIBRATION_RUNS} finished runs on ${printer.name}; it has ${fit.runs}.`, "printerId");
    }
    const updated = tx.update(printers).set({ efficiency: Math.round(fit.efficiency * 10_000) / 10_000 }).where(eq(printers.id, printer.id)).returning().get();
    forgetCachedLabRates(db);
    return { printer: updated, previous: printer.efficiency, runs: fit.runs };
  }, { behavior: "immediate" });
}

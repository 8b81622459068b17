import { and, asc, eq, gt } from "drizzle-orm";
import { rangesOverlap } from "../../lib/lab-calendar/overlaps";
import { RuleViolation } from "../../lib/rule-violation";
import type { MaintenanceInput } from "../../lib/validation/lab-calendar";
import type { NewPrinterInput, PrinterInput } from "../../lib/validation/printers";
import type { Db } from "../client";
import { printerMaintenance, printers, type Printer, type PrinterMaintenance } from "../schema";
import { forgetCachedLabRates } from "./pricing";

const immediate = { behavior: "immediate" } as const;

function slugify(name: string): string {
  return (
    name
      .toLowerCase()
      .normalize("NFKD")
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 48) || "printer"
  );
}

function requirePrinter(db: Db, id: string, field = "printerId"): Printer {
  const printer = db.select().from(printers).where(eq(printers.id, id)).get();
  if (!printer) throw new RuleViolation(404, "not_found", "That printer does not exist.", field);
  return printer;
}

/** Adds a printer with a slug made from its name (numbered when taken). */
export function createPrinter(db: Db, input: NewPrinterInput, minorPerMajor: number): Printer {
  const { hourlyRate, efficiency, ...fields } = input;
  return db.transaction((tx) => {
    const base = slugify(fields.name);
    let slug = base;
    for (let n = 2; tx.select({ id: printers.id }).from(printers).where(eq(printers.slug, slug)).get(); n++) slug = `${base}-${n}`;
    const printer = tx
      .insert(printers)
      .values({ ...fields, slug, efficiency, hourlyRateMinor: Math.round(hourlyRate * minorPerMajor) })
      .returning()
      .get();
    return printer;
  }, immediate);
}

export function updatePrinter(db: Db, id: string, input: PrinterInput): Printer {
  requirePrinter(db, id, "id");
  const printer = db.update(printers).set(input).where(eq(printers.id, id)).returning().get();
  forgetCachedLabRates(db);
  return printer;
}

export function setPrinterStatus(db: Db, id: string, status: Printer["status"]): Printer {
  requirePrinter(db, id);
  const printer = db.update(printers).set({ status }).where(eq(printers.id, id)).returning().get();
  forgetCachedLabRates(db);
  return printer;
}

/** Maintenance blocks that have not ended yet, per printer, soonest first. */
export function listUpcomingMaintenance(db: Db, now: number): PrinterMaintenance[] {
  return db
    .select()
    .from(printerMaintenance)
    .where(gt(printerMaintenance.endsAt, new Date(now)))
    .orderBy(asc(printerMaintenance.printerId), asc(printerMaintenance.startsAt))
    .all();
}

/**
 * Adds a block unless it is already over or overlaps another block on the same printer (422,
 * naming the field). Checked and written in one immediate transaction, so two admins adding
 * overlapping blocks at once cannot both succeed.
 */
export function addMaintenance(db: Db, input: MaintenanceInput, now: number): PrinterMaintenance {
  return db.transaction((tx) => {
    const printer = tx.select().from(printers).where(eq(printers.id, input.printerId)).get();
    if (!printer) throw new RuleViolation(404, "not_found", "That printer does not exist.", "printerId");
    if (input.end <= now) throw new RuleViolation(422, "in_the_past", "That block is already over; enter one that ends in the future.", "end");
    const others = tx
      .select()
      .from(printerMaintenance)
      .where(and(eq(printerMaintenance.printerId, input.printerId), gt(printerMaintenance.endsAt, new Date(input.start))))
      .all();
    const clash = others.find((block) => rangesOverlap({ start: block.startsAt.getTime(), end: block.endsAt.getTime() }, input));
    if (clash) {
      throw new RuleViolation(422, "overlapping_block", `This overlaps ${printer.name}'s block "${clash.reason}"; change the times or remove that one first.`, "start");
    }
    return tx
      .insert(printerMaintenance)
      .values({ printerId: input.printerId, startsAt: new Date(input.start), endsAt: new Date(input.end), reason: input.reason })
      .returning()
      .get();
  }, immediate);
}

export function removeMaintenance(db: Db, id: string): PrinterMaintenance {
  const removed = db.delete(printerMaintenance).where(eq(printerMaintenance.id, id)).returning().get();
  if (!removed) throw new RuleViolation(404, "not_found", "That maintenance block is already gone.");
  return removed;
}


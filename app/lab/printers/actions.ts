"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { addMaintenance, createPrinter, removeMaintenance, setPrinterStatus, updatePrinter } from "@/db/queries/printer-admin";
import { formatDateTime } from "@/lib/format";
import { isCurrencyCode, minorUnitExponent } from "@/lib/money";
import { idSchema, maintenanceSchema } from "@/lib/validation/lab-calendar";
import { newPrinterSchema, printerSchema, printerStatusLabels, printerStatusSchema } from "@/lib/validation/printers";
import { guardedAction, parseInput } from "@/server/action";
import { refreshQueue } from "@/server/queue-refresh";

function revalidatePrinters() {
  revalidatePath("/lab/printers");
  revalidatePath("/lab/settings");
  revalidatePath("/queue");
}

export async function createPrinterAction(input: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const { currency } = getLabSettings(db);
    const printer = createPrinter(db, parseInput(newPrinterSchema, input), 10 ** (isCurrencyCode(currency) ? minorUnitExponent(currency) : 2));
    refreshQueue(db, `${printer.name} joined the lab`);
    revalidatePrinters();
    return { id: printer.id };
  });
}

export async function updatePrinterAction(id: unknown, input: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const printer = updatePrinter(db, parseInput(idSchema, id), parseInput(printerSchema, input));
    refreshQueue(db, `${printer.name}'s settings changed`);
    revalidatePrinters();
    return { id: printer.id };
  });
}

export async function setPrinterStatusAction(input: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const { printerId, status } = parseInput(printerStatusSchema, input);
    const printer = setPrinterStatus(db, printerId, status);
    refreshQueue(db, `${printer.name} is ${printerStatusLabels[status].toLowerCase()}`);
    revalidatePrinters();
    return { id: printer.id, status: printer.status };
  });
}

export async function addMaintenanceAction(input: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const { timeZone } = getLabSettings(db);
    const block = addMaintenance(db, parseInput(maintenanceSchema(timeZone), input), Date.now());
    refreshQueue(db, `maintenance from ${formatDateTime(block.startsAt, timeZone)}: ${block.reason}`);
    revalidatePrinters();
    return { id: block.id };
  });
}

export async function removeMaintenanceAction(id: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const block = removeMaintenance(db, parseInput(idSchema, id));
    refreshQueue(db);
    revalidatePrinters();
    return { id: block.id };
  });
}

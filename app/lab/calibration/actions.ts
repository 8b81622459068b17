"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { applyCalibration } from "@/db/queries/calibration";
import { idSchema } from "@/lib/validation/lab-calendar";
import { guardedAction, parseInput } from "@/server/action";
import { refreshQueue } from "@/server/queue-refresh";

/** Admins only: the efficiency prices every new test plan as well as timing the queue. */
export async function applyCalibrationAction(printerId: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const { printer, previous, runs } = applyCalibration(db, parseInput(idSchema, printerId));
    refreshQueue(db, `${printer.name}'s time estimates were recalibrated`);
    revalidatePath("/lab/calibration");
    revalidatePath("/lab/settings");
    return { efficiency: printer.efficiency, previous, runs };
  });
}

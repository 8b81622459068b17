import { eq } from "drizzle-orm";
import type { LabSettingsUpdate } from "@/lib/validation/lab-settings";
import type { Db } from "../client";
import { filamentPrices, labSettings, printers } from "../schema";
import { forgetCachedLabRates } from "./pricing";

/** Saves every rate at once, so an estimate never mixes old and new settings. */
export function updateLabSettings(db: Db, update: LabSettingsUpdate): void {
  db.transaction((tx) => {
    tx.update(labSettings)
      .set({
        currency: update.currency,
        timeZone: update.timeZone,
        labourRateMinorPerHour: update.labourRateMinorPerHour,
        feeBasisPoints: update.feeBasisPoints,
        feeFixedMinor: update.feeFixedMinor,
        contingencyPercent: update.contingencyPercent,
        planLabourHours: update.planLabourHours,
        reportPrepHours: update.reportPrepHours,
        requireSafetyNote: update.requireSafetyNote,
      })
      .where(eq(labSettings.id, 1))
      .run();
    for (const price of update.filamentPrices) {
      tx.insert(filamentPrices)
        .values(price)
        .onConflictDoUpdate({ target: filamentPrices.material, set: { pricePerKgMinor: price.pricePerKgMinor, updatedAt: new Date() } })
        .run();
    }
    for (const { id, ...rates } of update.printers) {
      tx.update(printers).set(rates).where(eq(printers.id, id)).run();
    }
  });
  forgetCachedLabRates(db);
}

export function listFilamentPrices(db: Db) {
  return db.select().from(filamentPrices).all();
}

import { afterAll, describe, expect, it } from "vitest";
import { updateLabSettings } from "@/db/queries/lab-settings";
import { cachedLabRates, estimateCampaignPlan, listPrinters, loadPricing } from "@/db/queries/pricing";
import { seedDemo } from "@/db/seed";
import { campaigns } from "@/db/schema";
import { parseLabSettingsForm } from "@/lib/validation/lab-settings";
import { createTempDb } from "../helpers/temp-db";

const temp = createTempDb();
seedDemo(temp.db);
afterAll(() => temp.cleanup());

describe("lab settings", () => {
  it("seeded goals equal the campaign page's breakdown at the seeded rates", () => {
    for (const campaign of temp.db.select().from(campaigns).all()) {
      const estimate = estimateCampaignPlan(temp.db, campaign.id);
      expect(estimate?.cost.totalMinor).toBe(campaign.goalMinor);
    }
  });

  it("saving new rates changes the next estimate, and only through the saved values", () => {
    const [campaign] = temp.db.select().from(campaigns).all();
    if (!campaign) throw new Error("no campaign");
    const before = estimateCampaignPlan(temp.db, campaign.id);
    const cachedBefore = cachedLabRates(temp.db);
    const printers = listPrinters(temp.db);
    const data = new FormData();
    const pricing = loadPricing(temp.db);
    const entries: Record<string, string> = {
      currency: "USD",
      timeZone: "Europe/Lisbon",
      labourRate: "70",
      feePercent: "2.9",
      feeFixed: "0.30",
      contingencyPercent: "10",
      planLabourHours: "3",
      reportPrepHours: "24",
    };
    for (const [material, price] of Object.entries(pricing.filamentPricePerKgMinor)) entries[`price.${material}`] = String((price ?? 0) / 100);
    for (const printer of printers) {
      entries[`printer.${printer.id}.hourlyRate`] = String(printer.hourlyRateMinor / 100);
      entries[`printer.${printer.id}.efficiency`] = String(printer.efficiency);
      entries[`printer.${printer.id}.heatUpMinutes`] = String(printer.heatUpMinutes);
      entries[`printer.${printer.id}.changeoverMinutes`] = String(printer.changeoverMinutes);
      entries[`printer.${printer.id}.handlingMinutesPerJob`] = String(printer.handlingMinutesPerJob);
    }
    for (const [key, value] of Object.entries(entries)) data.set(key, value);
    const parsed = parseLabSettingsForm(data, printers.map((printer) => printer.id));
    expect(parsed.fields).toEqual({});
    updateLabSettings(temp.db, parsed.data!);

    const after = estimateCampaignPlan(temp.db, campaign.id);
    // The estimate API's cached rates are dropped on save, not served stale for their TTL.
    expect(cachedBefore.pricing.labourRatePerHourMinor).toBe(3500);
    expect(cachedLabRates(temp.db).pricing.labourRatePerHourMinor).toBe(7000);
    const labour = (estimate: typeof before) => estimate?.cost.lines.find((line) => line.kind === "labour")?.amountMinor ?? 0;
    // Doubling the labour rate (35 → 70 per hour) doubles the labour line, give or take a cent of rounding.
    expect(Math.abs(labour(after) - 2 * labour(before))).toBeLessThanOrEqual(1);
    const machine = (estimate: typeof before) => estimate?.cost.lines.find((line) => line.kind === "machine")?.amountMinor;
    expect(machine(after)).toBe(machine(before));
  });
});

import { describe, expect, it } from "vitest";
import { parseLabSettingsForm } from "@/lib/validation/lab-settings";

function form(values: Record<string, string>): FormData {
  const data = new FormData();
  for (const [key, value] of Object.entries(values)) data.set(key, value);
  return data;
}

const valid = {
  currency: "USD",
  timeZone: "America/Chicago",
  labourRate: "35",
  feePercent: "2.9",
  feeFixed: "0.30",
  contingencyPercent: "10",
  planLabourHours: "3",
  reportPrepHours: "24",
  "price.PLA": "22",
  "price.PETG": "24",
  "price.ABS": "23",
  "price.ASA": "29",
  "price.TPU": "34",
  "price.PC": "39",
  "price.PA": "46.50",
  "printer.p1.hourlyRate": "1.80",
  "printer.p1.efficiency": "0.55",
  "printer.p1.heatUpMinutes": "5",
  "printer.p1.changeoverMinutes": "15",
  "printer.p1.handlingMinutesPerJob": "4",
};

describe("parseLabSettingsForm", () => {
  it("stores typed major units as minor units and the fee percent as basis points (2.9 % = 290 bp)", () => {
    const { data } = parseLabSettingsForm(form(valid), ["p1"]);
    expect(data).toMatchObject({
      labourRateMinorPerHour: 3500,
      feeBasisPoints: 290,
      feeFixedMinor: 30,
      printers: [{ id: "p1", hourlyRateMinor: 180, efficiency: 0.55 }],
    });
    expect(data?.filamentPrices.find((price) => price.material === "PA")?.pricePerKgMinor).toBe(4650);
  });

  it("names every bad field and saves nothing", () => {
    const { data, fields } = parseLabSettingsForm(
      form({ ...valid, timeZone: "Mars/Olympus", labourRate: "abc", "printer.p1.efficiency": "1.5", currency: "XXX" }),
      ["p1"],
    );
    expect(data).toBeUndefined();
    expect(Object.keys(fields).sort()).toEqual(["currency", "labourRate", "printer.p1.efficiency", "timeZone"]);
  });

  it("uses the chosen currency's minor unit (ISO 4217: JPY has none)", () => {
    const { fields } = parseLabSettingsForm(form({ ...valid, currency: "JPY", feeFixed: "0.30" }), ["p1"]);
    expect(fields.feeFixed).toMatch(/amount/);
  });
});

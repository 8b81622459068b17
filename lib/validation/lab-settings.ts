import { z } from "zod";
import { MATERIAL_IDS, type MaterialId } from "@/lib/estimate/materials";
import { CURRENCY_CODES, parseMajorAmount, parseScaledDecimal, type CurrencyCode } from "@/lib/money";

export type LabSettingsUpdate = {
  currency: CurrencyCode;
  timeZone: string;
  labourRateMinorPerHour: number;
  feeBasisPoints: number;
  feeFixedMinor: number;
  contingencyPercent: number;
  planLabourHours: number;
  reportPrepHours: number;
  requireSafetyNote: boolean;
  filamentPrices: { material: MaterialId; pricePerKgMinor: number }[];
  printers: {
    id: string;
    hourlyRateMinor: number;
    efficiency: number;
    heatUpMinutes: number;
    changeoverMinutes: number;
    handlingMinutesPerJob: number;
  }[];
};

export type FieldErrors = Record<string, string>;

function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat("en", { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

const numberIn = (min: number, max: number) => z.coerce.number({ error: "Enter a number." }).min(min).max(max);

/**
 * Reads the admin's settings form. Amounts are typed in major units of the chosen currency and
 * stored in minor units; field names match the form's input names so errors land beside them.
 */
export function parseLabSettingsForm(form: FormData, printerIds: readonly string[]): { data?: LabSettingsUpdate; fields: FieldErrors } {
  const fields: FieldErrors = {};
  const text = (name: string) => String(form.get(name) ?? "");
  const currency = text("currency");
  if (!(CURRENCY_CODES as readonly string[]).includes(currency)) fields.currency = "Pick a supported currency.";
  const code = (CURRENCY_CODES as readonly string[]).includes(currency) ? (currency as CurrencyCode) : "USD";

  const money = (name: string, label: string) => {
    const minor = parseMajorAmount(text(name), code);
    if (minor === undefined) fields[name] = `${label}: enter an amount like 12.50.`;
    return minor ?? 0;
  };
  const number = (name: string, label: string, min: number, max: number) => {
    const parsed = numberIn(min, max).safeParse(text(name));
    if (!parsed.success) fields[name] = `${label} must be between ${min} and ${max}.`;
    return parsed.success ? parsed.data : 0;
  };

  const timeZone = text("timeZone");
  if (!isTimeZone(timeZone)) fields.timeZone = "Enter an IANA time zone such as America/Chicago.";
  const feeBasisPoints = parseScaledDecimal(text("feePercent"), 2);
  if (feeBasisPoints === undefined || feeBasisPoints >= 10_000) fields.feePercent = "Fee percent: enter a number like 2.9.";

  const data: LabSettingsUpdate = {
    currency: code,
    timeZone,
    labourRateMinorPerHour: money("labourRate", "Labour rate"),
    feeBasisPoints: feeBasisPoints ?? 0,
    feeFixedMinor: money("feeFixed", "Fixed fee"),
    contingencyPercent: number("contingencyPercent", "Contingency", 0, 100),
    planLabourHours: number("planLabourHours", "Hands-on hours per plan", 0, 200),
    reportPrepHours: number("reportPrepHours", "Report preparation", 0, 720),
    requireSafetyNote: form.get("requireSafetyNote") === "on",
    filamentPrices: MATERIAL_IDS.map((material) => ({
      material,
      pricePerKgMinor: money(`price.${material}`, `${material} price`),
    })),
    printers: printerIds.map((id) => ({
      id,
      hourlyRateMinor: money(`printer.${id}.hourlyRate`, "Hourly rate"),
      efficiency: number(`printer.${id}.efficiency`, "Efficiency", 0.05, 1),
      heatUpMinutes: number(`printer.${id}.heatUpMinutes`, "Heat-up", 0, 120),
      changeoverMinutes: number(`printer.${id}.changeoverMinutes`, "Changeover", 0, 240),
      handlingMinutesPerJob: number(`printer.${id}.handlingMinutesPerJob`, "Handling", 0, 120),
    })),
  };
  return Object.keys(fields).length > 0 ? { fields } : { data, fields };
}

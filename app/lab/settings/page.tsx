import type { Metadata } from "next";
import { LabSettingsForm, type PrinterRow, type SettingsField } from "@/components/lab/lab-settings-form";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listFilamentPrices } from "@/db/queries/lab-settings";
import { listPrinters } from "@/db/queries/pricing";
import { MATERIAL_IDS } from "@/lib/estimate/materials";
import { CURRENCY_CODES, isCurrencyCode, minorToDecimalString } from "@/lib/money";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Settings · Lab" };

export default async function LabSettingsPage() {
  await requirePageRole("admin", "/lab/settings");
  const db = getDb();
  const settings = getLabSettings(db);
  const currency = isCurrencyCode(settings.currency) ? settings.currency : "USD";
  const major = (minor: number) => minorToDecimalString(minor, currency);
  const prices = new Map(listFilamentPrices(db).map((price) => [price.material, price.pricePerKgMinor]));

  const general: SettingsField[] = [
    { name: "timeZone", label: "Time zone", value: settings.timeZone, hint: "IANA name; dates are shown in it." },
    { name: "labourRate", label: "Labour rate", value: major(settings.labourRateMinorPerHour), suffix: `${currency}/h` },
    { name: "planLabourHours", label: "Hands-on hours per plan", value: String(settings.planLabourHours), suffix: "h", hint: "Measuring, photographing, writing up." },
    { name: "feePercent", label: "Payment fee allowance", value: (settings.feeBasisPoints / 100).toString(), suffix: "%", hint: "The card processor's rate." },
    { name: "feeFixed", label: "Fixed fee per payment", value: major(settings.feeFixedMinor), suffix: currency },
    { name: "contingencyPercent", label: "Contingency", value: String(settings.contingencyPercent), suffix: "%", hint: "For failed prints and reprints." },
    { name: "reportPrepHours", label: "Report preparation", value: String(settings.reportPrepHours), suffix: "h", hint: "Added after a campaign's last print." },
  ];
  const priceFields: SettingsField[] = MATERIAL_IDS.map((material) => ({
    name: `price.${material}`,
    label: material,
    value: major(prices.get(material) ?? 0),
    suffix: "/kg",
  }));
  const printers: PrinterRow[] = listPrinters(db).map((printer) => ({
    id: printer.id,
    name: printer.name,
    fields: [
      { name: `printer.${printer.id}.hourlyRate`, label: "Machine rate", value: major(printer.hourlyRateMinor), suffix: "/h" },
      { name: `printer.${printer.id}.efficiency`, label: "Efficiency", value: String(printer.efficiency) },
      { name: `printer.${printer.id}.heatUpMinutes`, label: "Heat-up", value: String(printer.heatUpMinutes), suffix: "min" },
      { name: `printer.${printer.id}.changeoverMinutes`, label: "Changeover", value: String(printer.changeoverMinutes), suffix: "min" },
      { name: `printer.${printer.id}.handlingMinutesPerJob`, label: "Handling", value: String(printer.handlingMinutesPerJob), suffix: "min/job" },
    ],
  }));

  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Lab settings</h1>
      <p className="max-w-3xl text-muted">
        These rates price every new test plan. Open campaigns keep the goal they opened with. Fees, taxes and fundraising rules
        vary by place — check them with a licensed adviser.
      </p>
      <Card>
        <LabSettingsForm requireSafetyNote={settings.requireSafetyNote} general={general} prices={priceFields} printers={printers} currencies={CURRENCY_CODES} currency={currency} />
      </Card>
    </div>
  );
}

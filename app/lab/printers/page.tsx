import type { Metadata } from "next";
import Link from "next/link";
import { CautionList } from "@/components/proposals/caution-list";
import { PrinterAdmin, type AdminPrinter } from "@/components/lab/queue-screens/printer-admin";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listUpcomingMaintenance } from "@/db/queries/printer-admin";
import { listPrinters } from "@/db/queries/pricing";
import { MATERIAL_IDS } from "@/lib/estimate/materials";
import { formatDateTime } from "@/lib/format";
import { printerRoomCautions } from "@/lib/run-log/cautions";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Printers · Lab" };

export default async function PrintersPage() {
  await requirePageRole("admin", "/lab/printers");
  const db = getDb();
  const settings = getLabSettings(db);
  const now = new Date().getTime();
  const blocks = listUpcomingMaintenance(db, now);
  const printers: AdminPrinter[] = listPrinters(db).map((printer) => ({
    id: printer.id,
    name: printer.name,
    model: printer.model,
    motionType: printer.motionType,
    buildXmm: printer.buildXmm,
    buildYmm: printer.buildYmm,
    buildZmm: printer.buildZmm,
    nozzleMm: printer.nozzleMm,
    maxFlowMm3PerS: printer.maxFlowMm3PerS,
    enclosed: printer.enclosed,
    materials: printer.materials,
    status: printer.status,
    efficiency: printer.efficiency,
    maintenance: blocks
      .filter((block) => block.printerId === printer.id)
      .map((block) => ({
        id: block.id,
        startLabel: formatDateTime(block.startsAt, settings.timeZone),
        endLabel: formatDateTime(block.endsAt, settings.timeZone),
        reason: block.reason,
        ongoing: block.startsAt.getTime() <= now,
      })),
  }));

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 className="text-2xl font-bold">Printers</h1>
        <p className="max-w-3xl text-muted">
          What each printer can print decides where the queue places a job: build volume, materials, enclosure. A printer that is down or
          in maintenance gets no new jobs, and a maintenance block keeps jobs off it for its hours (times in {settings.timeZone}). Every
          change recomputes the queue. Machine rates and minutes are on <Link href="/lab/settings" className="text-teal underline">Settings</Link>;
          efficiencies can be fitted from logged runs on <Link href="/lab/calibration" className="text-teal underline">Calibration</Link>.
        </p>
      </header>
      <CautionList cautions={printerRoomCautions()} headingId="printer-safety" heading="At the printers" />
      <PrinterAdmin printers={printers} materials={MATERIAL_IDS} timeZone={settings.timeZone} currency={settings.currency} />
    </div>
  );
}

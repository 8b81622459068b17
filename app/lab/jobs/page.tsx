import type { Metadata } from "next";
import Link from "next/link";
import { CautionList } from "@/components/proposals/caution-list";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listRunLogJobs } from "@/db/queries/run-log";
import { formatDateTime } from "@/lib/format";
import { printerRoomCautions } from "@/lib/run-log/cautions";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Run log · Lab" };

const stateLabel = { running: "Printing", scheduled: "Scheduled", planned: "Waiting for a slot", done: "Done", failed: "Failed" } as const;

export default async function RunLogPage() {
  await requirePageRole("host", "/lab/jobs");
  const db = getDb();
  const { timeZone } = getLabSettings(db);
  const rows = listRunLogJobs(db);

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 className="text-2xl font-bold">Run log</h1>
        <p className="max-w-3xl text-muted">
          Start a job when it goes on the printer and log it when it comes off: actual hours, filament, done or failed. A failed print goes
          back into the queue; logged runs calibrate the estimates. The timeline is on the <Link href="/lab/queue" className="text-teal underline">print queue</Link>.
        </p>
      </header>
      <CautionList cautions={printerRoomCautions()} headingId="run-safety" heading="Before you start a print" />
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[40rem] text-sm">
          <caption className="sr-only">Jobs printing now and next</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">Job</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Printer</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Start ({timeZone})</th>
              <th scope="col" className="px-4 py-2.5 font-medium">State</th>
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={4} className="px-4 py-6 text-center text-muted">Nothing in the queue.</td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={row.id} className="border-b border-line last:border-0">
                  <td className="px-4 py-2.5">
                    <Link href={`/lab/jobs/${row.id}`} className="font-medium text-teal underline">
                      {row.pieceName} × {row.variantName} #{row.repeat}
                    </Link>
                    <span className="block text-xs text-muted">{row.campaignTitle}</span>
                  </td>
                  <td className="px-4 py-2.5">{row.printerName ?? "—"}</td>
                  <td className="px-4 py-2.5">{row.scheduledStart ? formatDateTime(row.scheduledStart, timeZone) : "—"}</td>
                  <td className="px-4 py-2.5">{stateLabel[row.state]}</td>
                </tr>
              ))
            )}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { FinishRunForm, StartRunButton } from "@/components/lab/queue-screens/run-log-panel";
import { CautionList } from "@/components/proposals/caution-list";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { getRunLogJob } from "@/db/queries/run-log";
import { formatDateTime } from "@/lib/format";
import { runCautions } from "@/lib/run-log/cautions";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Job · Run log" };

const HOUR_MS = 3_600_000;

export default async function JobRunPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requirePageRole("host", `/lab/jobs/${id}`);
  const db = getDb();
  const found = getRunLogJob(db, id);
  if (!found) notFound();
  const { job, campaign, pieceName, pieceGrams, variantName, material, printer, runs } = found;
  const { timeZone } = getLabSettings(db);
  const open = runs.find(({ run }) => run.outcome === null)?.run;
  const startBlocker =
    job.state === "done"
      ? "This job is done."
      : job.state !== "scheduled" || !printer
        ? `Waiting for a slot: the queue has not placed this job on a printer yet.${job.unplacedReason ? ` ${job.unplacedReason}` : ""}`
        : printer.status !== "available"
          ? `${printer.name} is ${printer.status === "down" ? "down" : "in maintenance"}.`
          : null;
  const elapsedHours = open ? Math.max(0.1, Math.round(((new Date().getTime() - open.startedAt.getTime()) / HOUR_MS) * 10) / 10) : 0;

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-1">
        <p className="text-sm text-muted">
          <Link href="/lab/jobs" className="text-teal underline">Run log</Link> · {campaign.title}
        </p>
        <h1 className="text-2xl font-bold">
          {pieceName} × {variantName} <span className="text-muted">#{job.repeat}</span>
        </h1>
        <p className="text-sm text-muted">
          {material ?? "—"} · {printer ? printer.name : "no printer yet"} · estimated {job.estimatedHours.toFixed(2)} h
          {job.scheduledStart ? ` · ${job.state === "running" ? "started" : "starts"} ${formatDateTime(job.scheduledStart, timeZone)}` : ""}
        </p>
      </header>

      <CautionList cautions={runCautions(material)} headingId="job-safety" heading="Safety at the printer" />

      <Card className="flex flex-col gap-4">
        {open ? (
          <>
            <h2 className="text-lg font-semibold">Printing — attempt {open.attempt}</h2>
            <p className="text-sm text-muted">Started {formatDateTime(open.startedAt, timeZone)} on {printer?.name ?? "its printer"}.</p>
            <FinishRunForm runId={open.id} suggestedHours={elapsedHours} suggestedGrams={pieceGrams} />
          </>
        ) : (
          <>
            <h2 className="text-lg font-semibold">{job.state === "done" ? "Done" : "Not printing"}</h2>
            {job.state === "done" ? (
              <p className="text-sm">
                Took {job.actualHours ?? "—"} h and {job.filamentUsedGrams ?? "—"} g.
              </p>
            ) : (
              <StartRunButton jobId={job.id} disabledReason={startBlocker} />
            )}
          </>
        )}
      </Card>

      <section aria-labelledby="runs-heading" className="flex flex-col gap-3">
        <h2 id="runs-heading" className="text-lg font-semibold">Runs</h2>
        {runs.length === 0 ? (
          <p className="text-sm text-muted">No runs logged yet.</p>
        ) : (
          <Card className="overflow-x-auto p-0">
            <table className="w-full min-w-[40rem] text-sm">
              <caption className="sr-only">Attempts at this job</caption>
              <thead className="border-b border-line bg-paper text-left text-muted">
                <tr>
                  <th scope="col" className="px-4 py-2 font-medium">Attempt</th>
                  <th scope="col" className="px-4 py-2 font-medium">Printer</th>
                  <th scope="col" className="px-4 py-2 font-medium">Started</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">Estimated / actual</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">Filament</th>
                  <th scope="col" className="px-4 py-2 font-medium">Outcome</th>
                </tr>
              </thead>
              <tbody>
                {runs.map(({ run, printerName }) => (
                  <tr key={run.id} className="border-b border-line align-top last:border-0">
                    <td className="px-4 py-2">{run.attempt}</td>
                    <td className="px-4 py-2">{printerName}</td>
                    <td className="px-4 py-2">{formatDateTime(run.startedAt, timeZone)}</td>
                    <td className="px-4 py-2 text-right font-mono">
                      {run.estimatedHoursAtStart.toFixed(2)} / {run.actualHours?.toFixed(2) ?? "—"} h
                    </td>
                    <td className="px-4 py-2 text-right font-mono">{run.filamentUsedGrams ?? "—"} g</td>
                    <td className="px-4 py-2">
                      {run.outcome === null ? "printing" : run.outcome}
                      {run.failureReason ? <span className="block text-xs text-rose">{run.failureReason}</span> : null}
                      {run.notes ? <span className="block text-xs text-muted">{run.notes}</span> : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
        )}
      </section>
    </div>
  );
}

"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { ArrowDown, ArrowUp, Pin, PinOff } from "lucide-react";
import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import type { QueueBoard as QueueBoardData, QueueBoardJob } from "@/db/queries/queue-board";
import { cn } from "@/lib/cn";
import { formatDate, formatDateTime } from "@/lib/format";
import type { QueueJobAction } from "@/lib/validation/queue";
import { labFetch } from "./api";
import { campaignTone, QueueTimeline, type TimelineScale } from "./queue-timeline";

const QUEUE_KEY = ["lab-queue"] as const;
/** The board follows changes made elsewhere (the run log, another host) this often. */
const REFRESH_MS = 4_000;

type ActionResult = { jobsMoved: number; unplaced: number };

export function QueueBoard() {
  const client = useQueryClient();
  const board = useQuery({ queryKey: QUEUE_KEY, queryFn: () => labFetch<QueueBoardData>("/api/lab/queue"), refetchInterval: REFRESH_MS });
  const [selectedJobId, setSelectedJobId] = useState<string | null>(null);
  const [scale, setScale] = useState<TimelineScale>("hours");
  const [notice, setNotice] = useState<{ tone: "ok" | "error"; text: string } | null>(null);

  const settle = {
    onSuccess: (result: ActionResult, _: unknown) => {
      setNotice({ tone: "ok", text: result.jobsMoved === 0 ? "Saved; no job had to move." : `Saved; ${result.jobsMoved} ${result.jobsMoved === 1 ? "job" : "jobs"} moved.` });
    },
    onError: (error: Error) => setNotice({ tone: "error", text: error.message }),
    onSettled: () => client.invalidateQueries({ queryKey: QUEUE_KEY }),
  };
  const jobAction = useMutation({
    mutationFn: ({ jobId, action }: { jobId: string; action: QueueJobAction }) =>
      labFetch<ActionResult>(`/api/lab/queue/jobs/${encodeURIComponent(jobId)}`, { method: "POST", body: JSON.stringify(action) }),
    ...settle,
  });
  const printerAction = useMutation({
    mutationFn: ({ printerId, status }: { printerId: string; status: "available" | "down" }) =>
      labFetch<ActionResult>(`/api/lab/queue/printers/${encodeURIComponent(printerId)}`, { method: "POST", body: JSON.stringify({ status }) }),
    ...settle,
  });
  const busy = jobAction.isPending || printerAction.isPending;

  if (board.isPending) return <p className="text-muted">Loading the queue…</p>;
  if (board.isError) {
    return (
      <p role="alert" className="rounded-lg bg-rose-soft px-4 py-3 text-rose">
        The queue could not be loaded: {board.error.message}
      </p>
    );
  }
  const data = board.data;
  const selected = data.jobs.find((job) => job.id === selectedJobId) ?? null;
  const unplaced = data.jobs.filter((job) => job.start === null);

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2 text-xs text-muted">
        <Legend swatch="bg-teal-soft" label="Start window (someone in the lab)" />
        <Legend swatch="bg-ember-soft ring-1 ring-ember/40" label="Maintenance" />
        <Legend swatch="bg-slate-soft" label="Lab closed" />
        <Legend swatch="bg-ink/35" label="Changeover" />
        <Legend swatch="bg-ember w-0.5" label="Now" />
        <span aria-live="polite">Times in {data.timeZone}; updated {formatDateTime(new Date(data.now), data.timeZone)}</span>
        <span role="group" aria-label="Timeline scale" className="ml-auto inline-flex overflow-hidden rounded-lg border border-line">
          {(["hours", "days"] as const).map((option) => (
            <button
              key={option}
              type="button"
              aria-pressed={scale === option}
              className={cn("px-2.5 py-1 font-semibold", scale === option ? "bg-teal text-white" : "bg-surface text-ink hover:text-teal")}
              onClick={() => setScale(option)}
            >
              {option === "hours" ? "Hours" : "Days"}
            </button>
          ))}
        </span>
      </div>

      <QueueTimeline
        board={data}
        scale={scale}
        selectedJobId={selectedJobId}
        onSelect={(jobId) => {
          setSelectedJobId((current) => (current === jobId ? null : jobId));
          setNotice(null);
        }}
        renderPrinterActions={(printer) =>
          printer.status === "maintenance" ? null : (
            <button
              type="button"
              disabled={busy}
              className="rounded px-1 py-0.5 text-[11px] font-semibold whitespace-nowrap text-teal underline-offset-2 hover:underline disabled:opacity-50"
              onClick={() => printerAction.mutate({ printerId: printer.id, status: printer.status === "down" ? "available" : "down" })}
            >
              {printer.status === "down" ? "Mark up" : "Mark down"}
              <span className="sr-only"> {printer.name}</span>
            </button>
          )
        }
      />

      {notice ? (
        <p role={notice.tone === "error" ? "alert" : "status"} className={cn("rounded-lg px-4 py-2 text-sm", notice.tone === "error" ? "bg-rose-soft text-rose" : "bg-moss-soft text-moss")}>
          {notice.text}
        </p>
      ) : null}

      {selected ? (
        <JobPanel
          job={selected}
          board={data}
          busy={busy}
          onAction={(action) => jobAction.mutate({ jobId: selected.id, action })}
          onClose={() => setSelectedJobId(null)}
        />
      ) : (
        <p className="text-sm text-muted">Select a bar to pin it, move it up or down on its printer, or put it on another printer.</p>
      )}

      <div className="grid gap-4 lg:grid-cols-2">
        <section aria-labelledby="queue-campaigns" className="rounded-card border border-line bg-surface p-4">
          <h2 id="queue-campaigns" className="mb-2 font-semibold">
            Campaigns in the queue
          </h2>
          <ul className="flex flex-col gap-1.5 text-sm">
            {data.campaigns.map((campaign) => (
              <li key={campaign.id} className="flex items-center gap-2">
                <span aria-hidden className={cn("h-3 w-3 shrink-0 rounded-sm", campaignTone(campaign.colour))} />
                <span className="min-w-0 flex-1 truncate">{campaign.title}</span>
                <span className="shrink-0 text-muted">
                  {campaign.estimatedResultsAt ? `results ${formatDate(new Date(campaign.estimatedResultsAt), data.timeZone)}` : "no date yet"}
                </span>
              </li>
            ))}
            {data.campaigns.length === 0 ? <li className="text-muted">No funded campaigns are waiting.</li> : null}
          </ul>
        </section>
        <section aria-labelledby="queue-unplaced" className="rounded-card border border-line bg-surface p-4">
          <h2 id="queue-unplaced" className="mb-2 font-semibold">
            Not placed ({unplaced.length})
          </h2>
          {unplaced.length === 0 ? (
            <p className="text-sm text-muted">Every waiting job has a printer and a start.</p>
          ) : (
            <ul className="flex flex-col gap-1.5 text-sm">
              {unplaced.slice(0, 50).map((job) => (
                <li key={job.id}>
                  <button type="button" className="text-left text-teal hover:underline" onClick={() => setSelectedJobId(job.id)}>
                    {job.pieceName} · {job.variantName} · repeat {job.repeat}
                  </button>
                  <span className="block text-muted">{job.unplacedReason}</span>
                </li>
              ))}
            </ul>
          )}
        </section>
      </div>
    </div>
  );
}

function Legend({ swatch, label }: { swatch: string; label: string }) {
  return (
    <span className="inline-flex items-center gap-1.5">
      <span aria-hidden className={cn("inline-block h-3 w-4 rounded-sm", swatch)} />
      {label}
    </span>
  );
}

type PanelProps = { job: QueueBoardJob; board: QueueBoardData; busy: boolean; onAction: (action: QueueJobAction) => void; onClose: () => void };

function JobPanel({ job, board, busy, onAction, onClose }: PanelProps) {
  const campaign = board.campaigns.find((candidate) => candidate.id === job.campaignId);
  const printer = board.printers.find((candidate) => candidate.id === job.printerId);
  const movable = job.state !== "running";
  return (
    <section aria-labelledby="queue-job" className="flex flex-col gap-3 rounded-card border border-teal bg-surface p-4">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h2 id="queue-job" className="font-semibold">
            {job.pieceName} · {job.variantName} · repeat {job.repeat}
          </h2>
          <p className="text-sm text-muted">
            {campaign?.title}
            {" — "}
            {job.start !== null && job.end !== null
              ? `${printer?.name ?? "?"}, ${formatDateTime(new Date(job.start), board.timeZone)} to ${formatDateTime(new Date(job.end), board.timeZone)}`
              : (job.unplacedReason ?? "not placed")}
            {` · about ${job.estimatedHours.toFixed(1)} h on the plan's printer`}
            {job.state === "running" ? " · printing now" : ""}
          </p>
          <Link href={`/lab/jobs/${job.id}`} prefetch={false} className="text-sm font-medium text-teal hover:underline">
            Run log for this job
          </Link>
        </div>
        <Button variant="quiet" size="sm" onClick={onClose}>
          Close
        </Button>
      </div>
      {movable ? (
        <div className="flex flex-wrap items-center gap-2">
          <Button variant="secondary" size="sm" disabled={busy} onClick={() => onAction({ action: "pin", pinned: !job.pinned })}>
            {job.pinned ? <PinOff aria-hidden className="h-3.5 w-3.5" /> : <Pin aria-hidden className="h-3.5 w-3.5" />}
            {job.pinned ? "Unpin" : "Pin to the front"}
          </Button>
          <Button variant="secondary" size="sm" disabled={busy || job.start === null} onClick={() => onAction({ action: "move", direction: "up" })}>
            <ArrowUp aria-hidden className="h-3.5 w-3.5" /> Earlier
          </Button>
          <Button variant="secondary" size="sm" disabled={busy || job.start === null} onClick={() => onAction({ action: "move", direction: "down" })}>
            <ArrowDown aria-hidden className="h-3.5 w-3.5" /> Later
          </Button>
          <label className="flex items-center gap-2 text-sm">
            <span>Printer</span>
            <select
              className="rounded-lg border border-line bg-surface px-2 py-1.5 text-sm"
              value={job.chosenPrinterId ?? ""}
              disabled={busy}
              onChange={(event) => onAction({ action: "assign", printerId: event.target.value === "" ? null : event.target.value })}
            >
              <option value="">Let the queue choose</option>
              {board.printers.map((candidate) => (
                <option key={candidate.id} value={candidate.id}>
                  {candidate.name}
                  {candidate.status === "available" ? "" : ` (${candidate.status})`}
                </option>
              ))}
            </select>
          </label>
        </div>
      ) : (
        <p className="text-sm text-muted">A printing job stays where it is; finish or fail it in the run log.</p>
      )}
    </section>
  );
}

"use client";

import { Pin } from "lucide-react";
import { useEffect, useRef } from "react";
import type { QueueBoard, QueueBoardJob } from "@/db/queries/queue-board";
import { cn } from "@/lib/cn";
import { dateTimeFormat } from "@/lib/intl-cache";

const HOUR_MS = 3_600_000;
/** Pixels per hour: "hours" shows each print with its label, "days" a week or more at a glance. */
export const TIMELINE_SCALES = { hours: 32, days: 8 } as const;
export type TimelineScale = keyof typeof TIMELINE_SCALES;
const ROW_HEIGHT = 56;
const LABEL_CLASS = "sticky left-0 z-20 w-36 shrink-0 border-r border-line bg-surface px-2 sm:w-44 sm:px-3";
const HATCH = "repeating-linear-gradient(135deg, rgb(0 0 0 / 0.07) 0 6px, transparent 6px 12px)";

/** Bar colours by campaign, from the site palette; a campaign keeps its colour (funded order). */
export const campaignTones = [
  "bg-teal text-white",
  "bg-indigo text-white",
  "bg-plum text-white",
  "bg-moss text-white",
  "bg-ember text-white",
  "bg-rose text-white",
  "bg-teal-strong text-white",
] as const;

export function campaignTone(colour: number): string {
  return campaignTones[colour % campaignTones.length] ?? campaignTones[0];
}

type Props = {
  board: QueueBoard;
  scale: TimelineScale;
  selectedJobId: string | null;
  onSelect: (jobId: string) => void;
  renderPrinterActions: (printer: QueueBoard["printers"][number]) => React.ReactNode;
};

/** One lane per printer on a shared time axis: start windows shaded, closures and maintenance hatched, a now-line. */
export function QueueTimeline({ board, scale, selectedJobId, onSelect, renderPrinterActions }: Props) {
  const { range } = board;
  const pxPerHour = TIMELINE_SCALES[scale];
  const x = (instant: number) => ((Math.max(range.start, Math.min(range.end, instant)) - range.start) / HOUR_MS) * pxPerHour;
  const width = x(range.end);
  const campaignById = new Map(board.campaigns.map((campaign) => [campaign.id, campaign]));
  const { days, quarters } = dayMarks(range.start, range.end, board.timeZone);
  const dayLabel = dateTimeFormat("en-US", { timeZone: board.timeZone, weekday: "short", month: "short", day: "numeric" });
  const timeLabel = dateTimeFormat("en-US", { timeZone: board.timeZone, hour: "numeric", minute: "2-digit" });
  const nowLine = <div aria-hidden className="pointer-events-none absolute inset-y-0 z-10 w-0.5 bg-ember" style={{ left: x(board.now) }} data-now-line />;

  // Open on the present: an hour of the past stays in view, the rest is a scroll away.
  const scroller = useRef<HTMLDivElement>(null);
  const nowOffset = x(board.now);
  useEffect(() => {
    if (scroller.current) scroller.current.scrollLeft = Math.max(0, nowOffset - pxPerHour);
    // Only when the scale changes, not on every refresh (the host may have scrolled).
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [scale]);

  return (
    <div ref={scroller} className="overflow-x-auto rounded-card border border-line bg-surface" role="region" aria-label="Queue timeline" tabIndex={0}>
      <div className="w-max min-w-full">
        <div className="flex border-b border-line text-xs text-muted" style={{ height: 28 }}>
          <div className={cn(LABEL_CLASS, "py-1.5 font-semibold")}>Printer</div>
          <div className="relative overflow-hidden" style={{ width }}>
            {nowLine}
            {scale === "hours"
              ? quarters.map((mark) => (
                  <span key={mark} className="absolute top-0 h-full border-l border-line/70 pl-1 pt-1.5 whitespace-nowrap text-[11px]" style={{ left: x(mark) }}>
                    {timeLabel.format(mark)}
                  </span>
                ))
              : null}
            {days.map((day) => (
              <span key={day} className="absolute top-0 h-full border-l-2 border-muted/40 bg-surface pl-1.5 pt-1.5 font-semibold whitespace-nowrap" style={{ left: x(day) }}>
                {dayLabel.format(day)}
              </span>
            ))}
          </div>
        </div>

        {board.printers.map((printer) => {
          const lane = board.jobs.filter((job) => job.printerId === printer.id && job.start !== null && job.end !== null);
          return (
            <div key={printer.id} className="flex border-b border-line last:border-b-0" style={{ height: ROW_HEIGHT }} data-printer-row={printer.id}>
              <div className={cn(LABEL_CLASS, "flex flex-col justify-center gap-1")}>
                <span className="truncate text-sm font-semibold" title={`${printer.name} (${printer.model})`}>
                  {printer.name}
                </span>
                <span className="flex items-center gap-1 whitespace-nowrap sm:gap-2">
                  <span
                    className={cn(
                      "rounded px-1.5 py-0.5 text-[11px] font-semibold",
                      printer.status === "available" ? "bg-moss-soft text-moss" : printer.status === "down" ? "bg-rose-soft text-rose" : "bg-ember-soft text-ember",
                    )}
                  >
                    {printer.status === "available" ? "Available" : printer.status === "down" ? "Down" : "Maintenance"}
                  </span>
                  {renderPrinterActions(printer)}
                </span>
              </div>
              <div className="relative" style={{ width }}>
                {nowLine}
                {board.startWindows.map((window) => (
                  <div key={window.start} aria-hidden className="absolute inset-y-0 bg-teal-soft/60" style={{ left: x(window.start), width: x(window.end) - x(window.start) }} />
                ))}
                {board.closures.map((closure) => (
                  <div
                    key={closure.start}
                    className="absolute inset-y-0 bg-slate-soft"
                    style={{ left: x(closure.start), width: x(closure.end) - x(closure.start), backgroundImage: HATCH }}
                    title={`Lab closed: ${closure.reason}`}
                  />
                ))}
                {printer.maintenance.map((block) => (
                  <div
                    key={block.start}
                    className="absolute inset-y-1 rounded bg-ember-soft ring-1 ring-ember/40"
                    style={{ left: x(block.start), width: x(block.end) - x(block.start), backgroundImage: HATCH }}
                    title={`Maintenance ${timeLabel.format(block.start)}–${timeLabel.format(block.end)}: ${block.reason}`}
                  />
                ))}
                {lane.map((job) => (
                  <JobBar
                    key={job.id}
                    job={job}
                    left={x(job.changeoverStart ?? job.start!)}
                    changeoverWidth={x(job.start!) - x(job.changeoverStart ?? job.start!)}
                    width={x(job.end!) - x(job.changeoverStart ?? job.start!)}
                    tone={campaignTone(campaignById.get(job.campaignId)?.colour ?? 0)}
                    campaignTitle={campaignById.get(job.campaignId)?.title ?? ""}
                    when={`${timeLabel.format(job.start!)}–${timeLabel.format(job.end!)}`}
                    selected={job.id === selectedJobId}
                    onSelect={onSelect}
                  />
                ))}
              </div>
            </div>
          );
        })}
      </div>
    </div>
  );
}

type BarProps = {
  job: QueueBoardJob;
  left: number;
  width: number;
  changeoverWidth: number;
  tone: string;
  campaignTitle: string;
  when: string;
  selected: boolean;
  onSelect: (jobId: string) => void;
};

function JobBar({ job, left, width, changeoverWidth, tone, campaignTitle, when, selected, onSelect }: BarProps) {
  const label = `${campaignTitle}: ${job.pieceName}, ${job.variantName}, repeat ${job.repeat} (${when})${job.state === "running" ? ", printing" : ""}${job.pinned ? ", pinned" : ""}`;
  return (
    <button
      type="button"
      className={cn(
        "absolute top-2 flex h-10 items-center overflow-hidden rounded-md text-left text-[11px] leading-tight shadow-sm",
        tone,
        selected ? "ring-2 ring-ink ring-offset-1" : "hover:brightness-110",
        job.state === "running" && "outline-2 outline-dashed outline-offset-1 outline-ink/60",
      )}
      style={{ left, width: Math.max(width - 1, 3) }}
      title={label}
      aria-label={label}
      aria-pressed={selected}
      data-job-bar={job.id}
      onClick={() => onSelect(job.id)}
    >
      {changeoverWidth > 0 ? <span aria-hidden className="h-full shrink-0 bg-ink/35" style={{ width: changeoverWidth }} /> : null}
      {width > 34 ? (
        <span className="truncate px-1.5">
          {job.pinned ? <Pin aria-hidden className="mr-0.5 inline h-3 w-3" /> : null}
          {job.pieceName} · {job.variantName}
        </span>
      ) : null}
    </button>
  );
}

/** Local midnights, and 06:00 / 12:00 / 18:00, in the lab's zone between two instants (the axis ticks). */
function dayMarks(from: number, to: number, timeZone: string): { days: number[]; quarters: number[] } {
  const hourOf = dateTimeFormat("en-US", { timeZone, hour: "numeric", hourCycle: "h23" });
  const days: number[] = [];
  const quarters: number[] = [];
  // Walk in hours: a day can be 23 or 25 hours long across a clock change.
  for (let at = Math.ceil(from / HOUR_MS) * HOUR_MS; at < to; at += HOUR_MS) {
    const hour = Number(hourOf.formatToParts(at).find((part) => part.type === "hour")?.value);
    if (hour === 0) days.push(at);
    else if (hour % 6 === 0) quarters.push(at);
  }
  return { days, quarters };
}

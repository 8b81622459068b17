import { Calculator } from "lucide";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import type { PlanEstimateSummary } from "@/db/queries/test-plans";
import { cn } from "@/lib/cn";
import { formatMoney } from "@/lib/format";

export type EstimatePhase = "incomplete" | "waiting" | "loading" | "ready" | "invalid" | "error";

const hours = (value: number) => `${value.toFixed(2)} h`;
const plural = (count: number, noun: string) => `${count} ${noun}${count === 1 ? "" : "s"}`;

/** The live estimate beside the plan editor: the goal it implies and the lines behind it. */
export function PlanEstimatePanel({
  summary,
  phase,
  message,
  counts,
}: {
  summary: PlanEstimateSummary | undefined;
  phase: EstimatePhase;
  message?: string;
  counts: { pieces: number; variants: number; repeats: number };
}) {
  const status =
    phase === "ready"
      ? "Up to date"
      : phase === "waiting" || phase === "loading"
        ? "Updating…"
        : phase === "incomplete"
          ? "Finish the plan to price it"
          : phase === "invalid"
            ? "Fix the marked fields"
            : "Could not compute";
  const stale = phase !== "ready";
  return (
    <Card className="flex flex-col gap-4" aria-labelledby="plan-estimate-heading">
      <div className="flex items-center justify-between gap-2">
        <h2 id="plan-estimate-heading" className="flex items-center gap-2 text-lg font-semibold">
          <Icon node={Calculator} className="h-5 w-5 text-teal" /> Live estimate
        </h2>
        <span role="status" aria-live="polite" className={cn("text-xs", phase === "error" || phase === "invalid" ? "text-rose" : "text-muted")}>
          {status}
        </span>
      </div>
      {message ? <p className="text-sm text-rose">{message}</p> : null}
      {summary ? (
        <div className={cn("flex flex-col gap-4 transition-opacity", stale && "opacity-60")}>
          <div>
            <p className="text-sm text-muted">Computed goal</p>
            <p className="font-mono text-3xl font-bold tabular-nums text-teal-strong" data-testid="plan-goal">
              {formatMoney(summary.cost.totalMinor, summary.cost.currency)}
            </p>
            <p className="text-xs text-muted">
              on {summary.printer.name} at an average {summary.printer.averageFlowMm3PerS.toFixed(1)} mm³/s, at today&apos;s rates
            </p>
          </div>
          <dl className="grid grid-cols-2 gap-3 text-sm">
            <div>
              <dt className="text-xs text-muted">Jobs</dt>
              <dd className="font-mono font-semibold" data-testid="plan-jobs">{summary.jobs}</dd>
              <dd className="text-xs text-muted">
                {plural(counts.pieces, "piece")} × {plural(counts.variants, "variant")} × {plural(counts.repeats, "repeat")}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-muted">Printer time</dt>
              <dd className="font-mono font-semibold" data-testid="plan-hours">{hours(summary.hours.total)}</dd>
              <dd className="text-xs text-muted">{hours(summary.hours.extrusion)} extruding</dd>
            </div>
            <div>
              <dt className="text-xs text-muted">Machine / hands-on</dt>
              <dd className="font-mono">
                {hours(summary.hours.machine)} / {hours(summary.hours.labour)}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-muted">Filament</dt>
              <dd className="font-mono">{summary.filamentGrams.toFixed(0)} g</dd>
              <dd className="text-xs text-muted">{summary.filamentMetres.toFixed(1)} m</dd>
            </div>
          </dl>
          <table className="w-full text-sm">
            <caption className="pb-1 text-left text-xs font-semibold uppercase tracking-wide text-muted">Cost breakdown</caption>
            <tbody>
              {summary.cost.lines.map((line) => (
                <tr key={line.kind + line.label} className="border-b border-line align-top">
                  <td className="py-1.5 pr-2">
                    {line.label}
                    <span className="block text-xs text-muted">{line.quantity}</span>
                  </td>
                  <td className="py-1.5 text-right font-mono">{formatMoney(line.amountMinor, summary.cost.currency)}</td>
                </tr>
              ))}
            </tbody>
            <tfoot>
              <tr>
                <th scope="row" className="py-2 text-left font-semibold">Total</th>
                <td className="py-2 text-right font-mono font-semibold">{formatMoney(summary.cost.totalMinor, summary.cost.currency)}</td>
              </tr>
            </tfoot>
          </table>
        </div>
      ) : (
        <p className="text-sm text-muted">Add at least one piece and name a variant under test; the estimate follows every edit.</p>
      )}
    </Card>
  );
}

import type { CalculatorSummary } from "@/lib/estimate/calculator";
import { formatMoney } from "@/lib/format";
import { cn } from "@/lib/cn";
import { formatHours, formatNumber } from "./numbers";
import { Quantity } from "./quantity";

const MM3_PER_CM3 = 1000;

/** The figures and the cost breakdown of one estimate, as a backer reads them. */
export function EstimateResult({ summary, plan }: { summary: CalculatorSummary; plan: { pieces: number; variants: number; repeats: number } }) {
  const { hours, cost } = summary;
  const usedFlow = Math.min(summary.protocolFlowMm3PerS, summary.printer.maxVolumetricFlowMm3PerS);
  return (
    <div className="flex flex-col gap-5">
      <div>
        <p className="text-sm text-muted">Funding goal</p>
        <p className="font-mono text-3xl font-bold tabular-nums text-teal-strong" data-testid="estimate-goal">
          {formatMoney(cost.totalMinor, cost.currency)}
        </p>
        <p className="mt-1 text-xs text-muted">
          on {summary.printer.name}, at{" "}
          <span data-testid="estimate-protocol-flow">
            <Quantity value={formatNumber(summary.protocolFlowMm3PerS, 2)} unit="mm³/s" />
          </span>{" "}
          protocol flow
          {summary.protocolFlowMm3PerS > summary.printer.maxVolumetricFlowMm3PerS
            ? ` (capped at the printer's ${formatNumber(summary.printer.maxVolumetricFlowMm3PerS, 1)} mm³/s)`
            : ""}
        </p>
      </div>

      <dl className="grid grid-cols-2 gap-x-4 gap-y-3 text-sm">
        <Figure label="Jobs">
          <span className="font-mono tabular-nums" data-testid="estimate-jobs">
            {summary.jobs}
          </span>
          <span className="block font-sans text-xs font-normal text-muted">
            {plan.pieces} {plan.pieces === 1 ? "piece" : "pieces"} × {plan.variants} variants × {plan.repeats}{" "}
            {plan.repeats === 1 ? "repeat" : "repeats"}
          </span>
        </Figure>
        <Figure label="Filament">
          <Quantity value={formatNumber(summary.filamentGrams, 1)} unit="g" />
          <span className="block text-xs font-normal text-muted">
            <Quantity value={formatNumber(summary.filamentMetres, 2)} unit="m" />
          </span>
        </Figure>
        <Figure label="Extruded volume">
          <Quantity value={formatNumber(summary.volumeMm3 / MM3_PER_CM3, 1)} unit="cm³" />
        </Figure>
        <Figure label="Average flow">
          <Quantity value={formatNumber(summary.printer.averageFlowMm3PerS, 1)} unit="mm³/s" />
          <span className="block text-xs font-normal text-muted">
            <Quantity value={formatNumber(usedFlow, 1)} /> × <Quantity value={formatNumber(summary.printer.efficiency, 2)} /> efficiency
          </span>
        </Figure>
      </dl>

      <div>
        <h4 className="mb-2 text-xs font-semibold uppercase tracking-wide text-muted">Printer time</h4>
        <dl className="flex flex-col gap-1 text-sm">
          <TimeRow label="Extrusion" hours={hours.extrusion} />
          <TimeRow label="Heat-up" hours={hours.heatUp} note="once per job" />
          <TimeRow label="Changeover" hours={hours.changeover} note={`${summary.variantSwitches} variant ${summary.variantSwitches === 1 ? "switch" : "switches"}`} />
          <TimeRow label="Handling" hours={hours.handling} note="once per job" />
          <TimeRow label="Total" hours={hours.total} strong testId="estimate-hours-total" />
        </dl>
      </div>

      <div className="-mx-5 -mb-5 overflow-x-auto border-t border-line">
        <table className="w-full text-sm" data-testid="estimate-breakdown">
          <caption className="px-5 pb-2 pt-4 text-left text-xs font-semibold uppercase tracking-wide text-muted">
            Cost breakdown
          </caption>
          <thead>
            <tr className="text-left text-xs text-muted">
              <th scope="col" className="py-1 pl-5 pr-2 font-medium">
                Item and quantity
              </th>
              <th scope="col" className="py-1 pl-2 pr-5 text-right font-medium">
                Amount
              </th>
            </tr>
          </thead>
          <tbody>
            {cost.lines.map((line) => (
              <tr key={line.kind + line.label} className="border-t border-line align-top">
                <th scope="row" className="py-2 pl-5 pr-2 text-left font-normal">
                  <span className="block font-medium">{line.label}</span>
                  <span className="block text-xs text-muted">{line.quantity}</span>
                </th>
                <td className="whitespace-nowrap py-2 pl-2 pr-5 text-right font-mono tabular-nums">
                  {formatMoney(line.amountMinor, cost.currency)}
                </td>
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr className="border-t-2 border-ink/70">
              <th scope="row" className="py-2.5 pl-5 pr-2 text-left font-semibold">
                Funding goal
              </th>
              <td className="whitespace-nowrap py-2.5 pl-2 pr-5 text-right font-mono font-bold tabular-nums" data-testid="estimate-total">
                {formatMoney(cost.totalMinor, cost.currency)}
              </td>
            </tr>
          </tfoot>
        </table>
      </div>
    </div>
  );
}

function Figure({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="rounded-lg bg-paper px-3 py-2">
      <dt className="text-xs font-medium uppercase tracking-wide text-muted">{label}</dt>
      <dd className="mt-0.5 text-base font-semibold">{children}</dd>
    </div>
  );
}

function TimeRow({ label, hours, note, strong, testId }: { label: string; hours: number; note?: string; strong?: boolean; testId?: string }) {
  return (
    <div className={cn("flex items-baseline justify-between gap-3", strong && "mt-1 border-t border-line pt-1.5 font-semibold")}>
      <dt>
        {label}
        {note ? <span className="ml-2 text-xs text-muted">{note}</span> : null}
      </dt>
      <dd data-testid={testId}>
        <Quantity {...splitUnit(formatHours(hours))} />
      </dd>
    </div>
  );
}

function splitUnit(text: string): { value: string; unit?: string } {
  const space = text.lastIndexOf(" ");
  return space < 0 ? { value: text } : { value: text.slice(0, space), unit: text.slice(space + 1) };
}

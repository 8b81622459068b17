import { Calculator } from "lucide";
import type { TestPlanEstimate } from "@/lib/estimate/plan";
import { formatMoney } from "@/lib/format";
import { Icon } from "./ui/icon";

type Props = {
  estimate: TestPlanEstimate;
  goalMinor: number;
  goalOverrideReason: string | null;
  printerName: string;
  averageFlowMm3PerS: number;
};

const hours = (minutes: number) => `${(minutes / 60).toFixed(2)} h`;

/** "How this goal was computed": the cost lines of the plan and the formulas behind them, in words. */
export function CampaignGoalBreakdown({ estimate, goalMinor, goalOverrideReason, printerName, averageFlowMm3PerS }: Props) {
  const { cost, time } = estimate;
  const money = (minor: number) => formatMoney(minor, cost.currency);
  const differs = cost.totalMinor !== goalMinor;
  return (
    <details className="group rounded-[var(--radius-card)] border border-line bg-surface p-5" open>
      <summary className="flex cursor-pointer list-none items-center gap-2 text-lg font-semibold">
        <Icon node={Calculator} className="h-5 w-5 text-teal" /> How this goal was computed
      </summary>
      <div className="mt-4 flex flex-col gap-4 text-sm">
        <table className="w-full">
          <caption className="sr-only">Cost breakdown of the test plan</caption>
          <thead className="border-b border-line text-left text-muted">
            <tr>
              <th scope="col" className="py-1.5 pr-3 font-medium">Item</th>
              <th scope="col" className="py-1.5 pr-3 font-medium">How much</th>
              <th scope="col" className="py-1.5 text-right font-medium">Amount</th>
            </tr>
          </thead>
          <tbody>
            {cost.lines.map((line) => (
              <tr key={line.kind + line.label} className="border-b border-line">
                <td className="py-1.5 pr-3">{line.label}</td>
                <td className="py-1.5 pr-3 text-muted">{line.quantity}</td>
                <td className="py-1.5 text-right font-mono">{money(line.amountMinor)}</td>
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr>
              <th scope="row" colSpan={2} className="py-2 text-left font-semibold">
                Plan total at today&apos;s rates
              </th>
              <td className="py-2 text-right font-mono font-semibold">{money(cost.totalMinor)}</td>
            </tr>
          </tfoot>
        </table>
        {differs ? (
          <p className="rounded-md bg-slate-soft p-2">
            The goal is {money(goalMinor)}.{" "}
            {goalOverrideReason ? `The lab set it by hand: ${goalOverrideReason}` : "It was computed when the campaign opened; rates have changed since."}
          </p>
        ) : null}
        <ol className="flex list-decimal flex-col gap-1.5 pl-5 text-muted">
          <li>
            Each print&apos;s filament in grams, divided by the material&apos;s density, gives its volume:{" "}
            {estimate.jobs.length} prints use {estimate.filamentGrams.toFixed(0)} g ({estimate.filamentMetres.toFixed(1)} m of filament,{" "}
            {(estimate.volumeMm3 / 1000).toFixed(0)} cm³).
          </li>
          <li>
            Print time is that volume divided by the average flow of {printerName} — its maximum volumetric flow times an efficiency
            for acceleration, travel and slow features, here {averageFlowMm3PerS.toFixed(1)} mm³/s: {hours(time.extrusionMinutes)} in all.
          </li>
          <li>
            Each print also heats up ({hours(time.heatUpMinutes)} in all) and is handled — bed cleared, part labelled —{" "}
            ({hours(time.handlingMinutes)}); swapping the part under test between variants adds {hours(time.changeoverMinutes)}.
          </li>
          <li>
            Machine time is billed at the printer&apos;s hourly rate, hands-on time (changeovers, handling, measuring and writing up)
            at the lab&apos;s labour rate, filament at its price per kilogram.
          </li>
          <li>
            A contingency covers failed prints and reprints; the payment allowance is grossed up so that after the card fee the whole
            amount reaches the lab; the total is rounded up to a whole currency unit.
          </li>
        </ol>
      </div>
    </details>
  );
}

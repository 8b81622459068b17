import { cn } from "@/lib/cn";
import { formatScore } from "@/lib/reports/criteria";
import type { ScorecardLine } from "@/lib/reports/scorecard";

function tone(score: number): string {
  if (score >= 0.5) return "text-moss";
  if (score <= -0.5) return "text-rose";
  return "text-muted";
}

/** The scorecard as a table: criteria down, variants across, the reference column at 0 by definition. */
export function ScorecardTable({ lines, variants }: { lines: readonly ScorecardLine[]; variants: { id: string; name: string; isReference: boolean }[] }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="scorecard">
        <caption className="sr-only">Scores per criterion against the reference variant</caption>
        <thead className="border-b border-line text-left text-muted">
          <tr>
            <th scope="col" className="px-3 py-2 font-medium">Criterion</th>
            {variants.map((variant) => (
              <th key={variant.id} scope="col" className="px-3 py-2 text-right font-medium">
                {variant.name}
                {variant.isReference ? <span className="block text-xs font-normal">reference</span> : null}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {lines.map((line) => (
            <tr key={line.criterion} className="border-b border-line last:border-0 align-top">
              <th scope="row" className="px-3 py-2 text-left font-medium">{line.label}</th>
              {variants.map((variant) => {
                const cell = line.cells[variant.id];
                return (
                  <td key={variant.id} className="px-3 py-2 text-right">
                    {cell ? (
                      <>
                        <span className={cn("font-mono font-semibold", variant.isReference ? "text-muted" : tone(cell.score))}>{formatScore(cell.score)}</span>
                        {cell.fromPieces > 1 ? <span className="block text-xs text-muted">mean of {cell.fromPieces} pieces</span> : null}
                        {cell.note ? <span className="block text-xs text-muted">{cell.note}</span> : null}
                      </>
                    ) : (
                      <span className="text-muted" title="not scored">—</span>
                    )}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

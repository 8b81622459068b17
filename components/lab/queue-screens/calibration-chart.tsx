"use client";

import { CartesianGrid, Legend, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from "recharts";

export type ChartPoint = { estimatedHours: number; actualHours: number };

/** Logged runs, estimated against actual hours, with y = x (a perfect estimate) and the fitted y = k·x. */
export function CalibrationChart({ points, factor, title }: { points: ChartPoint[]; factor: number | null; title: string }) {
  const top = Math.max(1, ...points.map((point) => Math.max(point.estimatedHours, point.actualHours))) * 1.1;
  const max = Math.ceil(top * 2) / 2;
  return (
    <figure className="flex flex-col gap-2">
      <div className="h-72 w-full" role="img" aria-label={`${title}: ${points.length} runs, estimated against actual hours${factor ? `, fitted slope ${factor.toFixed(3)}` : ""}`}>
        <ResponsiveContainer width="100%" height="100%">
          <ScatterChart margin={{ top: 10, right: 20, bottom: 30, left: 10 }}>
            <CartesianGrid stroke="var(--color-line)" />
            <XAxis type="number" dataKey="estimatedHours" name="Estimated" unit=" h" domain={[0, max]} label={{ value: "Estimated hours", position: "insideBottom", offset: -15 }} />
            <YAxis type="number" dataKey="actualHours" name="Actual" unit=" h" domain={[0, max]} label={{ value: "Actual hours", angle: -90, position: "insideLeft" }} />
            <Tooltip cursor={{ strokeDasharray: "3 3" }} formatter={(value) => (typeof value === "number" ? value.toFixed(2) : String(value))} />
            <Legend verticalAlign="top" height={28} />
            <ReferenceLine segment={[{ x: 0, y: 0 }, { x: max, y: max }]} stroke="var(--color-muted)" strokeDasharray="6 4" ifOverflow="hidden" label={{ value: "y = x", position: "insideTopLeft" }} />
            {factor ? (
              <ReferenceLine segment={[{ x: 0, y: 0 }, { x: max, y: factor * max }]} stroke="var(--color-ember)" strokeWidth={2} ifOverflow="hidden" label={{ value: `fit: y = ${factor.toFixed(3)}·x`, position: "insideBottomRight" }} />
            ) : null}
            <Scatter name="Logged runs" data={points} fill="var(--color-teal)" />
          </ScatterChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">
        Dashed: y = x, a perfect estimate. Solid: the fitted line through the origin; above the dashed line the printer is slower than estimated.
      </figcaption>
    </figure>
  );
}

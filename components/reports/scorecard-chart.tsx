"use client";

import { Bar, BarChart, CartesianGrid, Legend, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatScore, SCORE_MAX, SCORE_MIN } from "@/lib/reports/criteria";

const palette = ["#0e5e5b", "#a63d0c", "#364592", "#6a2c78", "#2f6420", "#9b1c38"];

/** Bars per criterion: each variant's score against the reference, which is the zero line. */
export function ScorecardChart({
  data,
  variants,
  referenceName,
}: {
  data: Record<string, string | number>[];
  variants: { id: string; name: string }[];
  referenceName: string;
}) {
  return (
    <figure className="flex flex-col gap-1">
      <div className="h-80 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} margin={{ top: 8, right: 8, bottom: 8, left: 0 }}>
            <CartesianGrid stroke="#e2ddd1" strokeDasharray="3 3" vertical={false} />
            <XAxis dataKey="criterion" tick={{ fontSize: 11 }} interval={0} />
            <YAxis domain={[SCORE_MIN, SCORE_MAX]} ticks={[-2, -1, 0, 1, 2]} tickFormatter={(value: number) => formatScore(value)} tick={{ fontSize: 11 }} width={32} />
            <ReferenceLine y={0} stroke="#1b2330" />
            <Tooltip formatter={(value) => formatScore(Number(value))} />
            <Legend wrapperStyle={{ fontSize: 12 }} />
            {variants.map((variant, i) => (
              <Bar key={variant.id} dataKey={variant.id} name={variant.name} fill={palette[i % palette.length]} isAnimationActive={false} />
            ))}
          </BarChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">
        Score per criterion against {referenceName} (the zero line): −2 much worse … +2 much better.
      </figcaption>
    </figure>
  );
}

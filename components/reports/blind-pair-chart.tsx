"use client";

import { Bar, BarChart, CartesianGrid, ErrorBar, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";

export type BlindPairChartRow = { name: string; chance: number; low: number; high: number; isReference: boolean };

/** Each variant's chance of being picked over an average variant, with its 95 % bootstrap interval as whiskers. */
export function BlindPairChart({ rows }: { rows: readonly BlindPairChartRow[] }) {
  const data = rows.map((row) => ({
    name: row.isReference ? `${row.name} (reference)` : row.name,
    chance: Number(row.chance.toFixed(1)),
    interval: [Number((row.chance - row.low).toFixed(1)), Number((row.high - row.chance).toFixed(1))],
    low: row.low,
    high: row.high,
  }));
  return (
    <div className="w-full" style={{ height: Math.max(160, 56 * data.length + 48) }}>
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} layout="vertical" margin={{ top: 8, right: 24, bottom: 20, left: 8 }}>
          <CartesianGrid stroke="#e2ddd1" strokeDasharray="3 3" horizontal={false} />
          <XAxis type="number" domain={[0, 100]} ticks={[0, 25, 50, 75, 100]} unit=" %" tick={{ fontSize: 11 }} label={{ value: "chance of being picked over an average variant", position: "insideBottom", offset: -12, fontSize: 11 }} />
          <YAxis type="category" dataKey="name" width={180} tick={{ fontSize: 12 }} />
          <ReferenceLine x={50} stroke="#8a8373" strokeDasharray="4 3" />
          <Tooltip
            formatter={(value, _name, item) => {
              const row = item.payload as { low: number; high: number };
              return [`${value} % (95 % interval ${row.low.toFixed(0)}–${row.high.toFixed(0)} %)`, "picked over average"];
            }}
          />
          <Bar dataKey="chance" fill="#0e5e5b" barSize={22} isAnimationActive={false}>
            <ErrorBar dataKey="interval" direction="x" width={8} stroke="#1f2a2a" strokeWidth={1.5} />
          </Bar>
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

"use client";

import { Area, AreaChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { ModelLayerPoint } from "@/lib/validation/model-analysis";

/** Cross-section area per layer up the part: where it is thin, the minimum layer time takes over. */
export function LayerChart({ series }: { series: readonly ModelLayerPoint[] }) {
  const data = series.map((point) => ({ z: Number(point.zMm.toFixed(2)), area: Number(point.areaMm2.toFixed(1)), seconds: Number(point.seconds.toFixed(1)) }));
  return (
    <figure className="flex flex-col gap-1">
      <div className="h-48 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <AreaChart data={data} margin={{ top: 8, right: 8, bottom: 16, left: 0 }}>
            <CartesianGrid stroke="#e2ddd1" strokeDasharray="3 3" />
            <XAxis dataKey="z" type="number" domain={["dataMin", "dataMax"]} tick={{ fontSize: 11 }} label={{ value: "height (mm)", position: "insideBottom", offset: -8, fontSize: 11 }} />
            <YAxis dataKey="area" tick={{ fontSize: 11 }} width={48} />
            <Tooltip formatter={(value, name) => [name === "area" ? `${value} mm²` : `${value} s`, name === "area" ? "cross-section" : "layer time"]} labelFormatter={(z) => `z = ${z} mm`} />
            <Area type="monotone" dataKey="area" stroke="#0e5e5b" fill="#dcedea" isAnimationActive={false} />
          </AreaChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">Cross-section area per layer (mm²) against height.</figcaption>
    </figure>
  );
}

import type { ModelFiguresInput } from "@/db/queries/proposal-reads";
import { formatDuration, MeshHealth } from "@/components/estimate/mesh-health";
import { formatNumber } from "@/components/estimate/numbers";

/** A model's measured figures: volume, size, whether it is closed (or what is wrong), filament and print time. */
export function ModelFigures({ analysis, compact = false }: { analysis: ModelFiguresInput; compact?: boolean }) {
  const [x = 0, y = 0, z = 0] = analysis.boundingBox.sizeMm;
  const facts: [string, string][] = [
    ["Volume", `${formatNumber(analysis.volumeMm3 / 1000, 2)} cm³`],
    ["Size", `${formatNumber(x, 1)} × ${formatNumber(y, 1)} × ${formatNumber(z, 1)} mm`],
    ["Filament", `${formatNumber(analysis.filament.grams, 1)} g`],
    ["Print time", formatDuration(analysis.printTime.seconds)],
  ];
  return (
    <div className="flex flex-col gap-2 text-sm">
      <dl className={compact ? "grid grid-cols-2 gap-x-4 gap-y-1" : "grid gap-x-6 gap-y-1 sm:grid-cols-2"}>
        {facts.map(([label, value]) => (
          <div key={label} className="flex justify-between gap-3 border-b border-line py-1">
            <dt className="text-muted">{label}</dt>
            <dd className="text-right font-mono">{value}</dd>
          </div>
        ))}
      </dl>
      {analysis.settings?.material && analysis.settings.layerHeightMm ? (
        <p className="text-xs text-muted">
          Filament and time estimated for {analysis.settings.material} at {analysis.settings.layerHeightMm} mm layers.
        </p>
      ) : null}
      <MeshHealth analysis={analysis} />
    </div>
  );
}

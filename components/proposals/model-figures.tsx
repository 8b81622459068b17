import type { ModelFiguresInput } from "@/db/queries/proposal-reads";
import { formatNumber } from "@/components/estimate/numbers";

const problemLabels: Record<string, string> = {
  open_edges: "open edges (holes)",
  non_manifold_edges: "edges shared by more than two faces",
  flipped_faces: "edges whose faces disagree on which way is out",
  inverted_normals: "the whole mesh is inside out",
  degenerate_triangles: "zero-area triangles",
};

export function formatDuration(seconds: number): string {
  const hours = Math.floor(seconds / 3600);
  const minutes = Math.round((seconds % 3600) / 60);
  return hours > 0 ? `${hours} h ${minutes} min` : `${minutes} min`;
}

/** A model's measured figures: volume, size, whether it is closed (or what is wrong), filament and print time. */
export function ModelFigures({ analysis, compact = false }: { analysis: ModelFiguresInput; compact?: boolean }) {
  const [x = 0, y = 0, z = 0] = analysis.boundingBox.sizeMm;
  const sound = analysis.closed && analysis.consistentlyOriented && !analysis.invertedNormals;
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
      {sound ? (
        <p className="text-moss">Closed and consistently oriented: its volume can be trusted.</p>
      ) : (
        <div className="rounded-md bg-ember-soft p-2">
          <p className="font-semibold text-ember">This mesh has problems; its volume and filament may be off.</p>
          <ul className="mt-1 list-disc pl-5">
            {analysis.problems.map((problem) => (
              <li key={problem.code}>
                {formatNumber(problem.count, 0)} {problem.of}: {problemLabels[problem.code] ?? problem.code}
              </li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}

import type { ModelMeasurement } from "@/lib/validation/model-analysis";
import { formatNumber } from "./numbers";

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

type Health = Pick<ModelMeasurement, "closed" | "consistentlyOriented" | "invertedNormals" | "problems">;

/** Whether a measured mesh can be trusted, or what is wrong with it. */
export function MeshHealth({ analysis }: { analysis: Health }) {
  if (analysis.closed && analysis.consistentlyOriented && !analysis.invertedNormals) {
    return <p className="text-sm text-moss">The mesh is closed and consistently oriented: its volume can be trusted.</p>;
  }
  return (
    <div className="rounded-md bg-ember-soft p-3 text-sm">
      <p className="font-semibold text-ember">This mesh has problems; its volume and filament may be off.</p>
      <ul className="mt-1 list-disc pl-5">
        {analysis.problems.map((problem) => (
          <li key={problem.code}>
            {formatNumber(problem.count, 0)} {problem.of}: {problemLabels[problem.code] ?? problem.code}
          </li>
        ))}
      </ul>
    </div>
  );
}

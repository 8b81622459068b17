export interface EdgeReport {
  /** Distinct undirected edges between distinct vertices. */
  readonly edgeCount: number;
  /** Edges used by exactly one face: holes in the surface. */
  readonly openEdges: number;
  /** Edges used by more than two faces. */
  readonly nonManifoldEdges: number;
  /** Edges shared by two faces that traverse them in the same direction: inconsistent winding. */
  readonly flippedEdges: number;
  /** Triangles with two corners on the same vertex; they are left out of the edge counts. */
  readonly degenerateTriangles: number;
}

const INSERTION_SORT_LIMIT = 16;

/**
 * Counts edge uses without a hash map: every directed edge a→b is filed under its lower
 * vertex (compressed rows), tagged with the higher vertex and its direction. Sorting each
 * vertex's few entries puts the uses of one undirected edge side by side.
 */
export function analyzeEdges(cornerVertexIds: Int32Array, vertexCount: number): EdgeReport {
  const triangleCount = Math.floor(cornerVertexIds.length / 3);
  const rowStarts = new Int32Array(vertexCount + 1);
  let degenerateTriangles = 0;
  for (let t = 0; t < triangleCount; t++) {
    const a = cornerVertexIds[3 * t]!;
    const b = cornerVertexIds[3 * t + 1]!;
    const c = cornerVertexIds[3 * t + 2]!;
    if (a === b || b === c || c === a) {
      degenerateTriangles++;
      continue;
    }
    rowStarts[Math.min(a, b) + 1]!++;
    rowStarts[Math.min(b, c) + 1]!++;
    rowStarts[Math.min(c, a) + 1]!++;
  }
  for (let v = 0; v < vertexCount; v++) rowStarts[v + 1]! += rowStarts[v]!;

  const entries = new Int32Array(rowStarts[vertexCount]!);
  const fill = rowStarts.slice(0, vertexCount);
  for (let t = 0; t < triangleCount; t++) {
    const a = cornerVertexIds[3 * t]!;
    const b = cornerVertexIds[3 * t + 1]!;
    const c = cornerVertexIds[3 * t + 2]!;
    if (a === b || b === c || c === a) continue;
    fileEdge(entries, fill, a, b);
    fileEdge(entries, fill, b, c);
    fileEdge(entries, fill, c, a);
  }
  return { ...countEdgeUses(entries, rowStarts, vertexCount), degenerateTriangles };
}

// Entry = higher vertex × 2 + (1 when the edge runs from the lower vertex to the higher one).
function fileEdge(entries: Int32Array, fill: Int32Array, from: number, to: number): void {
  if (from < to) entries[fill[from]!++] = to * 2 + 1;
  else entries[fill[to]!++] = from * 2;
}

function countEdgeUses(
  entries: Int32Array,
  rowStarts: Int32Array,
  vertexCount: number,
): Omit<EdgeReport, "degenerateTriangles"> {
  let edgeCount = 0;
  let openEdges = 0;
  let nonManifoldEdges = 0;
  let flippedEdges = 0;
  for (let v = 0; v < vertexCount; v++) {
    const start = rowStarts[v]!;
    const end = rowStarts[v + 1]!;
    sortRange(entries, start, end);
    let i = start;
    while (i < end) {
      const other = entries[i]! >> 1;
      let uses = 0;
      let forward = 0;
      while (i < end && entries[i]! >> 1 === other) {
        uses++;
        forward += entries[i]! & 1;
        i++;
      }
      edgeCount++;
      if (uses === 1) openEdges++;
      else if (uses > 2) nonManifoldEdges++;
      else if (forward !== 1) flippedEdges++;
    }
  }
  return { edgeCount, openEdges, nonManifoldEdges, flippedEdges };
}

function sortRange(values: Int32Array, start: number, end: number): void {
  if (end - start > INSERTION_SORT_LIMIT) {
    values.subarray(start, end).sort();
    return;
  }
  for (let i = start + 1; i < end; i++) {
    const value = values[i]!;
    let j = i - 1;
    while (j >= start && values[j]! > value) {
      values[j + 1] = values[j]!;
      j--;
    }
    values[j + 1] = value;
  }
}

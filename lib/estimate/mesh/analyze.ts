import { requirePositive } from "../../input-checks";
import { analyzeEdges } from "./edges";
import { boundingBox, boxCentre, scaleBoundingBox, volumeAndArea, type BoundingBox } from "./geometry";
import { weldVertices } from "./weld";

export type MeshProblem = "open_edges" | "non_manifold_edges" | "flipped_faces" | "inverted_normals" | "degenerate_triangles";

export interface MeshAnalysis {
  readonly triangleCount: number;
  readonly vertexCount: number;
  readonly edgeCount: number;
  readonly bounds: BoundingBox;
  /** Enclosed volume, always ≥ 0 (the magnitude of the signed volume). */
  readonly volumeMm3: number;
  /** Negative when the faces wind inwards (normals point into the part). */
  readonly signedVolumeMm3: number;
  readonly surfaceAreaMm2: number;
  /** Every edge shared by exactly two faces: the surface encloses a volume. */
  readonly closed: boolean;
  /** No edge is traversed twice in the same direction. */
  readonly consistentlyOriented: boolean;
  /** Closed and consistent, but wound inside out. */
  readonly invertedNormals: boolean;
  readonly openEdges: number;
  readonly nonManifoldEdges: number;
  readonly flippedEdges: number;
  readonly degenerateTriangles: number;
  readonly problems: readonly MeshProblem[];
}

export interface MeshAnalysisOptions {
  /** Uniform scale about the origin applied before measuring (1.5 = 150 %). */
  readonly scale?: number;
}

export function analyzeMesh(positions: Float32Array, options: MeshAnalysisOptions = {}): MeshAnalysis {
  const scale = requirePositive("scale", options.scale ?? 1);
  const triangleCount = Math.floor(positions.length / 9);
  const unscaledBounds = boundingBox(positions);
  const { signedVolumeMm3, surfaceAreaMm2 } = volumeAndArea(positions, boxCentre(unscaledBounds));
  const { vertexCount, cornerVertexIds } = weldVertices(positions);
  const edges = analyzeEdges(cornerVertexIds, vertexCount);

  const closed = triangleCount > 0 && edges.openEdges === 0 && edges.nonManifoldEdges === 0;
  const consistentlyOriented = edges.flippedEdges === 0;
  const invertedNormals = closed && consistentlyOriented && signedVolumeMm3 < 0;
  const scaledVolume = signedVolumeMm3 * scale ** 3;
  return {
    triangleCount,
    vertexCount,
    edgeCount: edges.edgeCount,
    bounds: scaleBoundingBox(unscaledBounds, scale),
    volumeMm3: Math.abs(scaledVolume),
    signedVolumeMm3: scaledVolume,
    surfaceAreaMm2: surfaceAreaMm2 * scale ** 2,
    closed,
    consistentlyOriented,
    invertedNormals,
    openEdges: edges.openEdges,
    nonManifoldEdges: edges.nonManifoldEdges,
    flippedEdges: edges.flippedEdges,
    degenerateTriangles: edges.degenerateTriangles,
    problems: listProblems(edges, invertedNormals),
  };
}

function listProblems(edges: ReturnType<typeof analyzeEdges>, invertedNormals: boolean): MeshProblem[] {
  const problems: MeshProblem[] = [];
  if (edges.openEdges > 0) problems.push("open_edges");
  if (edges.nonManifoldEdges > 0) problems.push("non_manifold_edges");
  if (edges.flippedEdges > 0) problems.push("flipped_faces");
  if (invertedNormals) problems.push("inverted_normals");
  if (edges.degenerateTriangles > 0) problems.push("degenerate_triangles");
  return problems;
}

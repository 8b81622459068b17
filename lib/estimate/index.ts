export { DomainInputError } from "../input-checks";
export * from "./materials";
export * from "./filament";
export * from "./flow";
export * from "./print-time";

export * from "./cost";
export * from "./plan";
export * from "./duct";
export { MeshError, DEFAULT_MAX_TRIANGLES, type MeshErrorCode, type MeshParseOptions } from "./mesh/mesh-error";
export { parseStl, parseAsciiStl, detectStlFormat, type ParsedMesh, type ParsedStl, type StlFormat } from "./mesh/stl";
export { parse3mf } from "./mesh/three-mf";
export { parseMesh, type MeshFileFormat } from "./mesh/parse-mesh";
export { analyzeMesh, type MeshAnalysis, type MeshAnalysisOptions, type MeshProblem } from "./mesh/analyze";
export type { BoundingBox, Vector3 } from "./mesh/geometry";
export { sliceMesh, layerCountForHeight, type MeshSlices, type SliceOptions } from "./mesh/slice";
export {
  extrusionByLayer,
  DEFAULT_EXTRUSION_SETTINGS,
  type ExtrusionSettings,
  type LayerCrossSections,
  type LayerExtrusion,
} from "./mesh/extrusion";
export { estimateMeshPrint, type MeshPrintEstimate, type MeshPrintInput } from "./mesh/mesh-estimate";

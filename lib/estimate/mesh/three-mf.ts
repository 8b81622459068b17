import { XMLParser } from "fast-xml-parser";
import { unzipSync, type Unzipped } from "fflate";
import { parseDecimal } from "./byte-text";
import { IDENTITY, isMirroring, parseAffine, scaled, thenApply, type Affine } from "./affine";
import { DEFAULT_MAX_TRIANGLES, MeshError, requireWithinLimit, type MeshParseOptions } from "./mesh-error";
import type { ParsedMesh } from "./stl";
import { XmlTagReader } from "./xml-tags";

const DEFAULT_MODEL_PATH = "3D/3dmodel.model";
const MODEL_RELATIONSHIP_TYPE = "http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel";
const MAX_COMPONENT_DEPTH = 32;
const MAX_VERTEX_INDEX = 2 ** 31 - 1;
// A model file is XML text: at least ~60 bytes per triangle once its vertices are counted.
const MAX_MODEL_BYTES_PER_TRIANGLE = 200;

// source: 3MF core specification, "unit" attribute of <model>: millimeter is the default.
const MILLIMETRES_PER_UNIT: Readonly<Record<string, number>> = {
  micron: 0.001,
  millimeter: 1,
  centimeter: 10,
  inch: 25.4,
  foot: 304.8,
  meter: 1000,
};

interface ComponentRef {
  readonly objectId: string;
  readonly path: string | undefined;
  readonly transform: Affine;
}

interface ObjectDef {
  vertexStart: number;
  vertexEnd: number;
  triangleStart: number;
  triangleEnd: number;
  readonly components: ComponentRef[];
}

interface ModelFile {
  readonly millimetresPerUnit: number;
  readonly vertices: Float64Array;
  readonly triangles: Int32Array;
  readonly objects: ReadonlyMap<string, ObjectDef>;
  readonly build: readonly ComponentRef[];
}

/** Meshes of all build items of a 3MF package, with item and component transforms applied, in mm. */
export function parse3mf(bytes: Uint8Array, options?: MeshParseOptions): ParsedMesh {
  if (bytes.length === 0) throw new MeshError("empty", "the file is empty");
  const files = unzipModelParts(bytes, options);
  const rootPath = findRootModelPath(files);
  const models = new ModelLibrary(files);
  const root = models.get(rootPath);
  if (!root) throw new MeshError("not_a_mesh", `the package has no 3D model part (${rootPath})`);
  const items = root.build.length > 0 ? root.build : allObjectsAsItems(root);
  const unitTransform = scaled(IDENTITY, root.millimetresPerUnit);

  const triangleCount = items.reduce((sum, item) => sum + models.countTriangles(item, rootPath, 0), 0);
  if (triangleCount === 0) throw new MeshError("empty", "the 3MF model has no triangles");
  requireWithinLimit(triangleCount, options);
  const positions = new Float32Array(triangleCount * 9);
  let written = 0;
  for (const item of items) {
    written = models.emit(item, rootPath, unitTransform, positions, written, 0);
  }
  return { positions, triangleCount };
}

function unzipModelParts(bytes: Uint8Array, options: MeshParseOptions | undefined): Unzipped {
  const maxModelBytes = (options?.maxTriangles ?? DEFAULT_MAX_TRIANGLES) * MAX_MODEL_BYTES_PER_TRIANGLE;
  try {
    return unzipSync(bytes, {
      filter: (file) => {
        const name = file.name.toLowerCase();
        const wanted = name.endsWith(".model") || name.endsWith(".rels");
        if (wanted && file.originalSize > maxModelBytes) {
          throw new MeshError("too_large", `${file.name} expands to ${file.originalSize} bytes`);
        }
        return wanted;
      },
    });
  } catch (error) {
    if (error instanceof MeshError) throw error;
    throw new MeshError("not_a_mesh", `not a 3MF package: ${(error as Error).message}`);
  }
}

function findRootModelPath(files: Unzipped): string {
  const rels = findPart(files, "_rels/.rels");
  if (!rels) return DEFAULT_MODEL_PATH;
  const parser = new XMLParser({
    ignoreAttributes: false,
    attributeNamePrefix: "",
    removeNSPrefix: true,
    isArray: (name) => name === "Relationship",
  });
  const document = parser.parse(new TextDecoder().decode(rels)) as {
    Relationships?: { Relationship?: { Type?: string; Target?: string }[] };
  };
  const model = document.Relationships?.Relationship?.find((r) => r.Type === MODEL_RELATIONSHIP_TYPE);
  return model?.Target ? normalizePartName(model.Target) : DEFAULT_MODEL_PATH;
}

function normalizePartName(name: string): string {
  return name.replace(/^\/+/, "");
}

// Part names in an OPC package are compared case-insensitively.
function findPart(files: Unzipped, path: string): Uint8Array | undefined {
  const wanted = normalizePartName(path).toLowerCase();
  for (const [name, data] of Object.entries(files)) {
    if (normalizePartName(name).toLowerCase() === wanted) return data;
  }
  return undefined;
}

function allObjectsAsItems(model: ModelFile): ComponentRef[] {
  return [...model.objects.keys()].map((objectId) => ({ objectId, path: undefined, transform: IDENTITY }));
}

class ModelLibrary {
  private readonly cache = new Map<string, ModelFile | undefined>();

  constructor(private readonly files: Unzipped) {}

  get(path: string): ModelFile | undefined {
    const key = normalizePartName(path).toLowerCase();
    if (!this.cache.has(key)) {
      const data = findPart(this.files, path);
      this.cache.set(key, data ? readModelFile(data) : undefined);
    }
    return this.cache.get(key);
  }

  countTriangles(ref: ComponentRef, currentPath: string, depth: number): number {
    const { object, path } = this.resolve(ref, currentPath, depth);
    let count = object.triangleEnd - object.triangleStart;
    for (const component of object.components) count += this.countTriangles(component, path, depth + 1);
    return count;
  }

  emit(ref: ComponentRef, currentPath: string, parent: Affine, out: Float32Array, at: number, depth: number): number {
    const { object, path, model } = this.resolve(ref, currentPath, depth);
    const transform = thenApply(ref.transform, parent);
    let written = emitMesh(model, object, transform, out, at);
    for (const component of object.components) {
      written = this.emit(component, path, transform, out, written, depth + 1);
    }
    return written;
  }

  private resolve(ref: ComponentRef, currentPath: string, depth: number) {
    if (depth > MAX_COMPONENT_DEPTH) throw new MeshError("not_a_mesh", "3MF components nest too deep (a cycle?)");
    const path = ref.path ?? currentPath;
    const model = this.get(path);
    const object = model?.objects.get(ref.objectId);
    if (!model || !object) throw new MeshError("not_a_mesh", `3MF refers to missing object ${ref.objectId} in ${path}`);
    return { model, object, path };
  }
}

function emitMesh(model: ModelFile, object: ObjectDef, transform: Affine, out: Float32Array, at: number): number {
  const [m00, m01, m02, m10, m11, m12, m20, m21, m22, m30, m31, m32] = transform;
  // Mirroring turns the winding inside out; swapping two corners restores outward normals.
  const order = isMirroring(transform) ? [0, 2, 1] : [0, 1, 2];
  const vertexCount = object.vertexEnd - object.vertexStart;
  const { vertices, triangles } = model;
  let o = at;
  for (let t = object.triangleStart; t < object.triangleEnd; t++) {
    for (const corner of order) {
      const index = triangles[3 * t + corner]!;
      if (index < 0 || index >= vertexCount) {
        throw new MeshError("not_a_mesh", `triangle ${t - object.triangleStart} uses missing vertex ${index}`);
      }
      const v = 3 * (object.vertexStart + index);
      const x = vertices[v]!;
      const y = vertices[v + 1]!;
      const z = vertices[v + 2]!;
      out[o++] = x * m00 + y * m10 + z * m20 + m30;
      out[o++] = x * m01 + y * m11 + z * m21 + m31;
      out[o++] = x * m02 + y * m12 + z * m22 + m32;
    }
  }
  return o;
}

function readModelFile(data: Uint8Array): ModelFile {
  const reader = new XmlTagReader(data);
  const vertices = new GrowableFloat64();
  const triangles = new GrowableInt32();
  const objects = new Map<string, ObjectDef>();
  const build: ComponentRef[] = [];
  let millimetresPerUnit = 1;
  let current: ObjectDef | undefined;
  let sawModel = false;

  while (reader.next()) {
    if (reader.kind === "end") {
      if (reader.nameIs("object") && current) {
        current.vertexEnd = vertices.length / 3;
        current.triangleEnd = triangles.length / 3;
        current = undefined;
      }
      continue;
    }
    if (reader.nameIs("vertex")) {
      if (current) readVertex(reader, vertices);
    } else if (reader.nameIs("triangle")) {
      if (current) readTriangle(reader, triangles);
    } else if (reader.nameIs("object")) {
      current = startObject(reader, objects, vertices.length / 3, triangles.length / 3);
      if (reader.selfClosing) current = undefined;
    } else if (reader.nameIs("component")) {
      if (current) current.components.push(readReference(reader));
    } else if (reader.nameIs("item")) {
      build.push(readReference(reader));
    } else if (reader.nameIs("model")) {
      sawModel = true;
      millimetresPerUnit = readUnit(reader);
    }
  }
  if (!sawModel) throw new MeshError("not_a_mesh", "the 3D model part has no <model> element");
  return { millimetresPerUnit, vertices: vertices.values(), triangles: triangles.values(), objects, build };
}

function startObject(reader: XmlTagReader, objects: Map<string, ObjectDef>, vertexStart: number, triangleStart: number): ObjectDef {
  const idAttribute = reader.findAttribute("id");
  if (idAttribute < 0) throw new MeshError("not_a_mesh", "3MF object without an id");
  const object: ObjectDef = {
    vertexStart,
    vertexEnd: vertexStart,
    triangleStart,
    triangleEnd: triangleStart,
    components: [],
  };
  objects.set(reader.valueText(idAttribute), object);
  return object;
}

function readVertex(reader: XmlTagReader, vertices: GrowableFloat64): void {
  vertices.push(numberAttribute(reader, "x"));
  vertices.push(numberAttribute(reader, "y"));
  vertices.push(numberAttribute(reader, "z"));
}

function readTriangle(reader: XmlTagReader, triangles: GrowableInt32): void {
  for (const name of ["v1", "v2", "v3"]) {
    const value = numberAttribute(reader, name);
    if (!Number.isInteger(value) || value < 0 || value > MAX_VERTEX_INDEX) {
      throw new MeshError("not_a_mesh", `triangle index ${name} is not a vertex number`);
    }
    triangles.push(value);
  }
}

function numberAttribute(reader: XmlTagReader, name: string): number {
  const attribute = reader.findAttribute(name);
  const value = attribute < 0 ? Number.NaN : parseDecimal(reader.bytes, reader.valueStart(attribute), reader.valueEnd(attribute));
  if (!Number.isFinite(value)) throw new MeshError("not_a_mesh", `3MF ${name} attribute is missing or not a number`);
  return value;
}

function readReference(reader: XmlTagReader): ComponentRef {
  const idAttribute = reader.findAttribute("objectid");
  if (idAttribute < 0) throw new MeshError("not_a_mesh", "3MF reference without an objectid");
  const pathAttribute = reader.findAttribute("path");
  const transformAttribute = reader.findAttribute("transform");
  let transform = IDENTITY;
  if (transformAttribute >= 0) {
    const parsed = parseAffine(reader.valueText(transformAttribute));
    if (!parsed) throw new MeshError("not_a_mesh", "3MF transform is not 12 numbers");
    transform = parsed;
  }
  return {
    objectId: reader.valueText(idAttribute),
    path: pathAttribute >= 0 ? reader.valueText(pathAttribute) : undefined,
    transform,
  };
}

function readUnit(reader: XmlTagReader): number {
  const attribute = reader.findAttribute("unit");
  if (attribute < 0) return 1;
  const unit = reader.valueText(attribute);
  const millimetres = MILLIMETRES_PER_UNIT[unit];
  if (millimetres === undefined) throw new MeshError("not_a_mesh", `unknown 3MF unit "${unit}"`);
  return millimetres;
}

class GrowableFloat64 {
  length = 0;
  private data = new Float64Array(1024);

  push(value: number): void {
    if (this.length === this.data.length) {
      const grown = new Float64Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    this.data[this.length++] = value;
  }

  values(): Float64Array {
    return this.data.subarray(0, this.length);
  }
}

class GrowableInt32 {
  length = 0;
  private data = new Int32Array(1024);

  push(value: number): void {
    if (this.length === this.data.length) {
      const grown = new Int32Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    this.data[this.length++] = value;
  }

  values(): Int32Array {
    return this.data.subarray(0, this.length);
  }
}

// Writers for the mesh file formats, used to feed the parsers with generated meshes.
import { zipSync, strToU8 } from "fflate";

export function binaryStl(positions: Float32Array, header = "generated test mesh"): Uint8Array {
  const triangleCount = positions.length / 9;
  const bytes = new Uint8Array(84 + 50 * triangleCount);
  const view = new DataView(bytes.buffer);
  bytes.set(strToU8(header).subarray(0, 80));
  view.setUint32(80, triangleCount, true);
  for (let t = 0; t < triangleCount; t++) {
    const offset = 84 + 50 * t;
    const normal = unitNormal(positions, t);
    for (let k = 0; k < 3; k++) view.setFloat32(offset + 4 * k, normal[k]!, true);
    for (let k = 0; k < 9; k++) view.setFloat32(offset + 12 + 4 * k, positions[9 * t + k]!, true);
  }
  return bytes;
}

export interface AsciiStlStyle {
  readonly name?: string;
  readonly lineEnd?: "\n" | "\r\n";
  readonly indent?: string;
  readonly format?: (value: number) => string;
}

export function asciiStl(positions: Float32Array, style: AsciiStlStyle = {}): string {
  const name = style.name ?? "generated";
  const nl = style.lineEnd ?? "\n";
  const indent = style.indent ?? "  ";
  const format = style.format ?? ((value: number) => value.toExponential(6));
  const lines = [`solid ${name}`];
  for (let t = 0; t < positions.length / 9; t++) {
    const normal = unitNormal(positions, t);
    lines.push(`${indent}facet normal ${normal.map(format).join(" ")}`);
    lines.push(`${indent}${indent}outer loop`);
    for (let corner = 0; corner < 3; corner++) {
      const p = positions.subarray(9 * t + 3 * corner, 9 * t + 3 * corner + 3);
      lines.push(`${indent}${indent}${indent}vertex ${Array.from(p, format).join(" ")}`);
    }
    lines.push(`${indent}${indent}endloop`);
    lines.push(`${indent}endfacet`);
  }
  lines.push(`endsolid ${name}`);
  return lines.join(nl) + nl;
}

function unitNormal(positions: Float32Array, t: number): [number, number, number] {
  const p = (k: number) => positions[9 * t + k]!;
  const ux = p(3) - p(0);
  const uy = p(4) - p(1);
  const uz = p(5) - p(2);
  const vx = p(6) - p(0);
  const vy = p(7) - p(1);
  const vz = p(8) - p(2);
  const n: [number, number, number] = [uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx];
  const length = Math.hypot(...n);
  return length > 0 ? [n[0] / length, n[1] / length, n[2] / length] : [0, 0, 0];
}

export interface ModelObject {
  readonly id: number;
  /** Triangle soup; corners with equal coordinates become one shared vertex. */
  readonly positions?: Float32Array;
  readonly components?: readonly { readonly objectId: number; readonly transform?: string }[];
}

export interface ModelItem {
  readonly objectId: number;
  readonly transform?: string;
}

export interface ThreeMfOptions {
  readonly unit?: string;
  readonly modelPath?: string;
  /** Omit the _rels/.rels part. */
  readonly withoutRelationships?: boolean;
  /** Prefix core elements with a namespace prefix instead of using the default namespace. */
  readonly prefixed?: boolean;
}

const CORE_NAMESPACE = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";

export function modelXml(objects: readonly ModelObject[], items: readonly ModelItem[], options: ThreeMfOptions = {}): string {
  const p = options.prefixed ? "m:" : "";
  const ns = options.prefixed ? `xmlns:m="${CORE_NAMESPACE}"` : `xmlns="${CORE_NAMESPACE}"`;
  const unit = options.unit ? ` unit="${options.unit}"` : "";
  const parts = [`<?xml version="1.0" encoding="UTF-8"?>`, `<${p}model${unit} xml:lang="en-US" ${ns}>`];
  parts.push(`<${p}metadata name="Title">generated &amp; tested</${p}metadata>`, `<!-- test model -->`);
  parts.push(`<${p}resources>`);
  for (const object of objects) {
    parts.push(`<${p}object id="${object.id}" type="model">`);
    if (object.positions) parts.push(meshXml(object.positions, p));
    if (object.components) {
      parts.push(`<${p}components>`);
      for (const component of object.components) {
        const transform = component.transform ? ` transform="${component.transform}"` : "";
        parts.push(`<${p}component objectid="${component.objectId}"${transform}/>`);
      }
      parts.push(`</${p}components>`);
    }
    parts.push(`</${p}object>`);
  }
  parts.push(`</${p}resources>`, `<${p}build>`);
  for (const item of items) {
    const transform = item.transform ? ` transform="${item.transform}"` : "";
    parts.push(`<${p}item objectid="${item.objectId}"${transform} />`);
  }
  parts.push(`</${p}build>`, `</${p}model>`);
  return parts.join("\n");
}

function meshXml(positions: Float32Array, p: string): string {
  const ids = new Map<string, number>();
  const vertices: string[] = [];
  const triangles: string[] = [];
  for (let t = 0; t < positions.length / 9; t++) {
    const corners: number[] = [];
    for (let c = 0; c < 3; c++) {
      const x = positions[9 * t + 3 * c]!;
      const y = positions[9 * t + 3 * c + 1]!;
      const z = positions[9 * t + 3 * c + 2]!;
      const key = `${x} ${y} ${z}`;
      let id = ids.get(key);
      if (id === undefined) {
        id = ids.size;
        ids.set(key, id);
        vertices.push(`<${p}vertex x="${x}" y="${y}" z="${z}"/>`);
      }
      corners.push(id);
    }
    triangles.push(`<${p}triangle v1="${corners[0]}" v2="${corners[1]}" v3="${corners[2]}"/>`);
  }
  return [`<${p}mesh>`, `<${p}vertices>`, ...vertices, `</${p}vertices>`, `<${p}triangles>`, ...triangles, `</${p}triangles>`, `</${p}mesh>`].join("\n");
}

export function threeMf(objects: readonly ModelObject[], items: readonly ModelItem[], options: ThreeMfOptions = {}): Uint8Array {
  const modelPath = options.modelPath ?? "3D/3dmodel.model";
  const files: Record<string, Uint8Array> = {
    "[Content_Types].xml": strToU8(
      `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
        `<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>` +
        `<Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/></Types>`,
    ),
    [modelPath]: strToU8(modelXml(objects, items, options)),
  };
  if (!options.withoutRelationships) {
    files["_rels/.rels"] = strToU8(
      `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
        `<Relationship Target="/${modelPath}" Id="rel0" Type="http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"/></Relationships>`,
    );
  }
  return zipSync(files);
}

/** Deterministic pseudo-random bytes (xorshift32), for garbage-input tests. */
export function pseudoRandomBytes(length: number, seed = 0x2545f491): Uint8Array {
  const bytes = new Uint8Array(length);
  let state = seed >>> 0 || 1;
  for (let i = 0; i < length; i++) {
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    bytes[i] = state & 0xff;
  }
  return bytes;
}

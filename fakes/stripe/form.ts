import { StripeApiError } from "./errors";

/** A decoded Stripe request body or query: strings at the leaves, as the wire carries them. */
export type FormValue = string | FormObject | FormValue[];
export interface FormObject {
  [key: string]: FormValue;
}

type Node = { kind: "object"; entries: Map<string, Node | string> } | { kind: "array"; items: (Node | string)[]; indexed: Map<number, number> };

/**
 * Decodes `application/x-www-form-urlencoded` the way Stripe reads it: `a[b][0][c]=x` nests,
 * `list[]=x` appends, `list[3]=x` places by index (indices only order the items; gaps close up,
 * as they do when Stripe parses `line_items[0]`, `line_items[2]`).
 */
export function parseForm(body: string | URLSearchParams): FormObject {
  const params = typeof body === "string" ? new URLSearchParams(body) : body;
  const root: Node = { kind: "object", entries: new Map() };
  for (const [rawKey, value] of params) {
    const path = splitKey(rawKey);
    if (!path) throw new StripeApiError(400, { message: `Invalid parameter name: ${rawKey}`, param: rawKey });
    assign(root, path, value, rawKey);
  }
  return toValue(root) as FormObject;
}

export function parseFormBody(contentType: string | null, text: string): FormObject {
  if (text.trim() === "") return {};
  const type = (contentType ?? "").split(";")[0]?.trim().toLowerCase();
  if (type && type !== "application/x-www-form-urlencoded") {
    throw new StripeApiError(400, {
      message: `Invalid request: Stripe expects "application/x-www-form-urlencoded" bodies, got "${type}".`,
    });
  }
  return parseForm(text);
}

function splitKey(key: string): string[] | undefined {
  const first = key.indexOf("[");
  if (first === -1) return key === "" ? undefined : [key];
  const head = key.slice(0, first);
  if (head === "") return undefined;
  const segments = [head];
  let rest = key.slice(first);
  while (rest.length > 0) {
    const match = /^\[([^\][]*)\]/.exec(rest);
    if (!match) return undefined;
    segments.push(match[1] ?? "");
    rest = rest.slice(match[0].length);
  }
  return segments;
}

function assign(node: Node, path: string[], value: string, rawKey: string): void {
  const [segment, ...rest] = path as [string, ...string[]];
  const isLast = rest.length === 0;
  // Metadata is always a hash, even when its first key looks like an index (`metadata[2024]`).
  const nextKind = isLast ? undefined : segment === "metadata" || !isIndex(rest[0] ?? "") ? "object" : "array";

  if (node.kind === "object") {
    if (segment === "") throw conflict(rawKey);
    const existing = node.entries.get(segment);
    if (isLast) {
      node.entries.set(segment, value);
      return;
    }
    const child = existing === undefined ? newNode(nextKind!) : existing;
    if (typeof child === "string" || child.kind !== nextKind) throw conflict(rawKey);
    node.entries.set(segment, child);
    assign(child, rest, value, rawKey);
    return;
  }

  if (!isIndex(segment)) throw conflict(rawKey);
  let position: number;
  if (segment === "") {
    position = node.items.length;
    node.items.push(isLast ? value : newNode(nextKind!));
  } else {
    const index = Number(segment);
    const known = node.indexed.get(index);
    if (known === undefined) {
      position = node.items.length;
      node.indexed.set(index, position);
      node.items.push(isLast ? value : newNode(nextKind!));
    } else {
      position = known;
      if (isLast) node.items[position] = value;
    }
  }
  if (isLast) return;
  const child = node.items[position];
  if (child === undefined || typeof child === "string" || child.kind !== nextKind) throw conflict(rawKey);
  assign(child, rest, value, rawKey);
}

function isIndex(segment: string): boolean {
  return segment === "" || /^\d{1,6}$/.test(segment);
}

function newNode(kind: "object" | "array"): Node {
  return kind === "object" ? { kind, entries: new Map() } : { kind, items: [], indexed: new Map() };
}

function conflict(rawKey: string): StripeApiError {
  return new StripeApiError(400, { message: `Invalid array or hash for parameter: ${rawKey}`, param: rawKey });
}

function toValue(node: Node | string): FormValue {
  if (typeof node === "string") return node;
  if (node.kind === "array") {
    // Items placed by index keep the order of their indices, not of their arrival.
    const order = [...node.indexed.entries()].sort((a, b) => a[0] - b[0]).map(([, position]) => position);
    const appended = node.items.map((_, position) => position).filter((position) => !order.includes(position));
    return [...order, ...appended].map((position) => toValue(node.items[position]!));
  }
  const result: FormObject = {};
  for (const [key, child] of node.entries) result[key] = toValue(child);
  return result;
}

/** Key-order-independent JSON, so an idempotent retry with reordered parameters still matches. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([key, child]) => `${JSON.stringify(key)}:${canonicalJson(child)}`).join(",")}}`;
  }
  return JSON.stringify(value);
}

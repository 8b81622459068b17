import { StripeApiError, invalidRequest, missingParam, unknownParam } from "./errors";
import type { FormObject, FormValue } from "./form";

export type Metadata = Record<string, string>;

export interface ParamOptions {
  /** Parameters Stripe knows for this endpoint but the fake does not act on; accepted and reported. */
  ignored?: readonly string[];
  onIgnored?: (param: string) => void;
}

/**
 * Typed reads over a decoded form, with Stripe's wording for bad input ("Invalid integer: x",
 * "Missing required param: x.", "Received unknown parameter: x") and the full bracketed name in `param`.
 */
export class Params {
  constructor(
    readonly value: FormObject,
    readonly path = "",
  ) {}

  name(key: string): string {
    return this.path ? `${this.path}[${key}]` : key;
  }

  has(key: string): boolean {
    return Object.prototype.hasOwnProperty.call(this.value, key);
  }

  /** Refuses what Stripe would refuse; parameters it knows but the fake does not model are let through. */
  allow(modelled: readonly string[], options: ParamOptions = {}): this {
    const ignored = options.ignored ?? [];
    for (const key of Object.keys(this.value)) {
      if (modelled.includes(key)) continue;
      if (ignored.includes(key)) {
        options.onIgnored?.(this.name(key));
        continue;
      }
      throw unknownParam(this.name(key));
    }
    return this;
  }

  raw(key: string): FormValue | undefined {
    return this.has(key) ? this.value[key] : undefined;
  }

  str(key: string): string | undefined {
    const value = this.raw(key);
    if (value === undefined) return undefined;
    if (typeof value !== "string") throw invalidRequest(`Invalid string: ${describe(value)}`, this.name(key));
    return value;
  }

  requiredStr(key: string): string {
    const value = this.str(key);
    if (value === undefined || value === "") throw missingParam(this.name(key));
    return value;
  }

  int(key: string, range: { min?: number; max?: number } = {}): number | undefined {
    const value = this.str(key);
    if (value === undefined || value === "") return undefined;
    if (!/^-?\d+$/.test(value) || !Number.isSafeInteger(Number(value))) throw invalidRequest(`Invalid integer: ${value}`, this.name(key));
    const number = Number(value);
    if (range.min !== undefined && number < range.min) {
      throw invalidRequest(`This value must be greater than or equal to ${range.min}.`, this.name(key));
    }
    if (range.max !== undefined && number > range.max) {
      throw invalidRequest(`This value must be less than or equal to ${range.max}.`, this.name(key));
    }
    return number;
  }

  bool(key: string): boolean | undefined {
    const value = this.str(key);
    if (value === undefined || value === "") return undefined;
    if (value === "true") return true;
    if (value === "false") return false;
    throw invalidRequest(`Invalid boolean: ${value}`, this.name(key));
  }

  oneOf<T extends string>(key: string, allowed: readonly T[]): T | undefined {
    const value = this.str(key);
    if (value === undefined) return undefined;
    if (!(allowed as readonly string[]).includes(value)) {
      throw invalidRequest(`Invalid ${key}: must be one of ${formatChoices(allowed)}`, this.name(key));
    }
    return value as T;
  }

  obj(key: string): Params | undefined {
    const value = this.raw(key);
    if (value === undefined || value === "") return undefined;
    if (typeof value === "string" || Array.isArray(value)) throw invalidRequest(`Invalid object`, this.name(key));
    return new Params(value, this.name(key));
  }

  objects(key: string): Params[] {
    const value = this.raw(key);
    if (value === undefined || value === "") return [];
    if (!Array.isArray(value)) throw invalidRequest(`Invalid array`, this.name(key));
    return value.map((item, index) => {
      if (typeof item === "string" || Array.isArray(item)) throw invalidRequest(`Invalid object`, `${this.name(key)}[${index}]`);
      return new Params(item, `${this.name(key)}[${index}]`);
    });
  }

  strings(key: string): string[] {
    const value = this.raw(key);
    if (value === undefined || value === "") return [];
    if (typeof value === "string") return [value];
    if (!Array.isArray(value)) throw invalidRequest(`Invalid array`, this.name(key));
    return value.map((item, index) => {
      if (typeof item !== "string") throw invalidRequest(`Invalid string: ${describe(item)}`, `${this.name(key)}[${index}]`);
      return item;
    });
  }

  /**
   * Metadata as Stripe limits it: 50 keys, keys up to 40 characters, values up to 500, no brackets
   * in keys. An empty string (`metadata=`) clears it, so it reads as `{}` with `cleared`.
   */
  metadata(key = "metadata"): { value: Metadata; cleared: boolean } | undefined {
    const raw = this.raw(key);
    if (raw === undefined) return undefined;
    if (raw === "") return { value: {}, cleared: true };
    if (typeof raw === "string" || Array.isArray(raw)) throw invalidRequest("Invalid hash", this.name(key));
    const entries = Object.entries(raw);
    if (entries.length > 50) throw invalidRequest("Invalid metadata: metadata can have at most 50 keys.", this.name(key));
    const value: Metadata = {};
    for (const [name, item] of entries) {
      const param = `${this.name(key)}[${name}]`;
      if (typeof item !== "string") throw invalidRequest("Invalid hash", param);
      if (name.length > 40) throw invalidRequest("Invalid metadata: metadata keys can be at most 40 characters long.", param);
      if (item.length > 500) throw invalidRequest("Invalid metadata: metadata values can be at most 500 characters long.", param);
      // An empty value unsets that key on update.
      value[name] = item;
    }
    return { value, cleared: false };
  }

  expand(): string[] {
    return this.strings("expand");
  }
}

export function applyMetadata(current: Metadata, update: { value: Metadata; cleared: boolean } | undefined): Metadata {
  if (!update) return current;
  if (update.cleared) return {};
  const next = { ...current };
  for (const [key, value] of Object.entries(update.value)) {
    if (value === "") delete next[key];
    else next[key] = value;
  }
  return next;
}

export function pagination(params: Params): { limit: number; startingAfter?: string; endingBefore?: string } {
  const limit = params.int("limit", { min: 1, max: 100 }) ?? 10;
  const startingAfter = params.str("starting_after") || undefined;
  const endingBefore = params.str("ending_before") || undefined;
  if (startingAfter && endingBefore) {
    throw new StripeApiError(400, { message: "You may only specify one of these parameters: ending_before, starting_after." });
  }
  return { limit, ...(startingAfter ? { startingAfter } : {}), ...(endingBefore ? { endingBefore } : {}) };
}

/** `created=123`, `created[gte]=…` and friends. */
export function rangeFilter(params: Params, key: string): ((value: number) => boolean) | undefined {
  const raw = params.raw(key);
  if (raw === undefined || raw === "") return undefined;
  if (typeof raw === "string") {
    const exact = params.int(key);
    return (value) => value === exact;
  }
  const range = params.obj(key)!.allow(["gt", "gte", "lt", "lte"]);
  const gt = range.int("gt");
  const gte = range.int("gte");
  const lt = range.int("lt");
  const lte = range.int("lte");
  return (value) =>
    (gt === undefined || value > gt) && (gte === undefined || value >= gte) && (lt === undefined || value < lt) && (lte === undefined || value <= lte);
}

export const PAGINATION_PARAMS = ["limit", "starting_after", "ending_before", "expand"] as const;

function describe(value: FormValue): string {
  return typeof value === "string" ? value : JSON.stringify(value);
}

function formatChoices(values: readonly string[]): string {
  if (values.length <= 1) return values.join("");
  return `${values.slice(0, -1).join(", ")}, or ${values[values.length - 1]}`;
}

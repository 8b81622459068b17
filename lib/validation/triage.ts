import { z } from "zod";
import { printerTypeValues, proposalKindValues } from "./proposal";

/** The states a host triages; drafts belong to their authors and never appear here. */
export const triageStateValues = ["submitted", "accepted", "declined", "merged"] as const;
export type TriageState = (typeof triageStateValues)[number];

export const triageStateLabels: Record<TriageState, string> = {
  submitted: "Waiting for a decision",
  accepted: "Accepted",
  declined: "Declined",
  merged: "Merged",
};

export const triageSortValues = ["votes", "age"] as const;
export type TriageSort = (typeof triageSortValues)[number];

export const TRIAGE_MAX_PAGE_SIZE = 100;
export const TRIAGE_DEFAULT_PAGE_SIZE = 25;
/** Longer queries are cut here; a search box never needs more. */
export const TRIAGE_MAX_QUERY_LENGTH = 200;

const emptyToUndefined = (value: unknown) => (value === "" || value === null ? undefined : value);

/** `state=submitted&state=accepted`, `state=submitted,accepted` or an array: always a list. */
const stateList = z.preprocess(
  (value) => {
    if (value === undefined || value === null || value === "") return undefined;
    const list = (Array.isArray(value) ? value : [value]).flatMap((item) => String(item).split(","));
    const cleaned = list.map((item) => item.trim()).filter(Boolean);
    return cleaned.length > 0 ? [...new Set(cleaned)] : undefined;
  },
  z
    .array(z.enum(triageStateValues, { error: `State must be one of ${triageStateValues.join(", ")}.` }))
    .min(1)
    .default(["submitted"]),
);

const positiveInt = (fallback: number, max: number, label: string) =>
  z.preprocess(
    emptyToUndefined,
    z.coerce
      .number({ error: `${label} must be a whole number.` })
      .int({ error: `${label} must be a whole number.` })
      .min(1, { error: `${label} must be at least 1.` })
      .max(max, { error: `${label} must be at most ${max}.` })
      .default(fallback),
  );

/**
 * Query of `GET /api/lab/proposals`. `sort=votes` orders by vote count, `sort=age` by how long a
 * proposal has existed: `dir=desc` puts the most voted (or the oldest) first.
 */
export const triageQuerySchema = z.object({
  state: stateList,
  kind: z.preprocess(emptyToUndefined, z.enum(proposalKindValues, { error: `Kind must be one of ${proposalKindValues.join(", ")}.` }).optional()),
  printerType: z.preprocess(
    emptyToUndefined,
    z.enum(printerTypeValues, { error: `Printer type must be one of ${printerTypeValues.join(", ")}.` }).optional(),
  ),
  q: z.preprocess(
    (value) => (typeof value === "string" ? value.slice(0, TRIAGE_MAX_QUERY_LENGTH) : value),
    z.string().trim().optional(),
  ),
  sort: z.preprocess(emptyToUndefined, z.enum(triageSortValues, { error: "Sort by votes or age." }).default("votes")),
  dir: z.preprocess(emptyToUndefined, z.enum(["asc", "desc"], { error: "Direction is asc or desc." }).default("desc")),
  page: positiveInt(1, 100_000, "Page"),
  pageSize: positiveInt(TRIAGE_DEFAULT_PAGE_SIZE, TRIAGE_MAX_PAGE_SIZE, "Page size"),
});

export type TriageQuery = z.output<typeof triageQuerySchema>;
export type TriageQueryInput = z.input<typeof triageQuerySchema>;

/** URL search params as the schema's input: keys given more than once become lists. */
export function searchParamsToTriageInput(params: URLSearchParams): Record<string, string | string[]> {
  const input: Record<string, string | string[]> = {};
  for (const key of new Set(params.keys())) {
    const values = params.getAll(key);
    input[key] = values.length > 1 ? values : (values[0] ?? "");
  }
  return input;
}

/** The inverse, for the client: a query as URL search params, defaults left out. */
export function triageQueryToSearchParams(query: Partial<TriageQuery>): URLSearchParams {
  const params = new URLSearchParams();
  const states = query.state ?? [];
  if (!(states.length === 1 && states[0] === "submitted")) for (const state of states) params.append("state", state);
  if (query.kind) params.set("kind", query.kind);
  if (query.printerType) params.set("printerType", query.printerType);
  if (query.q?.trim()) params.set("q", query.q.trim());
  if (query.sort && query.sort !== "votes") params.set("sort", query.sort);
  if (query.dir && query.dir !== "desc") params.set("dir", query.dir);
  if (query.page && query.page > 1) params.set("page", String(query.page));
  if (query.pageSize && query.pageSize !== TRIAGE_DEFAULT_PAGE_SIZE) params.set("pageSize", String(query.pageSize));
  return params;
}

/** At most this many terms reach the full-text index; the rest of a pasted paragraph is ignored. */
export const FTS_MAX_TERMS = 12;

/**
 * Turns whatever a host typed into a safe FTS5 MATCH expression: each whitespace-separated chunk
 * becomes a quoted string (so `"`, `*`, `:`, `^`, `-`, AND/OR/NOT/NEAR and column filters are plain
 * text), chunks are ANDed, and the last one matches as a prefix so results appear while typing.
 * Chunks without a letter or digit tokenise to nothing and are dropped. Undefined: nothing to search.
 */
export function toFtsMatchQuery(text: string | undefined): string | undefined {
  if (!text) return undefined;
  const chunks = text
    .normalize("NFKC")
    .split(/\s+/u)
    .filter((chunk) => /[\p{L}\p{N}]/u.test(chunk))
    .slice(0, FTS_MAX_TERMS);
  if (chunks.length === 0) return undefined;
  return chunks.map((chunk, index) => `"${chunk.replaceAll('"', '""')}"${index === chunks.length - 1 ? "*" : ""}`).join(" ");
}

/* ---------- Bulk actions on the triage table ---------- */

export const TRIAGE_MAX_BULK = 100;

export const bulkIdsSchema = z.object({
  ids: z
    .array(z.string().min(1).max(80))
    .min(1, { error: "Select at least one proposal." })
    .max(TRIAGE_MAX_BULK, { error: `Select at most ${TRIAGE_MAX_BULK} proposals at once.` }),
});

/** One reason for every selected proposal (clear duplicates, spam); each proposer is e-mailed it. */
export const bulkDeclineSchema = bulkIdsSchema.extend({
  reason: z.string().trim().min(10, { error: "Give the proposers a reason of at least 10 characters." }).max(2_000),
});

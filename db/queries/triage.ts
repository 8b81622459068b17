import { and, asc, desc, eq, inArray, sql, type SQL } from "drizzle-orm";
import { needsSafetyNote } from "@/lib/proposals/rules";
import { toFtsMatchQuery, type TriageQuery } from "@/lib/validation/triage";
import type { Db } from "../client";
import { proposals, users } from "../schema";

export type TriageRow = {
  id: string;
  slug: string;
  title: string;
  kind: (typeof proposals.$inferSelect)["kind"];
  printerType: (typeof proposals.$inferSelect)["printerType"];
  state: (typeof proposals.$inferSelect)["state"];
  voteCount: number;
  proposerName: string | null;
  /** Milliseconds since the epoch (UTC), as JSON carries them. */
  submittedAt: number | null;
  reviewStartedAt: number | null;
  createdAt: number;
  needsSafetyNote: boolean;
};

export type TriagePage = { rows: TriageRow[]; total: number; page: number; pageSize: number };

/**
 * The filters as one WHERE clause. Full-text search goes through `proposal_fts` (external content
 * keyed by the proposal's rowid), as a rowid IN (…) subquery SQLite evaluates once per statement.
 */
function triageWhere(query: Pick<TriageQuery, "state" | "kind" | "printerType" | "q">): SQL | undefined {
  const conditions: SQL[] = [inArray(proposals.state, query.state)];
  if (query.kind) conditions.push(eq(proposals.kind, query.kind));
  if (query.printerType) conditions.push(eq(proposals.printerType, query.printerType));
  const match = toFtsMatchQuery(query.q);
  if (match) conditions.push(sql`${proposals}.rowid in (select rowid from proposal_fts where proposal_fts match ${match})`);
  return and(...conditions);
}

/**
 * Orders that the existing indexes serve directly: `proposal_votes_idx (state, vote_count)` and
 * `proposal_state_idx (state, created_at)` both end in the implicit rowid, so ties break on rowid
 * (insertion order) in the same direction and SQLite walks the index instead of sorting.
 * `age desc` means oldest first.
 */
function triageOrder(query: Pick<TriageQuery, "sort" | "dir">): SQL[] {
  const rowid = sql`${proposals}.rowid`;
  if (query.sort === "votes") {
    return query.dir === "desc" ? [desc(proposals.voteCount), desc(rowid)] : [asc(proposals.voteCount), asc(rowid)];
  }
  return query.dir === "desc" ? [asc(proposals.createdAt), asc(rowid)] : [desc(proposals.createdAt), desc(rowid)];
}

/** One page of the host's triage table, with the total for the pagination controls. */
export function listTriagePage(db: Db, query: TriageQuery): TriagePage {
  const where = triageWhere(query);
  const total = db.select({ count: sql<number>`count(*)` }).from(proposals).where(where).get()?.count ?? 0;
  const lastPage = Math.max(1, Math.ceil(total / query.pageSize));
  const page = Math.min(query.page, lastPage);
  const rows = db
    .select({
      id: proposals.id,
      slug: proposals.slug,
      title: proposals.title,
      kind: proposals.kind,
      printerType: proposals.printerType,
      state: proposals.state,
      voteCount: proposals.voteCount,
      material: proposals.material,
      proposerName: users.name,
      submittedAt: proposals.submittedAt,
      reviewStartedAt: proposals.reviewStartedAt,
      createdAt: proposals.createdAt,
    })
    .from(proposals)
    .innerJoin(users, eq(users.id, proposals.proposerId))
    .where(where)
    .orderBy(...triageOrder(query))
    .limit(query.pageSize)
    .offset((page - 1) * query.pageSize)
    .all();
  return {
    rows: rows.map(({ material, submittedAt, reviewStartedAt, createdAt, ...row }) => ({
      ...row,
      submittedAt: submittedAt?.getTime() ?? null,
      reviewStartedAt: reviewStartedAt?.getTime() ?? null,
      createdAt: createdAt.getTime(),
      needsSafetyNote: needsSafetyNote(row.kind, material),
    })),
    total,
    page,
    pageSize: query.pageSize,
  };
}

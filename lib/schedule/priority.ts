import type { ScheduleJob } from "./types";

type Ranked = Pick<ScheduleJob, "id" | "pinned" | "position" | "fundedAt">;

/** Queue order of the same class: host pins, then host order (nulls last), then funded date. */
export function comparePriorityClass(a: Ranked, b: Ranked): number {
  if (a.pinned !== b.pinned) return a.pinned ? -1 : 1;
  if (a.position !== b.position) {
    if (a.position === null) return 1;
    if (b.position === null) return -1;
    return a.position - b.position;
  }
  return a.fundedAt - b.fundedAt;
}

/** The full queue order: priority class, then id (code-unit order, so the same everywhere). */
export function comparePriority(a: Ranked, b: Ranked): number {
  return comparePriorityClass(a, b) || compareIds(a.id, b.id);
}

export function compareIds(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

import type { Interval } from "./types";

/** Sorted, non-empty, with overlapping or touching intervals joined. */
export function mergeIntervals(intervals: readonly Interval[]): Interval[] {
  const sorted = intervals.filter((interval) => interval.end > interval.start).sort((a, b) => a.start - b.start || a.end - b.end);
  const merged: Interval[] = [];
  for (const interval of sorted) {
    const last = merged[merged.length - 1];
    if (last && interval.start <= last.end) last.end = Math.max(last.end, interval.end);
    else merged.push({ start: interval.start, end: interval.end });
  }
  return merged;
}

/** `base` minus `cut`; both merged (sorted, disjoint). */
export function subtractIntervals(base: readonly Interval[], cut: readonly Interval[]): Interval[] {
  const result: Interval[] = [];
  let c = 0;
  for (const interval of base) {
    let start = interval.start;
    while (c < cut.length && (cut[c] as Interval).end <= start) c++;
    let k = c;
    while (k < cut.length && (cut[k] as Interval).start < interval.end) {
      const piece = cut[k] as Interval;
      if (piece.start > start) result.push({ start, end: piece.start });
      start = Math.max(start, piece.end);
      k++;
    }
    if (start < interval.end) result.push({ start, end: interval.end });
  }
  return result;
}

/** Index of the first interval of a merged list whose end is after `instant` (list length when none). */
export function firstEndingAfter(intervals: readonly Interval[], instant: number): number {
  let low = 0;
  let high = intervals.length;
  while (low < high) {
    const middle = (low + high) >>> 1;
    if ((intervals[middle] as Interval).end > instant) high = middle;
    else low = middle + 1;
  }
  return low;
}

export function overlaps(a: Interval, b: Interval): boolean {
  return a.start < b.end && b.start < a.end;
}

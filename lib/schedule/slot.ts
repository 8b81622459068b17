import { firstEndingAfter } from "./intervals";
import type { Interval } from "./types";

/**
 * The earliest instant s ≥ `from` at which a job may begin on a printer: s and the end of its
 * changeover (s + changeover, when the print is started) lie inside one start window, and
 * [s, s + changeover + duration) misses every maintenance block. Null when no window is left.
 * `windows` and `maintenance` are merged lists (see mergeIntervals).
 */
export function earliestSlot(windows: readonly Interval[], maintenance: readonly Interval[], from: number, changeoverMs: number, durationMs: number): number | null {
  let candidate = from;
  for (;;) {
    const w = firstEndingAfter(windows, candidate);
    const window = windows[w];
    if (!window) return null;
    const begin = Math.max(candidate, window.start);
    if (begin + changeoverMs >= window.end) {
      const next = windows[w + 1];
      if (!next) return null;
      candidate = next.start;
      continue;
    }
    const block = maintenance[firstEndingAfter(maintenance, begin)];
    if (block && block.start < begin + changeoverMs + durationMs) {
      candidate = block.end;
      continue;
    }
    return begin;
  }
}

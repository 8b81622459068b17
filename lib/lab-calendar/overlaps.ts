/** Half-open [start, end) ranges overlap when each starts before the other ends. */
export function rangesOverlap(a: { start: number; end: number }, b: { start: number; end: number }): boolean {
  return a.start < b.end && b.start < a.end;
}

export type DayWindow = { isoWeekday: number; startMinute: number; endMinute: number };

/** The first existing window on the same weekday that a new one would overlap, if any. */
export function overlappingWindow<W extends DayWindow>(existing: readonly W[], candidate: DayWindow): W | undefined {
  return existing.find(
    (window) =>
      window.isoWeekday === candidate.isoWeekday &&
      rangesOverlap({ start: window.startMinute, end: window.endMinute }, { start: candidate.startMinute, end: candidate.endMinute }),
  );
}

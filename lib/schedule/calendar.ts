import { mergeIntervals, subtractIntervals } from "./intervals";
import type { Interval, LabCalendar, WeeklyWindow } from "./types";
import { addDays, isoWeekdayOf, ZoneTimeline } from "./zone-clock";

/** Someone present around the clock, every day: for labs (and tests) without staffing limits. */
export const ALWAYS_STAFFED: WeeklyWindow[] = ([1, 2, 3, 4, 5, 6, 7] as const).map((isoWeekday) => ({ isoWeekday, startMinute: 0, endMinute: 1440 }));

/**
 * The instants in [from, to) when a job may be started or changed: each weekly window turned
 * into UTC in the lab's zone for every local date (so 09:00 stays 09:00 across a clock change,
 * and a day of 23 or 25 hours keeps its windows), windows that touch joined (Monday 22:00–24:00
 * and Tuesday 00:00–06:00 make one stretch), closures cut out. A window time skipped by a clock
 * change means the moment of the jump; a repeated one its first occurrence. A calendar with no
 * windows at all has no staffing limit: all of [from, to) outside closures.
 */
export function expandStartWindows(calendar: LabCalendar, from: number, to: number): Interval[] {
  if (!(to > from)) return [];
  const byWeekday = new Map<number, WeeklyWindow[]>();
  for (const window of calendar.startWindows) {
    if (!(window.endMinute > window.startMinute)) continue;
    const list = byWeekday.get(window.isoWeekday) ?? [];
    list.push(window);
    byWeekday.set(window.isoWeekday, list);
  }
  const closures = mergeIntervals(calendar.closures);
  if (calendar.startWindows.length === 0) return subtractIntervals([{ start: from, end: to }], closures);

  const zone = new ZoneTimeline(calendar.timeZone, from, to);
  const raw: Interval[] = [];
  const last = zone.localDateOf(to);
  const lastKey = Date.UTC(last.year, last.month - 1, last.day);
  for (let date = addDays(zone.localDateOf(from), -1); Date.UTC(date.year, date.month - 1, date.day) <= lastKey; date = addDays(date, 1)) {
    for (const window of byWeekday.get(isoWeekdayOf(date)) ?? []) {
      const start = Math.max(from, zone.wallToUtc(date, Math.max(0, window.startMinute)));
      const end = Math.min(to, zone.wallToUtc(date, Math.min(1440, window.endMinute)));
      if (end > start) raw.push({ start, end });
    }
  }
  return subtractIntervals(mergeIntervals(raw), closures);
}

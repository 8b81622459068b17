import { zoneOffsetMs } from "../time-zone";

/*
 * Wall-clock arithmetic in an IANA time zone, built on Intl only. The lab's start windows are
 * written in local time; these turn a local date and minute into the UTC instant it names.
 * Intl is slow (tens of microseconds a call), so offsets are probed once a week and clock
 * changes located by bisection; both are memoised per zone (the zone rules never change while
 * the process runs, so this keeps every function here a pure function of its arguments).
 */

const MINUTE = 60_000;
const DAY = 86_400_000;
const WEEK = 7 * DAY;

export type LocalDate = { year: number; month: number; day: number };


type Segment = { from: number; offset: number };
const weeklyProbes = new Map<string, Map<number, number>>();
const changes = new Map<string, number>();

function probeWeek(timeZone: string, week: number): number {
  let probes = weeklyProbes.get(timeZone);
  if (!probes) {
    probes = new Map();
    weeklyProbes.set(timeZone, probes);
  }
  let offset = probes.get(week);
  if (offset === undefined) {
    offset = zoneOffsetMs(week * WEEK, timeZone);
    probes.set(week, offset);
  }
  return offset;
}

/** The first instant after the start of `week` with the offset of the week's end (one change a week at most). */
function changeInWeek(timeZone: string, week: number): number {
  const key = `${timeZone}|${week}`;
  let change = changes.get(key);
  if (change === undefined) {
    let low = week * WEEK;
    let high = (week + 1) * WEEK;
    const lowOffset = probeWeek(timeZone, week);
    while (high - low > MINUTE) {
      const middle = low + Math.floor((high - low) / 2 / MINUTE) * MINUTE;
      if (zoneOffsetMs(middle, timeZone) === lowOffset) low = middle;
      else high = middle;
    }
    change = high;
    changes.set(key, change);
  }
  return change;
}

/** The zone's offsets over [from, to) as constant stretches, two days' margin either side. */
export class ZoneTimeline {
  private readonly segments: Segment[] = [];

  constructor(
    readonly timeZone: string,
    from: number,
    to: number,
  ) {
    const firstWeek = Math.floor((from - 2 * DAY) / WEEK);
    const lastWeek = Math.ceil((to + 2 * DAY) / WEEK);
    this.segments.push({ from: -Infinity, offset: probeWeek(timeZone, firstWeek) });
    for (let week = firstWeek; week < lastWeek; week++) {
      const next = probeWeek(timeZone, week + 1);
      if (next !== probeWeek(timeZone, week)) this.segments.push({ from: changeInWeek(timeZone, week), offset: next });
    }
  }

  private segmentIndex(instant: number): number {
    let low = 0;
    let high = this.segments.length - 1;
    while (low < high) {
      const middle = (low + high + 1) >>> 1;
      if ((this.segments[middle] as Segment).from <= instant) low = middle;
      else high = middle - 1;
    }
    return low;
  }

  offsetAt(instant: number): number {
    return (this.segments[this.segmentIndex(instant)] as Segment).offset;
  }

  localDateOf(instant: number): LocalDate {
    const wall = new Date(instant + this.offsetAt(instant));
    return { year: wall.getUTCFullYear(), month: wall.getUTCMonth() + 1, day: wall.getUTCDate() };
  }

  /**
   * The UTC instant at which the wall clock first reads `minute` minutes after local midnight of
   * `date`, or later: a time repeated when clocks go back names its first occurrence, a time
   * skipped when clocks go forward names the moment of the jump. `minute` may be 1440.
   */
  wallToUtc(date: LocalDate, minute: number): number {
    const asUtc = Date.UTC(date.year, date.month - 1, date.day, 0, minute);
    const before = this.offsetAt(asUtc - DAY);
    const after = this.offsetAt(asUtc + DAY);
    if (before === after) return asUtc - before;
    const valid = [asUtc - before, asUtc - after].filter((instant) => this.offsetAt(instant) === asUtc - instant);
    if (valid.length > 0) return Math.min(...valid);
    // In the gap: the change lies between the two readings; it starts the segment holding the later one.
    const later = Math.max(asUtc - before, asUtc - after);
    return (this.segments[this.segmentIndex(later)] as Segment).from;
  }
}

/** See ZoneTimeline.wallToUtc; for a single conversion. */
export function wallMinuteToUtc(date: LocalDate, minute: number, timeZone: string): number {
  const asUtc = Date.UTC(date.year, date.month - 1, date.day, 0, minute);
  return new ZoneTimeline(timeZone, asUtc - DAY, asUtc + DAY).wallToUtc(date, minute);
}

/** ISO weekday (1 = Monday … 7 = Sunday) of a calendar date. */
export function isoWeekdayOf(date: LocalDate): 1 | 2 | 3 | 4 | 5 | 6 | 7 {
  const weekday = new Date(Date.UTC(date.year, date.month - 1, date.day)).getUTCDay();
  return (weekday === 0 ? 7 : weekday) as 1 | 2 | 3 | 4 | 5 | 6 | 7;
}

/** The calendar date `days` after `date`. */
export function addDays(date: LocalDate, days: number): LocalDate {
  const next = new Date(Date.UTC(date.year, date.month - 1, date.day + days));
  return { year: next.getUTCFullYear(), month: next.getUTCMonth() + 1, day: next.getUTCDate() };
}

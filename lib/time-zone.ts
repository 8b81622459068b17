import { dateTimeFormat } from "./intl-cache";

/** The wall-clock fields of an instant in a time zone. */
export function wallClock(instant: number, timeZone: string) {
  const parts = dateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "numeric",
    day: "numeric",
    hour: "numeric",
    minute: "numeric",
    second: "numeric",
  }).formatToParts(new Date(instant));
  const field = (type: string) => Number(parts.find((part) => part.type === type)?.value);
  return { year: field("year"), month: field("month"), day: field("day"), hour: field("hour"), minute: field("minute"), second: field("second") };
}

/** The zone's offset from UTC at an instant, in milliseconds (positive east of Greenwich). */
export function zoneOffsetMs(instant: number, timeZone: string): number {
  const wall = wallClock(instant, timeZone);
  const asUtc = Date.UTC(wall.year, wall.month - 1, wall.day, wall.hour, wall.minute, wall.second);
  return asUtc - Math.floor(instant / 1000) * 1000;
}

/** The UTC instant when the wall clock in `timeZone` reads the given local midnight. */
export function zonedMidnight(year: number, month: number, day: number, timeZone: string): Date {
  const guess = Date.UTC(year, month - 1, day);
  // Two passes settle the offset even when the first guess lands across a DST change.
  const first = guess - zoneOffsetMs(guess, timeZone);
  return new Date(guess - zoneOffsetMs(first, timeZone));
}

/** The calendar month containing `now` in `timeZone`, as [start, end) UTC instants. */
export function monthInZone(now: Date, timeZone: string): { start: Date; end: Date } {
  const { year, month } = wallClock(now.getTime(), timeZone);
  const next = month === 12 ? { year: year + 1, month: 1 } : { year, month: month + 1 };
  return { start: zonedMidnight(year, month, 1, timeZone), end: zonedMidnight(next.year, next.month, 1, timeZone) };
}

import { wallClock, zoneOffsetMs as offsetMs } from "../time-zone";

/*
 * The lab's calendar is typed in the lab's wall-clock time and stored as UTC milliseconds. These
 * helpers convert between the two for `<input type="datetime-local">` strings ("2026-12-24T08:30")
 * and minute-of-day strings ("08:30").
 */

const LOCAL_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;
const MINUTE_OF_DAY = /^(\d{2}):(\d{2})$/;

const pad = (value: number, width = 2) => String(value).padStart(width, "0");

/** "2026-12-24T08:30" as the wall clock in `timeZone` reads it → UTC ms; undefined when malformed or skipped by a clock change. */
export function parseLocalDateTime(value: string, timeZone: string): number | undefined {
  const match = LOCAL_DATE_TIME.exec(value.trim());
  if (!match) return undefined;
  const [year, month, day, hour, minute] = match.slice(1).map(Number) as [number, number, number, number, number];
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 23 || minute > 59) return undefined;
  const asUtc = Date.UTC(year, month - 1, day, hour, minute);
  // Two passes settle the offset when the first guess lands across a daylight-saving change.
  const first = asUtc - offsetMs(asUtc, timeZone);
  const instant = asUtc - offsetMs(first, timeZone);
  // A wall time that never happens (the hour skipped in spring) or a 31 February does not round-trip.
  return formatLocalDateTime(instant, timeZone) === value.trim() ? instant : undefined;
}

/** UTC ms → "2026-12-24T08:30" on the wall clock in `timeZone`. */
export function formatLocalDateTime(instant: number, timeZone: string): string {
  const wall = wallClock(instant, timeZone);
  return `${pad(wall.year, 4)}-${pad(wall.month)}-${pad(wall.day)}T${pad(wall.hour)}:${pad(wall.minute)}`;
}

/** "08:30" → 510; "24:00" is accepted as the end of the day (1440). */
export function parseMinuteOfDay(value: string): number | undefined {
  const match = MINUTE_OF_DAY.exec(value.trim());
  if (!match) return undefined;
  const hour = Number(match[1]);
  const minute = Number(match[2]);
  if (minute > 59 || hour > 24 || (hour === 24 && minute !== 0)) return undefined;
  return hour * 60 + minute;
}

export function formatMinuteOfDay(minutes: number): string {
  return `${pad(Math.floor(minutes / 60))}:${pad(minutes % 60)}`;
}

/** ISO 8601 weekday names, 1 = Monday. */
export const ISO_WEEKDAYS = [
  { day: 1, name: "Monday" },
  { day: 2, name: "Tuesday" },
  { day: 3, name: "Wednesday" },
  { day: 4, name: "Thursday" },
  { day: 5, name: "Friday" },
  { day: 6, name: "Saturday" },
  { day: 7, name: "Sunday" },
] as const;

export function weekdayName(isoWeekday: number): string {
  return ISO_WEEKDAYS.find((entry) => entry.day === isoWeekday)?.name ?? `Day ${isoWeekday}`;
}

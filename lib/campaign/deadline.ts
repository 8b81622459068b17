import { dateTimeFormat } from "../intl-cache";
import { zonedMidnight } from "../time-zone";

/** A calendar date as `YYYY-MM-DD`, the value of an `<input type="date">`. */
export type CalendarDate = string;

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DAY_MS = 24 * 60 * 60 * 1000;

function parts(date: CalendarDate): { year: number; month: number; day: number } {
  const match = DATE.exec(date);
  if (!match) throw new RangeError(`Not a calendar date: ${date}`);
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const check = new Date(Date.UTC(year, month - 1, day));
  if (check.getUTCFullYear() !== year || check.getUTCMonth() !== month - 1 || check.getUTCDate() !== day) {
    throw new RangeError(`Not a calendar date: ${date}`);
  }
  return { year, month, day };
}

export function isCalendarDate(value: string): boolean {
  try {
    parts(value);
    return true;
  } catch {
    return false;
  }
}

/** The date the wall calendar shows in `timeZone` at `instant`. */
export function calendarDateInZone(instant: Date, timeZone: string): CalendarDate {
  const fields = dateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).formatToParts(instant);
  const field = (type: string) => fields.find((part) => part.type === type)?.value ?? "";
  return `${field("year")}-${field("month")}-${field("day")}`;
}

/** Calendar arithmetic (no clocks, so no daylight-saving surprises). */
export function addCalendarDays(date: CalendarDate, days: number): CalendarDate {
  const { year, month, day } = parts(date);
  return new Date(Date.UTC(year, month - 1, day) + days * DAY_MS).toISOString().slice(0, 10);
}

/** Whole calendar days from `from` to `to` (negative when `to` is earlier). */
export function calendarDaysBetween(from: CalendarDate, to: CalendarDate): number {
  const a = parts(from);
  const b = parts(to);
  return Math.round((Date.UTC(b.year, b.month - 1, b.day) - Date.UTC(a.year, a.month - 1, a.day)) / DAY_MS);
}

/**
 * The instant a campaign with this deadline date closes: the last second of that day on the
 * lab's wall clock (23:59:59), so "ends on 20 March" means pledges are taken all of 20 March.
 */
export function deadlineInstant(date: CalendarDate, timeZone: string): Date {
  const next = parts(addCalendarDays(date, 1));
  return new Date(zonedMidnight(next.year, next.month, next.day, timeZone).getTime() - 1000);
}

export type DeadlineWindow = { today: CalendarDate; earliest: CalendarDate; latest: CalendarDate };

/** The dates a host may pick: `minDays` to `maxDays` calendar days after today in the lab's zone. */
export function deadlineWindow(now: Date, timeZone: string, minDays: number, maxDays: number): DeadlineWindow {
  const today = calendarDateInZone(now, timeZone);
  return { today, earliest: addCalendarDays(today, minDays), latest: addCalendarDays(today, maxDays) };
}

/** Why a deadline date is refused, or undefined when it is inside the window. */
export function deadlineProblem(date: string, now: Date, timeZone: string, minDays: number, maxDays: number): string | undefined {
  if (!isCalendarDate(date)) return "Pick a deadline date.";
  const { today } = deadlineWindow(now, timeZone, minDays, maxDays);
  const ahead = calendarDaysBetween(today, date);
  if (ahead < minDays) return `The deadline must be at least ${minDays} days ahead (today is ${today} in the lab's time zone).`;
  if (ahead > maxDays) return `The deadline can be at most ${maxDays} days ahead.`;
  return undefined;
}

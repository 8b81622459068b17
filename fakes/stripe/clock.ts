export interface ClockState {
  /** Seconds added to the real time (a running clock). */
  offsetSeconds: number;
  /** When set, time stands still here until advanced (unix seconds). */
  frozenAt: number | null;
}

/**
 * The fake's notion of "now", in unix seconds like every Stripe timestamp. It runs with the real
 * time plus an offset, or stands still (tests); `advance` moves it forward only, as Stripe's test
 * clocks do, so created/expires_at/period timestamps never go backwards.
 */
export class FakeClock {
  private state: ClockState;
  private readonly listeners = new Set<(state: ClockState) => void>();

  constructor(state: Partial<ClockState> = {}) {
    this.state = { offsetSeconds: state.offsetSeconds ?? 0, frozenAt: state.frozenAt ?? null };
  }

  now(): number {
    return this.state.frozenAt ?? Math.floor(Date.now() / 1000) + this.state.offsetSeconds;
  }

  advance(seconds: number): number {
    if (!Number.isFinite(seconds) || seconds < 0) throw new RangeError(`The clock only moves forward; got ${seconds} seconds`);
    const whole = Math.round(seconds);
    if (this.state.frozenAt === null) this.state = { ...this.state, offsetSeconds: this.state.offsetSeconds + whole };
    else this.state = { ...this.state, frozenAt: this.state.frozenAt + whole };
    this.emit();
    return this.now();
  }

  /** Moves to an absolute time; refuses to go back. */
  advanceTo(unixSeconds: number): number {
    return this.advance(unixSeconds - this.now());
  }

  snapshot(): ClockState {
    return { ...this.state };
  }

  onChange(listener: (state: ClockState) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private emit(): void {
    for (const listener of this.listeners) listener(this.snapshot());
  }
}

const SECONDS_PER_DAY = 86_400;

/**
 * Adds calendar months in UTC the way Stripe bills: a period anchored on the 31st ends on the last
 * day of shorter months and returns to the 31st when the month allows (Stripe's billing-cycle
 * documentation: an anchor of January 31 bills February 28 or 29, then March 31, April 30).
 */
export function addMonthsUtc(anchorSeconds: number, months: number): number {
  const anchor = new Date(anchorSeconds * 1000);
  const targetMonthIndex = anchor.getUTCMonth() + months;
  const year = anchor.getUTCFullYear() + Math.floor(targetMonthIndex / 12);
  const month = ((targetMonthIndex % 12) + 12) % 12;
  const lastDay = new Date(Date.UTC(year, month + 1, 0)).getUTCDate();
  const day = Math.min(anchor.getUTCDate(), lastDay);
  const millis = Date.UTC(year, month, day, anchor.getUTCHours(), anchor.getUTCMinutes(), anchor.getUTCSeconds());
  return Math.floor(millis / 1000);
}

export function addInterval(anchorSeconds: number, interval: string, count: number, periods: number): number {
  switch (interval) {
    case "day":
      return anchorSeconds + count * periods * SECONDS_PER_DAY;
    case "week":
      return anchorSeconds + count * periods * 7 * SECONDS_PER_DAY;
    case "year":
      return addMonthsUtc(anchorSeconds, 12 * count * periods);
    default:
      return addMonthsUtc(anchorSeconds, count * periods);
  }
}

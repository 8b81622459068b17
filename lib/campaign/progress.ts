export type FundingProgress = {
  raisedMinor: number;
  goalMinor: number;
  remainingMinor: number;
  /** Whole percent, rounded down so 99.6 % never reads as "100 %" before the goal is met. */
  percent: number;
  goalMet: boolean;
};

export function fundingProgress(raisedMinor: number, goalMinor: number): FundingProgress {
  if (!Number.isInteger(raisedMinor) || !Number.isInteger(goalMinor) || goalMinor <= 0) {
    throw new RangeError("raised and goal must be integers in minor units, goal above zero");
  }
  return {
    raisedMinor,
    goalMinor,
    remainingMinor: Math.max(0, goalMinor - raisedMinor),
    percent: Math.floor((raisedMinor * 100) / goalMinor),
    goalMet: raisedMinor >= goalMinor,
  };
}

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

/** "12 days left", "5 hours left", "ended" — the coarsest unit that is at least one. */
export function timeLeft(deadline: Date, now: Date): string {
  const ms = deadline.getTime() - now.getTime();
  if (ms <= 0) return "ended";
  if (ms >= 2 * DAY) return `${Math.floor(ms / DAY)} days left`;
  if (ms >= 2 * HOUR) return `${Math.floor(ms / HOUR)} hours left`;
  const minutes = Math.max(1, Math.floor(ms / MINUTE));
  return `${minutes} minute${minutes === 1 ? "" : "s"} left`;
}

const DAY_MS = 24 * 60 * 60 * 1000;

export type CampaignDates = {
  /** The date from the latest schedule; null while the campaign has unplaced jobs. */
  estimatedResultsAt: number | null;
  scheduledNotifiedAt: number | null;
  lastNotifiedResultsAt: number | null;
};

export type DateNotice = { kind: "scheduled"; resultsAt: number } | { kind: "slipped"; previous: number; resultsAt: number };

/**
 * Which mail, if any, the backers of a campaign get after a recompute: the first date once
 * ("scheduled"), then a "slipped" notice only when the date is more than `slipNoticeDays` later
 * than the last date they were told. Earlier dates and small moves stay quiet, and the date they
 * were told stays the reference, so many small slips that add up past the threshold still mail.
 */
export function dateNotice(dates: CampaignDates, slipNoticeDays: number): DateNotice | null {
  const resultsAt = dates.estimatedResultsAt;
  if (resultsAt === null) return null;
  if (dates.scheduledNotifiedAt === null || dates.lastNotifiedResultsAt === null) return { kind: "scheduled", resultsAt };
  if (resultsAt - dates.lastNotifiedResultsAt > slipNoticeDays * DAY_MS) {
    return { kind: "slipped", previous: dates.lastNotifiedResultsAt, resultsAt };
  }
  return null;
}

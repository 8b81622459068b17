/**
 * A Filament Club membership as a handful of facts learnt from processor events. Events arrive in
 * any order and more than once, so every fact only moves one way (a later period end, a first
 * end, the newest cancel request) and merging is commutative: any delivery order of the same
 * events yields the same facts, and the status and perks follow from the facts alone.
 */

/** The membership states of db/schema.ts `membershipStatuses` (kept here so lib/ stays free of the database). */
export type MembershipStatus = "active" | "past_due" | "canceled";

export type MembershipFacts = {
  /** End of the last period that was paid for; the epoch while no payment is known yet. */
  paidThrough: Date;
  /** End of the latest period whose renewal payment failed. */
  unpaidThrough: Date | null;
  /** The subscription ended at the processor. */
  endedAt: Date | null;
  /** When the member asked to stop (the processor's `canceled_at`). */
  canceledAt: Date | null;
  cancelAtPeriodEnd: boolean;
  /** Processor time of the snapshot the cancel flag came from. */
  cancelFlagAt: Date | null;
  startedAt: Date;
};

/** What one event says about its subscription; every part is optional. */
export type MembershipEvidence = {
  paidThrough?: Date;
  unpaidThrough?: Date;
  ended?: { at: Date; canceledAt: Date | null };
  cancelFlag?: { value: boolean; at: Date };
  startedAt?: Date;
};

const EPOCH = new Date(0);

const later = (a: Date | null, b: Date | undefined): Date | null => (b && (!a || b > a) ? b : a);
const earlier = (a: Date | null, b: Date | null | undefined): Date | null => (b && (!a || b < a) ? b : a);

export function emptyFacts(startedAt: Date): MembershipFacts {
  return { paidThrough: EPOCH, unpaidThrough: null, endedAt: null, canceledAt: null, cancelAtPeriodEnd: false, cancelFlagAt: null, startedAt };
}

/**
 * Folds one event's evidence into the facts. The cancel flag is the one fact that can move both
 * ways (asked to stop, then asked to stay), so the newest snapshot wins; two snapshots from the
 * same instant agree on "cancel" if either says so, which keeps the merge order-free.
 */
export function mergeEvidence(facts: MembershipFacts, evidence: MembershipEvidence): MembershipFacts {
  const next: MembershipFacts = { ...facts };
  next.paidThrough = later(facts.paidThrough, evidence.paidThrough) ?? EPOCH;
  next.unpaidThrough = later(facts.unpaidThrough, evidence.unpaidThrough);
  if (evidence.ended) {
    next.endedAt = earlier(facts.endedAt, evidence.ended.at);
    next.canceledAt = earlier(facts.canceledAt, evidence.ended.canceledAt);
  }
  if (evidence.cancelFlag) {
    const { value, at } = evidence.cancelFlag;
    const known = facts.cancelFlagAt;
    if (!known || at > known) {
      next.cancelAtPeriodEnd = value;
      next.cancelFlagAt = at;
    } else if (at.getTime() === known.getTime()) {
      next.cancelAtPeriodEnd = facts.cancelAtPeriodEnd || value;
    }
  }
  next.startedAt = earlier(facts.startedAt, evidence.startedAt) ?? facts.startedAt;
  return next;
}

/** Ended is final; a failed renewal not yet made good is past due; otherwise active. */
export function membershipStatus(facts: Pick<MembershipFacts, "endedAt" | "paidThrough" | "unpaidThrough">): MembershipStatus {
  if (facts.endedAt) return "canceled";
  if (facts.unpaidThrough && facts.unpaidThrough > facts.paidThrough) return "past_due";
  return "active";
}

/**
 * Perks (the member role, the plan's votes, early blind pairs) need an active membership inside a
 * paid period. A failed renewal stops them at once (the period it was for is unpaid); a requested
 * cancellation keeps them to the end of the period already paid for.
 */
export function hasPerks(membership: { status: MembershipStatus; currentPeriodEnd: Date }, now: Date): boolean {
  return membership.status === "active" && membership.currentPeriodEnd.getTime() > now.getTime();
}

/**
 * `months` calendar months after `from` in UTC, clamped to the end of a shorter month, as the
 * processor bills monthly subscriptions from their anchor.
 */
export function addCalendarMonthsUtc(from: Date, months: number): Date {
  const year = from.getUTCFullYear();
  const month = from.getUTCMonth() + months;
  const lastDay = new Date(Date.UTC(year, month + 1, 0)).getUTCDate();
  const day = Math.min(from.getUTCDate(), lastDay);
  return new Date(Date.UTC(year, month, day, from.getUTCHours(), from.getUTCMinutes(), from.getUTCSeconds(), from.getUTCMilliseconds()));
}

export const membershipStatusLabels: Record<MembershipStatus, string> = {
  active: "Active",
  past_due: "Renewal failed",
  canceled: "Ended",
};

import { RuleViolation } from "../rule-violation";

/** The plan codes of db/schema.ts `membership_plan.code`. */
export const planCodes = ["spool", "reel", "workshop"] as const;
export type PlanCode = (typeof planCodes)[number];

export function isPlanCode(value: string): value is PlanCode {
  return (planCodes as readonly string[]).includes(value);
}

export type PlanPricing = { code: PlanCode; name: string; monthlyMinor: number; currency: string };

/**
 * The processor's `lookup_key` for a plan's monthly price. It names the amount and currency, so a
 * new price for the plan gets a new key (processor prices are immutable) while a restart finds
 * the same price again instead of creating another.
 */
export function planPriceLookupKey(plan: PlanPricing): string {
  return `filament-club:${plan.code}:${plan.currency.toUpperCase()}:${plan.monthlyMinor}:month`;
}

/** The processor product's id for a plan (set by us, so it is found again after a restart). */
export function planProductId(code: PlanCode): string {
  return `proofbay_filament_club_${code}`;
}

export const planIdempotencyKeys = {
  product: (code: PlanCode) => `filament-club-product:${code}`,
  price: (plan: PlanPricing) => `filament-club-price:${planPriceLookupKey(plan)}`,
  customer: (userId: string) => `billing-customer:${userId}`,
  /** One Checkout Session per person, plan and five-minute window: a double click gets the same page. */
  checkout: (userId: string, code: PlanCode, window: number) => `filament-club-checkout:${userId}:${code}:${window}`,
  cancel: (subscriptionId: string) => `filament-club-cancel:${subscriptionId}`,
};

/** A double click within the same window reuses the same Checkout Session (the idempotency key). */
export const JOIN_WINDOW_MS = 5 * 60_000;

/**
 * The window a join request falls in. The session keeps the processor's default lifetime (a day):
 * an expiry computed from our clock could fall outside the processor's allowed range when the
 * two clocks disagree (the fake's clock is advanced in demos).
 */
export function joinWindow(now: Date): number {
  return Math.floor(now.getTime() / JOIN_WINDOW_MS);
}

/** One membership at a time: joining again needs the live one to have ended. */
export function assertCanJoin(live: { status: string; planName: string } | undefined): void {
  if (!live) return;
  throw new RuleViolation(
    409,
    "already_member",
    live.status === "past_due"
      ? `Your ${live.planName} membership's renewal failed; it ends on its own if the card is not charged. Join again once it has ended.`
      : `You are already a ${live.planName} member. To change plans, cancel this one and join again after it ends.`,
  );
}

/** The perks a plan gives, as the club page and the account page list them. */
export function planPerks(plan: { monthlyVotes: number; earlyBlindPairs: boolean }): string[] {
  return [
    `${plan.monthlyVotes} proposal vote${plan.monthlyVotes === 1 ? "" : "s"} a month`,
    plan.earlyBlindPairs ? "Judge blind pairs before they open to everyone" : "Judge blind pairs when they open to everyone",
    "Every membership payment goes to the lab fund, which the lab allocates to campaigns",
  ];
}

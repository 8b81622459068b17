import { RuleViolation } from "../rule-violation";

/** The pledge states of db/schema.ts `pledgeStates` (kept here so lib/ stays free of the database). */
export type PledgeState = "pending" | "paid" | "refunded" | "failed";

/** A second click within this long, for the same amount, reuses the first pending pledge. */
export const PLEDGE_REUSE_WINDOW_MS = 5 * 60_000;
/** Stripe refuses a Checkout Session that lives less than 30 minutes (or more than 24 hours). */
export const CHECKOUT_MIN_LIFETIME_MS = 30 * 60_000;
/** Room for the processor's clock being ahead of ours. */
export const CLOCK_SKEW_ALLOWANCE_MS = 60_000;

/**
 * When the pledge's Checkout Session expires, derived from the pledge (not from "now") so a retried
 * create sends identical parameters under the same idempotency key: 30 minutes from the last moment
 * the pledge can be reused, plus a minute for clock skew — 36 minutes after the pledge was created.
 */
export function checkoutExpiresAt(pledgeCreatedAt: Date): Date {
  return new Date(pledgeCreatedAt.getTime() + PLEDGE_REUSE_WINDOW_MS + CHECKOUT_MIN_LIFETIME_MS + CLOCK_SKEW_ALLOWANCE_MS);
}

/** The idempotency key of the pledge's one Checkout Session create request. */
export function checkoutIdempotencyKey(pledgeId: string): string {
  return `pledge-checkout:${pledgeId}`;
}

/** Pledges are taken only while a campaign is open and before its deadline. */
export function assertCampaignTakesPledges(campaign: { state: string; deadline: Date }, now: Date): void {
  if (campaign.state !== "open") {
    throw new RuleViolation(409, "campaign_closed", `This campaign is ${campaign.state} and no longer takes pledges.`);
  }
  if (now.getTime() >= campaign.deadline.getTime()) {
    throw new RuleViolation(409, "campaign_closed", "This campaign's deadline has passed; it no longer takes pledges.");
  }
}

export type ReusablePledge = { supporterId: string; campaignId: string; amountMinor: number; state: PledgeState; createdAt: Date };

/**
 * The double-click rule: the supporter's own pending pledge on the same campaign, for the same
 * amount, created less than PLEDGE_REUSE_WINDOW_MS ago, is reused instead of a second one.
 */
export function isReusable(pledge: ReusablePledge, wanted: { supporterId: string; campaignId: string; amountMinor: number }, now: Date): boolean {
  return (
    pledge.state === "pending" &&
    pledge.supporterId === wanted.supporterId &&
    pledge.campaignId === wanted.campaignId &&
    pledge.amountMinor === wanted.amountMinor &&
    now.getTime() - pledge.createdAt.getTime() < PLEDGE_REUSE_WINDOW_MS &&
    now.getTime() >= pledge.createdAt.getTime()
  );
}

/** The state names a backer sees. */
export const pledgeStateLabels: Record<PledgeState, string> = {
  pending: "Awaiting payment",
  paid: "Paid",
  refunded: "Refunded",
  failed: "Not completed",
};

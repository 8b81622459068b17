import { formatMoney } from "../format";
import { isCurrencyCode, minorUnitExponent, parseMajorAmount } from "../money";
import { RuleViolation } from "../rule-violation";

/*
 * The lab fund in the ledger (every row signed from the fund's point of view):
 * - membership_payment: income, positive;
 * - fund_allocation: money moved to a campaign, negative;
 * - fund_release: an allocation returned from a lapsed or withdrawn campaign, positive.
 * The balance is their sum. A campaign's lab-fund support is minus the sum of its allocations
 * and releases, as db/queries/campaigns.ts and db/queries/pledges.ts `raisedMinor` count it.
 */
export const LAB_FUND_KINDS = ["membership_payment", "fund_allocation", "fund_release"] as const;
export type LabFundKind = (typeof LAB_FUND_KINDS)[number];

export const labFundKindLabels: Record<LabFundKind, string> = {
  membership_payment: "Membership income",
  fund_allocation: "Allocated to a campaign",
  fund_release: "Returned from a campaign",
};

export type AllocationLimits = {
  currency: string;
  balanceMinor: number;
  /** What the campaign still needs to reach its goal. */
  remainingMinor: number;
};

/**
 * Reads the typed amount ("25", "25.50") in the fund's currency and checks it against the fund's
 * balance and what the campaign still needs; a 422 naming `amount` otherwise. Amounts with more
 * decimals than the currency has (ISO 4217 minor units) are not a whole number of minor units.
 */
export function requireAllocationAmount(text: string, limits: AllocationLimits): number {
  const fail = (message: string) => new RuleViolation(422, "invalid_amount", message, "amount");
  if (!isCurrencyCode(limits.currency)) throw new RuleViolation(422, "unsupported_currency", `The lab fund's currency ${limits.currency} is not supported.`, "amount");
  const trimmed = text.trim();
  if (trimmed === "") throw fail("Amount is required.");
  const exponent = minorUnitExponent(limits.currency);
  if (/^-/.test(trimmed)) throw fail("Amount must be more than zero.");
  const amountMinor = parseMajorAmount(trimmed, limits.currency);
  if (amountMinor === undefined) {
    const decimals = exponent === 0 ? "no decimals" : `at most ${exponent} decimal${exponent === 1 ? "" : "s"}`;
    throw fail(`Amount must be a number with ${decimals} (a whole number of ${limits.currency} minor units).`);
  }
  return checkAllocationMinor(amountMinor, limits);
}

/** The same checks for an amount already in minor units (the JSON API). */
export function checkAllocationMinor(amountMinor: number, limits: AllocationLimits): number {
  const fail = (message: string) => new RuleViolation(422, "invalid_amount", message, "amount");
  if (!Number.isSafeInteger(amountMinor)) throw fail("Amount must be a whole number of minor units.");
  if (amountMinor <= 0) throw fail("Amount must be more than zero.");
  if (amountMinor > limits.balanceMinor) {
    throw fail(`Amount is more than the lab fund holds (${formatMoney(Math.max(0, limits.balanceMinor), limits.currency)}).`);
  }
  if (amountMinor > limits.remainingMinor) {
    throw fail(`Amount is more than the campaign still needs (${formatMoney(limits.remainingMinor, limits.currency)}).`);
  }
  return amountMinor;
}

/** Allocations are made only to open campaigns before their deadline. */
export function assertCampaignTakesAllocations(campaign: { state: string; deadline: Date }, now: Date): void {
  if (campaign.state !== "open") throw new RuleViolation(409, "campaign_not_open", `This campaign is ${campaign.state}; only open campaigns take lab-fund money.`);
  if (now.getTime() >= campaign.deadline.getTime()) throw new RuleViolation(409, "campaign_not_open", "This campaign's deadline has passed; it no longer takes lab-fund money.");
}

/** Ledger keys: one per allocation request (a double click sends the same id), one return per campaign. */
export const labFundKeys = {
  allocation: (requestId: string) => `fund-allocation:${requestId}`,
  return: (campaignId: string) => `fund-return:${campaignId}`,
};

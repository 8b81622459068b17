import { describe, expect, it } from "vitest";
import { assertCampaignTakesAllocations, requireAllocationAmount } from "@/lib/lab-fund/allocation";
import { RuleViolation } from "@/lib/rule-violation";

/*
 * Check values and where they come from: the ISO 4217 minor-unit column — USD and EUR 2 decimals,
 * JPY 0, KWD 3 (so 1.234 KWD is 1234 fils; 12.5 JPY is not a whole number of yen).
 */

const limits = (currency: string, balanceMinor = 1_000_000, remainingMinor = 1_000_000) => ({ currency, balanceMinor, remainingMinor });

function problem(text: string, l: ReturnType<typeof limits>): RuleViolation {
  try {
    requireAllocationAmount(text, l);
  } catch (error) {
    if (error instanceof RuleViolation) return error;
    throw error;
  }
  throw new Error(`expected ${text} to be refused`);
}

describe("requireAllocationAmount", () => {
  it("reads typed amounts into ISO 4217 minor units", () => {
    expect(requireAllocationAmount("25.50", limits("USD"))).toBe(2_550);
    expect(requireAllocationAmount("1,234.50", limits("EUR"))).toBe(123_450);
    expect(requireAllocationAmount("1,500", limits("JPY"))).toBe(1_500);
    expect(requireAllocationAmount("1.234", limits("KWD"))).toBe(1_234);
  });

  it("refuses more decimals than the currency has, zero, negatives, and more than the fund or the campaign allows, on `amount`", () => {
    expect(problem("12.5", limits("JPY")).message).toMatch(/no decimals/);
    expect(problem("0.001", limits("USD")).message).toMatch(/at most 2 decimals/);
    expect(problem("1.2345", limits("KWD")).message).toMatch(/at most 3 decimals/);
    expect(problem("0", limits("USD")).message).toMatch(/more than zero/);
    expect(problem("-1", limits("USD")).message).toMatch(/more than zero/);
    expect(problem("10.01", limits("USD", 1_000)).message).toBe("Amount is more than the lab fund holds ($10).");
    expect(problem("5", limits("USD", 100_000, 499)).message).toBe("Amount is more than the campaign still needs ($4.99).");
    expect(problem("0", limits("USD"))).toMatchObject({ field: "amount", status: 422, code: "invalid_amount" });
  });
});

describe("assertCampaignTakesAllocations", () => {
  const now = new Date(Date.UTC(2027, 0, 1));
  it("only open campaigns before their deadline (409)", () => {
    expect(() => assertCampaignTakesAllocations({ state: "open", deadline: new Date(now.getTime() + 1) }, now)).not.toThrow();
    for (const campaign of [{ state: "funded", deadline: new Date(now.getTime() + 1) }, { state: "open", deadline: now }]) {
      try {
        assertCampaignTakesAllocations(campaign, now);
        throw new Error("expected a refusal");
      } catch (error) {
        expect(error).toMatchObject({ status: 409, code: "campaign_not_open" });
      }
    }
  });
});

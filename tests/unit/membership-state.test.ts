import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { addCalendarMonthsUtc, emptyFacts, hasPerks, membershipStatus, mergeEvidence, type MembershipEvidence } from "@/lib/memberships/state";
import { planPriceLookupKey } from "@/lib/memberships/plans";

/*
 * Check values and where they come from:
 * - monthly billing from an anchor: Stripe's billing-cycle documentation (from memory) — an anchor on
 *   31 January bills on 28 February in a common year (29 February in a leap year), then 31 March;
 *   an anchor on the 15th stays on the 15th;
 * - 2028 is a leap year (Gregorian rule: divisible by 4, not a century), 2027 is not.
 */

const utc = (y: number, m: number, d: number, h = 9, min = 30) => new Date(Date.UTC(y, m - 1, d, h, min));

describe("addCalendarMonthsUtc", () => {
  it("clamps to the end of a shorter month and keeps the anchor's day afterwards", () => {
    const anchor = utc(2027, 1, 31);
    expect(addCalendarMonthsUtc(anchor, 1)).toEqual(utc(2027, 2, 28));
    expect(addCalendarMonthsUtc(anchor, 2)).toEqual(utc(2027, 3, 31));
    expect(addCalendarMonthsUtc(anchor, 3)).toEqual(utc(2027, 4, 30));
    expect(addCalendarMonthsUtc(utc(2028, 1, 31), 1)).toEqual(utc(2028, 2, 29));
    expect(addCalendarMonthsUtc(utc(2027, 11, 15), 2)).toEqual(utc(2028, 1, 15));
  });
});

describe("membership facts", () => {
  const start = utc(2027, 1, 31);
  const feb = utc(2027, 2, 28);
  const mar = utc(2027, 3, 31);
  const apr = utc(2027, 4, 30);

  it("a failed renewal is past due until a later payment covers it; an end is final", () => {
    let facts = mergeEvidence(emptyFacts(start), { paidThrough: feb, startedAt: start });
    expect(membershipStatus(facts)).toBe("active");
    facts = mergeEvidence(facts, { paidThrough: feb, unpaidThrough: mar });
    expect(membershipStatus(facts)).toBe("past_due");
    facts = mergeEvidence(facts, { paidThrough: mar });
    expect(membershipStatus(facts)).toBe("active");
    facts = mergeEvidence(facts, { ended: { at: mar, canceledAt: feb } });
    expect(membershipStatus(facts)).toBe("canceled");
    expect(membershipStatus(mergeEvidence(facts, { paidThrough: apr }))).toBe("canceled");
  });

  it("perks need an active membership inside its paid period", () => {
    expect(hasPerks({ status: "active", currentPeriodEnd: feb }, utc(2027, 2, 27))).toBe(true);
    expect(hasPerks({ status: "active", currentPeriodEnd: feb }, feb)).toBe(false);
    expect(hasPerks({ status: "past_due", currentPeriodEnd: feb }, start)).toBe(false);
    expect(hasPerks({ status: "canceled", currentPeriodEnd: feb }, start)).toBe(false);
  });

  it("the newest cancel snapshot wins; same-instant snapshots agree on cancel", () => {
    const asked = mergeEvidence(emptyFacts(start), { cancelFlag: { value: true, at: feb } });
    expect(mergeEvidence(asked, { cancelFlag: { value: false, at: start } }).cancelAtPeriodEnd).toBe(true);
    expect(mergeEvidence(asked, { cancelFlag: { value: false, at: mar } }).cancelAtPeriodEnd).toBe(false);
    expect(mergeEvidence(asked, { cancelFlag: { value: false, at: feb } }).cancelAtPeriodEnd).toBe(true);
  });

  it("any order and any repetition of the same evidence gives the same facts (property test)", () => {
    const day = (n: number) => new Date(start.getTime() + n * 86_400_000);
    const evidence: fc.Arbitrary<MembershipEvidence> = fc.record(
      {
        paidThrough: fc.integer({ min: 0, max: 400 }).map(day),
        unpaidThrough: fc.integer({ min: 0, max: 400 }).map(day),
        ended: fc.record({ at: fc.integer({ min: 0, max: 400 }).map(day), canceledAt: fc.option(fc.integer({ min: 0, max: 400 }).map(day), { nil: null }) }),
        cancelFlag: fc.record({ value: fc.boolean(), at: fc.integer({ min: 0, max: 20 }).map(day) }),
        startedAt: fc.integer({ min: -5, max: 5 }).map(day),
      },
      { requiredKeys: [] },
    );
    fc.assert(
      fc.property(fc.array(evidence, { minLength: 1, maxLength: 12 }), fc.integer(), (items, seed) => {
        const inOrder = items.reduce(mergeEvidence, emptyFacts(start));
        const shuffled = [...items, ...items].sort((a, b) => (JSON.stringify(a) + seed).localeCompare(JSON.stringify(b) + seed) || 0).reverse();
        const scrambled = shuffled.reduce(mergeEvidence, emptyFacts(start));
        expect(scrambled).toEqual(inOrder);
      }),
      { numRuns: 300 },
    );
  });
});

describe("plan prices", () => {
  it("a lookup key names the plan, the currency and the amount in minor units (USD: 2 decimals, ISO 4217)", () => {
    expect(planPriceLookupKey({ code: "reel", name: "Reel", monthlyMinor: 1200, currency: "usd" })).toBe("filament-club:reel:USD:1200:month");
    expect(planPriceLookupKey({ code: "reel", name: "Reel", monthlyMinor: 1500, currency: "USD" })).not.toBe(planPriceLookupKey({ code: "reel", name: "Reel", monthlyMinor: 1200, currency: "USD" }));
  });
});

import { describe, expect, it } from "vitest";
import { amountInputValue, describeBounds, parsePledgeAmount, pledgeBounds, processorMinimumMinor, requirePledgeAmount } from "@/lib/pledges/amounts";
import { checkoutExpiresAt, isReusable } from "@/lib/pledges/rules";
import { decidePledgeEvent, sessionFacts, type SessionFacts } from "@/lib/pledges/webhook";
import { RuleViolation } from "@/lib/rule-violation";

/*
 * Check values and where they come from:
 * - minor-unit exponents: ISO 4217 (USD 2, JPY 0, KWD 3);
 * - the processor's minimum charges: Stripe's "Minimum and maximum charge amounts" table, from
 *   memory (USD 0.50, GBP 0.30, MXN 10.00, CZK 15.00, JPY 50);
 * - the lab's bounds ($5 to $1,000, suggestions 10/25/50/100): lab policy in lib/pledges/amounts.ts;
 * - Checkout Session lifetime of at least 30 minutes: Stripe's API reference for `expires_at` (from memory).
 */

describe("pledge bounds", () => {
  it("takes the larger of the lab minimum and the processor minimum, per currency", () => {
    expect(pledgeBounds("USD")).toEqual({ currency: "USD", minMinor: 500, maxMinor: 100_000, suggestedMinor: [1000, 2500, 5000, 10_000] });
    expect(processorMinimumMinor("USD")).toBe(50);
    expect(processorMinimumMinor("GBP")).toBe(30);
    expect(pledgeBounds("GBP").minMinor).toBe(500);
    // MXN 10.00 and CZK 15.00 are above the lab's 5 units: the processor's minimum wins.
    expect(pledgeBounds("MXN").minMinor).toBe(1000);
    expect(pledgeBounds("CZK").minMinor).toBe(1500);
    // Zero-decimal yen: one minor unit is one yen.
    expect(pledgeBounds("JPY")).toMatchObject({ minMinor: 500, maxMinor: 150_000 });
    // Three-decimal dinar: 5 KWD is 5000 minor units.
    expect(pledgeBounds("KWD")).toMatchObject({ minMinor: 5000, maxMinor: 1_000_000 });
    expect(describeBounds(pledgeBounds("USD"))).toBe("Between $5 and $1,000.");
    expect(() => pledgeBounds("XTS")).toThrow(RuleViolation);
  });

  it("parses typed amounts exactly and names the field in every message", () => {
    expect(parsePledgeAmount("25", "USD")).toEqual({ ok: true, amountMinor: 2500 });
    expect(parsePledgeAmount(" 25.5 ", "USD")).toEqual({ ok: true, amountMinor: 2550 });
    expect(parsePledgeAmount("1,000", "USD")).toEqual({ ok: true, amountMinor: 100_000 });
    expect(parsePledgeAmount("5", "USD")).toEqual({ ok: true, amountMinor: 500 });
    expect(parsePledgeAmount("4.99", "USD")).toEqual({ ok: false, message: "Amount must be at least $5." });
    expect(parsePledgeAmount("1000.01", "USD")).toEqual({ ok: false, message: "Amount can be at most $1,000." });
    expect(parsePledgeAmount("-25", "USD")).toMatchObject({ ok: false, message: expect.stringMatching(/^Amount must be a number/) });
    expect(parsePledgeAmount("2500.5", "JPY")).toEqual({ ok: false, message: "Amount must be a number such as 2500, with no decimals." });
    expect(parsePledgeAmount("5.250", "KWD")).toEqual({ ok: true, amountMinor: 5250 });
    expect(parsePledgeAmount("5.2501", "KWD")).toMatchObject({ ok: false, message: expect.stringMatching(/at most 3 decimals/) });
    try {
      requirePledgeAmount("1", "USD");
      expect.unreachable();
    } catch (error) {
      expect(error).toMatchObject({ status: 422, code: "invalid_amount", field: "amount" });
    }
    expect(amountInputValue(2550, "USD")).toBe("25.50");
    expect(amountInputValue(2500, "USD")).toBe("25");
    expect(amountInputValue(5250, "KWD")).toBe("5.250");
  });
});

describe("pledge rules", () => {
  const created = new Date("2031-03-01T10:00:00Z");
  const pledge = { supporterId: "u1", campaignId: "c1", amountMinor: 2500, state: "pending" as const, createdAt: created };
  const wanted = { supporterId: "u1", campaignId: "c1", amountMinor: 2500 };

  it("reuses only the supporter's own pending pledge, same campaign and amount, under five minutes old", () => {
    expect(isReusable(pledge, wanted, new Date(created.getTime() + 4 * 60_000))).toBe(true);
    expect(isReusable(pledge, wanted, new Date(created.getTime() + 5 * 60_000))).toBe(false);
    expect(isReusable(pledge, { ...wanted, amountMinor: 2600 }, created)).toBe(false);
    expect(isReusable(pledge, { ...wanted, supporterId: "u2" }, created)).toBe(false);
    expect(isReusable({ ...pledge, state: "paid" }, wanted, created)).toBe(false);
  });

  it("expires the session 36 minutes after the pledge: 30 minutes past the reuse window, plus a minute of skew", () => {
    expect(checkoutExpiresAt(created).toISOString()).toBe("2031-03-01T10:36:00.000Z");
  });
});

describe("webhook decisions", () => {
  const facts = (over: Partial<SessionFacts>): SessionFacts => ({
    type: "checkout.session.completed",
    sessionId: "cs_1",
    pledgeId: "p1",
    mode: "payment",
    paymentStatus: "paid",
    paymentIntentId: "pi_1",
    amountTotal: 2500,
    currency: "USD",
    occurredAt: new Date(0),
    ...over,
  });
  const pending = { state: "pending" as const, amountMinor: 2500, currency: "USD", checkoutSessionId: "cs_1" };

  it("reads the pledge id from metadata, else client_reference_id, and upper-cases the currency", () => {
    const event = { type: "checkout.session.expired", created: 1_900_000_000, data: { object: { id: "cs_9", object: "checkout.session", client_reference_id: "p9", metadata: {}, currency: "usd" } } };
    expect(sessionFacts(event as never)).toMatchObject({ type: "checkout.session.expired", sessionId: "cs_9", pledgeId: "p9", currency: "USD", occurredAt: new Date(1_900_000_000_000) });
    expect(sessionFacts({ type: "invoice.paid", created: 1, data: { object: {} } } as never)).toBeNull();
  });

  it("moves a pledge only along pending → paid | failed, whatever the order", () => {
    expect(decidePledgeEvent(facts({}), pending)).toEqual({ kind: "mark_paid", paymentIntentId: "pi_1" });
    expect(decidePledgeEvent(facts({ paymentStatus: "unpaid" }), pending)).toEqual({ kind: "ignore", reason: "payment_not_settled" });
    expect(decidePledgeEvent(facts({ type: "checkout.session.async_payment_succeeded" }), pending).kind).toBe("mark_paid");
    expect(decidePledgeEvent(facts({ type: "checkout.session.expired", paymentStatus: "unpaid" }), pending)).toEqual({ kind: "mark_failed" });
    expect(decidePledgeEvent(facts({ type: "checkout.session.async_payment_failed" }), pending)).toEqual({ kind: "mark_failed" });
    expect(decidePledgeEvent(facts({ type: "checkout.session.expired" }), { ...pending, state: "paid" })).toEqual({ kind: "ignore", reason: "already_paid" });
    expect(decidePledgeEvent(facts({}), { ...pending, state: "paid" })).toEqual({ kind: "ignore", reason: "already_paid" });
    expect(decidePledgeEvent(facts({}), { ...pending, state: "refunded" })).toEqual({ kind: "ignore", reason: "already_refunded" });
    expect(decidePledgeEvent(facts({}), undefined)).toEqual({ kind: "ignore", reason: "unknown_session" });
    expect(decidePledgeEvent(facts({ sessionId: "cs_2" }), pending)).toEqual({ kind: "ignore", reason: "other_session" });
    expect(decidePledgeEvent(facts({ amountTotal: 100 }), pending)).toEqual({ kind: "ignore", reason: "amount_mismatch" });
    expect(decidePledgeEvent(facts({ mode: "subscription" }), pending)).toEqual({ kind: "ignore", reason: "not_a_payment" });
  });
});

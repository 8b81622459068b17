import { describe, expect, it } from "vitest";
import {
  decideRefund,
  deadlineOutcome,
  handleRefundRefusal,
  isWithdrawable,
  refundFactsFromEvent,
  refundFactsOf,
  refundIdempotencyKey,
  refundRetryDelayMs,
  type RefundablePledge,
} from "@/lib/pledges/refunds";
import { withdrawCampaignSchema } from "@/lib/validation/campaign-close";

/*
 * Sources:
 * - the refund object (`object: "refund"`, `amount`, `currency` lower-case, `status` one of pending,
 *   requires_action, succeeded, failed, canceled; `payment_intent`; `metadata`; `created` in seconds)
 *   and the events that carry it: Stripe's API reference for refunds and its event types list (from memory);
 * - which errors are safe to retry with the same idempotency key (409 for a concurrent request with
 *   the same key, 429, 5xx, no answer at all) and the codes `charge_already_refunded` and
 *   `resource_missing`: Stripe's error-handling and error-codes pages (from memory).
 */

const refund = (overrides: Record<string, unknown> = {}) => ({
  id: "re_1",
  object: "refund",
  amount: 2_500,
  currency: "usd",
  status: "succeeded",
  created: 1_800_000_000,
  payment_intent: "pi_1",
  metadata: { pledge_id: "pl_1" },
  ...overrides,
});
const pledge = (overrides: Partial<RefundablePledge> = {}): RefundablePledge => ({
  id: "pl_1",
  state: "paid",
  amountMinor: 2_500,
  currency: "USD",
  paymentIntentId: "pi_1",
  refundId: null,
  ...overrides,
});

describe("refund facts", () => {
  it("maps a refund object once, whatever carries it", () => {
    expect(refundFactsOf(refund())).toEqual({
      refundId: "re_1",
      paymentIntentId: "pi_1",
      pledgeId: "pl_1",
      amountMinor: 2_500,
      currency: "USD",
      status: "succeeded",
      createdAt: new Date(1_800_000_000_000),
    });
    expect(refundFactsOf({ ...refund(), object: "charge" })).toBeNull();
    const event = (type: string, object: unknown) => ({ type, data: { object } });
    expect(refundFactsFromEvent(event("refund.created", refund()))).toHaveLength(1);
    expect(refundFactsFromEvent(event("refund.updated", refund({ status: "failed" })))[0]?.status).toBe("failed");
    // charge.refunded lists its refunds only on older API versions; otherwise it carries none.
    expect(refundFactsFromEvent(event("charge.refunded", { object: "charge", refunds: { data: [refund()] } }))).toHaveLength(1);
    expect(refundFactsFromEvent(event("charge.refunded", { object: "charge", amount_refunded: 2_500 }))).toEqual([]);
    expect(refundFactsFromEvent(event("checkout.session.completed", refund()))).toEqual([]);
  });
});

describe("deciding a refund report", () => {
  const facts = (overrides: Record<string, unknown> = {}) => refundFactsOf(refund(overrides))!;

  it("records a succeeded full refund of a paid pledge, once", () => {
    expect(decideRefund(facts(), pledge())).toEqual({ kind: "record" });
    expect(decideRefund(facts(), pledge({ state: "refunded", refundId: "re_1" }))).toEqual({ kind: "ignore", reason: "already_refunded" });
  });

  it("waits on a pending refund and flags a failed or canceled one", () => {
    expect(decideRefund(facts({ status: "pending" }), pledge())).toEqual({ kind: "pending" });
    expect(decideRefund(facts({ status: "failed" }), pledge())).toEqual({ kind: "failed", status: "failed" });
    expect(decideRefund(facts({ status: "canceled" }), pledge())).toEqual({ kind: "failed", status: "canceled" });
  });

  it("ignores another payment's refund, a partial refund, another currency and unpaid pledges", () => {
    expect(decideRefund(facts({ payment_intent: "pi_other" }), pledge())).toMatchObject({ kind: "ignore", reason: "other_payment" });
    expect(decideRefund(facts({ amount: 1_000 }), pledge())).toMatchObject({ kind: "ignore", reason: "partial_or_other_amount" });
    expect(decideRefund(facts({ currency: "eur" }), pledge())).toMatchObject({ kind: "ignore", reason: "partial_or_other_amount" });
    expect(decideRefund(facts(), pledge({ state: "pending" }))).toMatchObject({ kind: "ignore", reason: "pledge_pending" });
    expect(decideRefund(facts(), undefined)).toMatchObject({ kind: "ignore", reason: "unknown_pledge" });
  });
});

describe("refused refund requests", () => {
  it("retries what may succeed later and flags what will not", () => {
    expect(handleRefundRefusal({ statusCode: null }, "pi_1")).toEqual({ kind: "retry" });
    expect(handleRefundRefusal({ statusCode: 409, type: "idempotency_error" }, "pi_1")).toEqual({ kind: "retry" });
    expect(handleRefundRefusal({ statusCode: 429 }, "pi_1")).toEqual({ kind: "retry" });
    expect(handleRefundRefusal({ statusCode: 503 }, "pi_1")).toEqual({ kind: "retry" });
    expect(handleRefundRefusal({ statusCode: 400, code: "charge_already_refunded" }, "pi_1")).toEqual({ kind: "find_existing" });
    expect(handleRefundRefusal({ statusCode: 400, code: "resource_missing" }, "pi_seed_abc")).toEqual({ kind: "outside_processor" });
    expect(handleRefundRefusal({ statusCode: 400, code: "resource_missing", message: "No such payment_intent: 'pi_9'" }, "pi_9")).toEqual({ kind: "attention", message: "No such payment_intent: 'pi_9'" });
    expect(handleRefundRefusal({ statusCode: 400, code: "charge_disputed" }, "pi_1").kind).toBe("attention");
  });

  it("backs off 30 s, 1 min, 2 min … up to an hour, and keys each pledge's refund by its id", () => {
    expect([1, 2, 3, 4, 8, 20].map(refundRetryDelayMs)).toEqual([30_000, 60_000, 120_000, 240_000, 3_600_000, 3_600_000]);
    expect(refundIdempotencyKey("abc")).toBe("pledge-refund:abc");
  });
});

describe("closing campaigns", () => {
  const deadline = new Date("2026-03-20T10:59:59Z");
  const open = { state: "open", deadline, goalMinor: 10_000 };

  it("lapses an open campaign short of its goal at its deadline, funds one that reached it, and leaves the rest", () => {
    expect(deadlineOutcome(open, 9_999, new Date(deadline.getTime() - 1))).toBeNull();
    expect(deadlineOutcome(open, 9_999, deadline)).toBe("lapse");
    expect(deadlineOutcome(open, 10_000, deadline)).toBe("fund");
    expect(deadlineOutcome({ ...open, state: "funded" }, 0, deadline)).toBeNull();
  });

  it("lets a host withdraw only before printing, with a reason of at least 10 characters", () => {
    expect(["open", "funded", "queued", "printing", "reported", "lapsed", "withdrawn"].filter(isWithdrawable)).toEqual(["open", "funded", "queued"]);
    expect(withdrawCampaignSchema.safeParse({ reason: "   too short " }).error?.issues[0]?.path).toEqual(["reason"]);
    expect(withdrawCampaignSchema.parse({ reason: "  The part was recalled by its maker.  " })).toEqual({ reason: "The part was recalled by its maker." });
  });
});

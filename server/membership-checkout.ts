import "server-only";
import Stripe from "stripe";
import { asProcessorError } from "@/server/stripe";
import type { Db } from "@/db/client";
import {
  applySubscriptionSnapshot,
  closeFinishedCancellations,
  findBillingCustomerId,
  findLiveMembership,
  findPlan,
  markCancelRequested,
  saveBillingCustomer,
  setPlanPriceId,
} from "@/db/queries/memberships";
import type { MembershipPlan } from "@/db/schema";
import { MEMBERSHIP_METADATA } from "@/lib/memberships/webhook";
import {
  assertCanJoin,
  joinWindow,
  planIdempotencyKeys,
  planPriceLookupKey,
  planProductId,
  type PlanCode,
} from "@/lib/memberships/plans";
import { RuleViolation } from "@/lib/rule-violation";

/*
 * When plans reach the processor: lazily, on the first join of each plan (and again whenever the
 * stored price id is missing, e.g. on a fresh database). The price is found by its lookup key
 * before anything is created, and every create carries an idempotency key, so a restart, a second
 * app process or two first joins at once end up with one product and one price per plan.
 */

type StoredPlan = Pick<MembershipPlan, "code" | "name" | "monthlyMinor" | "currency" | "monthlyVotes" | "stripePriceId">;

function pricing(plan: StoredPlan) {
  return { code: plan.code, name: plan.name, monthlyMinor: plan.monthlyMinor, currency: plan.currency };
}

function isResourceError(error: unknown, code: string): boolean {
  return asProcessorError(error)?.code === code;
}

async function ensurePlanProduct(stripe: Stripe, plan: StoredPlan): Promise<string> {
  const id = planProductId(plan.code);
  try {
    const product = await stripe.products.create(
      { id, name: `Filament Club: ${plan.name}`, description: `Proofbay Filament Club, ${plan.name} plan`, metadata: { plan_code: plan.code } },
      { idempotencyKey: planIdempotencyKeys.product(plan.code) },
    );
    return product.id;
  } catch (error) {
    // Made before (by an earlier run whose idempotency key has since expired): use it.
    if (isResourceError(error, "resource_already_exists")) return (await stripe.products.retrieve(id)).id;
    throw error;
  }
}

/** The plan's monthly price at the processor: found by lookup key, else created once; stored on the plan. */
export async function ensurePlanPrice(db: Db, stripe: Stripe, plan: StoredPlan): Promise<string> {
  if (plan.stripePriceId) return plan.stripePriceId;
  const lookupKey = planPriceLookupKey(pricing(plan));
  const found = await stripe.prices.list({ lookup_keys: [lookupKey], active: true, limit: 1 });
  let priceId = found.data[0]?.id;
  if (!priceId) {
    const product = await ensurePlanProduct(stripe, plan);
    const price = await stripe.prices.create(
      {
        product,
        currency: plan.currency.toLowerCase(),
        unit_amount: plan.monthlyMinor,
        recurring: { interval: "month", interval_count: 1 },
        lookup_key: lookupKey,
        transfer_lookup_key: true,
        nickname: `Filament Club ${plan.name}, monthly`,
        metadata: { plan_code: plan.code },
      },
      { idempotencyKey: planIdempotencyKeys.price(pricing(plan)) },
    );
    priceId = price.id;
  }
  setPlanPriceId(db, plan.code, priceId);
  return priceId;
}

/** Every plan's price, for a stack that wants them before the first join (e.g. a setup script). */
export async function ensureAllPlanPrices(db: Db, stripe: Stripe, plans: StoredPlan[]): Promise<Record<string, string>> {
  const prices: Record<string, string> = {};
  for (const plan of plans) prices[plan.code] = await ensurePlanPrice(db, stripe, plan);
  return prices;
}

/** The person's processor customer: stored, else created once under an idempotency key per person. */
export async function ensureCustomer(db: Db, stripe: Stripe, person: { id: string; email: string; name: string | null }): Promise<string> {
  const stored = findBillingCustomerId(db, person.id);
  if (stored) return stored;
  const customer = await stripe.customers.create(
    { email: person.email, ...(person.name ? { name: person.name } : {}), metadata: { user_id: person.id } },
    { idempotencyKey: planIdempotencyKeys.customer(person.id) },
  );
  return saveBillingCustomer(db, person.id, customer.id);
}

export type JoinCheckout = { kind: "redirect"; url: string; sessionId: string } | { kind: "processor_error"; message: string };

/**
 * Starts joining a plan: one live membership at a time (409), then the plan's price and the
 * person's customer, then a subscription-mode Checkout Session whose price and metadata the
 * server sets. Nothing is fulfilled here: the webhook makes the membership.
 */
export async function startMembershipCheckout(
  db: Db,
  stripe: Stripe,
  input: { planCode: PlanCode; person: { id: string; email: string; name: string | null }; appUrl: string },
  now = new Date(),
): Promise<JoinCheckout> {
  const plan = findPlan(db, input.planCode);
  if (!plan) throw new RuleViolation(404, "not_found", "No such Filament Club plan.", "plan");
  closeFinishedCancellations(db, input.person.id, now);
  assertCanJoin(findLiveMembership(db, input.person.id));
  try {
    const price = await ensurePlanPrice(db, stripe, plan);
    const customer = await ensureCustomer(db, stripe, input.person);
    const window = joinWindow(now);
    const metadata = { [MEMBERSHIP_METADATA.userId]: input.person.id, [MEMBERSHIP_METADATA.planCode]: plan.code };
    const session = await stripe.checkout.sessions.create(
      {
        mode: "subscription",
        line_items: [{ price, quantity: 1 }],
        customer,
        metadata,
        subscription_data: { metadata, description: `Filament Club ${plan.name}` },
        success_url: `${input.appUrl}/account/membership?joined={CHECKOUT_SESSION_ID}`,
        cancel_url: `${input.appUrl}/club`,
      },
      { idempotencyKey: planIdempotencyKeys.checkout(input.person.id, plan.code, window) },
    );
    if (!session.url) return { kind: "processor_error", message: "This payment page is no longer available. Try joining again." };
    return { kind: "redirect", url: session.url, sessionId: session.id };
  } catch (error) {
    console.error(`Filament Club checkout for ${input.person.id} failed:`, error instanceof Error ? error.message : error);
    return { kind: "processor_error", message: "The card processor did not accept the request. Try again in a minute." };
  }
}

export type CancelOutcome = { kind: "scheduled"; periodEnd: Date } | { kind: "processor_error"; message: string };

/**
 * Cancels the person's live membership at the end of the period already paid for, through the
 * subscriptions API under an idempotency key, and shows the processor's answer at once (the
 * webhook brings the same state again). Perks run until the period ends.
 */
export async function cancelMembership(db: Db, stripe: Stripe, personId: string, now = new Date()): Promise<CancelOutcome> {
  const live = findLiveMembership(db, personId);
  if (!live) throw new RuleViolation(409, "not_member", "You have no membership to cancel.");
  if (!live.subscriptionId) throw new RuleViolation(409, "not_member", "This membership is not billed by the card processor.");
  try {
    const subscription = await stripe.subscriptions.update(live.subscriptionId, { cancel_at_period_end: true }, { idempotencyKey: planIdempotencyKeys.cancel(live.subscriptionId) });
    // The processor's own time of the change (the event it sends carries the same second).
    const at = subscription.canceled_at ? new Date(subscription.canceled_at * 1000) : now;
    const updated = applySubscriptionSnapshot(db, subscription, at);
    return { kind: "scheduled", periodEnd: updated?.currentPeriodEnd ?? now };
  } catch (error) {
    if (isResourceError(error, "resource_missing")) {
      // The processor bills nothing for it (the demo's seeded members): stop at the paid period's end.
      markCancelRequested(db, live.id, now);
      return { kind: "scheduled", periodEnd: live.currentPeriodEnd };
    }
    console.error(`Cancelling subscription ${live.subscriptionId} failed:`, error instanceof Error ? error.message : error);
    return { kind: "processor_error", message: "The card processor did not accept the request. Try again in a minute." };
  }
}

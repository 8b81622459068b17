import { and, asc, desc, eq, inArray, ne, sql } from "drizzle-orm";
import { formatDate, formatMoney } from "../../lib/format";
import { emptyFacts, hasPerks, membershipStatus, mergeEvidence, type MembershipEvidence, type MembershipFacts } from "../../lib/memberships/state";
import { isPlanCode, type PlanCode } from "../../lib/memberships/plans";
import { membershipEventFacts, membershipKeys, type InvoiceFacts, type MembershipEventFacts } from "../../lib/memberships/webhook";
import type { Db } from "../client";
import { billingCustomers, labSettings, ledgerEntries, membershipPlans, memberships, users, type Membership, type MembershipPlan } from "../schema";
import { enqueueMail } from "./outbox";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/* ---------- Plans and customers ---------- */

export function listPlans(db: Db | Tx): MembershipPlan[] {
  return db.select().from(membershipPlans).orderBy(asc(membershipPlans.position)).all();
}

export function findPlan(db: Db | Tx, code: PlanCode): MembershipPlan | undefined {
  return db.select().from(membershipPlans).where(eq(membershipPlans.code, code)).get();
}

/** Stores the processor price a plan is sold at (found or created by server/membership-checkout.ts). */
export function setPlanPriceId(db: Db, code: PlanCode, priceId: string): void {
  db.update(membershipPlans).set({ stripePriceId: priceId }).where(eq(membershipPlans.code, code)).run();
}

export function findBillingCustomerId(db: Db | Tx, userId: string): string | undefined {
  return db.select({ customerId: billingCustomers.customerId }).from(billingCustomers).where(eq(billingCustomers.userId, userId)).get()?.customerId;
}

/** Keeps the first customer stored for a person; returns the one that is stored. */
export function saveBillingCustomer(db: Db, userId: string, customerId: string, now = new Date()): string {
  db.insert(billingCustomers).values({ userId, customerId, createdAt: now }).onConflictDoNothing({ target: billingCustomers.userId }).run();
  return findBillingCustomerId(db, userId) ?? customerId;
}

/* ---------- Perks ---------- */

export type MemberPerks = { planCode: PlanCode; planName: string; monthlyVotes: number; earlyBlindPairs: boolean; currentPeriodEnd: Date };

/**
 * The perks of the person's membership right now, or null: only an active membership inside its
 * paid period counts (lib/memberships/state.ts `hasPerks`); past due and ended ones give nothing.
 */
export function memberPerks(db: Db | Tx, userId: string, now: Date): MemberPerks | null {
  const rows = db
    .select({ membership: memberships, plan: membershipPlans })
    .from(memberships)
    .innerJoin(membershipPlans, eq(membershipPlans.code, memberships.planCode))
    .where(and(eq(memberships.userId, userId), eq(memberships.status, "active"), sql`${memberships.currentPeriodEnd} > ${now.getTime()}`))
    .all();
  const row = rows.find((candidate) => hasPerks(candidate.membership, now));
  if (!row) return null;
  return {
    planCode: row.plan.code,
    planName: row.plan.name,
    monthlyVotes: row.plan.monthlyVotes,
    earlyBlindPairs: row.plan.earlyBlindPairs,
    currentPeriodEnd: row.membership.currentPeriodEnd,
  };
}

/** Whether the person may judge blind pairs before they open to everyone (a Reel or Workshop perk). */
export function hasEarlyBlindPairAccess(db: Db | Tx, userId: string, now: Date): boolean {
  return memberPerks(db, userId, now)?.earlyBlindPairs === true;
}

/* ---------- Reads for the account page ---------- */

export type OwnMembership = Membership & { plan: MembershipPlan; perksNow: boolean };

/** The person's live membership, else their latest one; explicit user id, no session lookup. */
export function findOwnMembership(db: Db, userId: string, now: Date): OwnMembership | undefined {
  const rows = db
    .select({ membership: memberships, plan: membershipPlans })
    .from(memberships)
    .innerJoin(membershipPlans, eq(membershipPlans.code, memberships.planCode))
    .where(eq(memberships.userId, userId))
    .orderBy(desc(memberships.startedAt))
    .all();
  const row = rows.find((candidate) => candidate.membership.status !== "canceled") ?? rows[0];
  return row ? { ...row.membership, plan: row.plan, perksNow: hasPerks(row.membership, now) } : undefined;
}

/**
 * Ends memberships whose member asked to stop and whose paid period is over, when the processor
 * never said so itself (a subscription it does not know, such as the demo's seeded ones).
 */
export function closeFinishedCancellations(db: Db | Tx, userId: string, now: Date): void {
  db.update(memberships)
    .set({ status: "canceled", endedAt: memberships.currentPeriodEnd })
    .where(
      and(
        eq(memberships.userId, userId),
        eq(memberships.status, "active"),
        eq(memberships.cancelAtPeriodEnd, true),
        sql`${memberships.currentPeriodEnd} <= ${now.getTime()}`,
      ),
    )
    .run();
}

/** The membership still billing (active or past due), which blocks joining a second time. */
export function findLiveMembership(db: Db | Tx, userId: string) {
  return db
    .select({ id: memberships.id, status: memberships.status, subscriptionId: memberships.subscriptionId, currentPeriodEnd: memberships.currentPeriodEnd, planName: membershipPlans.name })
    .from(memberships)
    .innerJoin(membershipPlans, eq(membershipPlans.code, memberships.planCode))
    .where(and(eq(memberships.userId, userId), inArray(memberships.status, ["active", "past_due"])))
    .get();
}

/* ---------- Webhook effects ---------- */

export type MembershipEventOutcome = {
  membershipId: string;
  status: Membership["status"];
  ledgerRow: boolean;
  mails: string[];
};

function factsOf(row: Membership): MembershipFacts {
  return {
    paidThrough: row.currentPeriodEnd,
    unpaidThrough: row.unpaidPeriodEnd,
    endedAt: row.endedAt,
    canceledAt: row.canceledAt,
    cancelAtPeriodEnd: row.cancelAtPeriodEnd,
    cancelFlagAt: row.cancelFlagAt,
    startedAt: row.startedAt,
  };
}

function columnsOf(facts: MembershipFacts) {
  return {
    status: membershipStatus(facts),
    currentPeriodEnd: facts.paidThrough,
    unpaidPeriodEnd: facts.unpaidThrough,
    endedAt: facts.endedAt,
    canceledAt: facts.canceledAt,
    cancelAtPeriodEnd: facts.cancelAtPeriodEnd,
    cancelFlagAt: facts.cancelFlagAt,
    startedAt: facts.startedAt,
  };
}

/**
 * Folds evidence into the subscription's membership row, creating it on the first event that
 * names a known person and plan. A person has one live membership at a time (a unique index); a
 * second paid subscription for someone who already has one is kept as an ended record and logged,
 * for a host to refund, rather than failing the webhook forever.
 */
function upsertMembership(tx: Tx, facts: Pick<MembershipEventFacts, "subscriptionId" | "userId" | "planCode">, evidence: MembershipEvidence, now: Date): Membership | undefined {
  const existing = tx.select().from(memberships).where(eq(memberships.subscriptionId, facts.subscriptionId)).get();
  const base = existing ? factsOf(existing) : emptyFacts(evidence.startedAt ?? new Date(0));
  const merged = columnsOf(mergeEvidence(base, evidence));
  const userId = existing?.userId ?? facts.userId;
  if (!userId) return undefined;
  const live = merged.status !== "canceled";
  if (live) closeFinishedCancellations(tx, userId, now);
  const otherLive = live
    ? tx
        .select({ id: memberships.id })
        .from(memberships)
        .where(
          and(
            eq(memberships.userId, userId),
            inArray(memberships.status, ["active", "past_due"]),
            existing ? ne(memberships.id, existing.id) : sql`1 = 1`,
          ),
        )
        .get()
    : undefined;
  if (otherLive) {
    console.warn(`Subscription ${facts.subscriptionId} is a second live membership for user ${userId}; recorded as ended for a host to refund.`);
    merged.status = "canceled";
  }

  if (existing) {
    return tx.update(memberships).set(merged).where(eq(memberships.id, existing.id)).returning().get();
  }
  if (!facts.planCode || !isPlanCode(facts.planCode) || !findPlan(tx, facts.planCode)) return undefined;
  if (!tx.select({ id: users.id }).from(users).where(eq(users.id, userId)).get()) return undefined;
  return tx
    .insert(memberships)
    .values({ userId, planCode: facts.planCode, subscriptionId: facts.subscriptionId, ...merged })
    .returning()
    .get();
}

function labTimeZone(tx: Tx): string {
  return tx.select({ timeZone: labSettings.timeZone }).from(labSettings).where(eq(labSettings.id, 1)).get()?.timeZone ?? "UTC";
}

/** Income from one paid invoice, once per invoice, accruing to the lab fund; and its receipt. */
function recordPayment(tx: Tx, membership: Membership, plan: MembershipPlan, invoice: InvoiceFacts, options: { appUrl: string; now: Date }): { ledgerRow: boolean; mail: boolean } {
  const renewal = invoice.billingReason === "subscription_cycle";
  const ledger = tx
    .insert(ledgerEntries)
    .values({
      kind: "membership_payment",
      amountMinor: invoice.amountMinor,
      currency: invoice.currency,
      membershipId: membership.id,
      externalRef: membershipKeys.paymentRef(invoice.invoiceId),
      memo: `Filament Club ${plan.name}, ${renewal ? "renewal" : "first month"} (invoice ${invoice.number ?? invoice.invoiceId})`,
      occurredAt: invoice.occurredAt,
    })
    .onConflictDoNothing({ target: ledgerEntries.externalRef })
    .run();

  const member = tx.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, membership.userId)).get();
  if (!member?.email) return { ledgerRow: ledger.changes === 1, mail: false };
  const timeZone = labTimeZone(tx);
  enqueueMail(
    tx,
    {
      dedupeKey: membershipKeys.receipt(invoice.invoiceId),
      toAddress: member.email,
      template: "membership-receipt",
      subject: renewal ? `Your Filament Club ${plan.name} membership renewed` : `Welcome to the Filament Club: ${plan.name}`,
      payload: {
        name: member.name,
        planName: plan.name,
        amount: formatMoney(invoice.amountMinor, invoice.currency),
        paidOn: formatDate(invoice.occurredAt, timeZone),
        periodEnd: formatDate(invoice.periodEnd, timeZone),
        renewal,
        invoiceRef: invoice.number ?? invoice.invoiceId,
        monthlyVotes: plan.monthlyVotes,
        earlyBlindPairs: plan.earlyBlindPairs,
        membershipUrl: `${options.appUrl}/account/membership`,
      },
    },
    options.now,
  );
  return { ledgerRow: ledger.changes === 1, mail: true };
}

function recordFailure(tx: Tx, membership: Membership, plan: MembershipPlan, invoice: InvoiceFacts, options: { appUrl: string; now: Date }): boolean {
  const member = tx.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, membership.userId)).get();
  if (!member?.email) return false;
  const timeZone = labTimeZone(tx);
  enqueueMail(
    tx,
    {
      dedupeKey: membershipKeys.renewalFailed(invoice.invoiceId),
      toAddress: member.email,
      template: "membership-renewal-failed",
      subject: `Your Filament Club ${plan.name} renewal did not go through`,
      payload: {
        name: member.name,
        planName: plan.name,
        amount: formatMoney(invoice.amountMinor, invoice.currency),
        failedOn: formatDate(invoice.occurredAt, timeZone),
        nextAttemptOn: invoice.nextAttemptAt ? formatDate(invoice.nextAttemptAt, timeZone) : null,
        invoiceRef: invoice.number ?? invoice.invoiceId,
        membershipUrl: `${options.appUrl}/account/membership`,
      },
    },
    options.now,
  );
  return true;
}

/**
 * The membership effects of one verified processor event, inside the webhook's transaction (the
 * one that records the event id). Null when the event is not about a Filament Club subscription
 * (no subscription, or metadata that names no known person and plan). Every write is a merge of
 * one-way facts or an insert under a unique key, so duplicates and any order give the same rows.
 */
export function applyMembershipEvent(
  tx: Tx,
  event: { type: string; created: number; data: { object: unknown } },
  options: { appUrl: string; now?: Date },
): MembershipEventOutcome | null {
  const facts = membershipEventFacts(event as Parameters<typeof membershipEventFacts>[0]);
  if (!facts) return null;
  const membership = upsertMembership(tx, facts, facts.evidence, options.now ?? new Date());
  if (!membership) return null;
  const plan = findPlan(tx, membership.planCode as PlanCode);
  if (!plan) return null;
  if (facts.customerId) {
    tx.insert(billingCustomers).values({ userId: membership.userId, customerId: facts.customerId, createdAt: options.now ?? new Date() }).onConflictDoNothing().run();
  }
  const context = { appUrl: options.appUrl, now: options.now ?? new Date() };
  const outcome: MembershipEventOutcome = { membershipId: membership.id, status: membership.status, ledgerRow: false, mails: [] };
  if (facts.paidInvoice) {
    const recorded = recordPayment(tx, membership, plan, facts.paidInvoice, context);
    outcome.ledgerRow = recorded.ledgerRow;
    if (recorded.mail) outcome.mails.push("membership-receipt");
  }
  if (facts.failedInvoice && recordFailure(tx, membership, plan, facts.failedInvoice, context)) outcome.mails.push("membership-renewal-failed");
  return outcome;
}

/**
 * Applies a subscription the processor just returned to our own request (the member's cancel), so
 * the page shows the new state at once; the webhook brings the same snapshot again later.
 */
export function applySubscriptionSnapshot(db: Db, subscription: unknown, at: Date): Membership | undefined {
  return db.transaction(
    (tx) => {
      const facts = membershipEventFacts({ type: "customer.subscription.updated", created: Math.floor(at.getTime() / 1000), data: { object: subscription } } as Parameters<typeof membershipEventFacts>[0]);
      if (!facts) return undefined;
      return upsertMembership(tx, facts, facts.evidence, at);
    },
    { behavior: "immediate" },
  );
}

/**
 * A cancellation for a subscription the processor does not know (the demo's seeded members):
 * nothing is billed any more, so the membership stops at the end of its paid period.
 */
export function markCancelRequested(db: Db, membershipId: string, at: Date): void {
  db.update(memberships)
    .set({ cancelAtPeriodEnd: true, cancelFlagAt: at, canceledAt: at })
    .where(and(eq(memberships.id, membershipId), inArray(memberships.status, ["active", "past_due"])))
    .run();
}

import { and, desc, eq, gt, inArray, isNull, or, sql } from "drizzle-orm";
import { formatDate, formatMoney } from "../../lib/format";
import { requirePledgeAmount } from "../../lib/pledges/amounts";
import { assertCampaignTakesPledges, isReusable, PLEDGE_REUSE_WINDOW_MS } from "../../lib/pledges/rules";
import { decidePledgeEvent, pledgeKeys, reachesGoal, sessionFacts, type PledgeDecision } from "../../lib/pledges/webhook";
import { RuleViolation } from "../../lib/rule-violation";
import type { Db } from "../client";
import { campaigns, labSettings, ledgerEntries, pledges, users, type Campaign, type Pledge } from "../schema";
import { enqueueMail } from "./outbox";
import { materialiseJobs } from "./queue-jobs";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/* ---------- Starting a pledge ---------- */

export type OpenedPledge = { pledge: Pledge; campaign: Campaign; reused: boolean };

/**
 * Step one of a pledge, in one IMMEDIATE transaction: the campaign must be open and before its
 * deadline (409), the amount within the bounds (422 on `amount`); then either the supporter's own
 * pending pledge on this campaign for the same amount from the last five minutes is reused (a
 * double click, lib/pledges/rules.ts `isReusable`), or a new `pending` pledge is written.
 */
export function openPendingPledge(
  db: Db | Tx,
  input: { slug: string; supporterId: string; amountText: string; publicName: string | null },
  now = new Date(),
): OpenedPledge {
  return db.transaction(
    (tx) => {
      const campaign = tx.select().from(campaigns).where(eq(campaigns.slug, input.slug)).get();
      if (!campaign) throw new RuleViolation(404, "not_found", "No such campaign.");
      assertCampaignTakesPledges(campaign, now);
      const amountMinor = requirePledgeAmount(input.amountText, campaign.currency);

      const wanted = { supporterId: input.supporterId, campaignId: campaign.id, amountMinor };
      const recent = tx
        .select()
        .from(pledges)
        .where(
          and(
            eq(pledges.supporterId, input.supporterId),
            eq(pledges.campaignId, campaign.id),
            eq(pledges.state, "pending"),
            eq(pledges.amountMinor, amountMinor),
            gt(pledges.createdAt, new Date(now.getTime() - PLEDGE_REUSE_WINDOW_MS)),
          ),
        )
        .orderBy(desc(pledges.createdAt))
        .all()
        .find((row) => isReusable(row, wanted, now));
      if (recent) {
        if (recent.publicName === input.publicName) return { pledge: recent, campaign, reused: true };
        const updated = tx.update(pledges).set({ publicName: input.publicName }).where(eq(pledges.id, recent.id)).returning().get();
        return { pledge: updated ?? recent, campaign, reused: true };
      }

      const pledge = tx
        .insert(pledges)
        .values({ campaignId: campaign.id, supporterId: input.supporterId, amountMinor, currency: campaign.currency, state: "pending", publicName: input.publicName, createdAt: now })
        .returning()
        .get();
      return { pledge, campaign, reused: false };
    },
    { behavior: "immediate" },
  );
}

/** Stores the Checkout Session on its pledge (once; a retry with the same session is a no-op). */
export function attachCheckoutSession(db: Db | Tx, pledgeId: string, sessionId: string): void {
  const result = db
    .update(pledges)
    .set({ checkoutSessionId: sessionId })
    .where(and(eq(pledges.id, pledgeId), or(isNull(pledges.checkoutSessionId), eq(pledges.checkoutSessionId, sessionId))))
    .run();
  if (result.changes !== 1) throw new Error(`Pledge ${pledgeId} already has another Checkout Session.`);
}

/** A pending pledge whose session could not be created at all (the processor refused the request). */
export function failUnstartedPledge(db: Db, pledgeId: string): void {
  db.update(pledges)
    .set({ state: "failed" })
    .where(and(eq(pledges.id, pledgeId), eq(pledges.state, "pending"), isNull(pledges.checkoutSessionId)))
    .run();
}

/* ---------- Webhook effects ---------- */

export type PledgeEventOutcome = { pledgeId: string | null; decision: PledgeDecision; funded: boolean };

function findPledgeForSession(tx: Tx, sessionId: string, pledgeId: string | null): Pledge | undefined {
  if (pledgeId) {
    const byId = tx.select().from(pledges).where(eq(pledges.id, pledgeId)).get();
    if (byId) return byId;
  }
  return tx.select().from(pledges).where(eq(pledges.checkoutSessionId, sessionId)).get();
}

/**
 * The pledge effects of one verified processor event, inside the webhook's transaction (the one
 * that records the event id). Null when the event is not a pledge's Checkout event.
 */
export function applyPledgeEvent(
  tx: Tx,
  event: { type: string; created: number; data: { object: unknown } },
  options: { appUrl: string; now?: Date },
): PledgeEventOutcome | null {
  const facts = sessionFacts(event as Parameters<typeof sessionFacts>[0]);
  if (!facts) return null;
  const pledge = findPledgeForSession(tx, facts.sessionId, facts.pledgeId);
  const decision = decidePledgeEvent(facts, pledge);
  if (!pledge || decision.kind === "ignore") return { pledgeId: pledge?.id ?? null, decision, funded: false };

  if (decision.kind === "mark_failed") {
    tx.update(pledges)
      .set({ state: "failed", checkoutSessionId: facts.sessionId })
      .where(and(eq(pledges.id, pledge.id), eq(pledges.state, "pending")))
      .run();
    return { pledgeId: pledge.id, decision, funded: false };
  }

  const paidAt = facts.occurredAt;
  const marked = tx
    .update(pledges)
    .set({ state: "paid", paidAt, paymentIntentId: decision.paymentIntentId, checkoutSessionId: facts.sessionId })
    .where(and(eq(pledges.id, pledge.id), inArray(pledges.state, ["pending", "failed"])))
    .run();
  if (marked.changes !== 1) return { pledgeId: pledge.id, decision: { kind: "ignore", reason: "raced" }, funded: false };

  tx.insert(ledgerEntries)
    .values({
      kind: "pledge_payment",
      amountMinor: pledge.amountMinor,
      currency: pledge.currency,
      campaignId: pledge.campaignId,
      pledgeId: pledge.id,
      externalRef: pledgeKeys.paymentRef(pledge.id),
      memo: decision.paymentIntentId ? `Checkout ${facts.sessionId}, payment ${decision.paymentIntentId}` : `Checkout ${facts.sessionId}`,
      occurredAt: paidAt,
    })
    .onConflictDoNothing({ target: ledgerEntries.externalRef })
    .run();

  const campaign = tx.select().from(campaigns).where(eq(campaigns.id, pledge.campaignId)).get();
  const backer = tx.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, pledge.supporterId)).get();
  const timeZone = tx.select({ timeZone: labSettings.timeZone }).from(labSettings).where(eq(labSettings.id, 1)).get()?.timeZone ?? "UTC";
  if (!campaign) throw new Error(`Pledge ${pledge.id} names a missing campaign.`);
  const campaignUrl = `${options.appUrl}/campaigns/${campaign.slug}`;
  const now = options.now ?? new Date();

  if (backer?.email) {
    enqueueMail(
      tx,
      {
        dedupeKey: pledgeKeys.receipt(pledge.id),
        userId: pledge.supporterId,
        toAddress: backer.email,
        template: "pledge-receipt",
        subject: `Your pledge to “${campaign.title}”`,
        payload: {
          name: backer.name,
          campaignTitle: campaign.title,
          amount: formatMoney(pledge.amountMinor, pledge.currency),
          paidOn: formatDate(paidAt, timeZone),
          pledgeId: pledge.id,
          campaignUrl,
          pledgesUrl: `${options.appUrl}/account/pledges`,
        },
      },
      now,
    );
  }

  const funded = fundIfGoalReached(tx, campaign, { campaignUrl, now });
  return { pledgeId: pledge.id, decision, funded };
}

/** Paid pledges plus lab-fund money moved to the campaign, as the campaign page counts them. */
export function raisedMinor(tx: Tx | Db, campaignId: string): number {
  const paid = tx
    .select({ total: sql<number>`coalesce(sum(${pledges.amountMinor}), 0)` })
    .from(pledges)
    .where(and(eq(pledges.campaignId, campaignId), eq(pledges.state, "paid")))
    .get();
  const fund = tx
    .select({ total: sql<number>`coalesce(-sum(${ledgerEntries.amountMinor}), 0)` })
    .from(ledgerEntries)
    .where(and(eq(ledgerEntries.campaignId, campaignId), inArray(ledgerEntries.kind, ["fund_allocation", "fund_release"])))
    .get();
  return Number(paid?.total ?? 0) + Number(fund?.total ?? 0);
}

/**
 * Recomputes what the campaign has raised and, when it reaches the goal while the campaign is
 * still open, moves it to `funded` — a conditional UPDATE, so it happens exactly once — writes its
 * print jobs, and queues one "campaign funded" mail per backer.
 */
export function fundIfGoalReached(tx: Tx, campaign: Campaign, options: { campaignUrl: string; now: Date }): boolean {
  if (campaign.state !== "open" || !reachesGoal(raisedMinor(tx, campaign.id), campaign.goalMinor)) return false;
  const moved = tx
    .update(campaigns)
    .set({ state: "funded", fundedAt: options.now })
    .where(and(eq(campaigns.id, campaign.id), eq(campaigns.state, "open")))
    .run();
  if (moved.changes !== 1) return false;
  materialiseJobs(tx, campaign.id);

  const backers = tx
    .selectDistinct({ id: users.id, email: users.email, name: users.name })
    .from(pledges)
    .innerJoin(users, eq(users.id, pledges.supporterId))
    .where(and(eq(pledges.campaignId, campaign.id), eq(pledges.state, "paid")))
    .all();
  for (const backer of backers) {
    if (!backer.email) continue;
    enqueueMail(
      tx,
      {
        dedupeKey: pledgeKeys.funded(campaign.id, backer.id),
        userId: backer.id,
        toAddress: backer.email,
        template: "campaign-funded",
        subject: `“${campaign.title}” is funded`,
        payload: {
          name: backer.name,
          campaignTitle: campaign.title,
          goal: formatMoney(campaign.goalMinor, campaign.currency),
          campaignUrl: options.campaignUrl,
        },
      },
      options.now,
    );
  }
  return true;
}

/* ---------- Reads ---------- */

/** The signed-in supporter's own pledges, newest first: explicit user id, no session lookup. */
export function listSupporterPledges(db: Db, supporterId: string) {
  return db
    .select({
      id: pledges.id,
      amountMinor: pledges.amountMinor,
      currency: pledges.currency,
      state: pledges.state,
      publicName: pledges.publicName,
      createdAt: pledges.createdAt,
      paidAt: pledges.paidAt,
      refundedAt: pledges.refundedAt,
      campaignTitle: campaigns.title,
      campaignSlug: campaigns.slug,
      campaignState: campaigns.state,
    })
    .from(pledges)
    .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
    .where(eq(pledges.supporterId, supporterId))
    .orderBy(desc(pledges.createdAt))
    .all();
}

export type SupporterPledge = ReturnType<typeof listSupporterPledges>[number];

/** The supporter's own pledge behind a Checkout Session (for the page the success URL opens). */
export function findOwnPledgeBySession(db: Db, supporterId: string, sessionId: string) {
  return db
    .select({ id: pledges.id, state: pledges.state, amountMinor: pledges.amountMinor, currency: pledges.currency, campaignId: pledges.campaignId })
    .from(pledges)
    .where(and(eq(pledges.supporterId, supporterId), eq(pledges.checkoutSessionId, sessionId)))
    .get();
}

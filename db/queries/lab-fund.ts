import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { LAB_FUND_KINDS, assertCampaignTakesAllocations, checkAllocationMinor, labFundKeys, requireAllocationAmount } from "../../lib/lab-fund/allocation";
import { RuleViolation } from "../../lib/rule-violation";
import type { Db } from "../client";
import { campaigns, labSettings, ledgerEntries, users } from "../schema";
import { fundIfGoalReached, raisedMinor } from "./pledges";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

function fundCurrency(tx: Tx | Db): string {
  const settings = tx.select({ currency: labSettings.currency }).from(labSettings).where(eq(labSettings.id, 1)).get();
  if (!settings) throw new Error("Lab settings are missing: run `npm run db:seed` or create them as an admin.");
  return settings.currency;
}

/**
 * The lab fund's balance in the lab's currency, from the ledger alone: membership income, minus
 * allocations to campaigns, plus allocations returned (lib/lab-fund/allocation.ts `LAB_FUND_KINDS`).
 */
export function labFundBalance(tx: Tx | Db): { balanceMinor: number; currency: string } {
  const currency = fundCurrency(tx);
  const row = tx
    .select({ total: sql<number>`coalesce(sum(${ledgerEntries.amountMinor}), 0)` })
    .from(ledgerEntries)
    .where(and(inArray(ledgerEntries.kind, [...LAB_FUND_KINDS]), eq(ledgerEntries.currency, currency)))
    .get();
  return { balanceMinor: Number(row?.total ?? 0), currency };
}

/** Totals per kind, for the fund page's summary. */
export function labFundTotals(db: Db) {
  const currency = fundCurrency(db);
  const rows = db
    .select({ kind: ledgerEntries.kind, total: sql<number>`coalesce(sum(${ledgerEntries.amountMinor}), 0)`.mapWith(Number) })
    .from(ledgerEntries)
    .where(and(inArray(ledgerEntries.kind, [...LAB_FUND_KINDS]), eq(ledgerEntries.currency, currency)))
    .groupBy(ledgerEntries.kind)
    .all();
  const of = (kind: (typeof LAB_FUND_KINDS)[number]) => rows.find((row) => row.kind === kind)?.total ?? 0;
  return { currency, incomeMinor: of("membership_payment"), allocatedMinor: -of("fund_allocation"), returnedMinor: of("fund_release") };
}

/** Every lab-fund movement, newest first, with the campaign it went to or came back from. */
export function listLabFundHistory(db: Db, limit = 200) {
  return db
    .select({
      id: ledgerEntries.id,
      kind: ledgerEntries.kind,
      amountMinor: ledgerEntries.amountMinor,
      currency: ledgerEntries.currency,
      memo: ledgerEntries.memo,
      occurredAt: ledgerEntries.occurredAt,
      campaignTitle: campaigns.title,
      campaignSlug: campaigns.slug,
    })
    .from(ledgerEntries)
    .leftJoin(campaigns, eq(campaigns.id, ledgerEntries.campaignId))
    .where(inArray(ledgerEntries.kind, [...LAB_FUND_KINDS]))
    .orderBy(desc(ledgerEntries.occurredAt), desc(ledgerEntries.id))
    .limit(limit)
    .all();
}

/** Open campaigns in the fund's currency with what each has raised and still needs. */
export function listAllocatableCampaigns(db: Db, now: Date) {
  const currency = fundCurrency(db);
  return db
    .select()
    .from(campaigns)
    .where(and(eq(campaigns.state, "open"), eq(campaigns.currency, currency), sql`${campaigns.deadline} > ${now.getTime()}`))
    .orderBy(asc(campaigns.deadline))
    .all()
    .map((campaign) => {
      const raised = raisedMinor(db, campaign.id);
      return { id: campaign.id, slug: campaign.slug, title: campaign.title, goalMinor: campaign.goalMinor, currency: campaign.currency, deadline: campaign.deadline, raisedMinor: raised, remainingMinor: Math.max(0, campaign.goalMinor - raised) };
    });
}

export type AllocationInput = {
  campaignId: string;
  hostId: string;
  /** Typed major units ("25.50") from the form, or minor units from the JSON API. */
  amount: { text: string } | { minor: number };
  /** The form's one-time id: a double click or a retried request allocates once. */
  requestId: string;
  appUrl: string;
};

export type AllocationResult = {
  ledgerId: string;
  amountMinor: number;
  currency: string;
  balanceAfterMinor: number;
  funded: boolean;
  repeated: boolean;
};

/**
 * Moves lab-fund money to an open campaign. One IMMEDIATE transaction takes the write lock before
 * it reads the balance, so two hosts allocating at once are serialised and the fund never goes
 * below zero. The allocation counts toward the goal like a payment and can fund the campaign,
 * through the same conditional transition (db/queries/pledges.ts `fundIfGoalReached`).
 */
export function allocateLabFund(db: Db, input: AllocationInput, now = new Date()): AllocationResult {
  return db.transaction(
    (tx) => {
      const externalRef = labFundKeys.allocation(input.requestId);
      const earlier = tx.select().from(ledgerEntries).where(eq(ledgerEntries.externalRef, externalRef)).get();
      if (earlier) {
        return { ledgerId: earlier.id, amountMinor: -earlier.amountMinor, currency: earlier.currency, balanceAfterMinor: labFundBalance(tx).balanceMinor, funded: false, repeated: true };
      }
      const campaign = tx.select().from(campaigns).where(eq(campaigns.id, input.campaignId)).get();
      if (!campaign) throw new RuleViolation(404, "not_found", "No such campaign.", "campaignId");
      assertCampaignTakesAllocations(campaign, now);
      const { balanceMinor, currency } = labFundBalance(tx);
      if (campaign.currency !== currency) {
        throw new RuleViolation(409, "currency_mismatch", `This campaign is in ${campaign.currency}; the lab fund holds ${currency}.`);
      }
      const limits = { currency, balanceMinor, remainingMinor: Math.max(0, campaign.goalMinor - raisedMinor(tx, campaign.id)) };
      const amountMinor = "text" in input.amount ? requireAllocationAmount(input.amount.text, limits) : checkAllocationMinor(input.amount.minor, limits);
      const host = tx.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, input.hostId)).get();

      const row = tx
        .insert(ledgerEntries)
        .values({
          kind: "fund_allocation",
          amountMinor: -amountMinor,
          currency,
          campaignId: campaign.id,
          externalRef,
          memo: `Lab fund to “${campaign.title}”${host ? `, by ${host.name ?? host.email}` : ""}`,
          occurredAt: now,
        })
        .returning()
        .get();
      const funded = fundIfGoalReached(tx, campaign, { campaignUrl: `${input.appUrl}/campaigns/${campaign.slug}`, now });
      return { ledgerId: row.id, amountMinor, currency, balanceAfterMinor: balanceMinor - amountMinor, funded, repeated: false };
    },
    { behavior: "immediate" },
  );
}

/**
 * Returns to the fund what a lapsed or withdrawn campaign received from it, inside the caller's
 * transaction: one `fund_release` row per campaign (a unique key), so calling it again writes
 * nothing. Returns the amount given back (0 when there was nothing, or it was already returned).
 */
export function returnLabFundAllocation(tx: Tx | Db, campaignId: string, now: Date): number {
  const row = tx
    .select({ net: sql<number>`coalesce(-sum(${ledgerEntries.amountMinor}), 0)`, currency: sql<string | null>`max(${ledgerEntries.currency})` })
    .from(ledgerEntries)
    .where(and(eq(ledgerEntries.campaignId, campaignId), inArray(ledgerEntries.kind, ["fund_allocation", "fund_release"])))
    .get();
  const net = Number(row?.net ?? 0);
  if (net <= 0 || !row?.currency) return 0;
  const campaign = tx.select({ title: campaigns.title, state: campaigns.state }).from(campaigns).where(eq(campaigns.id, campaignId)).get();
  const inserted = tx
    .insert(ledgerEntries)
    .values({
      kind: "fund_release",
      amountMinor: net,
      currency: row.currency,
      campaignId,
      externalRef: labFundKeys.return(campaignId),
      memo: `Returned to the lab fund: “${campaign?.title ?? campaignId}” ${campaign?.state ?? "closed"}`,
      occurredAt: now,
    })
    .onConflictDoNothing({ target: ledgerEntries.externalRef })
    .run();
  return inserted.changes === 1 ? net : 0;
}

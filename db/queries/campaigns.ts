import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import type { Db } from "../client";
import {
  campaigns,
  labSettings,
  ledgerEntries,
  pledges,
  printers,
  testPlanPieces,
  testPlans,
  testPlanVariants,
} from "../schema";

/**
 * Per-campaign money, as subqueries joined on campaign id: paid pledges, people who backed it
 * (paid or since refunded), and lab-fund money moved to it (allocations leave the fund as negative
 * ledger rows, releases return it).
 */
function fundingSubqueries(db: Db) {
  const pledgeTotals = db
    .select({
      campaignId: pledges.campaignId,
      pledgedMinor: sql<number>`coalesce(sum(case when ${pledges.state} = 'paid' then ${pledges.amountMinor} end), 0)`.as(
        "pledged_minor",
      ),
      backerCount: sql<number>`count(distinct ${pledges.supporterId})`.as("backer_count"),
    })
    .from(pledges)
    .where(inArray(pledges.state, ["paid", "refunded"]))
    .groupBy(pledges.campaignId)
    .as("pledge_totals");
  const fundTotals = db
    .select({
      campaignId: ledgerEntries.campaignId,
      labFundMinor: sql<number>`-sum(${ledgerEntries.amountMinor})`.as("lab_fund_minor"),
    })
    .from(ledgerEntries)
    .where(inArray(ledgerEntries.kind, ["fund_allocation", "fund_release"]))
    .groupBy(ledgerEntries.campaignId)
    .as("fund_totals");
  const columns = {
    pledgedMinor: sql<number>`coalesce(${pledgeTotals.pledgedMinor}, 0)`.mapWith(Number),
    labFundMinor: sql<number>`coalesce(${fundTotals.labFundMinor}, 0)`.mapWith(Number),
    backerCount: sql<number>`coalesce(${pledgeTotals.backerCount}, 0)`.mapWith(Number),
  };
  return { pledgeTotals, fundTotals, columns };
}

export function listBoardCampaigns(db: Db) {
  const { pledgeTotals, fundTotals, columns } = fundingSubqueries(db);
  return db
    .select({
      id: campaigns.id,
      slug: campaigns.slug,
      title: campaigns.title,
      summary: campaigns.summary,
      state: campaigns.state,
      goalMinor: campaigns.goalMinor,
      currency: campaigns.currency,
      deadline: campaigns.deadline,
      fundedAt: campaigns.fundedAt,
      ...columns,
    })
    .from(campaigns)
    .leftJoin(pledgeTotals, eq(pledgeTotals.campaignId, campaigns.id))
    .leftJoin(fundTotals, eq(fundTotals.campaignId, campaigns.id))
    .orderBy(asc(campaigns.deadline))
    .all();
}

export type BoardCampaign = ReturnType<typeof listBoardCampaigns>[number];

export function getCampaignBySlug(db: Db, slug: string) {
  const { pledgeTotals, fundTotals, columns } = fundingSubqueries(db);
  const campaign = db
    .select({ campaign: campaigns, ...columns })
    .from(campaigns)
    .leftJoin(pledgeTotals, eq(pledgeTotals.campaignId, campaigns.id))
    .leftJoin(fundTotals, eq(fundTotals.campaignId, campaigns.id))
    .where(eq(campaigns.slug, slug))
    .get();
  if (!campaign) return undefined;

  const plan = db
    .select({ plan: testPlans, printer: printers })
    .from(testPlans)
    .leftJoin(printers, eq(printers.id, testPlans.printerId))
    .where(eq(testPlans.campaignId, campaign.campaign.id))
    .get();
  const pieces = plan
    ? db.select().from(testPlanPieces).where(eq(testPlanPieces.testPlanId, plan.plan.id)).orderBy(asc(testPlanPieces.position)).all()
    : [];
  const variants = plan
    ? db
        .select()
        .from(testPlanVariants)
        .where(eq(testPlanVariants.testPlanId, plan.plan.id))
        .orderBy(asc(testPlanVariants.position))
        .all()
    : [];

  return { ...campaign, plan: plan?.plan, printer: plan?.printer ?? undefined, pieces, variants };
}

/** Public view of pledges: amount, state, date and the name a backer chose to show (or none). */
export function listPublicPledges(db: Db, campaignId: string) {
  return db
    .select({
      id: pledges.id,
      amountMinor: pledges.amountMinor,
      currency: pledges.currency,
      state: pledges.state,
      publicName: pledges.publicName,
      paidAt: pledges.paidAt,
      createdAt: pledges.createdAt,
    })
    .from(pledges)
    .where(and(eq(pledges.campaignId, campaignId), inArray(pledges.state, ["paid", "refunded"])))
    .orderBy(desc(pledges.createdAt))
    .all();
}

export function getLabSettings(db: Db) {
  const settings = db.select().from(labSettings).where(eq(labSettings.id, 1)).get();
  if (!settings) throw new Error("Lab settings are missing: run `npm run db:seed` or create them as an admin.");
  return settings;
}

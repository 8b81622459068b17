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

/** Paid pledges on the campaign, in minor units. */
const pledgedMinor = sql<number>`coalesce((
  select sum(${pledges.amountMinor}) from ${pledges}
  where ${pledges.campaignId} = ${campaigns.id} and ${pledges.state} = 'paid'), 0)`;

/** Lab-fund money moved to the campaign: allocations leave the fund (negative), releases return. */
const labFundMinor = sql<number>`coalesce((
  select -sum(${ledgerEntries.amountMinor}) from ${ledgerEntries}
  where ${ledgerEntries.campaignId} = ${campaigns.id}
    and ${ledgerEntries.kind} in ('fund_allocation', 'fund_release')), 0)`;

const backerCount = sql<number>`(
  select count(distinct ${pledges.supporterId}) from ${pledges}
  where ${pledges.campaignId} = ${campaigns.id} and ${pledges.state} in ('paid', 'refunded'))`;

export function listBoardCampaigns(db: Db) {
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
      pledgedMinor,
      labFundMinor,
      backerCount,
    })
    .from(campaigns)
    .orderBy(asc(campaigns.deadline))
    .all();
}

export type BoardCampaign = ReturnType<typeof listBoardCampaigns>[number];

export function getCampaignBySlug(db: Db, slug: string) {
  const campaign = db
    .select({
      campaign: campaigns,
      pledgedMinor,
      labFundMinor,
      backerCount,
    })
    .from(campaigns)
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

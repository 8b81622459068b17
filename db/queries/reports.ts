import { and, asc, desc, eq, inArray, isNotNull, sql } from "drizzle-orm";
import { runCostFromLog, type RunCost } from "../../lib/reports/actual-cost";
import { REPORTABLE_STATES } from "../../lib/reports/rules";
import type { Db } from "../client";
import {
  campaigns,
  filamentPrices,
  jobs,
  labNotes,
  labSettings,
  printers,
  reportPhotos,
  reports,
  reportScores,
  testPlanPieces,
  testPlans,
  testPlanVariants,
  uploads,
  users,
} from "../schema";
import { raisedMinor } from "./pledges";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
type Queryable = Db | Tx;

export type ReportPhotoView = {
  id: string;
  pieceId: string;
  variantId: string;
  uploadId: string;
  caption: string;
  position: number;
  lightSetKey: string | null;
  widthPx: number | null;
  heightPx: number | null;
  hasThumbnail: boolean;
};

function planOf(db: Queryable, campaignId: string) {
  const plan = db.select().from(testPlans).where(eq(testPlans.campaignId, campaignId)).get();
  const pieces = plan
    ? db.select().from(testPlanPieces).where(eq(testPlanPieces.testPlanId, plan.id)).orderBy(asc(testPlanPieces.position)).all()
    : [];
  const variants = plan
    ? db.select().from(testPlanVariants).where(eq(testPlanVariants.testPlanId, plan.id)).orderBy(asc(testPlanVariants.position)).all()
    : [];
  return { plan, pieces, variants };
}

export function listReportPhotos(db: Queryable, reportId: string): ReportPhotoView[] {
  return db
    .select({
      id: reportPhotos.id,
      pieceId: reportPhotos.pieceId,
      variantId: reportPhotos.variantId,
      uploadId: reportPhotos.uploadId,
      caption: reportPhotos.caption,
      position: reportPhotos.position,
      lightSetKey: reportPhotos.lightSetKey,
      widthPx: uploads.widthPx,
      heightPx: uploads.heightPx,
      hasThumbnail: sql<number>`${uploads.thumbnailSha256} is not null`.mapWith(Boolean),
    })
    .from(reportPhotos)
    .innerJoin(uploads, eq(uploads.id, reportPhotos.uploadId))
    .where(eq(reportPhotos.reportId, reportId))
    .orderBy(asc(reportPhotos.pieceId), asc(reportPhotos.variantId), asc(reportPhotos.position))
    .all();
}

export function listReportScores(db: Queryable, reportId: string) {
  return db
    .select({
      pieceId: reportScores.pieceId,
      variantId: reportScores.variantId,
      criterion: reportScores.criterion,
      score: reportScores.score,
      note: reportScores.note,
    })
    .from(reportScores)
    .where(eq(reportScores.reportId, reportId))
    .all();
}

/** The run log's cost for a campaign (done jobs with filament and hours), or undefined before any is logged. */
export function campaignRunCost(db: Queryable, campaignId: string): RunCost | undefined {
  const plan = db.select({ material: testPlans.material, planPrinterId: testPlans.printerId }).from(testPlans).where(eq(testPlans.campaignId, campaignId)).get();
  const settings = db.select().from(labSettings).where(eq(labSettings.id, 1)).get();
  if (!plan || !settings) return undefined;
  const price = db.select().from(filamentPrices).where(eq(filamentPrices.material, plan.material)).get();
  const planPrinter = plan.planPrinterId ? db.select().from(printers).where(eq(printers.id, plan.planPrinterId)).get() : undefined;
  const logged = db
    .select({ filamentUsedGrams: jobs.filamentUsedGrams, actualHours: jobs.actualHours, rate: printers.hourlyRateMinor })
    .from(jobs)
    .leftJoin(printers, eq(printers.id, jobs.printerId))
    .where(and(eq(jobs.campaignId, campaignId), inArray(jobs.state, ["done", "failed"])))
    .all();
  return runCostFromLog(
    logged.map((job) => ({
      filamentUsedGrams: job.filamentUsedGrams,
      actualHours: job.actualHours,
      machineRatePerHourMinor: job.rate ?? planPrinter?.hourlyRateMinor ?? 0,
    })),
    {
      filamentPricePerKgMinor: price?.pricePerKgMinor ?? 0,
      labourHours: settings.planLabourHours,
      labourRatePerHourMinor: settings.labourRateMinorPerHour,
    },
  );
}

/** Everything the host's report editor shows for one campaign; the report is undefined until the first save. */
export function getReportEditor(db: Db, campaignId: string) {
  const campaign = db.select().from(campaigns).where(eq(campaigns.id, campaignId)).get();
  if (!campaign) return undefined;
  const { plan, pieces, variants } = planOf(db, campaignId);
  const report = db.select().from(reports).where(eq(reports.campaignId, campaignId)).get();
  return {
    campaign,
    plan,
    pieces,
    variants,
    report,
    scores: report ? listReportScores(db, report.id) : [],
    photos: report ? listReportPhotos(db, report.id) : [],
    runCost: campaignRunCost(db, campaignId),
    notes: listLabNotes(db, campaignId),
  };
}

/** A published report by its campaign's slug, with what the public page shows. */
export function getPublishedReport(db: Db, slug: string) {
  const row = db
    .select({ campaign: campaigns, report: reports })
    .from(reports)
    .innerJoin(campaigns, eq(campaigns.id, reports.campaignId))
    .where(and(eq(campaigns.slug, slug), eq(reports.state, "published")))
    .get();
  if (!row) return undefined;
  const { plan, pieces, variants } = planOf(db, row.campaign.id);
  return {
    ...row,
    plan,
    pieces,
    variants,
    scores: listReportScores(db, row.report.id),
    photos: listReportPhotos(db, row.report.id),
    raisedMinor: raisedMinor(db, row.campaign.id),
  };
}

export type PublishedReportSummary = {
  reportId: string;
  slug: string;
  title: string;
  summary: string;
  publishedAt: Date;
  updatedAt: Date;
  coverUploadId: string | null;
};

/** Published reports, newest first, each with its first photo (for cards, the feed and share images). */
export function listPublishedReports(db: Db, limit = 50): PublishedReportSummary[] {
  const cover = sql<string | null>`(
    select ${reportPhotos.uploadId} from ${reportPhotos}
    inner join ${testPlanPieces} on ${testPlanPieces.id} = ${reportPhotos.pieceId}
    inner join ${testPlanVariants} on ${testPlanVariants.id} = ${reportPhotos.variantId}
    where ${reportPhotos.reportId} = ${reports.id}
    order by ${testPlanPieces.position}, ${testPlanVariants.position}, ${reportPhotos.position} limit 1)`;
  return db
    .select({
      reportId: reports.id,
      slug: campaigns.slug,
      title: campaigns.title,
      summary: reports.summary,
      publishedAt: reports.publishedAt,
      updatedAt: reports.updatedAt,
      coverUploadId: cover,
    })
    .from(reports)
    .innerJoin(campaigns, eq(campaigns.id, reports.campaignId))
    .where(and(eq(reports.state, "published"), isNotNull(reports.publishedAt)))
    .orderBy(desc(reports.publishedAt))
    .limit(limit)
    .all()
    .map((row) => ({ ...row, publishedAt: row.publishedAt ?? row.updatedAt }));
}

/** Campaigns a host can write a report for (and those already reported), with the report's state. */
export function listReportableCampaigns(db: Db) {
  return db
    .select({
      id: campaigns.id,
      slug: campaigns.slug,
      title: campaigns.title,
      state: campaigns.state,
      reportState: reports.state,
      reportUpdatedAt: reports.updatedAt,
      publishedAt: reports.publishedAt,
    })
    .from(campaigns)
    .leftJoin(reports, eq(reports.campaignId, campaigns.id))
    .where(inArray(campaigns.state, [...REPORTABLE_STATES, "reported"]))
    .orderBy(asc(campaigns.state), desc(campaigns.createdAt))
    .all();
}

/** A campaign's published lab notes, newest first, with the author's name. */
export function listLabNotes(db: Queryable, campaignId: string) {
  return db
    .select({ id: labNotes.id, bodyMd: labNotes.bodyMd, publishedAt: labNotes.publishedAt, createdAt: labNotes.createdAt, authorName: users.name })
    .from(labNotes)
    .leftJoin(users, eq(users.id, labNotes.authorId))
    .where(and(eq(labNotes.campaignId, campaignId), isNotNull(labNotes.publishedAt)))
    .orderBy(desc(labNotes.publishedAt), desc(labNotes.id))
    .all();
}

/** Whether an upload is a photo in a published report, which makes it public. */
export function isInPublishedReport(db: Queryable, uploadId: string): boolean {
  const row = db
    .select({ id: reportPhotos.id })
    .from(reportPhotos)
    .innerJoin(reports, eq(reports.id, reportPhotos.reportId))
    .where(and(eq(reportPhotos.uploadId, uploadId), eq(reports.state, "published")))
    .limit(1)
    .get();
  return row !== undefined;
}

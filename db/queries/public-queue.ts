import { and, asc, eq, inArray, sql } from "drizzle-orm";
import type { Db } from "../client";
import { campaigns, jobs, printers, testPlanPieces } from "../schema";
import { QUEUED_CAMPAIGN_STATES } from "./queue-jobs";

/*
 * What anyone may see of the queue: campaign titles, piece names, printer names and times. No
 * backers, notes, failure reasons or host controls leave through these queries.
 */

const publicJobColumns = {
  id: jobs.id,
  campaignTitle: campaigns.title,
  campaignSlug: campaigns.slug,
  pieceName: testPlanPieces.name,
  printerName: printers.name,
  start: jobs.scheduledStart,
  end: jobs.scheduledEnd,
};

export function listPrintingNow(db: Db) {
  return db
    .select(publicJobColumns)
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .innerJoin(testPlanPieces, eq(testPlanPieces.id, jobs.pieceId))
    .innerJoin(printers, eq(printers.id, jobs.printerId))
    .where(eq(jobs.state, "running"))
    .orderBy(asc(printers.name))
    .all();
}

export function listUpNext(db: Db, limit = 8) {
  return db
    .select(publicJobColumns)
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .innerJoin(testPlanPieces, eq(testPlanPieces.id, jobs.pieceId))
    .innerJoin(printers, eq(printers.id, jobs.printerId))
    .where(and(eq(jobs.state, "scheduled"), sql`${jobs.scheduledStart} is not null`))
    .orderBy(asc(jobs.scheduledStart), asc(jobs.id))
    .limit(limit)
    .all();
}

const jobCounts = {
  jobsDone: sql<number>`coalesce(sum(case when ${jobs.state} = 'done' then 1 else 0 end), 0)`.mapWith(Number),
  jobsTotal: sql<number>`count(${jobs.id})`.mapWith(Number),
};

/** Funded campaigns still in the lab, with their jobs done of total and the estimated results date. */
export function listQueuedCampaigns(db: Db) {
  return db
    .select({
      id: campaigns.id,
      slug: campaigns.slug,
      title: campaigns.title,
      state: campaigns.state,
      estimatedResultsAt: campaigns.estimatedResultsAt,
      ...jobCounts,
    })
    .from(campaigns)
    .leftJoin(jobs, eq(jobs.campaignId, campaigns.id))
    .where(inArray(campaigns.state, [...QUEUED_CAMPAIGN_STATES]))
    .groupBy(campaigns.id)
    .orderBy(sql`${campaigns.estimatedResultsAt} is null`, asc(campaigns.estimatedResultsAt), asc(campaigns.title))
    .all();
}

export function campaignQueueProgress(db: Db, campaignId: string): { jobsDone: number; jobsTotal: number } {
  return db.select(jobCounts).from(jobs).where(eq(jobs.campaignId, campaignId)).get() ?? { jobsDone: 0, jobsTotal: 0 };
}

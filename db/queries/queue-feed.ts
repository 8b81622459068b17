import { and, asc, eq, inArray, isNotNull, sql } from "drizzle-orm";
import type { FeedJob } from "../../lib/queue-feed/ics";
import type { Db } from "../client";
import { campaigns, jobRuns, jobs, printers, testPlanPieces, testPlanVariants } from "../schema";

/** Every placed job that has not finished, as calendar events. */
export function listFeedJobs(db: Db): Omit<FeedJob, "url">[] {
  return db
    .select({
      jobId: jobs.id,
      state: jobs.state,
      start: jobs.scheduledStart,
      end: jobs.scheduledEnd,
      repeat: jobs.repeat,
      printerName: printers.name,
      campaignTitle: campaigns.title,
      pieceName: testPlanPieces.name,
      variantName: testPlanVariants.name,
      attempts: sql<number>`(select count(*) from ${jobRuns} where ${jobRuns.jobId} = ${jobs.id})`.mapWith(Number),
    })
    .from(jobs)
    .innerJoin(campaigns, eq(campaigns.id, jobs.campaignId))
    .innerJoin(testPlanPieces, eq(testPlanPieces.id, jobs.pieceId))
    .innerJoin(testPlanVariants, eq(testPlanVariants.id, jobs.variantId))
    .innerJoin(printers, eq(printers.id, jobs.printerId))
    .where(and(inArray(jobs.state, ["scheduled", "running"]), isNotNull(jobs.scheduledStart), isNotNull(jobs.scheduledEnd)))
    .orderBy(asc(jobs.scheduledStart), asc(jobs.id))
    .all()
    .flatMap((row) =>
      row.start && row.end
        ? [
            {
              jobId: row.jobId,
              sequence: row.attempts,
              start: row.start.getTime(),
              end: row.end.getTime(),
              repeat: row.repeat,
              printerName: row.printerName,
              campaignTitle: row.campaignTitle,
              pieceName: row.pieceName,
              variantName: row.variantName,
              running: row.state === "running",
            },
          ]
        : [],
    );
}

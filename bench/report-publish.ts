/**
 * Publishing a report to 10,000 backers (report issue): the publish transaction — final save,
 * report and campaign state, and one queued `report-published` mail per paid backer — measured
 * on the query function against a temporary seeded database. Delivery through SMTP is measured
 * separately by bench/mail-fanout.ts. Budget: the transaction commits in under 2 s (the lab's own
 * figure: a host's click should feel immediate and hold the write lock briefly).
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { performance } from "node:perf_hooks";
import { and, eq, like, sql } from "drizzle-orm";
import { migrateDatabase, openDatabase } from "../db/client";
import { publishReport } from "../db/queries/report-commands";
import { campaigns, outbox, pledges, users } from "../db/schema";
import { seedDemo, seedId } from "../db/seed";
import { reportDraftSchema } from "../lib/validation/report";

export const REPORT_PUBLISH_BUDGET_MS = 2000;

export type ReportPublishBench = { backers: number; publishMs: number; queued: number; duplicates: number; stateChanges: number; secondPublishMs: number };

export function runReportPublishBench(backers = 10_000): ReportPublishBench {
  const dir = mkdtempSync(path.join(os.tmpdir(), "proofbay-report-publish-"));
  const db = openDatabase(path.join(dir, "bench.db"));
  try {
    migrateDatabase(db);
    seedDemo(db);
    const campaignId = seedId("campaign", "petg-bridging");
    db.transaction((tx) => {
      const people = Array.from({ length: backers }, (_, i) => ({ id: `bench-backer-${i}`, name: `Backer ${i}`, email: `bench-backer-${i}@backers.example` }));
      for (let i = 0; i < people.length; i += 500) tx.insert(users).values(people.slice(i, i + 500)).run();
      const rows = people.map((person, i) => ({
        id: `bench-pledge-${i}`,
        campaignId,
        supporterId: person.id,
        amountMinor: 1000,
        currency: "USD",
        state: "paid" as const,
        paidAt: new Date(),
      }));
      for (let i = 0; i < rows.length; i += 500) tx.insert(pledges).values(rows.slice(i, i + 500)).run();
    });
    const paid = db
      .select({ count: sql<number>`count(distinct ${pledges.supporterId})` })
      .from(pledges)
      .where(and(eq(pledges.campaignId, campaignId), eq(pledges.state, "paid")))
      .get()!.count;

    const input = reportDraftSchema.parse({ summary: "Bench report: sample B bridges with the least sag at full fan." });
    const host = seedId("user", "host");
    const started = performance.now();
    const first = publishReport(db, campaignId, host, input, { appUrl: "http://localhost:3000" });
    const publishMs = performance.now() - started;
    const againStarted = performance.now();
    const second = publishReport(db, campaignId, host, input, { appUrl: "http://localhost:3000" });
    const secondPublishMs = performance.now() - againStarted;

    const keys = db
      .select({ total: sql<number>`count(*)`, distinct: sql<number>`count(distinct ${outbox.toAddress})` })
      .from(outbox)
      .where(like(outbox.dedupeKey, `report-published:${first.report.id}:%`))
      .get()!;
    const state = db.select({ state: campaigns.state }).from(campaigns).where(eq(campaigns.id, campaignId)).get()?.state;
    if (state !== "reported" || keys.total !== paid) throw new Error(`publish bench: state ${state}, ${keys.total} mails for ${paid} backers`);
    return {
      backers: paid,
      publishMs: Math.round(publishMs),
      queued: keys.total,
      duplicates: keys.total - keys.distinct,
      stateChanges: [first.published, second.published].filter(Boolean).length,
      secondPublishMs: Math.round(secondPublishMs * 10) / 10,
    };
  } finally {
    db.$client.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const result = runReportPublishBench();
  console.log(JSON.stringify(result, null, 2));
  console.log(result.publishMs < REPORT_PUBLISH_BUDGET_MS ? "within budget" : `OVER BUDGET (${REPORT_PUBLISH_BUDGET_MS} ms)`);
}

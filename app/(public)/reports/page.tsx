import type { Metadata } from "next";
import Link from "next/link";
import { Rss } from "lucide";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listPublishedReports } from "@/db/queries/reports";
import { env } from "@/lib/env";
import { formatDate } from "@/lib/format";
import { REPORTS_FEED_PATH } from "@/lib/reports/feed";
import { uploadThumbnailUrl } from "@/lib/uploads/api";

export const dynamic = "force-dynamic";

export const metadata: Metadata = {
  title: "Reports",
  description: "What Harbor Street Print Lab learned from each funded test: scorecards, photos and write-ups.",
  alternates: { types: { "application/atom+xml": [{ url: `${env.appUrl}${REPORTS_FEED_PATH}`, title: "Proofbay reports" }] } },
};

export default function ReportsPage() {
  const db = getDb();
  const { timeZone } = getLabSettings(db);
  const reports = listPublishedReports(db, 100);
  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-3xl font-bold tracking-tight">Reports</h1>
          <p className="text-muted">What the lab learned from each funded test.</p>
        </div>
        <a href={REPORTS_FEED_PATH} className="inline-flex items-center gap-1.5 text-sm font-medium text-teal hover:underline">
          <Icon node={Rss} className="h-4 w-4" /> Atom feed
        </a>
      </header>
      {reports.length === 0 ? (
        <p className="text-muted">No reports published yet.</p>
      ) : (
        <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          {reports.map((report) => (
            <li key={report.reportId}>
              <Card className="flex h-full flex-col gap-3 p-0">
                {report.coverUploadId ? (
                  // eslint-disable-next-line @next/next/no-img-element -- our own upload route serves the cleaned thumbnail
                  <img src={uploadThumbnailUrl(report.coverUploadId)} alt="" loading="lazy" className="aspect-[16/9] w-full rounded-t-[var(--radius-card)] object-cover" />
                ) : null}
                <div className="flex flex-1 flex-col gap-2 px-5 pb-5 pt-1">
                  <h2 className="text-lg font-semibold leading-snug">
                    <Link href={`/reports/${report.slug}`} className="hover:text-teal">{report.title}</Link>
                  </h2>
                  <p className="text-xs text-muted">Published <time dateTime={report.publishedAt.toISOString()}>{formatDate(report.publishedAt, timeZone)}</time></p>
                  <p className="line-clamp-4 text-sm">{report.summary}</p>
                </div>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

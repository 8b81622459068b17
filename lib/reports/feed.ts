import { Feed } from "feed";

export const REPORTS_FEED_PATH = "/reports/feed.xml";

export type FeedReport = { reportId: string; slug: string; title: string; summary: string; publishedAt: Date; updatedAt: Date };

/**
 * The Atom feed (RFC 4287) of published reports, newest first. Entry ids are tag URIs on the
 * report id (RFC 4151), so an entry keeps its identity if the site moves or the slug changes.
 */
export function reportsAtomFeed(reports: readonly FeedReport[], appUrl: string, now: Date): string {
  const feed = new Feed({
    id: `${appUrl}/reports`,
    title: "Proofbay reports — Harbor Street Print Lab",
    description: "What the lab learned from each funded test: scorecards, photos and write-ups.",
    link: `${appUrl}/reports`,
    language: "en",
    updated: reports.reduce<Date>((latest, report) => (report.updatedAt > latest ? report.updatedAt : latest), reports[0]?.updatedAt ?? now),
    generator: false,
    feedLinks: { atom: `${appUrl}${REPORTS_FEED_PATH}` },
    copyright: "Harbor Street Print Lab",
  });
  for (const report of reports) {
    feed.addItem({
      id: `tag:proofbay,2026:report:${report.reportId}`,
      title: report.title,
      link: `${appUrl}/reports/${report.slug}`,
      date: report.updatedAt,
      published: report.publishedAt,
      description: report.summary,
    });
  }
  return feed.atom1();
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AlertTriangle, Rss, Video } from "lucide";
import { BlindPairRanking } from "@/components/reports/blind-pair-ranking";
import { PhotoComparison } from "@/components/reports/photo-comparison";
import { ReportMarkdown } from "@/components/reports/report-markdown";
import { ScorecardChart } from "@/components/reports/scorecard-chart";
import { ScorecardTable } from "@/components/reports/scorecard-table";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { ProgressBar } from "@/components/ui/progress-bar";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { getPublishedReport } from "@/db/queries/reports";
import { env } from "@/lib/env";
import { formatDate, formatMoney } from "@/lib/format";
import { REPORTS_FEED_PATH } from "@/lib/reports/feed";
import { buildScorecard, scorecardChartData } from "@/lib/reports/scorecard";
import { fanNoiseCaution, materialCautions } from "@/lib/safety";
import { uploadUrl } from "@/lib/uploads/api";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const found = getPublishedReport(getDb(), (await params).slug);
  if (!found) return { title: "Report not found" };
  const title = `Report: ${found.campaign.title}`;
  const description = found.report.summary || found.campaign.summary;
  const url = `${env.appUrl}/reports/${found.campaign.slug}`;
  const cover = firstPhoto(found);
  const images = cover
    ? [{ url: `${env.appUrl}${uploadUrl(cover.uploadId)}`, ...(cover.widthPx ? { width: cover.widthPx } : {}), ...(cover.heightPx ? { height: cover.heightPx } : {}), alt: cover.caption || title }]
    : [];
  return {
    title,
    description,
    alternates: { canonical: url, types: { "application/atom+xml": [{ url: `${env.appUrl}${REPORTS_FEED_PATH}`, title: "Proofbay reports" }] } },
    openGraph: {
      type: "article",
      title,
      description,
      url,
      siteName: "Proofbay",
      publishedTime: found.report.publishedAt?.toISOString(),
      images,
    },
    twitter: { card: images.length > 0 ? "summary_large_image" : "summary", title, description, images: images.map((image) => image.url) },
  };
}

/** The cover: the first photo of the first piece, reference variant first (the plan's own order). */
function firstPhoto(found: NonNullable<ReturnType<typeof getPublishedReport>>) {
  for (const piece of found.pieces) {
    for (const variant of found.variants) {
      const photo = found.photos.filter((p) => p.pieceId === piece.id && p.variantId === variant.id).sort((a, b) => a.position - b.position)[0];
      if (photo) return photo;
    }
  }
  return undefined;
}

export default async function ReportPage({ params }: Props) {
  const db = getDb();
  const found = getPublishedReport(db, (await params).slug);
  if (!found) notFound();
  const { campaign, report, plan, pieces, variants, scores, photos } = found;
  const { timeZone } = getLabSettings(db);
  const lines = buildScorecard(scores, variants);
  const reference = variants.find((variant) => variant.isReference) ?? variants[0];
  const compared = variants.filter((variant) => !variant.isReference);
  const cautions = plan ? [...materialCautions(plan.material), fanNoiseCaution] : [];
  const spent = report.actualCostMinor;

  return (
    <article className="flex flex-col gap-8">
      <header className="flex flex-col gap-3">
        <p className="text-sm font-semibold uppercase tracking-wide text-plum">Report</p>
        <h1 className="text-3xl font-bold tracking-tight">{campaign.title}</h1>
        {report.publishedAt ? (
          <p className="text-sm text-muted">
            Published <time dateTime={report.publishedAt.toISOString()}>{formatDate(report.publishedAt, timeZone)}</time> ·{" "}
            <Link href={`/campaigns/${campaign.slug}`} className="text-teal hover:underline">the campaign and its test plan</Link> ·{" "}
            <a href={REPORTS_FEED_PATH} className="inline-flex items-center gap-1 text-teal hover:underline">
              <Icon node={Rss} className="h-3.5 w-3.5" /> feed
            </a>
          </p>
        ) : null}
        <p className="text-lg" data-testid="report-summary">{report.summary}</p>
        {report.videoUrl ? (
          <p>
            <a href={report.videoUrl} rel="noopener noreferrer" className="inline-flex items-center gap-2 font-medium text-teal hover:underline">
              <Icon node={Video} className="h-4 w-4" /> Watch the run
            </a>
          </p>
        ) : null}
      </header>

      <section aria-labelledby="scorecard-heading" className="flex flex-col gap-3">
        <h2 id="scorecard-heading" className="text-xl font-semibold">Scorecard</h2>
        <p className="text-sm text-muted">
          Every variant against the reference, {reference?.name ?? "the reference variant"}: −2 much worse, 0 the same, +2 much better.
        </p>
        <Card className="flex flex-col gap-6">
          <ScorecardTable lines={lines} variants={variants.map(({ id, name, isReference }) => ({ id, name, isReference }))} />
          {compared.length > 0 ? (
            <ScorecardChart data={scorecardChartData(lines, variants)} variants={compared.map(({ id, name }) => ({ id, name }))} referenceName={reference?.name ?? "the reference"} />
          ) : null}
        </Card>
      </section>

      <BlindPairRanking campaignId={campaign.id} judgeHref={`/campaigns/${campaign.slug}/judge`} />

      <section aria-labelledby="photos-heading" className="flex flex-col gap-3">
        <h2 id="photos-heading" className="text-xl font-semibold">Photos side by side</h2>
        <PhotoComparison
          pieces={pieces.map(({ id, name }) => ({ id, name }))}
          variants={variants.map(({ id, name }) => ({ id, name }))}
          photos={photos}
          defaultLeft={reference?.id ?? ""}
          defaultRight={compared[0]?.id ?? reference?.id ?? ""}
        />
      </section>

      <section aria-labelledby="writeup-heading" className="flex flex-col gap-3">
        <h2 id="writeup-heading" className="text-xl font-semibold">Write-up</h2>
        <Card>
          <ReportMarkdown markdown={report.bodyMd} />
        </Card>
      </section>

      <section aria-labelledby="cost-heading" className="flex flex-col gap-3">
        <h2 id="cost-heading" className="text-xl font-semibold">What it cost</h2>
        <Card className="flex max-w-xl flex-col gap-2 text-sm">
          <p>
            Goal <strong>{formatMoney(campaign.goalMinor, campaign.currency)}</strong> · raised{" "}
            <strong>{formatMoney(found.raisedMinor, campaign.currency)}</strong>
          </p>
          {spent !== null ? (
            <>
              <p>
                Actually spent <strong data-testid="cost-spent">{formatMoney(spent, campaign.currency)}</strong>{" "}
                <span className="text-muted">({report.actualCostSource === "run_log" ? "from the run log: filament, printer hours and labour" : "entered by the lab"})</span>
              </p>
              <ProgressBar percent={Math.min(100, Math.round((spent / campaign.goalMinor) * 100))} label={`${Math.round((spent / campaign.goalMinor) * 100)} % of the goal spent`} />
            </>
          ) : (
            <p className="text-muted">The lab has not recorded what the run cost.</p>
          )}
        </Card>
      </section>

      {cautions.length > 0 ? (
        <section aria-labelledby="cautions-heading" className="flex flex-col gap-3">
          <h2 id="cautions-heading" className="flex items-center gap-2 text-xl font-semibold">
            <Icon node={AlertTriangle} className="h-5 w-5 text-ember" /> If you repeat this test
          </h2>
          <ul className="grid gap-3 sm:grid-cols-2">
            {cautions.map((caution) => (
              <li key={caution.id} className="rounded-lg border border-ember/30 bg-ember-soft/50 p-3 text-sm">
                <strong className="block text-ember">{caution.title}</strong>
                {caution.text}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </article>
  );
}

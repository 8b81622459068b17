import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ArrowLeft } from "lucide";
import { CampaignStateBadge } from "@/components/campaign-state-badge";
import { LabNoteForm } from "@/components/reports/lab-note-form";
import { LabNotesList } from "@/components/reports/lab-notes-list";
import { ReportEditor, type EditorScore } from "@/components/reports/report-editor";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { getReportEditor } from "@/db/queries/reports";
import { formatMoney } from "@/lib/format";
import { isCurrencyCode, minorToDecimalString } from "@/lib/money";
import { isCriterionId } from "@/lib/reports/criteria";
import { LAB_NOTE_STATES, REPORTABLE_STATES } from "@/lib/reports/rules";
import { requirePageRole } from "@/server/guards";

type Props = { params: Promise<{ campaignId: string }> };

export const metadata: Metadata = { title: "Report editor · Lab" };

export default async function ReportEditorPage({ params }: Props) {
  const { campaignId } = await params;
  await requirePageRole("host", `/lab/reports/${campaignId}`);
  const db = getDb();
  const found = getReportEditor(db, campaignId);
  if (!found) notFound();
  const { campaign, pieces, variants, report, scores, photos, runCost, notes } = found;
  const { timeZone } = getLabSettings(db);
  const editable = REPORTABLE_STATES.includes(campaign.state) && report?.state !== "published";
  const takesNotes = LAB_NOTE_STATES.includes(campaign.state);
  const enteredCost =
    report?.actualCostSource === "entered" && report.actualCostMinor !== null && isCurrencyCode(campaign.currency)
      ? minorToDecimalString(report.actualCostMinor, campaign.currency)
      : "";

  return (
    <div className="flex flex-col gap-6">
      <Link href="/lab/reports" className="inline-flex items-center gap-1 text-sm text-teal hover:underline">
        <Icon node={ArrowLeft} className="h-3.5 w-3.5" /> Reports and lab notes
      </Link>
      <header className="flex flex-col gap-2">
        <div><CampaignStateBadge state={campaign.state} /></div>
        <h1 className="text-2xl font-bold">{campaign.title}</h1>
        <p className="text-sm text-muted">
          Goal {formatMoney(campaign.goalMinor, campaign.currency)} ·{" "}
          <Link href={`/campaigns/${campaign.slug}`} className="text-teal hover:underline">campaign page</Link>
        </p>
      </header>

      <section aria-labelledby="notes-heading" className="flex flex-col gap-3">
        <h2 id="notes-heading" className="text-xl font-semibold">Lab notes</h2>
        {takesNotes ? (
          <Card>
            <LabNoteForm campaignId={campaign.id} />
          </Card>
        ) : (
          <p className="text-sm text-muted">Lab notes are posted between funding and the report; this campaign is {campaign.state}.</p>
        )}
        {notes.length > 0 ? <LabNotesList notes={notes} timeZone={timeZone} /> : null}
      </section>

      <section aria-labelledby="report-heading" className="flex flex-col gap-3">
        <h2 id="report-heading" className="text-xl font-semibold">Report</h2>
        {report?.state === "published" ? (
          <Card>
            This report is published.{" "}
            <Link href={`/reports/${campaign.slug}`} className="text-teal hover:underline">Read it</Link>.
          </Card>
        ) : !editable ? (
          <p className="text-sm text-muted">A report needs a funded campaign; this one is {campaign.state}.</p>
        ) : pieces.length === 0 || variants.length === 0 ? (
          <p className="text-sm text-muted">This campaign has no test plan to report on.</p>
        ) : (
          <ReportEditor
            campaign={{ id: campaign.id, title: campaign.title, slug: campaign.slug }}
            pieces={pieces.map(({ id, name }) => ({ id, name }))}
            variants={variants.map(({ id, name, isReference }) => ({ id, name, isReference }))}
            currency={campaign.currency}
            runCostText={runCost ? `${formatMoney(runCost.totalMinor, campaign.currency)} (${runCost.loggedJobs} of ${runCost.jobs} jobs logged)` : null}
            initial={{
              summary: report?.summary ?? "",
              bodyMd: report?.bodyMd ?? "",
              videoUrl: report?.videoUrl ?? "",
              actualCost: enteredCost,
              scores: scores.flatMap((s): EditorScore[] => (isCriterionId(s.criterion) ? [{ ...s, criterion: s.criterion }] : [])),
              photos: photos.map(({ uploadId, pieceId, variantId, caption, lightSetKey }) => ({ uploadId, pieceId, variantId, caption, lightSetKey })),
            }}
          />
        )}
      </section>
    </div>
  );
}

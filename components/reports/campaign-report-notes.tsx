import Link from "next/link";
import { FileText, NotebookPen } from "lucide";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { listLabNotes } from "@/db/queries/reports";
import { reports, type Campaign } from "@/db/schema";
import { hasRole, type Role } from "@/lib/roles";
import { canHaveReport } from "@/lib/reports/rules";
import { and, eq } from "drizzle-orm";
import { LabNotesList } from "./lab-notes-list";

/** On the campaign page: the link to its report once published, the lab's notes (newest first), and the host's way in. */
export function CampaignReportAndNotes({
  campaign,
  viewerRole,
  timeZone,
}: {
  campaign: Pick<Campaign, "id" | "slug" | "state">;
  viewerRole: Role | null;
  timeZone: string;
}) {
  const db = getDb();
  const notes = listLabNotes(db, campaign.id);
  const published = db
    .select({ id: reports.id })
    .from(reports)
    .where(and(eq(reports.campaignId, campaign.id), eq(reports.state, "published")))
    .get();
  const isHost = viewerRole !== null && hasRole(viewerRole, "host");
  if (!published && notes.length === 0 && !(isHost && canHaveReport(campaign.state))) return null;

  return (
    <>
      {published ? (
        <Card className="flex flex-wrap items-center justify-between gap-3 border-plum/30 bg-plum-soft/40">
          <p className="flex items-center gap-2 font-medium">
            <Icon node={FileText} className="h-5 w-5 text-plum" /> The lab has published its report on this test.
          </p>
          <span className="flex flex-wrap gap-4">
            <Link href={`/reports/${campaign.slug}`} className="font-semibold text-teal hover:underline">
              Read the report
            </Link>
            <Link href={`/campaigns/${campaign.slug}/judge`} prefetch={false} className="font-semibold text-teal hover:underline">
              Judge blind pairs (backers)
            </Link>
          </span>
        </Card>
      ) : null}
      {isHost && canHaveReport(campaign.state) && !published ? (
        <p className="text-sm">
          <Link href={`/lab/reports/${campaign.id}`} prefetch={false} className="inline-flex items-center gap-1 text-teal hover:underline">
            <Icon node={NotebookPen} className="h-4 w-4" /> Post a lab note or write the report
          </Link>
        </p>
      ) : null}
      {notes.length > 0 ? (
        <section id="lab-notes" aria-labelledby="lab-notes-heading">
          <h2 id="lab-notes-heading" className="mb-3 text-xl font-semibold">Lab notes</h2>
          <LabNotesList notes={notes} timeZone={timeZone} />
        </section>
      ) : null}
    </>
  );
}

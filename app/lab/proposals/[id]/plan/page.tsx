import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ArrowLeft } from "lucide";
import { TestPlanEditor } from "@/components/lab/test-plan-editor";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listPrinters } from "@/db/queries/pricing";
import { getProposalForDecision } from "@/db/queries/proposals";
import { listTestPieces } from "@/db/queries/test-pieces";
import { addCalendarDays, deadlineWindow } from "@/lib/campaign/deadline";
import { MATERIAL_IDS, MATERIALS, isMaterialId, type MaterialId } from "@/lib/estimate/materials";
import { DEADLINE_MAX_DAYS, DEADLINE_MIN_DAYS, defaultReferenceName } from "@/lib/validation/test-plan";
import { requirePageRole } from "@/server/guards";

type Props = { params: Promise<{ id: string }> };

export const metadata: Metadata = { title: "Test plan · Lab" };

/** A default a host will usually keep: three weeks of pledging. */
const DEFAULT_DEADLINE_DAYS = 21;

export default async function TestPlanPage({ params }: Props) {
  const { id } = await params;
  await requirePageRole("host", `/lab/proposals/${id}/plan`);
  const db = getDb();
  const found = getProposalForDecision(db, id);
  if (!found) notFound();
  const { proposal, campaign } = found;
  const back = (
    <Link href={`/lab/proposals/${proposal.id}`} prefetch={false} className="inline-flex items-center gap-1 text-sm text-teal hover:underline">
      <Icon node={ArrowLeft} className="h-3.5 w-3.5" /> {proposal.title}
    </Link>
  );

  if (campaign || proposal.state !== "accepted") {
    return (
      <div className="flex flex-col gap-4">
        {back}
        <h1 className="text-2xl font-bold">Test plan</h1>
        <Card className="flex max-w-2xl flex-col gap-3">
          {campaign ? (
            <>
              <p>This proposal&apos;s plan is published: the campaign is open to backers.</p>
              <div>
                <Button asChild>
                  <Link href={`/campaigns/${campaign.slug}`}>Open “{campaign.title}”</Link>
                </Button>
              </div>
            </>
          ) : (
            <p>
              Only accepted proposals get a test plan; this one is {proposal.state}.{" "}
              {proposal.state === "submitted" ? <Link className="text-teal underline" href={`/lab/proposals/${proposal.id}`} prefetch={false}>Accept it first.</Link> : null}
            </p>
          )}
        </Card>
      </div>
    );
  }

  const settings = getLabSettings(db);
  const printers = listPrinters(db);
  const material: MaterialId = proposal.material && isMaterialId(proposal.material) ? proposal.material : "PLA";
  const capable = printers.filter((printer) => printer.materials.includes(material));
  const printer =
    capable.find((candidate) => candidate.status === "available" && candidate.motionType === proposal.printerType) ??
    capable.find((candidate) => candidate.status === "available") ??
    capable[0] ??
    printers[0];
  const window = deadlineWindow(new Date(), settings.timeZone, DEADLINE_MIN_DAYS, DEADLINE_MAX_DAYS);

  return (
    <div className="flex flex-col gap-4">
      {back}
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-bold">Test plan</h1>
        <p className="max-w-3xl text-muted">
          Pick the pieces, name the variants and set the protocol; the estimate beside the form follows every edit. Nothing is saved
          until you publish, which opens the campaign.
        </p>
      </div>
      <TestPlanEditor
        proposal={{ id: proposal.id, title: proposal.title }}
        printers={printers.map((p) => ({ id: p.id, name: p.name, model: p.model, materials: p.materials, maxFlowMm3PerS: p.maxFlowMm3PerS, status: p.status }))}
        library={listTestPieces(db).map((piece) => ({ id: piece.id, name: piece.name, description: piece.description, filamentGrams: piece.filamentGrams }))}
        materials={MATERIAL_IDS.map((materialId) => ({ id: materialId, name: MATERIALS[materialId].name }))}
        currency={settings.currency}
        timeZone={settings.timeZone}
        window={window}
        defaults={{
          printerId: printer?.id ?? "",
          material,
          referenceName: defaultReferenceName(proposal.kind),
          title: proposal.title,
          summary: proposal.why.slice(0, 600),
          deadline: addCalendarDays(window.today, DEFAULT_DEADLINE_DAYS),
        }}
      />
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AlertTriangle, ArrowLeft, Eye, Paperclip, ThumbsUp } from "lucide";
import { DecisionPanel } from "@/components/lab/decision-panel";
import { ProposalMarkdown } from "@/components/lab/proposal-markdown";
import { ProposalStateBadge } from "@/components/proposal-state-badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { startReview } from "@/db/queries/proposal-commands";
import { getProposalForDecision } from "@/db/queries/proposals";
import type { DuctDetails } from "@/db/schema";
import { getMaterial, isMaterialId } from "@/lib/estimate/materials";
import { formatDate, formatDateTime } from "@/lib/format";
import { needsSafetyNote } from "@/lib/proposals/rules";
import { materialCautions, PTFE_LIMIT_CELSIUS } from "@/lib/safety";
import { printerTypeLabels, proposalKindLabels } from "@/lib/validation/proposal";
import { requirePageRole } from "@/server/guards";

type Props = { params: Promise<{ id: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const found = getProposalForDecision(getDb(), (await params).id);
  return { title: found ? `${found.proposal.title} · Lab` : "Proposal not found" };
}

/** Why the lab wants precautions written down before accepting a test in this material. */
function safetyNoteWhy(material: string | null): string | null {
  if (!material || !isMaterialId(material)) return null;
  const { id, fumeCaution, nozzleTemperatureCelsius } = getMaterial(material);
  const reasons: string[] = [];
  if (fumeCaution === "strong") reasons.push(`${id} gives off styrene fumes and ultrafine particles when heated`);
  if (nozzleTemperatureCelsius.min >= PTFE_LIMIT_CELSIUS) {
    reasons.push(`${id} prints at ${nozzleTemperatureCelsius.min} °C or more, where PTFE-lined hotends degrade (about ${PTFE_LIMIT_CELSIUS} °C)`);
  }
  return reasons.length ? `${reasons.join("; ")}. Write down how the lab will print it safely (enclosure, ventilation, hotend, supervision).` : null;
}

function openingText(shape: DuctDetails["inlet"]): string {
  return shape.kind === "circle" ? `⌀ ${shape.diameterMm} mm circle` : `${shape.widthMm} × ${shape.heightMm} mm ${shape.kind}`;
}

export default async function LabProposalPage({ params }: Props) {
  const { id } = await params;
  await requirePageRole("host", `/lab/proposals/${id}`);
  const db = getDb();
  let found = getProposalForDecision(db, id);
  if (!found) notFound();
  // Opening a waiting proposal starts its review: from now on its proposer cannot change it under the host.
  if (found.proposal.state === "submitted" && !found.proposal.reviewStartedAt && startReview(db, [id]) > 0) {
    found = getProposalForDecision(db, id) ?? found;
  }
  const { proposal, proposerName, mergedInto, attachments, campaign } = found;
  const settings = getLabSettings(db);
  const safetyNeeded = needsSafetyNote(proposal.kind, proposal.material);
  const cautions = proposal.material ? materialCautions(proposal.material) : [];

  return (
    <div className="grid gap-8 lg:grid-cols-[minmax(0,1fr)_24rem]">
      <article className="flex flex-col gap-6">
        <Link href="/lab/proposals" className="inline-flex items-center gap-1 text-sm text-teal hover:underline">
          <Icon node={ArrowLeft} className="h-3.5 w-3.5" /> All proposals
        </Link>
        <header className="flex flex-col gap-3">
          <div className="flex flex-wrap items-center gap-2">
            <ProposalStateBadge state={proposal.state} />
            {proposal.state === "submitted" && proposal.reviewStartedAt ? (
              <span className="inline-flex items-center gap-1 text-xs text-muted">
                <Icon node={Eye} className="h-3 w-3" /> In review since {formatDateTime(proposal.reviewStartedAt, settings.timeZone)} — the proposer can no longer edit it
              </span>
            ) : null}
          </div>
          <h1 className="text-3xl font-bold tracking-tight">{proposal.title}</h1>
          <dl className="grid grid-cols-2 gap-4 text-sm sm:grid-cols-4">
            <Fact label="Kind" value={proposalKindLabels[proposal.kind]} />
            <Fact label="Printer type" value={printerTypeLabels[proposal.printerType]} />
            <Fact label="Material" value={proposal.material ?? "—"} />
            <Fact
              label="Votes"
              value={
                <span className="inline-flex items-center gap-1.5">
                  <Icon node={ThumbsUp} className="h-3.5 w-3.5 text-muted" /> {proposal.voteCount}
                </span>
              }
            />
            <Fact label="Proposed by" value={proposerName ?? "—"} />
            <Fact label="Submitted" value={proposal.submittedAt ? formatDate(proposal.submittedAt, settings.timeZone) : "—"} />
          </dl>
        </header>

        <section aria-labelledby="why-heading" className="flex flex-col gap-2">
          <h2 id="why-heading" className="text-lg font-semibold">Why test this</h2>
          <p className="whitespace-pre-line">{proposal.why}</p>
        </section>

        <section aria-labelledby="description-heading" className="flex flex-col gap-2">
          <h2 id="description-heading" className="text-lg font-semibold">Description</h2>
          <Card>
            <ProposalMarkdown markdown={proposal.descriptionMd} />
          </Card>
        </section>

        {proposal.ductDetails ? (
          <section aria-labelledby="duct-heading" className="flex flex-col gap-2">
            <h2 id="duct-heading" className="text-lg font-semibold">Duct</h2>
            <ul className="list-disc pl-5 text-sm">
              <li>Inlet: {openingText(proposal.ductDetails.inlet)}</li>
              <li>Outlets: {proposal.ductDetails.outlets.map(openingText).join("; ")}</li>
              <li>
                Fan: {proposal.ductDetails.fan.description || "not described"} ({proposal.ductDetails.fan.rating.value} {proposal.ductDetails.fan.rating.unit})
              </li>
            </ul>
          </section>
        ) : null}

        {attachments.length > 0 ? (
          <section aria-labelledby="files-heading" className="flex flex-col gap-2">
            <h2 id="files-heading" className="text-lg font-semibold">Attached files</h2>
            <ul className="flex flex-col gap-1 text-sm">
              {attachments.map((file) => (
                <li key={file.id} className="inline-flex items-center gap-2">
                  <Icon node={Paperclip} className="h-3.5 w-3.5 text-muted" /> {file.originalName}
                  <span className="text-xs text-muted">
                    {file.kind}, {(file.sizeBytes / 1024).toFixed(0)} KiB
                  </span>
                </li>
              ))}
            </ul>
          </section>
        ) : null}

        {cautions.length > 0 ? (
          <section aria-labelledby="cautions-heading" className="flex flex-col gap-2">
            <h2 id="cautions-heading" className="flex items-center gap-2 text-lg font-semibold">
              <Icon node={AlertTriangle} className="h-5 w-5 text-ember" /> Safety with {proposal.material}
            </h2>
            <ul className="grid gap-3 sm:grid-cols-2">
              {cautions.map((caution) => (
                <li key={caution.id} className="rounded-lg border border-ember/30 bg-ember-soft/50 p-3 text-sm">
                  <strong className="block text-ember">{caution.title}</strong>
                  {caution.text}
                </li>
              ))}
            </ul>
            {proposal.safetyNote ? (
              <p className="rounded-md bg-slate-soft p-3 text-sm">
                <strong>Lab&apos;s safety note:</strong> {proposal.safetyNote}
              </p>
            ) : null}
          </section>
        ) : null}
      </article>

      <aside className="flex flex-col gap-4 lg:sticky lg:top-6 lg:self-start">
        {proposal.state === "submitted" ? (
          <DecisionPanel
            proposal={{ id: proposal.id, title: proposal.title }}
            safety={{ required: safetyNeeded && settings.requireSafetyNote, suggested: safetyNeeded, why: safetyNoteWhy(proposal.material) }}
          />
        ) : (
          <Card className="flex flex-col gap-3">
            <h2 className="text-lg font-semibold">Decided</h2>
            {proposal.decidedAt ? <p className="text-sm text-muted">On {formatDateTime(proposal.decidedAt, settings.timeZone)}</p> : null}
            {proposal.state === "accepted" ? (
              campaign ? (
                <p className="text-sm">
                  Published as the campaign{" "}
                  <Link className="font-medium text-teal underline" href={`/campaigns/${campaign.slug}`}>
                    {campaign.title}
                  </Link>
                  .
                </p>
              ) : (
                <>
                  <p className="text-sm">Accepted. Its campaign opens when you publish a test plan.</p>
                  <Button asChild>
                    <Link href={`/lab/proposals/${proposal.id}/plan`}>Build the test plan</Link>
                  </Button>
                </>
              )
            ) : null}
            {proposal.state === "declined" ? (
              <p className="text-sm">
                Declined. The proposer was e-mailed this reason: <span className="italic">{proposal.declineReason}</span>
              </p>
            ) : null}
            {proposal.state === "merged" && mergedInto ? (
              <p className="text-sm">
                Merged into{" "}
                <Link className="font-medium text-teal underline" href={`/lab/proposals/${mergedInto.id}`} prefetch={false}>
                  {mergedInto.title}
                </Link>
                ; its votes and followers moved there.
              </p>
            ) : null}
          </Card>
        )}
      </aside>
    </div>
  );
}

function Fact({ label, value }: { label: string; value: React.ReactNode }) {
  return (
    <div>
      <dt className="text-xs font-medium uppercase tracking-wide text-muted">{label}</dt>
      <dd className="mt-1 font-medium">{value}</dd>
    </div>
  );
}

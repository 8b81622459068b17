import type { Metadata } from "next";
import Image from "next/image";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ArrowRight, Box, CircleSlash, FileText, Image as ImageIcon, Pencil, ShieldCheck, Wind } from "lucide";
import { DuctAirflowCaveat, DuctAirflowFigures, shapeLabels } from "@/components/estimate/duct-figures";
import { formatNumber } from "@/components/estimate/numbers";
import { ProposalStateBadge } from "@/components/proposal-state-badge";
import { QueryProvider } from "@/components/providers/query-provider";
import { CautionList } from "@/components/proposals/caution-list";
import { formatBytes } from "@/components/proposals/format";
import { Markdown } from "@/components/proposals/markdown";
import { ModelFigures } from "@/components/proposals/model-figures";
import { VotesLeft } from "@/components/proposals/vote-button";
import { VoteSlot } from "@/components/proposals/vote-slot";
import { voteViewerFor } from "@/components/proposals/vote-viewer";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { getProposalBySlug, listUploadsForProposal, type ProposalUploadView } from "@/db/queries/proposal-reads";
import type { DuctDetails } from "@/db/schema";
import { ductAirflow, type DuctAirflow, type OpeningShape } from "@/lib/estimate/duct";
import { getMaterial, isMaterialId } from "@/lib/estimate/materials";
import { formatDate } from "@/lib/format";
import { isEditable, needsSafetyNote } from "@/lib/proposals/rules";
import { materialCautions } from "@/lib/safety";
import { printerTypeLabels, proposalKindLabels } from "@/lib/validation/proposal";
import { getViewer, type Viewer } from "@/server/auth";

type Props = { params: Promise<{ slug: string }> };

/** Drafts belong to their proposers: anyone else gets the same 404 as for a proposal that does not exist. */
function visibleProposal(slug: string, viewer: Viewer | null) {
  const found = getProposalBySlug(getDb(), slug);
  if (!found) return undefined;
  if (found.proposal.state === "draft" && found.proposal.proposerId !== viewer?.id) return undefined;
  return found;
}

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const found = visibleProposal((await params).slug, await getViewer());
  return found ? { title: found.proposal.title, description: found.proposal.why.slice(0, 200) } : { title: "Proposal not found" };
}

export default async function ProposalPage({ params }: Props) {
  const { slug } = await params;
  const viewer = await getViewer();
  const found = visibleProposal(slug, viewer);
  if (!found) notFound();
  const { proposal, proposerName, mergedInto, campaignSlug } = found;
  const db = getDb();
  const { timeZone } = getLabSettings(db);
  const uploads = listUploadsForProposal(db, proposal.id);
  const photos = uploads.filter((upload) => upload.kind === "photo");
  const models = uploads.filter((upload) => upload.kind === "model");
  const voteViewer = voteViewerFor(db, viewer, [proposal.id]);
  const mine = viewer?.id === proposal.proposerId;
  const cautions = proposal.kind === "material" && proposal.material ? materialCautions(proposal.material) : [];
  const here = `/proposals/${proposal.slug}`;

  return (
    <article className="grid gap-8 lg:grid-cols-[minmax(0,1fr)_20rem]">
      <div className="flex min-w-0 flex-col gap-8">
        <header className="flex flex-col gap-3">
          <div className="flex flex-wrap items-center gap-2 text-xs">
            <ProposalStateBadge state={proposal.state} />
            <span className="rounded-md bg-teal-soft px-2 py-0.5 font-medium text-teal-strong">{proposalKindLabels[proposal.kind]}</span>
            <span className="rounded-md bg-slate-soft px-2 py-0.5 font-medium text-muted">
              {printerTypeLabels[proposal.printerType]} printers
            </span>
            {proposal.material ? (
              <span className="rounded-md bg-slate-soft px-2 py-0.5 font-medium text-muted">{proposal.material}</span>
            ) : null}
          </div>
          <h1 className="text-3xl font-bold tracking-tight">{proposal.title}</h1>
          <p className="text-sm text-muted">
            Proposed by {proposerName ?? "a supporter"}
            {proposal.submittedAt ? (
              <>
                {" · submitted "}
                <time dateTime={proposal.submittedAt.toISOString()}>{formatDate(proposal.submittedAt, timeZone)}</time>
              </>
            ) : (
              <>
                {" · draft started "}
                <time dateTime={proposal.createdAt.toISOString()}>{formatDate(proposal.createdAt, timeZone)}</time>
              </>
            )}
          </p>
        </header>

        <StateNotice
          state={proposal.state}
          mine={mine}
          declineReason={proposal.declineReason}
          mergedInto={mergedInto}
          campaignSlug={campaignSlug}
          reviewStarted={proposal.reviewStartedAt !== null}
        />

        <section aria-labelledby="why-heading">
          <h2 id="why-heading" className="mb-2 text-xl font-semibold">
            Why it matters
          </h2>
          <p className="whitespace-pre-line">{proposal.why || <span className="text-muted">Not written yet.</span>}</p>
        </section>

        {proposal.descriptionMd.trim() ? (
          <section aria-labelledby="description-heading">
            <h2 id="description-heading" className="mb-2 flex items-center gap-2 text-xl font-semibold">
              <Icon node={FileText} className="h-5 w-5 text-muted" /> Description
            </h2>
            <Card>
              <Markdown>{proposal.descriptionMd}</Markdown>
            </Card>
          </section>
        ) : null}

        {proposal.kind === "duct" && proposal.ductDetails ? <DuctSection details={proposal.ductDetails} /> : null}

        {proposal.kind === "material" && proposal.material ? (
          <MaterialSection material={proposal.material} needsNote={needsSafetyNote(proposal.kind, proposal.material)} />
        ) : null}
        {proposal.safetyNote ? (
          <section aria-labelledby="safety-note-heading">
            <h2 id="safety-note-heading" className="mb-2 flex items-center gap-2 text-xl font-semibold">
              <Icon node={ShieldCheck} className="h-5 w-5 text-moss" /> The lab&apos;s safety note
            </h2>
            <Card className="whitespace-pre-line border-moss/30 bg-moss-soft/40 text-sm">{proposal.safetyNote}</Card>
          </section>
        ) : null}
        {cautions.length > 0 ? <CautionList cautions={cautions} headingId="cautions-heading" /> : null}

        {uploads.length > 0 ? (
          <section aria-labelledby="uploads-heading" className="flex flex-col gap-4">
            <h2 id="uploads-heading" className="text-xl font-semibold">
              Files
            </h2>
            {photos.length > 0 ? <PhotoGrid photos={photos} /> : null}
            {models.length > 0 ? (
              <ul className="flex flex-col gap-3">
                {models.map((model) => (
                  <li key={model.id}>
                    <Card className="flex flex-col gap-3">
                      <p className="flex flex-wrap items-center gap-2 text-sm">
                        <Icon node={Box} className="text-teal" />
                        <a href={model.url} className="font-semibold text-teal underline" download={model.originalName}>
                          {model.originalName}
                        </a>
                        <span className="text-muted">{formatBytes(model.sizeBytes)}</span>
                      </p>
                      {model.analysis ? (
                        <ModelFigures analysis={model.analysis} />
                      ) : (
                        <p className="text-sm text-muted">Not measured yet.</p>
                      )}
                    </Card>
                  </li>
                ))}
              </ul>
            ) : null}
          </section>
        ) : null}
      </div>

      <aside className="flex flex-col gap-4 lg:sticky lg:top-6 lg:self-start">
        <Card className="flex flex-col gap-3">
          <h2 className="text-sm font-semibold uppercase tracking-wide text-muted">Demand</h2>
          {proposal.state === "draft" ? (
            <p className="text-sm text-muted">Members can vote once you submit it to the lab.</p>
          ) : proposal.state === "merged" ? (
            <p className="text-sm text-muted">Its votes moved to the proposal it was merged into.</p>
          ) : (
            <QueryProvider>
              <VoteSlot proposal={proposal} viewer={voteViewer} returnTo={here} />
              {voteViewer.kind === "member" && proposal.state === "submitted" ? (
                <VotesLeft initial={{ allowance: voteViewer.allowance, votesLeft: voteViewer.votesLeft }} className="border-t border-line pt-3" />
              ) : null}
            </QueryProvider>
          )}
        </Card>
        {mine && isEditable(proposal) ? (
          <Button asChild variant="secondary">
            <Link href={`/proposals/${proposal.slug}/edit`}>
              <Icon node={Pencil} /> Edit {proposal.state === "draft" ? "or submit this draft" : "this proposal"}
            </Link>
          </Button>
        ) : null}
        <Link href="/proposals" className="text-sm font-medium text-teal underline">
          All proposals
        </Link>
      </aside>
    </article>
  );
}

function StateNotice({
  state,
  mine,
  declineReason,
  mergedInto,
  campaignSlug,
  reviewStarted,
}: {
  state: string;
  mine: boolean;
  declineReason: string | null;
  mergedInto: { slug: string; title: string } | null;
  campaignSlug: string | null;
  reviewStarted: boolean;
}) {
  if (state === "draft") {
    return (
      <p className="rounded-lg border border-dashed border-line bg-paper p-3 text-sm">
        This is your draft: only you can see it until you submit it to the lab.
      </p>
    );
  }
  if (state === "declined") {
    return (
      <Card className="flex flex-col gap-1 border-rose/30 bg-rose-soft/40">
        <h2 className="flex items-center gap-2 font-semibold text-rose">
          <Icon node={CircleSlash} /> The lab declined this proposal
        </h2>
        <p className="whitespace-pre-line text-sm">{declineReason}</p>
      </Card>
    );
  }
  if (state === "merged" && mergedInto) {
    return (
      <p className="flex flex-wrap items-center gap-1.5 rounded-lg border border-plum/30 bg-plum-soft/50 p-3 text-sm">
        <Icon node={ArrowRight} className="text-plum" /> The lab merged this duplicate into{" "}
        <Link href={`/proposals/${mergedInto.slug}`} className="font-semibold text-teal underline">
          {mergedInto.title}
        </Link>
        ; its votes moved there.
      </p>
    );
  }
  if (state === "accepted") {
    return (
      <p className="rounded-lg border border-moss/30 bg-moss-soft/50 p-3 text-sm">
        The lab accepted this proposal.{" "}
        {campaignSlug ? (
          <Link href={`/campaigns/${campaignSlug}`} className="font-semibold text-teal underline">
            See its campaign
          </Link>
        ) : (
          "Its campaign opens once the test plan is priced."
        )}
      </p>
    );
  }
  if (state === "submitted" && mine && reviewStarted) {
    return <p className="rounded-lg bg-indigo-soft/60 p-3 text-sm">The lab has started reviewing your proposal, so it can no longer be edited.</p>;
  }
  return null;
}

function describeOpening(shape: OpeningShape): string {
  const mm = (value: number) => formatNumber(value, 2);
  switch (shape.kind) {
    case "rectangle":
      return `rectangle ${mm(shape.widthMm)} × ${mm(shape.heightMm)} mm`;
    case "circle":
      return `circle ⌀ ${mm(shape.diameterMm)} mm`;
    case "slot":
      return `slot ${mm(shape.widthMm)} × ${mm(shape.heightMm)} mm`;
  }
}

function DuctSection({ details }: { details: DuctDetails }) {
  let airflow: DuctAirflow | undefined;
  try {
    airflow = ductAirflow(details.inlet, details.outlets, details.fan.rating);
  } catch {
    airflow = undefined;
  }
  const rating = details.fan.rating;
  return (
    <section aria-labelledby="duct-heading" className="flex flex-col gap-3">
      <h2 id="duct-heading" className="flex items-center gap-2 text-xl font-semibold">
        <Icon node={Wind} className="h-5 w-5 text-muted" /> The duct
      </h2>
      <div className="grid gap-4 md:grid-cols-2">
        <Card className="text-sm">
          <dl className="flex flex-col gap-2">
            <div>
              <dt className="text-xs font-medium uppercase tracking-wide text-muted">Inlet</dt>
              <dd title={shapeLabels[details.inlet.kind]}>{describeOpening(details.inlet)}</dd>
            </div>
            <div>
              <dt className="text-xs font-medium uppercase tracking-wide text-muted">
                {details.outlets.length === 1 ? "Outlet" : `${details.outlets.length} outlets`}
              </dt>
              <dd>
                <ol className="list-decimal pl-5">
                  {details.outlets.map((outlet, index) => (
                    <li key={index}>{describeOpening(outlet)}</li>
                  ))}
                </ol>
              </dd>
            </div>
            <div>
              <dt className="text-xs font-medium uppercase tracking-wide text-muted">Fan</dt>
              <dd>
                {details.fan.description ? `${details.fan.description}, ` : ""}
                rated {formatNumber(rating.value, 2)} {rating.unit === "cfm" ? "CFM" : "m³/h"} in free air
              </dd>
            </div>
          </dl>
        </Card>
        <Card className="flex flex-col gap-3">
          {airflow ? <DuctAirflowFigures airflow={airflow} /> : <p className="text-sm text-muted">These sizes do not give usable figures.</p>}
        </Card>
      </div>
      <DuctAirflowCaveat />
    </section>
  );
}

function MaterialSection({ material, needsNote }: { material: string; needsNote: boolean }) {
  const known = isMaterialId(material) ? getMaterial(material) : undefined;
  return (
    <section aria-labelledby="material-heading">
      <h2 id="material-heading" className="mb-2 text-xl font-semibold">
        Material
      </h2>
      <p>
        <strong>{material}</strong>
        {known ? ` — ${known.name}, printed at ${known.nozzleTemperatureCelsius.min}–${known.nozzleTemperatureCelsius.max} °C` : ""}
        {known?.needsEnclosure ? "; it needs an enclosed printer." : "."}
      </p>
      {needsNote ? (
        <p className="mt-1 text-sm text-muted">The lab writes down its precautions for this material before accepting the test.</p>
      ) : null}
    </section>
  );
}

function PhotoGrid({ photos }: { photos: ProposalUploadView[] }) {
  return (
    <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3">
      {photos.map((photo) => (
        <li key={photo.id}>
          <a href={photo.url} className="group flex flex-col gap-1 text-xs" aria-label={`${photo.originalName}, full size`}>
            <span className="relative block aspect-[4/3] overflow-hidden rounded-lg border border-line bg-slate-soft">
              {photo.thumbnailUrl ? (
                <Image
                  src={photo.thumbnailUrl}
                  alt={photo.originalName}
                  fill
                  unoptimized
                  sizes="(min-width: 640px) 14rem, 45vw"
                  className="object-cover transition-transform group-hover:scale-[1.02]"
                />
              ) : (
                <span className="flex h-full items-center justify-center text-muted">
                  <Icon node={ImageIcon} className="h-6 w-6" />
                </span>
              )}
            </span>
            <span className="truncate text-muted">
              {photo.originalName}
              {photo.widthPx && photo.heightPx ? ` · ${photo.widthPx} × ${photo.heightPx}` : ""}
            </span>
          </a>
        </li>
      ))}
    </ul>
  );
}

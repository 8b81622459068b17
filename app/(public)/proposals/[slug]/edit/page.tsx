import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Lock } from "lucide";
import { ProposalStateBadge } from "@/components/proposal-state-badge";
import { formValuesFrom, uploadItemFrom } from "@/components/proposals/form-values";
import { ProposalForm } from "@/components/proposals/proposal-form";

import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { getProposalBySlug, listUploadsForProposal } from "@/db/queries/proposal-reads";
import { isEditable } from "@/lib/proposals/rules";
import { requirePageRole } from "@/server/guards";
import { saveProposalDraft, submitProposalToLab } from "../../actions";

export const metadata: Metadata = { title: "Edit proposal", robots: { index: false } };

type Props = { params: Promise<{ slug: string }>; searchParams: Promise<{ saved?: string }> };

export default async function EditProposalPage({ params, searchParams }: Props) {
  const { slug } = await params;
  const viewer = await requirePageRole("supporter", `/proposals/${slug}/edit`);
  const db = getDb();
  const found = getProposalBySlug(db, slug);
  // Someone else's draft does not exist as far as anyone else can tell.
  if (!found || (found.proposal.state === "draft" && found.proposal.proposerId !== viewer.id)) notFound();
  const { proposal } = found;

  if (proposal.proposerId !== viewer.id || !isEditable(proposal)) {
    const text =
      proposal.proposerId !== viewer.id
        ? "Only the person who proposed it can edit this proposal."
        : proposal.state === "submitted"
          ? "The lab has started reviewing this proposal, so it can no longer be edited."
          : `This proposal is ${proposal.state}, so it can no longer be edited.`;
    return (
      <div className="mx-auto flex max-w-md flex-col gap-4">
        <Card className="flex flex-col items-start gap-3">
          <Icon node={Lock} className="h-8 w-8 text-ember" />
          <h1 className="text-2xl font-bold">You cannot edit this proposal</h1>
          <p data-testid="not-editable">{text}</p>
          <Button asChild variant="secondary">
            <Link href={`/proposals/${proposal.slug}`}>See the proposal</Link>
          </Button>
        </Card>
      </div>
    );
  }

  const { saved } = await searchParams;
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6">
      <header className="flex flex-col gap-2">
        <div>
          <ProposalStateBadge state={proposal.state} />
        </div>
        <h1 className="text-3xl font-bold tracking-tight">Edit “{proposal.title}”</h1>
        <p className="max-w-3xl text-muted">
          {proposal.state === "draft"
            ? "Only you can see this draft. Submit it when it is ready; the lab needs a title, the kind of test, the printer type and why it matters."
            : "The lab has this proposal but has not started reviewing it, so you can still change it."}
        </p>
      </header>
      <ProposalForm
        proposal={{ id: proposal.id, slug: proposal.slug, state: proposal.state }}
        initialValues={formValuesFrom(proposal)}
        initialUploads={listUploadsForProposal(db, proposal.id).map(uploadItemFrom)}
        justSaved={saved === "draft" && proposal.state === "draft"}
        saveDraft={saveProposalDraft}
        submit={submitProposalToLab}
      />
    </div>
  );
}

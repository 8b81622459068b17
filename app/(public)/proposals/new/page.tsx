import type { Metadata } from "next";
import { ProposalForm } from "@/components/proposals/proposal-form";
import { emptyFormValues } from "@/components/proposals/form-values";
import { requirePageRole } from "@/server/guards";
import { saveProposalDraft, submitProposalToLab } from "../actions";

export const metadata: Metadata = { title: "Propose a test" };

export default async function NewProposalPage() {
  await requirePageRole("supporter", "/proposals/new");
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 className="text-3xl font-bold tracking-tight">Propose a test</h1>
        <p className="max-w-3xl text-muted">
          Name what to test, why it matters and on which kind of printer, and attach the part&apos;s model file and photos. Save a
          draft as often as you like; when you submit it, Filament Club members can vote on it and the lab decides whether to run it.
        </p>
      </header>
      <ProposalForm
        proposal={null}
        initialValues={emptyFormValues()}
        initialUploads={[]}
        justSaved={false}
        saveDraft={saveProposalDraft}
        submit={submitProposalToLab}
      />
    </div>
  );
}

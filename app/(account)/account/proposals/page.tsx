import type { Metadata } from "next";
import Link from "next/link";
import { ArrowRight, Pencil, Plus } from "lucide";
import { ProposalStateBadge } from "@/components/proposal-state-badge";
import { formatVotes } from "@/components/proposals/format";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listProposalsByProposer, type OwnProposal } from "@/db/queries/proposal-reads";
import { formatDate } from "@/lib/format";
import { isEditable } from "@/lib/proposals/rules";
import { printerTypeLabels, proposalKindLabels } from "@/lib/validation/proposal";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "My proposals" };

export default async function MyProposalsPage() {
  const viewer = await requirePageRole("supporter", "/account/proposals");
  const db = getDb();
  const rows = listProposalsByProposer(db, viewer.id);
  const { timeZone } = getLabSettings(db);

  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-6">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <Link href="/account" className="text-teal underline">
          Your account
        </Link>{" "}
        / My proposals
      </nav>
      <header className="flex flex-wrap items-end justify-between gap-3">
        <h1 className="text-2xl font-bold">My proposals</h1>
        <Button asChild size="sm">
          <Link href="/proposals/new">
            <Icon node={Plus} /> Propose a test
          </Link>
        </Button>
      </header>
      {rows.length === 0 ? (
        <Card>
          <p>You have not proposed a test yet.</p>
          <p className="mt-1 text-sm text-muted">Proposals name a duct, material, nozzle or other part to test, and why.</p>
        </Card>
      ) : (
        <ul className="flex flex-col gap-3" aria-label="My proposals">
          {rows.map((row) => (
            <li key={row.id}>
              <OwnProposalCard row={row} timeZone={timeZone} />
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function OwnProposalCard({ row, timeZone }: { row: OwnProposal; timeZone: string }) {
  const editable = isEditable(row);
  return (
    <Card className="flex flex-col gap-2 p-4" data-testid="own-proposal">
      <div className="flex flex-wrap items-center gap-2 text-xs">
        <ProposalStateBadge state={row.state} />
        <span className="rounded-md bg-teal-soft px-2 py-0.5 font-medium text-teal-strong">{proposalKindLabels[row.kind]}</span>
        <span className="rounded-md bg-slate-soft px-2 py-0.5 font-medium text-muted">{printerTypeLabels[row.printerType]}</span>
      </div>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <h2 className="text-base font-semibold">
          <Link href={`/proposals/${row.slug}`} className="hover:text-teal hover:underline">
            {row.title}
          </Link>
        </h2>
        {editable ? (
          <Button asChild variant="secondary" size="sm">
            <Link href={`/proposals/${row.slug}/edit`} aria-label={`Edit ${row.title}`}>
              <Icon node={Pencil} /> Edit
            </Link>
          </Button>
        ) : null}
      </div>
      <p className="text-sm text-muted">
        {row.state === "draft"
          ? `Draft, last saved ${formatDate(row.updatedAt, timeZone)} — only you can see it.`
          : `Submitted ${formatDate(row.submittedAt ?? row.createdAt, timeZone)} · ${formatVotes(row.voteCount)}`}
        {row.state === "submitted" && !editable ? " · the lab is reviewing it" : ""}
      </p>
      {row.state === "declined" && row.declineReason ? (
        <p className="rounded-md bg-rose-soft/60 p-2 text-sm">
          <strong className="text-rose">Declined:</strong> {row.declineReason}
        </p>
      ) : null}
      {row.state === "merged" && row.mergedInto ? (
        <p className="flex flex-wrap items-center gap-1.5 text-sm">
          <Icon node={ArrowRight} className="text-plum" /> Merged into{" "}
          <Link href={`/proposals/${row.mergedInto.slug}`} className="font-medium text-teal underline">
            {row.mergedInto.title}
          </Link>
        </p>
      ) : null}
      {row.state === "accepted" ? (
        <p className="text-sm">
          Accepted by the lab.{" "}
          {row.campaignSlug ? (
            <Link href={`/campaigns/${row.campaignSlug}`} className="font-medium text-teal underline">
              See its campaign
            </Link>
          ) : (
            "Its campaign opens once the test plan is priced."
          )}
        </p>
      ) : null}
    </Card>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { ArrowRight, Plus } from "lucide";
import { z } from "zod";
import { QueryProvider } from "@/components/providers/query-provider";
import { formatAge } from "@/components/proposals/format";
import { VotesLeft } from "@/components/proposals/vote-button";
import { VoteSlot, type VoteViewer } from "@/components/proposals/vote-slot";
import { voteViewerFor } from "@/components/proposals/vote-viewer";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { boardSorts, listBoardProposals, type BoardProposal, type BoardSort } from "@/db/queries/proposal-reads";
import { cn } from "@/lib/cn";
import { printerTypeLabels, proposalKindLabels, proposalKindValues } from "@/lib/validation/proposal";
import { getViewer } from "@/server/auth";

export const metadata: Metadata = {
  title: "Proposals",
  description: "Tests supporters proposed to Harbor Street Print Lab, and how many Filament Club members want each.",
};

type Kind = (typeof proposalKindValues)[number];
const querySchema = z.object({
  sort: z.enum(boardSorts).catch("votes"),
  kind: z.enum(proposalKindValues).optional().catch(undefined),
});

const sortLabels: Record<BoardSort, string> = { votes: "Most votes", newest: "Newest" };

const sections: { state: BoardProposal["state"]; title: string; empty: string }[] = [
  { state: "submitted", title: "Open for votes", empty: "Nothing is waiting for the lab's decision right now." },
  { state: "accepted", title: "Accepted by the lab", empty: "" },
  { state: "merged", title: "Merged into another proposal", empty: "" },
];

function boardHref(sort: BoardSort, kind: Kind | undefined): string {
  const params = new URLSearchParams();
  if (sort !== "votes") params.set("sort", sort);
  if (kind) params.set("kind", kind);
  const query = params.toString();
  return query ? `/proposals?${query}` : "/proposals";
}

export default async function ProposalsBoardPage({ searchParams }: { searchParams: Promise<Record<string, string | string[]>> }) {
  const { sort, kind } = querySchema.parse(await searchParams);
  const db = getDb();
  const now = new Date();
  const rows = listBoardProposals(db, { sort, kind });
  const viewer = await getViewer();
  const voteViewer = voteViewerFor(db, viewer, rows.filter((row) => row.state === "submitted").map((row) => row.id), now);
  const here = boardHref(sort, kind);

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-3 sm:flex-row sm:items-end sm:justify-between">
        <div className="max-w-3xl">
          <h1 className="text-3xl font-bold tracking-tight">Proposals</h1>
          <p className="mt-2 text-muted">
            Tests supporters would like the lab to run. Filament Club members vote so the lab sees the demand; the lab accepts,
            declines or merges each one, and accepted proposals become campaigns.
          </p>
        </div>
        <Button asChild className="self-start sm:self-auto">
          <Link href="/proposals/new">
            <Icon node={Plus} /> Propose a test
          </Link>
        </Button>
      </header>

      <nav aria-label="Sort and filter proposals" className="flex flex-col gap-3 sm:flex-row sm:items-center sm:justify-between">
        <FilterGroup label="Sort">
          {boardSorts.map((option) => (
            <FilterLink key={option} href={boardHref(option, kind)} current={option === sort}>
              {sortLabels[option]}
            </FilterLink>
          ))}
        </FilterGroup>
        <FilterGroup label="Kind">
          <FilterLink href={boardHref(sort, undefined)} current={kind === undefined}>
            All
          </FilterLink>
          {proposalKindValues.map((option) => (
            <FilterLink key={option} href={boardHref(sort, option)} current={option === kind}>
              {proposalKindLabels[option]}
            </FilterLink>
          ))}
        </FilterGroup>
      </nav>

      <QueryProvider>
        {voteViewer.kind === "member" ? (
          <VotesLeft initial={{ allowance: voteViewer.allowance, votesLeft: voteViewer.votesLeft }} />
        ) : null}
        {rows.length === 0 ? (
          <p className="text-muted">No proposals {kind ? "of this kind " : ""}yet.</p>
        ) : (
          sections.map((section) => {
            const sectionRows = rows.filter((row) => row.state === section.state);
            if (sectionRows.length === 0 && section.state !== "submitted") return null;
            return (
              <section key={section.state} aria-labelledby={`section-${section.state}`} className="flex flex-col gap-3">
                <h2 id={`section-${section.state}`} className="text-xl font-semibold">
                  {section.title} <span className="font-normal text-muted">({sectionRows.length})</span>
                </h2>
                {sectionRows.length === 0 ? (
                  <p className="text-muted">{section.empty}</p>
                ) : (
                  <ul className="flex flex-col gap-3">
                    {sectionRows.map((row) => (
                      <li key={row.id}>
                        <ProposalRow row={row} now={now} voteViewer={voteViewer} returnTo={here} />
                      </li>
                    ))}
                  </ul>
                )}
              </section>
            );
          })
        )}
      </QueryProvider>
    </div>
  );
}

function ProposalRow({ row, now, voteViewer, returnTo }: { row: BoardProposal; now: Date; voteViewer: VoteViewer; returnTo: string }) {
  const reachedLab = row.submittedAt ?? row.createdAt;
  return (
    <Card className={cn("flex flex-col gap-3 p-4 sm:flex-row sm:items-center sm:gap-5", row.state === "merged" && "bg-paper")}>
      <div className="flex min-w-0 flex-1 flex-col gap-1.5">
        <div className="flex flex-wrap items-center gap-2 text-xs">
          <span className="rounded-md bg-teal-soft px-2 py-0.5 font-medium text-teal-strong">{proposalKindLabels[row.kind]}</span>
          <span className="rounded-md bg-slate-soft px-2 py-0.5 font-medium text-muted">{printerTypeLabels[row.printerType]}</span>
        </div>
        <h3 className="text-base font-semibold leading-snug">
          <Link href={`/proposals/${row.slug}`} className="hover:text-teal hover:underline">
            {row.title}
          </Link>
        </h3>
        <p className="text-sm text-muted">
          {row.proposerName ?? "A supporter"} · <time dateTime={reachedLab.toISOString()}>{formatAge(reachedLab, now)}</time>
          {row.campaignSlug ? (
            <>
              {" · "}
              <Link href={`/campaigns/${row.campaignSlug}`} className="font-medium text-teal underline">
                See the campaign
              </Link>
            </>
          ) : null}
        </p>
        {row.mergedInto ? (
          <p className="flex flex-wrap items-center gap-1.5 text-sm">
            <Icon node={ArrowRight} className="text-plum" /> Merged into{" "}
            <Link href={`/proposals/${row.mergedInto.slug}`} className="font-medium text-teal underline">
              {row.mergedInto.title}
            </Link>
          </p>
        ) : null}
      </div>
      {row.state === "merged" ? null : (
        <div className="shrink-0 sm:w-60">
          <VoteSlot proposal={row} viewer={voteViewer} returnTo={returnTo} />
        </div>
      )}
    </Card>
  );
}

function FilterGroup({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="flex flex-wrap items-center gap-1.5 text-sm">
      <span className="mr-1 text-muted">{label}</span>
      {children}
    </div>
  );
}

function FilterLink({ href, current, children }: { href: string; current: boolean; children: React.ReactNode }) {
  return (
    <Link
      href={href}
      aria-current={current ? "page" : undefined}
      className={cn(
        "rounded-full border px-3 py-1 font-medium transition-colors",
        current ? "border-teal bg-teal text-white" : "border-line bg-surface hover:border-teal hover:text-teal",
      )}
    >
      {children}
    </Link>
  );
}

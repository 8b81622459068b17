import type { Metadata } from "next";
import { TriageTable } from "@/components/lab/triage-table";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listTriagePage } from "@/db/queries/triage";
import { triageQuerySchema } from "@/lib/validation/triage";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Proposals · Lab" };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function LabProposalsPage({ searchParams }: Props) {
  await requirePageRole("host", "/lab/proposals");
  const db = getDb();
  // The table's filters live in the address; a hand-edited one that does not parse falls back to the default view.
  const parsed = triageQuerySchema.safeParse(await searchParams);
  const query = parsed.success ? parsed.data : triageQuerySchema.parse({});
  const { timeZone } = getLabSettings(db);
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-bold">Proposals</h1>
        <p className="max-w-3xl text-muted">
          Accept, decline with a reason, or merge duplicates. Opening a proposal starts its review, so its proposer can no longer edit it.
        </p>
      </div>
      <TriageTable initialQuery={query} initialPage={listTriagePage(db, query)} timeZone={timeZone} renderedAt={new Date().getTime()} />
    </div>
  );
}

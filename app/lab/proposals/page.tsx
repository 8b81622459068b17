import type { Metadata } from "next";
import { ProposalStateBadge } from "@/components/proposal-state-badge";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listProposalsForTriage } from "@/db/queries/proposals";
import { formatDate } from "@/lib/format";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Proposals · Lab" };

const kindLabels = { duct: "Duct", material: "Material", nozzle: "Nozzle", part: "Other part" } as const;
const printerTypeLabels = { corexy: "CoreXY", bedslinger: "Bed-slinger", delta: "Delta" } as const;

export default async function LabProposalsPage() {
  await requirePageRole("host", "/lab/proposals");
  const db = getDb();
  const rows = listProposalsForTriage(db);
  const { timeZone } = getLabSettings(db);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Proposals</h1>
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[40rem] text-sm">
          <caption className="sr-only">Proposals from supporters, newest first</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">Title</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Kind</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Printer type</th>
              <th scope="col" className="px-4 py-2.5 font-medium">State</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Votes</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Proposed by</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Received</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} className="border-b border-line last:border-0 hover:bg-paper">
                <td className="px-4 py-2.5 font-medium">{row.title}</td>
                <td className="px-4 py-2.5">{kindLabels[row.kind]}</td>
                <td className="px-4 py-2.5">{printerTypeLabels[row.printerType]}</td>
                <td className="px-4 py-2.5"><ProposalStateBadge state={row.state} /></td>
                <td className="px-4 py-2.5 text-right font-mono">{row.votes}</td>
                <td className="px-4 py-2.5">{row.proposerName ?? "—"}</td>
                <td className="px-4 py-2.5 text-muted">{formatDate(row.submittedAt ?? row.createdAt, timeZone)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

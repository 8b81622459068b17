import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listOutbox, outboxCounts } from "@/db/queries/outbox";
import { outboxStates, type OutboxMessage } from "@/db/schema";
import { cn } from "@/lib/cn";
import { formatDateTime } from "@/lib/format";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Outbox · Lab" };

const tones: Record<OutboxMessage["state"], string> = {
  queued: "bg-indigo-soft text-indigo",
  sending: "bg-ember-soft text-ember",
  sent: "bg-moss-soft text-moss",
  failed: "bg-rose-soft text-rose",
};

type Props = { searchParams: Promise<{ state?: string }> };

export default async function OutboxPage({ searchParams }: Props) {
  await requirePageRole("host", "/lab/outbox");
  const { state } = await searchParams;
  const filter = (outboxStates as readonly string[]).includes(state ?? "") ? (state as OutboxMessage["state"]) : undefined;
  const db = getDb();
  const counts = outboxCounts(db);
  const rows = listOutbox(db, { state: filter });
  const { timeZone } = getLabSettings(db);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Outbox</h1>
      <p className="max-w-3xl text-muted">
        Every e-mail Proofbay sends is queued here in the same transaction as the event that causes it, then sent by the mail
        worker, retried with growing pauses when the mail server refuses it, and never queued twice for the same person and event.
      </p>
      <nav aria-label="Filter by state" className="flex flex-wrap gap-2 text-sm">
        <Link href="/lab/outbox" className={cn("rounded-md border border-line px-3 py-1.5", !filter && "border-teal bg-teal-soft")}>
          All
        </Link>
        {outboxStates.map((name) => (
          <Link key={name} href={`/lab/outbox?state=${name}`} className={cn("rounded-md border border-line px-3 py-1.5 capitalize", filter === name && "border-teal bg-teal-soft")}>
            {name} <span className="font-mono text-muted">{counts[name]}</span>
          </Link>
        ))}
      </nav>
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[48rem] text-sm">
          <caption className="sr-only">Queued and sent e-mail, newest first</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">Queued</th>
              <th scope="col" className="px-4 py-2.5 font-medium">To</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Subject</th>
              <th scope="col" className="px-4 py-2.5 font-medium">State</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Attempts</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Last error</th>
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={6} className="px-4 py-6 text-center text-muted">No mail here.</td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={row.id} className="border-b border-line last:border-0">
                  <td className="px-4 py-2.5 whitespace-nowrap text-muted">{formatDateTime(row.createdAt, timeZone)}</td>
                  <td className="px-4 py-2.5">{row.toAddress}</td>
                  <td className="px-4 py-2.5">{row.subject}</td>
                  <td className="px-4 py-2.5">
                    <span className={cn("rounded-md px-2 py-0.5 text-xs font-semibold capitalize", tones[row.state])}>{row.state}</span>
                  </td>
                  <td className="px-4 py-2.5 text-right font-mono">{row.attempts}</td>
                  <td className="px-4 py-2.5 text-xs text-muted">{row.lastError ?? ""}</td>
                </tr>
              ))
            )}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

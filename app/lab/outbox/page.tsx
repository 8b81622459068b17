import type { Metadata } from "next";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listOutbox, outboxCounts, outboxRetryTotals, type OutboxFilter } from "@/db/queries/outbox";
import { outboxStates, type OutboxMessage } from "@/db/schema";
import { cn } from "@/lib/cn";
import { emailCategories, emailCategoryInfo, type EmailCategory } from "@/lib/email/categories";
import { formatDateTime } from "@/lib/format";
import { requirePageRole } from "@/server/guards";
import { retryMailAction } from "./actions";

export const metadata: Metadata = { title: "Outbox · Lab" };

const tones: Record<OutboxMessage["state"], string> = {
  queued: "bg-indigo-soft text-indigo",
  sending: "bg-ember-soft text-ember",
  sent: "bg-moss-soft text-moss",
  failed: "bg-rose-soft text-rose",
  suppressed: "bg-paper text-muted",
};

type Search = { state?: string; category?: string; q?: string };
type Props = { searchParams: Promise<Search> };

function hrefWith(current: Search, change: Partial<Search>): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries({ ...current, ...change })) if (value) params.set(key, value);
  const query = params.toString();
  return query ? `/lab/outbox?${query}` : "/lab/outbox";
}

export default async function OutboxPage({ searchParams }: Props) {
  await requirePageRole("host", "/lab/outbox");
  const search = await searchParams;
  const state = (outboxStates as readonly string[]).includes(search.state ?? "") ? (search.state as OutboxMessage["state"]) : undefined;
  const category = (emailCategories as readonly string[]).includes(search.category ?? "") ? (search.category as EmailCategory) : undefined;
  const q = search.q?.trim().slice(0, 200) || undefined;
  const current: Search = { state, category, q };
  const filter: OutboxFilter = { state, category, search: q };
  const db = getDb();
  const counts = outboxCounts(db);
  const totals = outboxRetryTotals(db);
  const rows = listOutbox(db, filter);
  const { timeZone } = getLabSettings(db);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Outbox</h1>
      <p className="max-w-3xl text-muted">
        Every e-mail Proofbay sends is queued here in the same transaction as the event that causes it, once per person and event,
        then sent by the mail worker and retried with growing pauses when the mail server refuses it. Mail of a kind the recipient
        turned off is suppressed, not sent.
      </p>
      <dl className="grid max-w-3xl grid-cols-2 gap-3 text-sm sm:grid-cols-3">
        <div className="rounded-md border border-line p-3">
          <dt className="text-muted">Messages retried</dt>
          <dd className="font-mono text-lg" data-testid="outbox-retried">{totals.retried}</dd>
        </div>
        <div className="rounded-md border border-line p-3">
          <dt className="text-muted">Retries in all</dt>
          <dd className="font-mono text-lg">{totals.retries}</dd>
        </div>
        <div className="rounded-md border border-line p-3">
          <dt className="text-muted" title="The worker stopped between claiming and recording; the resend carried the same Message-ID">
            Interrupted sends
          </dt>
          <dd className="font-mono text-lg">{totals.interrupted}</dd>
        </div>
      </dl>
      <nav aria-label="Filter by state" className="flex flex-wrap gap-2 text-sm">
        <Link href={hrefWith(current, { state: undefined })} className={cn("rounded-md border border-line px-3 py-1.5", !state && "border-teal bg-teal-soft")}>
          All
        </Link>
        {outboxStates.map((name) => (
          <Link
            key={name}
            href={hrefWith(current, { state: name })}
            className={cn("rounded-md border border-line px-3 py-1.5 capitalize", state === name && "border-teal bg-teal-soft")}
            data-testid={`outbox-count-${name}`}
          >
            {name} <span className="font-mono text-muted">{counts[name]}</span>
          </Link>
        ))}
      </nav>
      <form method="get" action="/lab/outbox" className="flex flex-wrap items-end gap-3 text-sm">
        {state ? <input type="hidden" name="state" value={state} /> : null}
        <label className="flex flex-col gap-1">
          <span className="text-muted">Kind of mail</span>
          <select name="category" defaultValue={category ?? ""} className="rounded-md border border-line bg-white px-2 py-1.5">
            <option value="">All kinds</option>
            {emailCategories.map((name) => (
              <option key={name} value={name}>
                {emailCategoryInfo[name].label}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-muted">Recipient or subject</span>
          <input type="search" name="q" defaultValue={q ?? ""} className="w-64 rounded-md border border-line bg-white px-2 py-1.5" />
        </label>
        <Button type="submit" variant="secondary">
          Filter
        </Button>
      </form>
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[56rem] text-sm">
          <caption className="sr-only">Queued and sent e-mail, newest first</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">Queued</th>
              <th scope="col" className="px-4 py-2.5 font-medium">To</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Subject</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Kind</th>
              <th scope="col" className="px-4 py-2.5 font-medium">State</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Retries</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Last error</th>
              <th scope="col" className="px-4 py-2.5 font-medium"><span className="sr-only">Actions</span></th>
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={8} className="px-4 py-6 text-center text-muted">No mail here.</td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={row.id} className="border-b border-line last:border-0" data-testid="outbox-row">
                  <td className="px-4 py-2.5 whitespace-nowrap text-muted">{formatDateTime(row.createdAt, timeZone)}</td>
                  <td className="px-4 py-2.5">{row.toAddress}</td>
                  <td className="px-4 py-2.5">{row.subject}</td>
                  <td className="px-4 py-2.5 text-muted">{emailCategoryInfo[row.category as EmailCategory]?.label ?? row.category}</td>
                  <td className="px-4 py-2.5">
                    <span className={cn("rounded-md px-2 py-0.5 text-xs font-semibold capitalize", tones[row.state])}>{row.state}</span>
                  </td>
                  <td className="px-4 py-2.5 text-right font-mono">
                    {row.attempts}
                    {row.interruptedAttempts > 0 ? <span className="block text-xs text-muted">{row.interruptedAttempts} interrupted</span> : null}
                  </td>
                  <td className="px-4 py-2.5 text-xs text-muted">
                    {row.state === "suppressed" ? "The recipient turned this kind of mail off." : (row.lastError ?? "")}
                  </td>
                  <td className="px-4 py-2.5">
                    {row.state === "failed" ? (
                      <form action={retryMailAction}>
                        <input type="hidden" name="id" value={row.id} />
                        <Button type="submit" variant="secondary" className="whitespace-nowrap">
                          Retry now
                        </Button>
                      </form>
                    ) : null}
                  </td>
                </tr>
              ))
            )}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

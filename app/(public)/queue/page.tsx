import type { Metadata } from "next";
import Link from "next/link";
import { CalendarClock, Printer } from "lucide";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { ProgressBar } from "@/components/ui/progress-bar";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { listPrintingNow, listQueuedCampaigns, listUpNext } from "@/db/queries/public-queue";
import { formatDate, formatDateTime } from "@/lib/format";

export const metadata: Metadata = { title: "Print queue", description: "What the lab is printing now and next, and when each funded test's results are expected." };
export const dynamic = "force-dynamic";

export default function PublicQueuePage() {
  const db = getDb();
  const { timeZone, labName } = getLabSettings(db);
  const printing = listPrintingNow(db);
  const next = listUpNext(db);
  const queued = listQueuedCampaigns(db);

  return (
    <div className="flex flex-col gap-8">
      <header className="flex flex-col gap-2">
        <h1 className="text-3xl font-bold tracking-tight">Print queue</h1>
        <p className="max-w-3xl text-muted">
          What {labName} is printing for funded tests, and when each test&apos;s results are expected. Dates are estimates in the lab&apos;s time
          zone ({timeZone}); they move when a print fails, a printer needs repair, or the lab reorders the queue.
        </p>
      </header>

      <section aria-labelledby="now-heading" className="flex flex-col gap-3">
        <h2 id="now-heading" className="flex items-center gap-2 text-xl font-semibold">
          <Icon node={Printer} className="h-5 w-5 text-teal" /> Printing now
        </h2>
        {printing.length === 0 ? (
          <p className="text-muted">Nothing is printing right now.</p>
        ) : (
          <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            {printing.map((job) => (
              <li key={job.id}>
                <Card className="flex h-full flex-col gap-1">
                  <p className="text-xs font-semibold uppercase tracking-wide text-teal">{job.printerName}</p>
                  <p className="font-semibold">{job.pieceName}</p>
                  <Link href={`/campaigns/${job.campaignSlug}`} className="text-sm text-teal underline">
                    {job.campaignTitle}
                  </Link>
                  {job.end ? <p className="text-xs text-muted">Expected off the bed {formatDateTime(job.end, timeZone)}</p> : null}
                </Card>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="next-heading" className="flex flex-col gap-3">
        <h2 id="next-heading" className="text-xl font-semibold">Up next</h2>
        {next.length === 0 ? (
          <p className="text-muted">Nothing else is scheduled yet.</p>
        ) : (
          <Card className="overflow-x-auto p-0">
            <table className="w-full min-w-[36rem] text-sm">
              <caption className="sr-only">The next scheduled prints</caption>
              <thead className="border-b border-line bg-paper text-left text-muted">
                <tr>
                  <th scope="col" className="px-4 py-2 font-medium">Starts</th>
                  <th scope="col" className="px-4 py-2 font-medium">Piece</th>
                  <th scope="col" className="px-4 py-2 font-medium">Campaign</th>
                  <th scope="col" className="px-4 py-2 font-medium">Printer</th>
                </tr>
              </thead>
              <tbody>
                {next.map((job) => (
                  <tr key={job.id} className="border-b border-line last:border-0">
                    <td className="whitespace-nowrap px-4 py-2">{job.start ? formatDateTime(job.start, timeZone) : "—"}</td>
                    <td className="px-4 py-2">{job.pieceName}</td>
                    <td className="px-4 py-2">
                      <Link href={`/campaigns/${job.campaignSlug}`} className="text-teal underline">
                        {job.campaignTitle}
                      </Link>
                    </td>
                    <td className="px-4 py-2">{job.printerName}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
        )}
      </section>

      <section aria-labelledby="dates-heading" className="flex flex-col gap-3">
        <h2 id="dates-heading" className="flex items-center gap-2 text-xl font-semibold">
          <Icon node={CalendarClock} className="h-5 w-5 text-teal" /> Expected results
        </h2>
        {queued.length === 0 ? (
          <p className="text-muted">No funded tests are waiting for the printers.</p>
        ) : (
          <ul className="grid gap-3 sm:grid-cols-2">
            {queued.map((campaign) => {
              const percent = campaign.jobsTotal > 0 ? Math.round((campaign.jobsDone / campaign.jobsTotal) * 100) : 0;
              return (
                <li key={campaign.id}>
                  <Card className="flex h-full flex-col gap-2" data-testid={`queue-campaign-${campaign.slug}`}>
                    <Link href={`/campaigns/${campaign.slug}`} className="font-semibold text-teal underline">
                      {campaign.title}
                    </Link>
                    <p className="text-sm">
                      {campaign.estimatedResultsAt ? (
                        <>
                          Results expected{" "}
                          <time dateTime={campaign.estimatedResultsAt.toISOString()} className="font-semibold">
                            {formatDate(campaign.estimatedResultsAt, timeZone)}
                          </time>
                        </>
                      ) : (
                        <span className="text-muted">Date not set yet — waiting for a printer slot.</span>
                      )}
                    </p>
                    <ProgressBar percent={percent} label={`${campaign.jobsDone} of ${campaign.jobsTotal} prints done`} />
                    <p className="text-xs text-muted">
                      {campaign.jobsDone} of {campaign.jobsTotal} prints done
                    </p>
                  </Card>
                </li>
              );
            })}
          </ul>
        )}
      </section>
    </div>
  );
}

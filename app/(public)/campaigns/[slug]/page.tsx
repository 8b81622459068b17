import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AlertTriangle, CalendarClock, Layers, Printer, Repeat, Users } from "lucide";
import { Icon } from "@/components/ui/icon";
import { CampaignGoalBreakdown } from "@/components/campaign-goal-breakdown";
import { CampaignStateBadge } from "@/components/campaign-state-badge";
import { PledgeBox } from "@/components/pledges/pledge-box";
import { CampaignReportAndNotes } from "@/components/reports/campaign-report-notes";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { ProgressBar } from "@/components/ui/progress-bar";
import { CampaignQueueProgress } from "@/components/queue/campaign-queue-progress";
import { getDb } from "@/db";
import { getCampaignBySlug, getLabSettings, listPublicPledges } from "@/db/queries/campaigns";
import { findOwnPledgeBySession } from "@/db/queries/pledges";
import { estimateCampaignPlan } from "@/db/queries/pricing";
import { fundingProgress, timeLeft } from "@/lib/campaign/progress";
import { formatDate, formatDateTime, formatMoney } from "@/lib/format";
import { pledgeBounds } from "@/lib/pledges/amounts";
import { fanNoiseCaution, materialCautions } from "@/lib/safety";
import { getViewer } from "@/server/auth";

type Props = { params: Promise<{ slug: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const found = getCampaignBySlug(getDb(), (await params).slug);
  return found ? { title: found.campaign.title, description: found.campaign.summary } : { title: "Campaign not found" };
}

export default async function CampaignPage({ params, searchParams }: Props) {
  const db = getDb();
  const found = getCampaignBySlug(db, (await params).slug);
  if (!found) notFound();
  const query = await searchParams;
  const viewer = await getViewer();
  const { campaign, plan, printer, pieces, variants } = found;
  const settings = getLabSettings(db);
  const pledges = listPublicPledges(db, campaign.id);
  const progress = fundingProgress(found.pledgedMinor + found.labFundMinor, campaign.goalMinor);
  const now = new Date();
  const jobCount = plan ? pieces.length * variants.length * plan.repeats : 0;
  const cautions = plan ? [...materialCautions(plan.material), fanNoiseCaution] : [];
  const estimate = estimateCampaignPlan(db, campaign.id);
  const takesPledges = campaign.state === "open" && campaign.deadline.getTime() > now.getTime();
  // Back from the card processor: the page only reports what the webhook has already recorded.
  const returnedSession = query.pledge === "thanks" && typeof query.session === "string" ? query.session : null;
  const returnedPledge = returnedSession && viewer ? findOwnPledgeBySession(db, viewer.id, returnedSession) : undefined;

  return (
    <article className="grid gap-8 lg:grid-cols-[minmax(0,1fr)_22rem]">
      <div className="flex flex-col gap-8">
        <header className="flex flex-col gap-3">
          <div><CampaignStateBadge state={campaign.state} /></div>
          <h1 className="text-3xl font-bold tracking-tight">{campaign.title}</h1>
          <p className="text-lg text-muted">{campaign.summary}</p>
          {campaign.state === "lapsed" || campaign.state === "withdrawn" ? (
            <div role="status" data-testid="campaign-closed" className="rounded-lg border border-line bg-slate-soft/60 p-3 text-sm">
              {campaign.state === "lapsed" ? (
                <p>
                  This campaign did not reach its goal by its deadline
                  {campaign.closedAt ? ` and lapsed on ${formatDate(campaign.closedAt, settings.timeZone)}` : ""}. Goal-or-refund: every
                  paid pledge is refunded in full.
                </p>
              ) : (
                <>
                  <p>
                    The lab withdrew this campaign{campaign.closedAt ? ` on ${formatDate(campaign.closedAt, settings.timeZone)}` : ""}. Every
                    paid pledge is refunded in full.
                  </p>
                  {campaign.withdrawReason ? <p className="mt-1">The lab&apos;s reason: {campaign.withdrawReason}</p> : null}
                </>
              )}
            </div>
          ) : null}
        </header>

        <section aria-labelledby="plan-heading">
          <h2 id="plan-heading" className="mb-3 text-xl font-semibold">Test plan</h2>
          {plan ? (
            <Card className="flex flex-col gap-5">
              <dl className="grid grid-cols-2 gap-4 text-sm sm:grid-cols-4">
                <PlanFact icon={<Icon node={Layers} className="h-4 w-4" />} label="Material" value={`${plan.material}, ${plan.layerHeightMm} mm layers`} />
                <PlanFact icon={<Icon node={Printer} className="h-4 w-4" />} label="Printer" value={printer ? `${printer.name} (${printer.model})` : "Not chosen yet"} />
                <PlanFact icon={<Icon node={Repeat} className="h-4 w-4" />} label="Repeats" value={`${plan.repeats} of each`} />
                <PlanFact icon={<Icon node={Layers} className="h-4 w-4" />} label="Prints" value={`${jobCount} jobs`} />
              </dl>
              <p className="text-sm text-muted">
                Protocol: up to {plan.maxFlowMm3PerS} mm³/s volumetric flow, part-cooling fan at {plan.fanPercent} %.
                {plan.estimatedHours ? ` Estimated ${plan.estimatedHours.toFixed(1)} printer hours in all.` : ""}
              </p>
              <div className="grid gap-5 sm:grid-cols-2">
                <div>
                  <h3 className="mb-2 text-sm font-semibold uppercase tracking-wide text-muted">Test pieces</h3>
                  <ul className="flex flex-col gap-1 text-sm">
                    {pieces.map((piece) => (
                      <li key={piece.id} className="flex justify-between gap-3">
                        <span>{piece.name}</span>
                        <span className="font-mono text-muted">{piece.filamentGrams} g</span>
                      </li>
                    ))}
                  </ul>
                </div>
                <div>
                  <h3 className="mb-2 text-sm font-semibold uppercase tracking-wide text-muted">Variants</h3>
                  <ul className="flex flex-col gap-1 text-sm">
                    {variants.map((variant) => (
                      <li key={variant.id}>
                        {variant.name}
                        {variant.isReference ? <span className="ml-2 rounded bg-slate-soft px-1.5 text-xs text-muted">reference</span> : null}
                      </li>
                    ))}
                  </ul>
                </div>
              </div>
            </Card>
          ) : (
            <p className="text-muted">The lab has not published a test plan for this campaign yet.</p>
          )}
        </section>

        {estimate && printer ? (
          <section aria-label="How this goal was computed">
            <CampaignGoalBreakdown
              estimate={estimate}
              goalMinor={campaign.goalMinor}
              goalOverrideReason={campaign.goalOverrideReason}
              printerName={printer.name}
              averageFlowMm3PerS={Math.min(printer.maxFlowMm3PerS, plan?.maxFlowMm3PerS ?? Infinity) * printer.efficiency}
            />
          </section>
        ) : null}

        {cautions.length > 0 ? (
          <section aria-labelledby="cautions-heading">
            <h2 id="cautions-heading" className="mb-3 flex items-center gap-2 text-xl font-semibold">
              <Icon node={AlertTriangle} className="h-5 w-5 text-ember" /> Safety in this test
            </h2>
            <ul className="grid gap-3 sm:grid-cols-2">
              {cautions.map((caution) => (
                <li key={caution.id} className="rounded-lg border border-ember/30 bg-ember-soft/50 p-3 text-sm">
                  <strong className="block text-ember">{caution.title}</strong>
                  {caution.text}
                </li>
              ))}
            </ul>
          </section>
        ) : null}

        <CampaignReportAndNotes campaign={campaign} viewerRole={viewer?.role ?? null} timeZone={settings.timeZone} />

        <section aria-labelledby="pledges-heading">
          <h2 id="pledges-heading" className="mb-3 text-xl font-semibold">Pledges so far</h2>
          {pledges.length === 0 ? (
            <p className="text-muted">No pledges yet.</p>
          ) : (
            <Card className="p-0">
              <table className="w-full text-sm">
                <caption className="sr-only">Pledges to this campaign</caption>
                <thead className="border-b border-line text-left text-muted">
                  <tr>
                    <th scope="col" className="px-4 py-2 font-medium">Backer</th>
                    <th scope="col" className="px-4 py-2 font-medium">Date</th>
                    <th scope="col" className="px-4 py-2 text-right font-medium">Amount</th>
                  </tr>
                </thead>
                <tbody>
                  {pledges.map((pledge) => (
                    <tr key={pledge.id} className="border-b border-line last:border-0">
                      <td className="px-4 py-2">{pledge.publicName ?? <span className="text-muted">A backer</span>}</td>
                      <td className="px-4 py-2 text-muted">{formatDate(pledge.paidAt ?? pledge.createdAt, settings.timeZone)}</td>
                      <td className="px-4 py-2 text-right font-mono">
                        {formatMoney(pledge.amountMinor, pledge.currency)}
                        {pledge.state === "refunded" ? <span className="ml-2 text-xs text-muted">refunded</span> : null}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </Card>
          )}
        </section>
      </div>

      <aside className="flex flex-col gap-4 lg:sticky lg:top-6 lg:self-start">
        {query.pledge === "thanks" ? (
          <p role="status" data-testid="pledge-thanks" className="rounded-lg border border-teal/30 bg-teal-soft p-3 text-sm">
            {returnedPledge?.state === "paid" && returnedPledge.campaignId === campaign.id
              ? `Your pledge of ${formatMoney(returnedPledge.amountMinor, returnedPledge.currency)} is confirmed. Thank you!`
              : "Thank you — your pledge will appear once the payment is confirmed."}
          </p>
        ) : null}
        <Card className="flex flex-col gap-3">
          <p className="text-2xl font-bold">{formatMoney(progress.raisedMinor, campaign.currency)}</p>
          <p className="-mt-2 text-sm text-muted">pledged of {formatMoney(campaign.goalMinor, campaign.currency)} goal</p>
          <ProgressBar percent={progress.percent} label={`${progress.percent} % funded`} />
          {found.labFundMinor > 0 ? (
            <p className="text-xs text-muted">Includes {formatMoney(found.labFundMinor, campaign.currency)} from the lab fund.</p>
          ) : null}
          <p className="flex items-center gap-2 text-sm">
            <Icon node={Users} className="h-4 w-4 text-muted" /> {found.backerCount} backers
          </p>
          <p className="flex items-center gap-2 text-sm">
            <Icon node={CalendarClock} className="h-4 w-4 text-muted" />
            <span>
              {campaign.state === "open" ? `${timeLeft(campaign.deadline, now)} — ` : "Deadline was "}
              <time dateTime={campaign.deadline.toISOString()}>{formatDateTime(campaign.deadline, settings.timeZone)}</time>
            </span>
          </p>
          {campaign.goalOverrideReason ? (
            <p className="rounded-md bg-slate-soft p-2 text-xs">Goal set by the lab: {campaign.goalOverrideReason}</p>
          ) : null}
          <p className="text-xs text-muted">
            Goal-or-refund: if the goal is not reached by the deadline, or the lab withdraws the campaign, every pledge is
            refunded in full.
          </p>
        </Card>
        <CampaignQueueProgress campaign={campaign} timeZone={settings.timeZone} />
        {takesPledges ? (
          <Card className="flex flex-col gap-3">
            {viewer ? (
              <PledgeBox slug={campaign.slug} bounds={pledgeBounds(campaign.currency)} defaultName={viewer.name} />
            ) : (
              <>
                <h2 className="text-lg font-semibold">Pledge to this test</h2>
                <Button asChild>
                  <Link href={`/sign-in?callbackUrl=${encodeURIComponent(`/campaigns/${campaign.slug}`)}`}>Sign in to pledge</Link>
                </Button>
                <p className="text-xs text-muted">Pledges are goal-or-refund: refunded in full if the goal is not reached by the deadline.</p>
              </>
            )}
          </Card>
        ) : null}
      </aside>
    </article>
  );
}

function PlanFact({ icon, label, value }: { icon: React.ReactNode; label: string; value: string }) {
  return (
    <div>
      <dt className="flex items-center gap-1.5 text-xs font-medium uppercase tracking-wide text-muted">
        <span aria-hidden="true">{icon}</span> {label}
      </dt>
      <dd className="mt-1 font-medium">{value}</dd>
    </div>
  );
}

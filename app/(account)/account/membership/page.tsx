import type { Metadata } from "next";
import Link from "next/link";
import { CancelMembershipForm } from "@/components/club/cancel-membership-form";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { findOwnMembership } from "@/db/queries/memberships";
import { cn } from "@/lib/cn";
import { formatDate, formatMoney } from "@/lib/format";
import { planPerks } from "@/lib/memberships/plans";
import { membershipStatusLabels } from "@/lib/memberships/state";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "My membership" };
export const dynamic = "force-dynamic";

const statusStyles = {
  active: "bg-teal-soft text-teal-strong",
  past_due: "bg-rose-soft text-rose",
  canceled: "bg-slate-soft text-muted",
} as const;

type Props = { searchParams: Promise<{ joined?: string }> };

export default async function MyMembershipPage({ searchParams }: Props) {
  const viewer = await requirePageRole("supporter", "/account/membership");
  const { joined } = await searchParams;
  const db = getDb();
  const now = new Date();
  const membership = findOwnMembership(db, viewer.id, now);
  const { timeZone } = getLabSettings(db);
  const live = membership && membership.status !== "canceled";
  const ending = membership?.status === "active" && membership.cancelAtPeriodEnd;

  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-6">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <Link href="/account" className="text-teal underline">
          Your account
        </Link>{" "}
        / My membership
      </nav>
      <h1 className="text-2xl font-bold">My Filament Club membership</h1>
      {joined && !live ? (
        <Card role="status" data-testid="membership-pending">
          <p>Thank you — the card processor is confirming your first month. This page shows your membership as soon as it does.</p>
        </Card>
      ) : null}
      {!membership ? (
        <Card>
          <p>You are not a Filament Club member.</p>
          <Link href="/club" className="mt-2 inline-block text-sm font-medium text-teal underline">
            See the plans
          </Link>
        </Card>
      ) : (
        <Card className="flex flex-col gap-4" data-testid="membership" data-status={membership.status}>
          <dl className="grid gap-3 text-sm sm:grid-cols-[10rem_1fr]">
            <dt className="text-muted">Plan</dt>
            <dd className="font-medium">
              {membership.plan.name}, {formatMoney(membership.plan.monthlyMinor, membership.plan.currency)} a month
            </dd>
            <dt className="text-muted">State</dt>
            <dd>
              <span className={cn("rounded-md px-2 py-0.5 text-xs font-semibold", statusStyles[membership.status])} data-testid="membership-status">
                {ending ? "Active until the period ends" : membershipStatusLabels[membership.status]}
              </span>
            </dd>
            <dt className="text-muted">{membership.status === "canceled" ? "Ended" : ending ? "Ends" : "Paid until"}</dt>
            <dd className="font-medium">{formatDate(membership.endedAt ?? membership.currentPeriodEnd, timeZone)}</dd>
            <dt className="text-muted">Member since</dt>
            <dd>{formatDate(membership.startedAt, timeZone)}</dd>
          </dl>
          {membership.status === "past_due" ? (
            <p className="rounded-md bg-rose-soft p-3 text-sm text-rose">
              The last renewal could not be charged, so your perks are paused. The card processor tries the card again; once it is
              paid, everything comes back.
            </p>
          ) : null}
          {live ? (
            <div className="text-sm">
              <p className="font-medium">{membership.perksNow ? "Your perks" : "Perks (paused)"}</p>
              <ul className="mt-1 list-disc pl-5 text-muted">
                {planPerks(membership.plan).map((perk) => (
                  <li key={perk}>{perk}</li>
                ))}
              </ul>
            </div>
          ) : null}
          {live && !ending ? <CancelMembershipForm periodEnd={formatDate(membership.currentPeriodEnd, timeZone)} /> : null}
          {membership.status === "canceled" ? (
            <Link href="/club" className="text-sm font-medium text-teal underline">
              Join again
            </Link>
          ) : null}
        </Card>
      )}
      <p className="text-xs text-muted">
        Receipts for each month are e-mailed to {viewer.email}. Memberships are money: receipts and taxes vary by place — defer to
        local law and licensed advice.
      </p>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { Check } from "lucide";
import { JoinPlanButton } from "@/components/club/join-plan-button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { findOwnMembership, listPlans } from "@/db/queries/memberships";
import { formatMoney } from "@/lib/format";
import { planPerks } from "@/lib/memberships/plans";
import { getViewer } from "@/server/auth";

export const metadata: Metadata = { title: "Filament Club" };
export const dynamic = "force-dynamic";

export default async function ClubPage() {
  const viewer = await getViewer();
  const db = getDb();
  const plans = listPlans(db);
  const own = viewer ? findOwnMembership(db, viewer.id, new Date()) : undefined;
  const live = own && own.status !== "canceled" ? own : undefined;

  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 className="text-3xl font-bold">Filament Club</h1>
        <p className="max-w-3xl text-muted">
          A monthly membership for the people who want the lab to keep testing. Every membership payment goes into the lab fund,
          which the lab allocates to campaigns; members vote on which proposals the lab takes on next, and Reel and Workshop
          members judge blind pairs before they open to everyone.
        </p>
      </header>
      {live ? (
        <Card className="border-teal bg-teal-soft" data-testid="club-current-plan">
          <p>
            You are a <strong>{live.plan.name}</strong> member.{" "}
            <Link href="/account/membership" className="font-medium text-teal underline">
              See or cancel your membership
            </Link>
          </p>
        </Card>
      ) : null}
      <div className="grid gap-4 md:grid-cols-3">
        {plans.map((plan) => (
          <Card key={plan.code} className="flex flex-col gap-4" data-testid={`plan-${plan.code}`}>
            <div>
              <h2 className="text-xl font-semibold">{plan.name}</h2>
              <p className="mt-1">
                <span className="text-2xl font-bold">{formatMoney(plan.monthlyMinor, plan.currency)}</span>
                <span className="text-muted"> a month</span>
              </p>
            </div>
            <ul className="flex flex-1 flex-col gap-2 text-sm">
              {planPerks(plan).map((perk) => (
                <li key={perk} className="flex gap-2">
                  <Icon node={Check} className="mt-0.5 h-4 w-4 shrink-0 text-teal" /> {perk}
                </li>
              ))}
            </ul>
            {!viewer ? (
              <Link href={`/sign-in?callbackUrl=${encodeURIComponent("/club")}`} className="rounded-lg border border-line px-4 py-2.5 text-center text-sm font-semibold hover:border-teal">
                Sign in to join
              </Link>
            ) : live ? (
              <p className="text-sm text-muted">{live.planCode === plan.code ? "Your plan" : "One membership at a time"}</p>
            ) : (
              <JoinPlanButton planCode={plan.code} planName={plan.name} />
            )}
          </Card>
        ))}
      </div>
      <p className="text-xs text-muted">
        Memberships renew every month on the day you joined, until you cancel from your account page; a canceled membership runs
        to the end of the month already paid for. Payment happens on the card processor&apos;s page; Proofbay never sees your
        card number. Memberships are money: receipts and taxes vary by place — defer to local law and licensed advice.
      </p>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { BadgeCheck, FileText, HandCoins, LogOut, Mail } from "lucide";
import { Icon } from "@/components/ui/icon";
import { signOutAction } from "@/app/(auth)/sign-in/actions";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { roleLabels } from "@/lib/roles";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Your account" };

export default async function AccountPage() {
  const viewer = await requirePageRole("supporter", "/account");
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-6">
      <h1 className="text-2xl font-bold">Your account</h1>
      <Card className="flex flex-col gap-4">
        <dl className="grid gap-3 text-sm sm:grid-cols-[10rem_1fr]">
          <dt className="text-muted">Name</dt>
          <dd className="font-medium">{viewer.name ?? "—"}</dd>
          <dt className="text-muted">E-mail</dt>
          <dd className="font-medium">{viewer.email}</dd>
          <dt className="text-muted">Role</dt>
          <dd className="font-medium" data-testid="account-role">{roleLabels[viewer.role]}</dd>
        </dl>
        <Link href="/account/proposals" className="inline-flex items-center gap-2 text-sm font-medium text-teal underline">
          <Icon node={FileText} className="h-4 w-4" /> My proposals
        </Link>
        <Link href="/account/pledges" className="inline-flex items-center gap-2 text-sm font-medium text-teal underline">
          <Icon node={HandCoins} className="h-4 w-4" /> My pledges
        </Link>
        <Link href="/account/membership" className="inline-flex items-center gap-2 text-sm font-medium text-teal underline">
          <Icon node={BadgeCheck} className="h-4 w-4" /> My Filament Club membership
        </Link>
        <Link href="/account/email" className="inline-flex items-center gap-2 text-sm font-medium text-teal underline">
          <Icon node={Mail} className="h-4 w-4" /> E-mail settings
        </Link>
        <form action={signOutAction}>
          <Button type="submit" variant="secondary">
            <Icon node={LogOut} className="h-4 w-4" /> Sign out
          </Button>
        </form>
      </Card>
    </div>
  );
}

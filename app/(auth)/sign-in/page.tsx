import type { Metadata } from "next";
import { inArray } from "drizzle-orm";
import { SignInForm } from "@/components/auth/sign-in-form";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { hasActiveMembership } from "@/db/queries/users";
import { demoAccountEmails } from "@/lib/demo-accounts";
import { env } from "@/lib/env";
import { effectiveRole, roleLabels, shortRoleLabels } from "@/lib/roles";
import { signInAsDemoAccount } from "./actions";

export const metadata: Metadata = { title: "Sign in" };

type Props = { searchParams: Promise<{ callbackUrl?: string }> };

export default async function SignInPage({ searchParams }: Props) {
  const { callbackUrl } = await searchParams;
  const safeCallback = callbackUrl?.startsWith("/") && !callbackUrl.startsWith("//") ? callbackUrl : "/";
  return (
    <div className="mx-auto flex max-w-md flex-col gap-6">
      <h1 className="text-2xl font-bold">Sign in</h1>
      <Card>
        <SignInForm callbackUrl={safeCallback} />
      </Card>
      <p className="text-sm text-muted">
        New here? The same link creates your supporter account. We use your address only for sign-in and for the mail you
        choose in your preferences.
      </p>
      {env.demoMode ? <DemoAccounts /> : null}
    </div>
  );
}

function DemoAccounts() {
  const db = getDb();
  const accounts = db
    .select()
    .from(users)
    .where(inArray(users.email, [...demoAccountEmails]))
    .all()
    .sort((a, b) => demoAccountEmails.indexOf(a.email as never) - demoAccountEmails.indexOf(b.email as never));
  const now = new Date();
  return (
    <Card className="border-dashed">
      <h2 className="text-base font-semibold">Demo accounts</h2>
      <p className="mb-3 text-sm text-muted">This shortcut exists only in the demo: sign in as any role in one click.</p>
      <ul className="flex flex-col gap-2">
        {accounts.map((account) => {
          const role = effectiveRole(account.role, hasActiveMembership(db, account.id, now));
          return (
            <li key={account.id}>
              <form action={signInAsDemoAccount} className="flex items-center justify-between gap-3">
                <input type="hidden" name="email" value={account.email ?? ""} />
                <span className="text-sm">
                  <span className="font-medium">{account.name}</span>
                  <span className="block text-xs text-muted">{roleLabels[role]} · {account.email}</span>
                </span>
                <Button type="submit" variant="secondary" size="sm" aria-label={`Sign in as ${account.name}, ${roleLabels[role]}`}>
                  Sign in as {shortRoleLabels[role]}
                </Button>
              </form>
            </li>
          );
        })}
      </ul>
    </Card>
  );
}

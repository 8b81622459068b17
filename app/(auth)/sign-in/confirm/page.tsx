import type { Metadata } from "next";
import Link from "next/link";
import { KeyRound } from "lucide";
import { Icon } from "@/components/ui/icon";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { isSignInTokenLive } from "@/db/queries/auth-tokens";
import { env } from "@/lib/env";
import { LinkProblem } from "../link-problem";

export const metadata: Metadata = { title: "Finish signing in", robots: { index: false } };

type Props = { searchParams: Promise<{ token?: string; email?: string; callbackUrl?: string }> };

/**
 * Reached from the e-mailed link. Opening it spends nothing; only the button below submits the
 * token, so a mail scanner that fetches every link in a message cannot sign in or burn the link.
 */
export default async function ConfirmSignInPage({ searchParams }: Props) {
  const { token, email, callbackUrl } = await searchParams;
  if (!token || !email) return <LinkProblem reason="incomplete" />;
  if (!env.authSecret || !isSignInTokenLive(getDb(), email, token, env.authSecret, new Date())) {
    return <LinkProblem reason="expired" />;
  }
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <Card className="flex flex-col items-start gap-4">
        <Icon node={KeyRound} className="h-8 w-8 text-teal" />
        <h1 className="text-2xl font-bold">Finish signing in</h1>
        <p>
          Signing in as <strong>{email}</strong>.
        </p>
        <form method="get" action="/api/auth/callback/nodemailer" className="w-full">
          <input type="hidden" name="token" value={token} />
          <input type="hidden" name="email" value={email} />
          <input type="hidden" name="callbackUrl" value={callbackUrl ?? "/"} />
          <Button type="submit" className="w-full">
            Sign in to Proofbay
          </Button>
        </form>
        <p className="text-sm text-muted">
          Not you? <Link href="/" className="text-teal underline">Leave without signing in</Link>.
        </p>
      </Card>
    </div>
  );
}

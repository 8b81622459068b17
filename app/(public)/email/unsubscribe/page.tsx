import type { Metadata } from "next";
import Link from "next/link";
import { MailX } from "lucide";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { isCategoryEnabled } from "@/db/queries/email-preferences";
import { emailCategoryInfo } from "@/lib/email/categories";
import { HttpError } from "@/server/http-error";
import { claimOfUnsubscribeToken } from "@/server/unsubscribe";
import { confirmUnsubscribeAction } from "./actions";

export const metadata: Metadata = { title: "Unsubscribe", robots: { index: false } };

type Props = { searchParams: Promise<{ token?: string; done?: string }> };

/**
 * Where the unsubscribe link in a mail's footer lands. Opening it changes nothing (link scanners
 * fetch every link); the button does. Mail clients use the one-click POST instead.
 */
export default async function UnsubscribePage({ searchParams }: Props) {
  const { token, done } = await searchParams;
  let claim;
  try {
    claim = claimOfUnsubscribeToken(token);
  } catch (error) {
    if (!(error instanceof HttpError)) throw error;
    return (
      <div className="mx-auto flex max-w-md flex-col gap-4">
        <Card className="flex flex-col gap-3">
          <h1 className="text-2xl font-bold">This link does not work</h1>
          <p>{error.message} Nothing was changed.</p>
          <p className="text-sm text-muted">
            Signed in, you can choose which mail you get on <Link href="/account/email" className="text-teal underline">your e-mail settings</Link>.
          </p>
        </Card>
      </div>
    );
  }
  const { label, description } = emailCategoryInfo[claim.category];
  const off = !isCategoryEnabled(getDb(), claim.userId, claim.category);
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <Card className="flex flex-col items-start gap-4">
        <Icon node={MailX} className="h-8 w-8 text-teal" />
        {done === "1" && off ? (
          <>
            <h1 className="text-2xl font-bold">Unsubscribed</h1>
            <p>
              You will get no more “{label}” mail. Account mail (sign-in links, receipts, refunds) is still sent.
            </p>
          </>
        ) : (
          <>
            <h1 className="text-2xl font-bold">Stop “{label}” mail?</h1>
            <p className="text-muted">{description}</p>
            {off ? <p>This kind of mail is already off for you.</p> : null}
            <form action={confirmUnsubscribeAction} className="w-full">
              <input type="hidden" name="token" value={token} />
              <Button type="submit" className="w-full">
                Unsubscribe from “{label}”
              </Button>
            </form>
          </>
        )}
        <p className="text-sm text-muted">
          Other kinds of mail are on <Link href="/account/email" className="text-teal underline">your e-mail settings</Link> (sign-in needed).
        </p>
      </Card>
    </div>
  );
}

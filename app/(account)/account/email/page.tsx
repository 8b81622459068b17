import type { Metadata } from "next";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { emailPreferencesFor } from "@/db/queries/email-preferences";
import { emailCategoryInfo, optionalEmailCategories } from "@/lib/email/categories";
import { requirePageRole } from "@/server/guards";
import { saveEmailPreferencesAction } from "./actions";

export const metadata: Metadata = { title: "E-mail settings" };

type Props = { searchParams: Promise<{ saved?: string }> };

export default async function EmailPreferencesPage({ searchParams }: Props) {
  const viewer = await requirePageRole("supporter", "/account/email");
  const { saved } = await searchParams;
  const preferences = emailPreferencesFor(getDb(), viewer.id);
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-6">
      <div className="flex flex-col gap-1">
        <Link href="/account" className="text-sm text-teal underline">
          Your account
        </Link>
        <h1 className="text-2xl font-bold">E-mail settings</h1>
        <p className="text-muted">Choose which mail Proofbay sends to {viewer.email}. Changes apply to mail not yet sent, at once.</p>
      </div>
      {saved === "1" ? (
        <p role="status" className="rounded-md border border-moss bg-moss-soft px-4 py-2 text-sm">
          Saved.
        </p>
      ) : null}
      <Card>
        <form action={saveEmailPreferencesAction} className="flex flex-col gap-4">
          <fieldset className="flex flex-col gap-4">
            <legend className="mb-2 font-semibold">Mail you can turn off</legend>
            {optionalEmailCategories.map((category) => (
              <label key={category} className="flex items-start gap-3">
                <input
                  type="checkbox"
                  name={category}
                  defaultChecked={preferences[category]}
                  className="mt-1 h-4 w-4 accent-teal"
                  data-testid={`email-pref-${category}`}
                />
                <span>
                  <span className="font-medium">{emailCategoryInfo[category].label}</span>
                  <span className="block text-sm text-muted">{emailCategoryInfo[category].description}</span>
                </span>
              </label>
            ))}
          </fieldset>
          <div className="flex items-start gap-3 rounded-md bg-paper p-3 text-sm">
            <input type="checkbox" checked disabled aria-describedby="account-mail-note" className="mt-1 h-4 w-4" />
            <span>
              <span className="font-medium">{emailCategoryInfo.account.label}</span> <span className="text-muted">(always sent)</span>
              <span id="account-mail-note" className="block text-muted">
                {emailCategoryInfo.account.description}
              </span>
            </span>
          </div>
          <div>
            <Button type="submit">Save e-mail settings</Button>
          </div>
        </form>
      </Card>
    </div>
  );
}

"use client";

import { useActionState, useId, useState } from "react";
import { pledgeFormAction } from "@/app/(public)/campaigns/[slug]/pledge/actions";
import { Button } from "@/components/ui/button";
import { cn } from "@/lib/cn";
import { formatMoney } from "@/lib/format";
import { amountInputValue, describeBounds, type PledgeBounds } from "@/lib/pledges/amounts";
import type { ActionFailure } from "@/server/action";

type Props = { slug: string; bounds: PledgeBounds; defaultName: string | null };

/**
 * The pledge form: suggested amounts or a typed one, an optional public name. The server checks
 * the amount again and sends the browser on to the card processor's page.
 */
export function PledgeBox({ slug, bounds, defaultName }: Props) {
  const [failure, formAction, pending] = useActionState<ActionFailure | null, FormData>(pledgeFormAction.bind(null, slug), null);
  const [amount, setAmount] = useState(() => amountInputValue(bounds.suggestedMinor[1] ?? bounds.minMinor, bounds.currency));
  const [showName, setShowName] = useState(false);
  const amountId = useId();
  const hintId = useId();
  const errorId = useId();
  const amountError = failure?.fields?.amount;

  return (
    <form action={formAction} className="flex flex-col gap-3" aria-labelledby={`${amountId}-heading`}>
      <h2 id={`${amountId}-heading`} className="text-lg font-semibold">
        Pledge to this test
      </h2>
      <div role="group" aria-label="Suggested amounts" className="grid grid-cols-4 gap-2">
        {bounds.suggestedMinor.map((minor) => {
          const value = amountInputValue(minor, bounds.currency);
          const chosen = value === amount;
          return (
            <button
              key={minor}
              type="button"
              aria-pressed={chosen}
              onClick={() => setAmount(value)}
              className={cn(
                "rounded-lg border px-2 py-2 text-sm font-semibold transition-colors",
                chosen ? "border-teal bg-teal-soft text-teal-strong" : "border-line hover:border-teal",
              )}
            >
              {formatMoney(minor, bounds.currency)}
            </button>
          );
        })}
      </div>
      <label htmlFor={amountId} className="text-sm font-medium">
        Amount ({bounds.currency})
      </label>
      <input
        id={amountId}
        name="amount"
        inputMode="decimal"
        autoComplete="off"
        value={amount}
        onChange={(event) => setAmount(event.target.value)}
        aria-describedby={amountError ? `${hintId} ${errorId}` : hintId}
        aria-invalid={amountError ? true : undefined}
        className="rounded-lg border border-line bg-surface px-3 py-2 font-mono"
      />
      <p id={hintId} className="-mt-2 text-xs text-muted">
        {describeBounds(bounds)}
      </p>
      {amountError ? (
        <p id={errorId} className="-mt-2 text-sm text-rose" role="alert">
          {amountError}
        </p>
      ) : null}

      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="showName" checked={showName} onChange={(event) => setShowName(event.target.checked)} />
        Show my name on the campaign page
      </label>
      {showName ? (
        <label className="flex flex-col gap-1 text-sm">
          <span>Show my name as</span>
          <input name="publicName" defaultValue={defaultName ?? ""} maxLength={60} className="rounded-lg border border-line bg-surface px-3 py-2" />
          {failure?.fields?.publicName ? <span className="text-rose">{failure.fields.publicName}</span> : null}
        </label>
      ) : null}

      {failure && !amountError ? (
        <p className="rounded-md bg-rose-soft p-2 text-sm text-rose" role="alert">
          {failure.message}
        </p>
      ) : null}
      <Button type="submit" disabled={pending}>
        {pending ? "Opening the payment page…" : "Continue to payment"}
      </Button>
      <p className="text-xs text-muted">
        Goal-or-refund: you pay now, and if the goal is not reached by the deadline, or the lab withdraws the campaign, your
        pledge is refunded in full.
      </p>
      <p className="text-xs text-muted">
        Payment happens on the card processor&apos;s page; Proofbay never sees your card number. Receipts, taxes and fundraising
        rules vary by place — defer to local law and licensed advice.
      </p>
    </form>
  );
}

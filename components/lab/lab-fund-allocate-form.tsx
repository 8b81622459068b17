"use client";

import { useActionState, useId, useState } from "react";
import { allocateFormAction } from "@/app/lab/fund/actions";
import { Button } from "@/components/ui/button";
import { formatMoney } from "@/lib/format";
import type { ActionResult } from "@/server/action";
import type { AllocationResult } from "@/db/queries/lab-fund";

type CampaignOption = { id: string; title: string; remainingMinor: number; currency: string };

/**
 * The host's allocation form. Each render carries a one-time request id, so a double click or a
 * resubmitted form allocates once; a new id is drawn after each success.
 */
export function LabFundAllocateForm({ campaigns, balanceMinor, currency, initialRequestId }: { campaigns: CampaignOption[]; balanceMinor: number; currency: string; initialRequestId: string }) {
  // Drawn by the server for the first render (so the hydrated page agrees), then anew after each success.
  const [requestId, setRequestId] = useState(initialRequestId);
  const [result, formAction, pending] = useActionState<ActionResult<AllocationResult> | null, FormData>(async (previous, form) => {
    const next = await allocateFormAction(previous, form);
    if (next.ok) setRequestId(crypto.randomUUID());
    return next;
  }, null);
  const campaignId = useId();
  const amountId = useId();
  const fields = result && !result.ok ? result.fields : undefined;

  if (campaigns.length === 0) return <p className="text-sm text-muted">No open campaign in {currency} needs money right now.</p>;
  return (
    <form action={formAction} className="flex flex-col gap-3">
      <input type="hidden" name="requestId" value={requestId} />
      <label htmlFor={campaignId} className="text-sm font-medium">
        Campaign
      </label>
      <select id={campaignId} name="campaignId" className="rounded-lg border border-line bg-surface px-3 py-2" aria-invalid={fields?.campaignId ? true : undefined}>
        {campaigns.map((campaign) => (
          <option key={campaign.id} value={campaign.id}>
            {campaign.title} — needs {formatMoney(campaign.remainingMinor, campaign.currency)}
          </option>
        ))}
      </select>
      {fields?.campaignId ? <p className="-mt-2 text-sm text-rose">{fields.campaignId}</p> : null}
      <label htmlFor={amountId} className="text-sm font-medium">
        Amount ({currency})
      </label>
      <input
        id={amountId}
        name="amount"
        inputMode="decimal"
        autoComplete="off"
        required
        className="rounded-lg border border-line bg-surface px-3 py-2 font-mono"
        aria-invalid={fields?.amount ? true : undefined}
        aria-describedby={`${amountId}-hint`}
      />
      <p id={`${amountId}-hint`} className="-mt-2 text-xs text-muted">
        At most {formatMoney(Math.max(0, balanceMinor), currency)} (the fund&apos;s balance) and at most what the campaign still needs.
      </p>
      {fields?.amount ? (
        <p className="-mt-2 text-sm text-rose" role="alert">
          {fields.amount}
        </p>
      ) : null}
      {result && !result.ok && !fields?.amount && !fields?.campaignId ? (
        <p className="rounded-md bg-rose-soft p-2 text-sm text-rose" role="alert">
          {result.message}
        </p>
      ) : null}
      {result?.ok ? (
        <p className="rounded-md bg-teal-soft p-2 text-sm text-teal-strong" role="status">
          Allocated {formatMoney(result.data.amountMinor, result.data.currency)}
          {result.data.funded ? "; the campaign reached its goal and is funded." : "."}
        </p>
      ) : null}
      <div>
        <Button type="submit" disabled={pending}>
          {pending ? "Allocating…" : "Allocate from the lab fund"}
        </Button>
      </div>
    </form>
  );
}

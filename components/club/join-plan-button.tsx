"use client";

import { useActionState } from "react";
import { joinClubFormAction } from "@/app/(public)/club/actions";
import { Button } from "@/components/ui/button";
import type { ActionFailure } from "@/server/action";

/** Join one plan: the server picks the price and sends the browser to the card processor's page. */
export function JoinPlanButton({ planCode, planName }: { planCode: string; planName: string }) {
  const [failure, formAction, pending] = useActionState<ActionFailure | null, FormData>(joinClubFormAction, null);
  return (
    <form action={formAction} className="flex flex-col gap-2">
      <input type="hidden" name="plan" value={planCode} />
      <Button type="submit" disabled={pending} data-testid={`join-${planCode}`}>
        {pending ? "Opening the payment page…" : `Join ${planName}`}
      </Button>
      {failure ? (
        <p className="rounded-md bg-rose-soft p-2 text-sm text-rose" role="alert">
          {failure.message}
        </p>
      ) : null}
    </form>
  );
}

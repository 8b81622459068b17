"use client";

import { useActionState, useState } from "react";
import { cancelMembershipFormAction } from "@/app/(account)/account/membership/actions";
import { Button } from "@/components/ui/button";
import type { ActionResult } from "@/server/action";

/** Cancels at the end of the paid period, after a confirmation step (nothing more is charged). */
export function CancelMembershipForm({ periodEnd }: { periodEnd: string }) {
  const [result, formAction, pending] = useActionState<ActionResult<{ periodEnd: string }> | null>(cancelMembershipFormAction, null);
  const [confirming, setConfirming] = useState(false);
  if (result?.ok) return <p className="text-sm text-muted" role="status">Canceled: your membership runs until {periodEnd} and is not renewed.</p>;
  return (
    <form action={formAction} className="flex flex-col gap-2">
      {confirming ? (
        <>
          <p className="text-sm">
            Cancel your membership? Its perks run until {periodEnd}; nothing more is charged after that.
          </p>
          <div className="flex flex-wrap gap-2">
            <Button type="submit" variant="danger" disabled={pending} data-testid="confirm-cancel-membership">
              {pending ? "Canceling…" : "Yes, cancel at the period end"}
            </Button>
            <Button type="button" variant="secondary" onClick={() => setConfirming(false)}>
              Keep my membership
            </Button>
          </div>
        </>
      ) : (
        <div>
          <Button type="button" variant="secondary" onClick={() => setConfirming(true)} data-testid="cancel-membership">
            Cancel membership
          </Button>
        </div>
      )}
      {result && !result.ok ? (
        <p className="rounded-md bg-rose-soft p-2 text-sm text-rose" role="alert">
          {result.message}
        </p>
      ) : null}
    </form>
  );
}

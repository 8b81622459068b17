"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { guardedAction, type ActionResult } from "@/server/action";
import { cancelMembership } from "@/server/membership-checkout";
import { getStripe } from "@/server/stripe";

/** Cancels the signed-in person's membership at the end of the paid period (the processor's subscriptions API). */
export async function cancelOwnMembership(): Promise<ActionResult<{ periodEnd: string }>> {
  const result = await guardedAction("supporter", async (viewer) => {
    const outcome = await cancelMembership(getDb(), getStripe(), viewer.id);
    if (outcome.kind === "processor_error") return outcome;
    return { kind: "scheduled" as const, periodEnd: outcome.periodEnd.toISOString() };
  });
  if (!result.ok) return result;
  if (result.data.kind === "processor_error") return { ok: false, status: 502, code: "processor_error", message: result.data.message };
  revalidatePath("/account/membership");
  return { ok: true, data: { periodEnd: result.data.periodEnd } };
}

export async function cancelMembershipFormAction(_previous: ActionResult<{ periodEnd: string }> | null): Promise<ActionResult<{ periodEnd: string }>> {
  return cancelOwnMembership();
}

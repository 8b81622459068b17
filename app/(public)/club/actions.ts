"use server";

import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { env } from "@/lib/env";
import { joinPlanSchema } from "@/lib/memberships/input";
import { guardedAction, parseInput, type ActionFailure } from "@/server/action";
import { startMembershipCheckout } from "@/server/membership-checkout";
import { getStripe } from "@/server/stripe";

/**
 * Joins a Filament Club plan: sends the browser to the card processor's page for a monthly
 * subscription. The browser chooses only the plan; the price and metadata are the server's, and
 * the membership exists only once the webhook says the first month is paid.
 */
export async function joinClub(values: unknown): Promise<ActionFailure> {
  const result = await guardedAction("supporter", async (viewer) => {
    const { plan } = parseInput(joinPlanSchema, values);
    return startMembershipCheckout(getDb(), getStripe(), { planCode: plan, person: { id: viewer.id, email: viewer.email, name: viewer.name }, appUrl: env.appUrl });
  });
  if (!result.ok) return result;
  if (result.data.kind === "processor_error") return { ok: false, status: 502, code: "processor_error", message: result.data.message };
  redirect(result.data.url);
}

/** The join buttons' action (`useActionState`). */
export async function joinClubFormAction(_previous: ActionFailure | null, form: FormData): Promise<ActionFailure | null> {
  return joinClub({ plan: form.get("plan") ?? undefined });
}

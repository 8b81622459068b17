"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { getDb } from "@/db";
import { env } from "@/lib/env";
import { pledgeStartSchema } from "@/lib/pledges/input";
import { guardedAction, parseInput, type ActionFailure } from "@/server/action";
import { startPledgeCheckout } from "@/server/checkout";
import { getStripe } from "@/server/stripe";

const slugSchema = z.string().min(1).max(200);

/**
 * Starts a pledge and sends the browser to the card processor's page. The browser chooses only
 * the amount and an optional public name; the campaign comes from the page, the supporter from
 * the session, and the metadata from the server. On success this redirects (it never returns).
 */
export async function startPledge(slug: string, values: unknown): Promise<ActionFailure> {
  const result = await guardedAction("supporter", async (viewer) => {
    const input = parseInput(pledgeStartSchema, values);
    return startPledgeCheckout(getDb(), getStripe(), {
      slug: parseInput(slugSchema, slug),
      supporter: { id: viewer.id, email: viewer.email },
      amountText: input.amount,
      publicName: input.publicName,
      appUrl: env.appUrl,
    });
  });
  if (!result.ok) return result;
  if (result.data.kind === "processor_error") return { ok: false, status: 502, code: "processor_error", message: result.data.message };
  redirect(result.data.url);
}

/** The pledge form's action (`useActionState`): the same as startPledge, from form fields. */
export async function pledgeFormAction(slug: string, _previous: ActionFailure | null, form: FormData): Promise<ActionFailure | null> {
  const publicName = form.get("showName") === "on" ? form.get("publicName") : null;
  return startPledge(slug, { amount: form.get("amount") ?? "", publicName: typeof publicName === "string" ? publicName : null });
}

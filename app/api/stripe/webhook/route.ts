import { NextResponse } from "next/server";
import Stripe from "stripe";
import { getDb } from "@/db";
import { applyPledgeEvent } from "@/db/queries/pledges";
import { recordProcessorEvent } from "@/db/queries/processor-events";
import { env } from "@/lib/env";
import { getStripe } from "@/server/stripe";

export const dynamic = "force-dynamic";

/** Stripe's default tolerance for the signed timestamp (5 minutes). */
const SIGNATURE_TOLERANCE_SECONDS = 300;

function badRequest(code: string, message: string) {
  return NextResponse.json({ error: { code, message } }, { status: 400 });
}

/**
 * The payment processor's webhook. Reads the raw body (the signature covers the exact bytes),
 * verifies it with the official SDK, and records each event id once, so replays and duplicates
 * change nothing. Effects per event type are dispatched inside the same transaction, so an event
 * is either recorded with all its effects or not at all (and the processor's retry runs them):
 * Checkout events move pledges (db/queries/pledges.ts `applyPledgeEvent`); every other type, and
 * sessions that are not a pledge's, are acknowledged and ignored.
 */
export async function POST(request: Request) {
  const signature = request.headers.get("stripe-signature");
  if (!signature) return badRequest("missing_signature", "The Stripe-Signature header is missing.");
  const body = await request.text();
  let event: Stripe.Event;
  try {
    event = getStripe().webhooks.constructEvent(body, signature, env.stripe.webhookSecret, SIGNATURE_TOLERANCE_SECONDS);
  } catch (error) {
    const message = error instanceof Error ? error.message : "The signature does not verify.";
    return badRequest("invalid_signature", message);
  }
  const db = getDb();
  const isNew = db.transaction(
    (tx) => {
      if (!recordProcessorEvent(tx, event)) return false;
      applyPledgeEvent(tx, event, { appUrl: env.appUrl });
      return true;
    },
    { behavior: "immediate" },
  );
  return NextResponse.json({ received: true, duplicate: !isNew });
}

import { NextResponse } from "next/server";
import Stripe from "stripe";
import { getDb } from "@/db";
import { groupCommitFor } from "@/db/group-commit";
import { applyMembershipEvent } from "@/db/queries/memberships";
import { applyPledgeEvent } from "@/db/queries/pledges";
import { recordProcessorEvent } from "@/db/queries/processor-events";
import { applyRefundEvent } from "@/db/queries/refunds";
import { env } from "@/lib/env";
import { refreshQueue } from "@/server/queue-refresh";
import { noteForegroundRequest } from "@/server/foreground-pressure";
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
 * Checkout events move pledges (db/queries/pledges.ts `applyPledgeEvent`), refund events record
 * goal-or-refund refunds (db/queries/refunds.ts `applyRefundEvent`), subscription sessions, invoices
 * and subscriptions move Filament Club memberships (db/queries/memberships.ts `applyMembershipEvent`); every other type, and
 * sessions that are not a pledge's, are acknowledged and ignored.
 */
export async function POST(request: Request) {
  noteForegroundRequest();
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
  // Events verified at the same moment share one durable commit (db/group-commit.ts).
  let funded = false;
  const isNew = await groupCommitFor(getDb())((tx) => {
    if (!recordProcessorEvent(tx, event)) return false;
    funded = applyPledgeEvent(tx, event, { appUrl: env.appUrl })?.funded === true;
    applyMembershipEvent(tx, event, { appUrl: env.appUrl });
    applyRefundEvent(tx, event, { appUrl: env.appUrl });
    return true;
  });
  // The newly funded campaign's jobs were written with it; this places them (and the board catches up if it fails).
  if (funded) refreshQueue(getDb(), "a new campaign was funded");
  return NextResponse.json({ received: true, duplicate: !isNew });
}

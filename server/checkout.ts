import "server-only";
import Stripe from "stripe";
import { asProcessorError } from "@/server/stripe";
import type { Db } from "@/db/client";
import { groupCommitFor } from "@/db/group-commit";
import { attachCheckoutSession, failUnstartedPledge, openPendingPledge } from "@/db/queries/pledges";
import type { Campaign, Pledge } from "@/db/schema";
import { formatMoney } from "@/lib/format";
import { checkoutExpiresAt, checkoutIdempotencyKey } from "@/lib/pledges/rules";

export type PledgeCheckout =
  | { kind: "redirect"; pledgeId: string; sessionId: string; url: string; reused: boolean }
  | { kind: "processor_error"; pledgeId: string; message: string };

/**
 * The Checkout Session create request for a pledge. Every parameter follows from the pledge and
 * its campaign (the expiry from the pledge's creation time), so a retry under the same
 * idempotency key sends the same request and gets the same session back.
 */
export function checkoutSessionParams(
  pledge: Pledge,
  campaign: Campaign,
  supporter: { id: string; email: string },
  appUrl: string,
): Stripe.Checkout.SessionCreateParams {
  const metadata = { pledge_id: pledge.id, campaign_id: campaign.id, supporter_id: supporter.id };
  const campaignUrl = `${appUrl}/campaigns/${encodeURIComponent(campaign.slug)}`;
  return {
    mode: "payment",
    line_items: [
      {
        quantity: 1,
        price_data: {
          currency: pledge.currency.toLowerCase(),
          unit_amount: pledge.amountMinor,
          product_data: { name: `Pledge: ${campaign.title}`.slice(0, 250), metadata: { campaign_id: campaign.id } },
        },
      },
    ],
    customer_email: supporter.email,
    client_reference_id: pledge.id,
    metadata,
    payment_intent_data: { metadata, description: `Pledge of ${formatMoney(pledge.amountMinor, pledge.currency)} to ${campaign.title}`.slice(0, 1000) },
    success_url: `${campaignUrl}?pledge=thanks&session={CHECKOUT_SESSION_ID}`,
    cancel_url: campaignUrl,
    expires_at: Math.floor(checkoutExpiresAt(pledge.createdAt).getTime() / 1000),
  };
}

/**
 * Starts a pledge: a pending pledge row (or the double click's reused one), then its Checkout
 * Session under an idempotency key derived from the pledge id, then the session id on the pledge.
 * Nothing is fulfilled here: the webhook marks the pledge paid.
 */
export async function startPledgeCheckout(
  db: Db,
  stripe: Stripe,
  input: { slug: string; supporter: { id: string; email: string }; amountText: string; publicName: string | null; appUrl: string },
  now = new Date(),
): Promise<PledgeCheckout> {
  // Both writes go through the shared group commit: concurrent starts share one durable fsync.
  const commit = groupCommitFor(db);
  const { pledge, campaign, reused } = await commit((tx) =>
    openPendingPledge(tx, { slug: input.slug, supporterId: input.supporter.id, amountText: input.amountText, publicName: input.publicName }, now),
  );
  let session: Stripe.Checkout.Session;
  try {
    session = await stripe.checkout.sessions.create(checkoutSessionParams(pledge, campaign, input.supporter, input.appUrl), {
      idempotencyKey: checkoutIdempotencyKey(pledge.id),
    });
  } catch (error) {
    // A refused request will be refused again: that pledge can never be paid. A network failure
    // leaves it pending, and a retry within the reuse window sends the same key.
    const refused = asProcessorError(error);
    if (refused?.type === "StripeInvalidRequestError" || refused?.type === "StripeIdempotencyError") {
      failUnstartedPledge(db, pledge.id);
    }
    console.error(`Checkout Session for pledge ${pledge.id} failed:`, error instanceof Error ? error.message : error);
    return { kind: "processor_error", pledgeId: pledge.id, message: "The card processor did not accept the request. Try again in a minute." };
  }
  if (!session.url) {
    return { kind: "processor_error", pledgeId: pledge.id, message: "This payment page is no longer available. Start the pledge again." };
  }
  await commit((tx) => attachCheckoutSession(tx, pledge.id, session.id));
  return { kind: "redirect", pledgeId: pledge.id, sessionId: session.id, url: session.url, reused };
}

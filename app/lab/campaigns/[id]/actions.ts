"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { withdrawCampaign } from "@/db/queries/refunds";
import { env } from "@/lib/env";
import { withdrawCampaignSchema } from "@/lib/validation/campaign-close";
import { guardedAction, parseInput } from "@/server/action";
import { expireOpenCheckouts, processRefundRequests } from "@/server/refund-sweeper";
import { refreshQueue } from "@/server/queue-refresh";
import { getStripe } from "@/server/stripe";

const idSchema = z.string().min(1).max(80);

/**
 * A host withdraws an open or funded campaign with the reason backers will read. The withdrawal
 * and every refund request commit together; open Checkout Sessions are then expired and the refunds
 * worked through at once (the sweeper picks up whatever is left, e.g. when the processor is unreachable).
 */
export async function withdrawCampaignAction(campaignId: string, input: unknown) {
  return guardedAction("host", async (viewer) => {
    const id = parseInput(idSchema, campaignId);
    const { reason } = parseInput(withdrawCampaignSchema, input);
    const db = getDb();
    const withdrawn = withdrawCampaign(db, { campaignId: id, reason, hostId: viewer.id });
    // A withdrawn funded or queued campaign's jobs leave the print queue (it only places funded, queued and printing campaigns).
    if (withdrawn.previousState !== "open") refreshQueue(db, null);
    await expireOpenCheckouts(db, getStripe(), new Date());
    const refunds = await processRefundRequests(db, getStripe(), { appUrl: env.appUrl, campaignId: id, maxPerPass: 200 });
    revalidatePath(`/lab/campaigns/${id}`);
    revalidatePath("/lab/campaigns");
    revalidatePath(`/campaigns/${withdrawn.campaign.slug}`);
    return { refundsRequested: withdrawn.refundsRequested, refunded: refunds.refunded, waiting: refunds.deferred, flagged: refunds.flagged };
  });
}

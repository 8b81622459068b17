"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { publishTestPlan } from "@/db/queries/test-plans";
import { publishTestPlanSchema } from "@/lib/validation/test-plan";
import { guardedAction, parseInput } from "@/server/action";

const idSchema = z.string().min(1).max(80);

/** Publishes the plan as an open campaign; a second call for the same proposal answers the same campaign. */
export async function publishTestPlanAction(proposalId: string, input: unknown) {
  return guardedAction("host", (viewer) => {
    const plan = parseInput(publishTestPlanSchema, input);
    const { campaign, created } = publishTestPlan(getDb(), parseInput(idSchema, proposalId), plan, { hostId: viewer.id });
    if (created) revalidatePath("/");
    return { slug: campaign.slug, created };
  });
}

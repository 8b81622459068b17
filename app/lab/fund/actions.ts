"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { allocateLabFund, type AllocationResult } from "@/db/queries/lab-fund";
import { env } from "@/lib/env";
import { allocationFormSchema } from "@/lib/lab-fund/input";
import { guardedAction, parseInput, type ActionResult } from "@/server/action";

/** A host moves lab-fund money to an open campaign (422 on `amount`, 409 for a campaign that is not open). */
export async function allocateFromLabFund(values: unknown): Promise<ActionResult<AllocationResult>> {
  const result = await guardedAction("host", (viewer) => {
    const input = parseInput(allocationFormSchema, values);
    return allocateLabFund(getDb(), { campaignId: input.campaignId, hostId: viewer.id, amount: { text: input.amount }, requestId: input.requestId, appUrl: env.appUrl });
  });
  if (result.ok) {
    revalidatePath("/lab/fund");
    revalidatePath("/", "layout");
  }
  return result;
}

export async function allocateFormAction(_previous: ActionResult<AllocationResult> | null, form: FormData): Promise<ActionResult<AllocationResult>> {
  return allocateFromLabFund({ campaignId: form.get("campaignId") ?? undefined, amount: form.get("amount") ?? "", requestId: form.get("requestId") ?? undefined });
}

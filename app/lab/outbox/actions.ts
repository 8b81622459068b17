"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { retryFailedMail } from "@/db/queries/outbox";
import { parseInput } from "@/server/action";
import { requireRole } from "@/server/guards";

const retrySchema = z.object({ id: z.string().min(1, "Which message to retry is missing") });

/** "Retry now" on a failed message: hosts only; a second click finds it queued and changes nothing. */
export async function retryMailAction(form: FormData): Promise<void> {
  await requireRole("host");
  const { id } = parseInput(retrySchema, { id: form.get("id") });
  retryFailedMail(getDb(), id, new Date());
  revalidatePath("/lab/outbox");
}

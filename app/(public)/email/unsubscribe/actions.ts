"use server";

import { redirect } from "next/navigation";
import { unsubscribeWithToken } from "@/server/unsubscribe";

/**
 * The confirmation page's button. Public like the one-click POST: the signed token is the
 * permission, and a forged one throws before anything is written (the page then explains).
 */
export async function confirmUnsubscribeAction(form: FormData): Promise<void> {
  const token = String(form.get("token") ?? "");
  try {
    unsubscribeWithToken(token);
  } catch {
    redirect(`/email/unsubscribe?token=${encodeURIComponent(token)}`);
  }
  redirect(`/email/unsubscribe?token=${encodeURIComponent(token)}&done=1`);
}

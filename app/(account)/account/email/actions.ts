"use server";

import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { saveEmailPreferences } from "@/db/queries/email-preferences";
import { emailPreferencesFormSchema, preferencesFromForm } from "@/lib/validation/email-preferences";
import { parseInput } from "@/server/action";
import { requireRole } from "@/server/guards";

/** Saves the whole form for the signed-in supporter only; the worker reads it before every send. */
export async function saveEmailPreferencesAction(form: FormData): Promise<void> {
  const viewer = await requireRole("supporter");
  const fields = Object.fromEntries([...form.entries()].filter(([name]) => !name.startsWith("$")));
  const choices = preferencesFromForm(parseInput(emailPreferencesFormSchema, fields));
  saveEmailPreferences(getDb(), viewer.id, choices, new Date());
  redirect("/account/email?saved=1");
}

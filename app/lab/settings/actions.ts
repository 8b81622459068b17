"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { updateLabSettings } from "@/db/queries/lab-settings";
import { listPrinters } from "@/db/queries/pricing";
import { parseLabSettingsForm } from "@/lib/validation/lab-settings";
import { requireRole } from "@/server/guards";
import { HttpError } from "@/server/http-error";

export type SettingsFormState = {
  ok?: boolean;
  error?: string;
  fields?: Record<string, string>;
  /** What was submitted, so a rejected form comes back exactly as typed. */
  values?: Record<string, string>;
};

export async function saveLabSettings(_previous: SettingsFormState, form: FormData): Promise<SettingsFormState> {
  try {
    await requireRole("admin");
  } catch (error) {
    if (error instanceof HttpError) return { error: error.message, values: Object.fromEntries([...form.entries()].map(([k, v]) => [k, String(v)])) };
    throw error;
  }
  const values = Object.fromEntries([...form.entries()].map(([key, value]) => [key, String(value)]));
  const db = getDb();
  const { data, fields } = parseLabSettingsForm(form, listPrinters(db).map((printer) => printer.id));
  if (!data) return { error: "Some settings need fixing; nothing was saved.", fields, values };
  updateLabSettings(db, data);
  revalidatePath("/", "layout");
  return { ok: true, values };
}

"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { postLabNote, publishReport, saveReportDraft } from "@/db/queries/report-commands";
import { env } from "@/lib/env";
import { labNoteSchema, reportDraftSchema, reportPublishSchema } from "@/lib/validation/report";
import { guardedAction, parseInput } from "@/server/action";

const idSchema = z.string().trim().min(1).max(80);

/** Saves the report draft (hosts only); the report is created on the first save. */
export async function saveReportDraftAction(campaignId: string, input: unknown) {
  return guardedAction("host", (viewer) => {
    const report = saveReportDraft(getDb(), parseInput(idSchema, campaignId), viewer.id, parseInput(reportDraftSchema, input));
    return { reportId: report.id, savedAt: report.updatedAt.toISOString() };
  });
}

/** Publishes the report once: the campaign moves to reported and every paid backer is mailed. */
export async function publishReportAction(campaignId: string, input: unknown) {
  return guardedAction("host", (viewer) => {
    const outcome = publishReport(getDb(), parseInput(idSchema, campaignId), viewer.id, parseInput(reportPublishSchema, input), {
      appUrl: env.appUrl,
    });
    revalidatePath("/reports");
    revalidatePath("/");
    return { reportId: outcome.report.id, published: outcome.published, mailed: outcome.mailed };
  });
}

/** Posts a lab note on a funded, queued or printing campaign and mails its backers. */
export async function postLabNoteAction(campaignId: string, input: unknown) {
  return guardedAction("host", (viewer) => {
    const { note, mailed } = postLabNote(getDb(), parseInput(idSchema, campaignId), viewer.id, parseInput(labNoteSchema, input), {
      appUrl: env.appUrl,
    });
    return { noteId: note.id, mailed };
  });
}

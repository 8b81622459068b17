import { z } from "zod";
import { CRITERION_IDS, SCORE_MAX, SCORE_MIN } from "@/lib/reports/criteria";

export const REPORT_SUMMARY_MAX = 600;
export const REPORT_BODY_MAX = 40_000;
export const REPORT_MAX_PHOTOS = 400;
export const LAB_NOTE_MAX = 4_000;
export const VIDEO_URL_MESSAGE = "The video link must be a full https:// address.";

const blankToNull = (value: unknown) => (typeof value === "string" && value.trim() === "" ? null : value);

/** An optional link to the run's video: https only, so a report never sends readers to plain http or a script URL. */
export const videoUrlSchema = z.preprocess(
  blankToNull,
  z
    .url({ protocol: /^https$/, hostname: z.regexes.domain, error: VIDEO_URL_MESSAGE })
    .max(500, { error: "Keep the video link under 500 characters." })
    .nullable(),
);

const id = z.string().trim().min(1).max(80);

export const reportScoreSchema = z.object({
  pieceId: id.nullable(),
  variantId: id,
  criterion: z.enum(CRITERION_IDS, { error: "Pick one of the lab's criteria." }),
  score: z
    .number({ error: "Enter a score." })
    .int({ error: "Scores are whole numbers." })
    .min(SCORE_MIN, { error: `Scores run from ${SCORE_MIN} to +${SCORE_MAX}.` })
    .max(SCORE_MAX, { error: `Scores run from ${SCORE_MIN} to +${SCORE_MAX}.` }),
  note: z.string().trim().max(300, { error: "Keep the note under 300 characters." }).default(""),
});

export const reportPhotoSchema = z.object({
  uploadId: id,
  pieceId: id,
  variantId: id,
  caption: z.string().trim().max(200, { error: "Keep the caption under 200 characters." }).default(""),
  lightSetKey: z.preprocess(
    blankToNull,
    z
      .string()
      .trim()
      .max(40, { error: "Keep the light-set key under 40 characters." })
      .regex(/^[\w .:-]+$/, { error: "Letters, digits, spaces and . : - _ only." })
      .nullable(),
  ),
});

/**
 * What the report editor saves as a draft. Photos are in display order per slot; the actual cost
 * is typed in major units ("312.50") or left blank to use the run log.
 */
export const reportDraftSchema = z.object({
  summary: z.string().trim().max(REPORT_SUMMARY_MAX, { error: `Keep the summary under ${REPORT_SUMMARY_MAX} characters.` }).default(""),
  bodyMd: z.string().max(REPORT_BODY_MAX, { error: `Keep the write-up under ${REPORT_BODY_MAX.toLocaleString("en-US")} characters.` }).default(""),
  videoUrl: videoUrlSchema.default(null),
  actualCost: z.string().trim().max(20, { error: "Enter an amount such as 312.50." }).default(""),
  scores: z.array(reportScoreSchema).max(12 * 31 * CRITERION_IDS.length).default([]),
  photos: z.array(reportPhotoSchema).max(REPORT_MAX_PHOTOS, { error: `At most ${REPORT_MAX_PHOTOS} photos in a report.` }).default([]),
});
export type ReportDraftInput = z.output<typeof reportDraftSchema>;
export type ReportDraftValues = z.input<typeof reportDraftSchema>;

/** Publishing also needs a summary: it is the feed entry and the share description. */
export const reportPublishSchema = reportDraftSchema.extend({
  summary: z
    .string()
    .trim()
    .min(20, { error: "Write a summary of at least 20 characters before publishing." })
    .max(REPORT_SUMMARY_MAX, { error: `Keep the summary under ${REPORT_SUMMARY_MAX} characters.` }),
});

export const labNoteSchema = z.object({
  bodyMd: z
    .string()
    .trim()
    .min(3, { error: "Write at least a few words." })
    .max(LAB_NOTE_MAX, { error: `Keep a lab note under ${LAB_NOTE_MAX.toLocaleString("en-US")} characters.` }),
});
export type LabNoteInput = z.output<typeof labNoteSchema>;

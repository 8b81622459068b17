import { RuleViolation } from "../rule-violation";

type CampaignState = "open" | "funded" | "lapsed" | "withdrawn" | "queued" | "printing" | "reported";

/** A report is written for a campaign that was funded; publishing it is what moves the campaign to `reported`. */
export const REPORTABLE_STATES: readonly CampaignState[] = ["funded", "queued", "printing"];
/** Lab notes cover the stretch between funding and the report. */
export const LAB_NOTE_STATES: readonly CampaignState[] = ["funded", "queued", "printing"];

export function canHaveReport(state: CampaignState): boolean {
  return REPORTABLE_STATES.includes(state) || state === "reported";
}

export function assertReportEditable(campaignState: CampaignState, reportState: "draft" | "published" | null): void {
  if (reportState === "published" || campaignState === "reported") {
    throw new RuleViolation(409, "already_published", "This report is published; it can no longer be edited.");
  }
  if (!REPORTABLE_STATES.includes(campaignState)) {
    throw new RuleViolation(409, "not_reportable", `A report needs a funded campaign; this one is ${campaignState}.`);
  }
}

export function assertCanPostLabNote(campaignState: CampaignState): void {
  if (!LAB_NOTE_STATES.includes(campaignState)) {
    throw new RuleViolation(
      409,
      "notes_closed",
      `Lab notes are posted between funding and the report (funded, queued or printing); this campaign is ${campaignState}.`,
    );
  }
}

/** Dedupe keys of the mail reports and notes cause: one message per event per backer. */
export const reportMailKeys = {
  published: (reportId: string, userId: string) => `report-published:${reportId}:${userId}`,
  labNote: (noteId: string, userId: string) => `lab-note:${noteId}:${userId}`,
};

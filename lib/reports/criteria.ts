/**
 * The lab's own scorecard: what every report scores each variant on, against the reference
 * variant of the same test plan. Scores run from −2 to +2; 0 means "the same as the reference".
 */
export const REPORT_CRITERIA = [
  { id: "overhang-finish", label: "Overhang finish", hint: "Curl and droop on the steepest overhangs, all four sides." },
  { id: "bridge-sag", label: "Bridge sag", hint: "How far the longest bridges sag; less sag scores higher." },
  { id: "surface", label: "Surface", hint: "Top and side surfaces on small layers: gloss, ripples, blobs." },
  { id: "dimensional-accuracy", label: "Dimensional accuracy", hint: "Measured against the model with calipers." },
  { id: "part-cooling-overall", label: "Part cooling overall", hint: "The lab's overall judgement of cooling across the pieces." },
  { id: "noise", label: "Noise", hint: "Quieter than the reference scores higher." },
] as const;

export type CriterionId = (typeof REPORT_CRITERIA)[number]["id"];
export const CRITERION_IDS = REPORT_CRITERIA.map((criterion) => criterion.id) as [CriterionId, ...CriterionId[]];

export const SCORE_MIN = -2;
export const SCORE_MAX = 2;
export const SCORE_LABELS: Record<number, string> = {
  [-2]: "much worse",
  [-1]: "worse",
  0: "same as reference",
  1: "better",
  2: "much better",
};

export function isCriterionId(value: string): value is CriterionId {
  return (CRITERION_IDS as readonly string[]).includes(value);
}

export function criterionLabel(id: string): string {
  return REPORT_CRITERIA.find((criterion) => criterion.id === id)?.label ?? id;
}

/** "+1", "0", "−2": a score with its sign, using the minus sign rather than a hyphen. */
export function formatScore(score: number): string {
  const rounded = Math.round(score * 10) / 10;
  if (rounded === 0) return "0";
  const text = Math.abs(rounded).toString();
  return rounded > 0 ? `+${text}` : `\u2212${text}`;
}

import { z } from "zod";
import { MATERIAL_IDS } from "@/lib/estimate/materials";

const optionalText = (max: number, message: string) =>
  z.preprocess((value) => (typeof value === "string" && value.trim() === "" ? undefined : value), z.string().trim().max(max, { error: message }).optional());

/* ---------- The piece library ---------- */

/** A piece in the lab's library: what an admin types in the add and edit forms. */
export const testPieceSchema = z.object({
  name: z.string().trim().min(3, { error: "Give the piece a name of at least 3 characters." }).max(80, { error: "Keep the name under 80 characters." }),
  description: z.string().trim().max(1_000, { error: "Keep the description under 1,000 characters." }).default(""),
  filamentGrams: z
    .number({ error: "Enter the filament in grams." })
    .positive({ error: "Filament must be more than 0 g." })
    .max(5_000, { error: "At most 5,000 g per print." }),
  /** An upload id from `POST /api/uploads` (a model file); optional until meshes are measured. */
  meshUploadId: optionalText(80, "That is not an upload id."),
});
export type TestPieceInput = z.output<typeof testPieceSchema>;
export type TestPieceFormValues = z.input<typeof testPieceSchema>;

export const testPieceActiveSchema = z.object({ id: z.string().min(1), active: z.boolean() });

/* ---------- Test plans ---------- */

export const PLAN_MAX_PIECES = 30;
export const PLAN_MAX_VARIANTS = 12;
export const PLAN_MAX_REPEATS = 20;

const planShape = {
  printerId: z.string({ error: "Pick a printer." }).min(1, { error: "Pick a printer." }),
  material: z.enum(MATERIAL_IDS, { error: `Pick one of ${MATERIAL_IDS.join(", ")}.` }),
  layerHeightMm: z
    .number({ error: "Enter the layer height in mm." })
    .min(0.04, { error: "At least 0.04 mm." })
    .max(1, { error: "At most 1 mm." }),
  maxFlowMm3PerS: z
    .number({ error: "Enter the maximum volumetric flow." })
    .positive({ error: "More than 0 mm³/s." })
    .max(200, { error: "At most 200 mm³/s." }),
  fanPercent: z
    .number({ error: "Enter the fan speed in %." })
    .int({ error: "A whole percentage." })
    .min(0, { error: "0 % or more." })
    .max(100, { error: "At most 100 %." }),
  repeats: z
    .number({ error: "Enter how many repeats." })
    .int({ error: "A whole number of repeats." })
    .min(1, { error: "At least 1 repeat." })
    .max(PLAN_MAX_REPEATS, { error: `At most ${PLAN_MAX_REPEATS} repeats.` }),
  /** Pieces from the library; grams are per print in the plan's material, edited per plan. */
  pieces: z
    .array(
      z.object({
        libraryPieceId: z.string().min(1, { error: "Pick a piece from the library." }),
        filamentGrams: z
          .number({ error: "Enter the filament in grams." })
          .positive({ error: "More than 0 g." })
          .max(5_000, { error: "At most 5,000 g per print." }),
      }),
    )
    .min(1, { error: "Pick at least one piece from the library." })
    .max(PLAN_MAX_PIECES, { error: `At most ${PLAN_MAX_PIECES} pieces.` }),
  /** The first variant is the reference (the stock part, a reference spool); the rest are under test. */
  variants: z
    .array(
      z.object({
        name: z
          .string()
          .trim()
          .min(2, { error: "Name this variant." })
          .max(80, { error: "Keep the name under 80 characters." }),
      }),
    )
    .min(2, { error: "Add at least one variant under test beside the reference." })
    .max(PLAN_MAX_VARIANTS, { error: `At most ${PLAN_MAX_VARIANTS} variants.` }),
};

type PlanShape = { pieces: { libraryPieceId: string }[]; variants: { name: string }[] };

function planChecks(value: PlanShape, context: z.RefinementCtx): void {
  const seenPieces = new Set<string>();
  value.pieces.forEach((piece, index) => {
    if (seenPieces.has(piece.libraryPieceId)) {
      context.addIssue({ code: "custom", path: ["pieces", index, "libraryPieceId"], message: "This piece is already in the plan." });
    }
    seenPieces.add(piece.libraryPieceId);
  });
  const seenVariants = new Set<string>();
  value.variants.forEach((variant, index) => {
    const key = variant.name.trim().toLowerCase();
    if (key && seenVariants.has(key)) {
      context.addIssue({ code: "custom", path: ["variants", index, "name"], message: "Two variants cannot share a name." });
    }
    seenVariants.add(key);
  });
}

/** What the live estimate needs: the plan without the campaign's words and dates. */
export const testPlanDraftSchema = z.object(planShape).superRefine(planChecks);
export type TestPlanDraft = z.output<typeof testPlanDraftSchema>;

/** Days ahead a deadline may be, counted in calendar days of the lab's time zone. */
export const DEADLINE_MIN_DAYS = 3;
export const DEADLINE_MAX_DAYS = 90;

/** Publishing: the plan plus the campaign shown to backers. */
export const publishTestPlanSchema = z
  .object({
    ...planShape,
    title: z
      .string()
      .trim()
      .min(8, { error: "A campaign title of at least 8 characters." })
      .max(120, { error: "Keep the title under 120 characters." }),
    summary: z
      .string()
      .trim()
      .min(20, { error: "Tell backers in a sentence or two (20+ characters) what this campaign tests." })
      .max(600, { error: "Keep the summary under 600 characters." }),
    /** A calendar date (YYYY-MM-DD) in the lab's time zone; the campaign closes at the end of it. */
    deadline: z.iso.date({ error: "Pick a deadline date." }),
    /** A typed amount in the lab's currency ("450", "450.00"), replacing the computed goal. */
    goalOverride: z.preprocess(
      (value) => (typeof value === "string" && value.trim() === "" ? undefined : value),
      z
        .string()
        .trim()
        .regex(/^\d[\d,]*(\.\d+)?$/, { error: "Enter an amount like 450 or 450.00." })
        .optional(),
    ),
    goalOverrideReason: optionalText(500, "Keep the reason under 500 characters."),
  })
  .superRefine((value, context) => {
    planChecks(value, context);
    if (value.goalOverride !== undefined && (value.goalOverrideReason ?? "").length < 10) {
      context.addIssue({
        code: "custom",
        path: ["goalOverrideReason"],
        message: "Say why the goal differs from the computed one (10+ characters); backers see this reason.",
      });
    }
  });
export type PublishTestPlanInput = z.output<typeof publishTestPlanSchema>;
export type PublishTestPlanFormValues = z.input<typeof publishTestPlanSchema>;

/** Default name of the reference variant: the printer's stock part, or a reference spool for material tests. */
export function defaultReferenceName(kind: string): string {
  return kind === "material" ? "Reference spool" : "Stock part";
}

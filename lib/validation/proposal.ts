import { z } from "zod";
import { MATERIAL_IDS } from "@/lib/estimate/materials";

export const proposalKindValues = ["duct", "material", "nozzle", "part"] as const;
export const printerTypeValues = ["corexy", "bedslinger", "delta"] as const;

export const proposalKindLabels: Record<(typeof proposalKindValues)[number], string> = {
  duct: "Fan duct",
  material: "Material",
  nozzle: "Nozzle",
  part: "Other part",
};
export const printerTypeLabels: Record<(typeof printerTypeValues)[number], string> = {
  corexy: "CoreXY",
  bedslinger: "Bed-slinger",
  delta: "Delta",
};

const positiveMm = z.number({ error: "Enter a size in mm." }).positive({ error: "Must be more than 0 mm." }).max(1000);
export const openingShapeSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("rectangle"), widthMm: positiveMm, heightMm: positiveMm }),
  z.object({ kind: z.literal("circle"), diameterMm: positiveMm }),
  z.object({ kind: z.literal("slot"), widthMm: positiveMm, heightMm: positiveMm }),
]);

export const ductDetailsSchema = z.object({
  inlet: openingShapeSchema,
  outlets: z.array(openingShapeSchema).min(1, { error: "Add at least one outlet." }).max(8),
  fan: z.object({
    description: z.string().trim().max(120).default(""),
    rating: z.object({ unit: z.enum(["cfm", "m3/h"]), value: z.number().positive({ error: "Enter the fan's rated flow." }).max(10_000) }),
  }),
});

const common = {
  kind: z.enum(proposalKindValues, { error: "Pick what kind of test this is." }),
  printerType: z.enum(printerTypeValues, { error: "Pick the kind of printer." }),
  descriptionMd: z.string().max(20_000, { error: "Keep the description under 20,000 characters." }).default(""),
  material: z.enum(MATERIAL_IDS, { error: `Pick one of ${MATERIAL_IDS.join(", ")}.` }).nullish(),
  ductDetails: ductDetailsSchema.nullish(),
  uploadIds: z.array(z.string().min(1)).max(20, { error: "Attach at most 20 files." }).default([]),
};

/** What a draft needs to be saved: a working title; everything else may come later. */
export const proposalDraftSchema = z.object({
  ...common,
  title: z.string().trim().min(3, { error: "Give the draft a title of at least 3 characters." }).max(120),
  why: z.string().trim().max(2_000, { error: "Keep this under 2,000 characters." }).default(""),
});

/** What a proposal needs to be submitted to the lab. */
export const proposalSubmissionSchema = z
  .object({
    ...common,
    title: z.string().trim().min(8, { error: "A title of at least 8 characters, please." }).max(120),
    why: z.string().trim().min(20, { error: "Say in a sentence or two (20+ characters) why this test matters." }).max(2_000),
  })
  .superRefine((value, context) => {
    if (value.kind === "material" && !value.material) {
      context.addIssue({ code: "custom", path: ["material"], message: "Say which material the test heats." });
    }
    if (value.kind !== "duct" && value.ductDetails) {
      context.addIssue({ code: "custom", path: ["ductDetails"], message: "Duct details belong to duct proposals only." });
    }
  });

export type ProposalDraftInput = z.output<typeof proposalDraftSchema>;
export type ProposalSubmissionInput = z.output<typeof proposalSubmissionSchema>;

export const declineSchema = z.object({
  reason: z.string().trim().min(10, { error: "Give the proposer a reason of at least 10 characters." }).max(2_000),
});
export const mergeSchema = z.object({ targetId: z.string().min(1, { error: "Pick the proposal to merge into." }) });
export const acceptSchema = z.object({ safetyNote: z.string().trim().max(2_000).optional() });

import { z } from "zod";
import { MATERIAL_IDS } from "@/lib/estimate/materials";

const piece = z
  .object({
    name: z.string().trim().min(1, { error: "Give the piece a name." }).max(80),
    filamentGrams: z.number().positive({ error: "Filament must be more than 0 g." }).max(5_000).optional(),
    filamentMetres: z.number().positive({ error: "Filament must be more than 0 m." }).max(2_000).optional(),
  })
  .refine((value) => (value.filamentGrams === undefined) !== (value.filamentMetres === undefined), {
    error: "Give the filament either in grams or in metres.",
    path: ["filamentGrams"],
  });

/** The flow a protocol states directly, or as layer height × line width × speed. */
const flow = z.union([
  z.object({ mm3PerS: z.number().positive().max(200) }),
  z.object({ lineWidthMm: z.number().min(0.1).max(3), speedMmPerS: z.number().positive().max(2_000) }),
]);

const printerOverrides = z.object({
  maxVolumetricFlowMm3PerS: z.number().positive().max(200).optional(),
  efficiency: z.number().gt(0).max(1, { error: "Efficiency is a fraction between 0 and 1." }).optional(),
  heatUpMinutes: z.number().min(0).max(120).optional(),
  changeoverMinutes: z.number().min(0).max(240).optional(),
  handlingMinutesPerJob: z.number().min(0).max(120).optional(),
  hourlyRateMinor: z.number().int().min(0).max(1_000_000).optional(),
});

export const estimateRequestSchema = z.object({
  /** A lab printer whose flow, efficiency, times and hourly rate are used; the first available when absent. */
  printerSlug: z.string().min(1).max(80).optional(),
  printer: printerOverrides.optional(),
  material: z.enum(MATERIAL_IDS, { error: `Material must be one of ${MATERIAL_IDS.join(", ")}.` }).default("PLA"),
  filamentDiameterMm: z.union([z.literal(1.75), z.literal(2.85)], { error: "Filament diameter is 1.75 or 2.85 mm." }).default(1.75),
  layerHeightMm: z.number().min(0.04).max(1).default(0.2),
  flow: flow.optional(),
  fanPercent: z.number().min(0).max(100).default(100),
  pieces: z.array(piece).min(1, { error: "Add at least one test piece." }).max(50),
  /** Number of variants including the reference (e.g. stock duct + two under test = 3). */
  variantCount: z.number().int().min(1).max(12).default(2),
  repeats: z.number().int().min(1).max(20).default(1),
});

export type EstimateRequest = z.output<typeof estimateRequestSchema>;

import { z } from "zod";
import { getMaterial, isMaterialId, MATERIAL_IDS, type MaterialId } from "@/lib/estimate/materials";

const motionTypeValues = ["corexy", "bedslinger", "delta"] as const;
const statusValues = ["available", "down", "maintenance"] as const;

export const motionTypeLabels: Record<(typeof motionTypeValues)[number], string> = {
  corexy: "CoreXY",
  bedslinger: "Bed-slinger",
  delta: "Delta",
};
export const printerStatusLabels: Record<(typeof statusValues)[number], string> = {
  available: "Available",
  down: "Down",
  maintenance: "In maintenance",
};

const number = (label: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `Enter the ${label}.` })
    .min(min, { error: `${label[0]?.toUpperCase()}${label.slice(1)}: at least ${min} ${unit}.` })
    .max(max, { error: `${label[0]?.toUpperCase()}${label.slice(1)}: at most ${max} ${unit}.` });

const axis = (name: string) => number(`build volume ${name}`, 50, 2_000, "mm").int({ error: "Whole millimetres." });

/** What an admin types to add or edit a printer (rates stay on the settings page). */
export const printerSchema = z
  .object({
    name: z.string({ error: "Name the printer." }).trim().min(2, { error: "Name the printer (2 characters or more)." }).max(60, { error: "Keep the name under 60 characters." }),
    model: z.string({ error: "Enter the model." }).trim().min(2, { error: "Enter the model (2 characters or more)." }).max(60, { error: "Keep the model under 60 characters." }),
    motionType: z.enum(motionTypeValues, { error: "Pick CoreXY, bed-slinger or delta." }),
    buildXmm: axis("X"),
    buildYmm: axis("Y"),
    buildZmm: axis("Z"),
    nozzleMm: number("nozzle diameter", 0.1, 2, "mm"),
    maxFlowMm3PerS: number("maximum volumetric flow", 1, 200, "mm³/s"),
    enclosed: z.boolean({ error: "Say whether the printer is enclosed." }),
    materials: z.array(z.string(), { error: "Pick the materials it prints." }).min(1, { error: "Pick at least one material it prints." }),
    status: z.enum(statusValues, { error: "Pick available, down or maintenance." }),
  })
  .transform((input, ctx) => {
    const unknown = input.materials.filter((material) => !isMaterialId(material));
    if (unknown.length > 0) {
      ctx.addIssue({ code: "custom", path: ["materials"], message: `Unknown material ${unknown.join(", ")}; pick from ${MATERIAL_IDS.join(", ")}.` });
      return z.NEVER;
    }
    const materials = [...new Set(input.materials)] as MaterialId[];
    // Styrenics and the hot engineering plastics need a warm, filtered chamber (lib/estimate/materials).
    const needEnclosure = materials.filter((material) => getMaterial(material).needsEnclosure);
    if (!input.enclosed && needEnclosure.length > 0) {
      ctx.addIssue({ code: "custom", path: ["materials"], message: `${needEnclosure.join(", ")} need an enclosed printer; this one is open.` });
      return z.NEVER;
    }
    return { ...input, materials: MATERIAL_IDS.filter((material) => materials.includes(material)) };
  });
export type PrinterInput = z.output<typeof printerSchema>;
export type PrinterFormValues = z.input<typeof printerSchema>;

/** A new printer also needs starting rates; admins fine-tune them on the settings page. */
export const newPrinterSchema = z
  .object({
    hourlyRate: z.number({ error: "Enter the machine rate per hour." }).min(0, { error: "Machine rate: 0 or more." }).max(1_000, { error: "Machine rate: at most 1,000 per hour." }),
    efficiency: z.number({ error: "Enter the efficiency." }).min(0.05, { error: "Efficiency: between 0.05 and 1." }).max(1, { error: "Efficiency: between 0.05 and 1." }),
  })
  .and(printerSchema);
export type NewPrinterInput = z.output<typeof newPrinterSchema>;

export const printerStatusSchema = z.object({
  printerId: z.string({ error: "Missing printer." }).min(1, { error: "Missing printer." }),
  status: z.enum(statusValues, { error: "Pick available, down or maintenance." }),
});

import { z } from "zod";
import { optionalEmailCategories, type OptionalEmailCategory } from "../email/categories";

/**
 * The preferences form: one checkbox per optional category, named after it. A browser leaves
 * unchecked boxes out, so a missing field means "off"; any value other than "on" is refused.
 */
export const emailPreferencesFormSchema = z.object(
  Object.fromEntries(optionalEmailCategories.map((category) => [category, z.literal("on").optional()])) as Record<
    OptionalEmailCategory,
    z.ZodOptional<z.ZodLiteral<"on">>
  >,
);

export function preferencesFromForm(parsed: z.output<typeof emailPreferencesFormSchema>): Record<OptionalEmailCategory, boolean> {
  return Object.fromEntries(optionalEmailCategories.map((category) => [category, parsed[category] === "on"])) as Record<
    OptionalEmailCategory,
    boolean
  >;
}

import { getMaterial, type MaterialId } from "../estimate/materials";

/** Library grams are PLA at reference scale; the piece's volume is what stays the same. */
export const LIBRARY_REFERENCE_MATERIAL: MaterialId = "PLA";

/**
 * Filament for one print of a library piece in another material: same volume, so the grams scale
 * with the density ratio; rounded to 0.1 g, which is what a host would type.
 */
export function libraryGramsIn(material: MaterialId, referenceGrams: number): number {
  const ratio = getMaterial(material).densityGPerCm3 / getMaterial(LIBRARY_REFERENCE_MATERIAL).densityGPerCm3;
  return Math.round(referenceGrams * ratio * 10) / 10;
}

/** A URL slug from a campaign title: ASCII letters, digits and single hyphens, at most 60 characters. */
export function campaignSlugBase(title: string): string {
  const base = title
    .toLowerCase()
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/%/g, " percent ")
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 60)
    .replace(/-+$/g, "");
  return base || "campaign";
}

/** `base`, then `base-2`, `base-3` … until `taken` says no. */
export function firstFreeSlug(base: string, taken: (slug: string) => boolean): string {
  for (let n = 1; ; n++) {
    const slug = n === 1 ? base : `${base}-${n}`;
    if (!taken(slug)) return slug;
  }
}

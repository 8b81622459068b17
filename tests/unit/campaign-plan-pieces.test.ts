import { describe, expect, it } from "vitest";
import { campaignSlugBase, firstFreeSlug, libraryGramsIn } from "@/lib/campaign/plan-pieces";

describe("library grams in another material", () => {
  // Same volume, so mass scales with density (lib/estimate/materials.ts: PLA 1.24, PETG 1.27, ASA 1.07 g/cm³).
  it("scales by the density ratio and rounds to 0.1 g", () => {
    expect(libraryGramsIn("PLA", 18)).toBe(18);
    expect(libraryGramsIn("PETG", 18)).toBe(18.4); // 18 × 1.27 / 1.24 = 18.435
    expect(libraryGramsIn("ASA", 18)).toBe(15.5); // 18 × 1.07 / 1.24 = 15.532
    expect(libraryGramsIn("ABS", 10)).toBe(8.4); // 10 × 1.04 / 1.24 = 8.387
  });
});

describe("campaign slugs", () => {
  it("match the seeded slug style", () => {
    // db/seed-data.ts spells this campaign's slug by hand the same way.
    expect(campaignSlugBase("PETG bridging with 100 % fan")).toBe("petg-bridging-with-100-percent-fan");
    expect(campaignSlugBase("Ünïcödé — Test!")).toBe("unicode-test");
    expect(campaignSlugBase("!!!")).toBe("campaign");
  });

  it("stay at most 60 characters without a dangling hyphen", () => {
    const slug = campaignSlugBase("A very long campaign title that keeps going on and on about fan ducts and nozzles");
    expect(slug.length).toBeLessThanOrEqual(60);
    expect(slug.endsWith("-")).toBe(false);
  });

  it("take the first free number when the base is taken", () => {
    const taken = new Set(["ring-duct", "ring-duct-2"]);
    expect(firstFreeSlug("ring-duct", (slug) => taken.has(slug))).toBe("ring-duct-3");
    expect(firstFreeSlug("other", (slug) => taken.has(slug))).toBe("other");
  });
});

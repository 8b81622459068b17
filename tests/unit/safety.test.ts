import { describe, expect, it } from "vitest";
import { materialCautions, PTFE_LIMIT_CELSIUS } from "@/lib/safety";

const ids = (material: string) => materialCautions(material).map((caution) => caution.id);

describe("materialCautions", () => {
  it("always warns of hot parts and fire", () => {
    expect(ids("PLA")).toEqual(["hot-parts", "unattended"]);
  });

  it("warns of styrene fumes for ABS and ASA (styrenics; common practice: print enclosed and ventilate)", () => {
    expect(ids("ABS")).toContain("fumes");
    expect(materialCautions("ASA").find((c) => c.id === "fumes")?.text).toMatch(/styrene/);
  });

  it(`warns about PTFE-lined hotends above ${PTFE_LIMIT_CELSIUS} °C (common practice) for PC and PA`, () => {
    expect(ids("PC")).toContain("ptfe");
    expect(ids("PA")).toContain("ptfe");
    expect(ids("PLA")).not.toContain("ptfe");
  });
});

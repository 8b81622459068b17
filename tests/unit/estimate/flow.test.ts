import { describe, expect, it } from "vitest";
import { speedForFlowMmPerS, volumetricFlowMm3PerS } from "@/lib/estimate/flow";
import { DomainInputError } from "@/lib/input-checks";

describe("volumetric flow", () => {
  it("is layer height × extrusion width × speed", () => {
    // Arithmetic: 0.2 mm × 0.45 mm × 100 mm/s = 9 mm³/s.
    expect(volumetricFlowMm3PerS(0.2, 0.45, 100)).toBeCloseTo(9, 12);
    // 0.3 mm × 0.6 mm × 50 mm/s = 9 mm³/s: a thicker, slower line can carry the same flow.
    expect(volumetricFlowMm3PerS(0.3, 0.6, 50)).toBeCloseTo(9, 12);
  });

  it("inverts to the speed that gives a stated flow", () => {
    // Arithmetic: 15 mm³/s ÷ (0.2 mm × 0.5 mm) = 150 mm/s.
    expect(speedForFlowMmPerS(15, 0.2, 0.5)).toBeCloseTo(150, 12);
    const speed = speedForFlowMmPerS(11, 0.28, 0.42);
    expect(volumetricFlowMm3PerS(0.28, 0.42, speed)).toBeCloseTo(11, 12);
  });

  it("rejects zero or negative dimensions", () => {
    expect(() => volumetricFlowMm3PerS(0, 0.45, 100)).toThrow(DomainInputError);
    expect(() => speedForFlowMmPerS(10, 0.2, -0.4)).toThrow(DomainInputError);
  });
});

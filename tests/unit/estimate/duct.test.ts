import { describe, expect, it } from "vitest";
import { CUBIC_METRES_PER_SECOND_PER_CFM, ductAirflow, ductAreas, fanFlowM3PerS, openingAreaMm2 } from "@/lib/estimate/duct";
import { DomainInputError } from "@/lib/input-checks";

describe("duct openings", () => {
  it("computes rectangle, circle and slot areas", () => {
    expect(openingAreaMm2({ kind: "rectangle", widthMm: 20, heightMm: 5 })).toBe(100);
    // Circle: π d² / 4 = π × 40² / 4 = 1256.637 mm².
    expect(openingAreaMm2({ kind: "circle", diameterMm: 40 })).toBeCloseTo(1256.637, 3);
    // Stadium 20 × 5: a 15 × 5 rectangle plus a 5 mm circle = 75 + π × 2.5² = 94.635 mm².
    expect(openingAreaMm2({ kind: "slot", widthMm: 20, heightMm: 5 })).toBeCloseTo(94.635, 3);
    // A slot as long as it is thick is a circle.
    expect(openingAreaMm2({ kind: "slot", widthMm: 6, heightMm: 6 })).toBeCloseTo(openingAreaMm2({ kind: "circle", diameterMm: 6 }), 12);
  });

  it("sums outlets and gives the outlet-to-inlet ratio", () => {
    const areas = ductAreas({ kind: "rectangle", widthMm: 20, heightMm: 15 }, [
      { kind: "rectangle", widthMm: 20, heightMm: 3 },
      { kind: "rectangle", widthMm: 20, heightMm: 3 },
    ]);
    expect(areas.inletAreaMm2).toBe(300);
    expect(areas.outletAreaMm2).toBe(120);
    expect(areas.outletToInletRatio).toBeCloseTo(0.4, 12);
  });

  it("rejects a slot shorter than it is thick and a duct without outlets", () => {
    expect(() => openingAreaMm2({ kind: "slot", widthMm: 3, heightMm: 5 })).toThrow(DomainInputError);
    expect(() => ductAreas({ kind: "circle", diameterMm: 30 }, [])).toThrow(DomainInputError);
  });
});

describe("fan flow units", () => {
  it("uses 1 ft = 0.3048 m exactly", () => {
    // source: NIST SP 811 (international foot = 0.3048 m exactly); 1 ft³ = 0.028316846592 m³,
    // so 1 CFM = 0.028316846592 / 60 = 0.0004719474432 m³/s.
    expect(CUBIC_METRES_PER_SECOND_PER_CFM).toBeCloseTo(0.0004719474432, 15);
    expect(fanFlowM3PerS({ unit: "cfm", value: 5 })).toBeCloseTo(0.002359737216, 15);
    // 1 m³/h = 1/3600 m³/s.
    expect(fanFlowM3PerS({ unit: "m3/h", value: 36 })).toBeCloseTo(0.01, 15);
  });
});

describe("duct air speeds by continuity", () => {
  it("gives inlet and outlet speeds from Q = A·v", () => {
    // Arithmetic: 5 CFM = 0.002359737 m³/s. Inlet 20 × 15 mm = 3.0e-4 m² → 7.8658 m/s.
    // Outlets 2 × 20 × 3 mm = 1.2e-4 m² → 19.6645 m/s, 2.5 × the inlet speed (300 / 120).
    const flow = ductAirflow(
      { kind: "rectangle", widthMm: 20, heightMm: 15 },
      [
        { kind: "rectangle", widthMm: 20, heightMm: 3 },
        { kind: "rectangle", widthMm: 20, heightMm: 3 },
      ],
      { unit: "cfm", value: 5 },
    );
    expect(flow.flowM3PerS).toBeCloseTo(0.002359737, 9);
    expect(flow.inletSpeedMPerS).toBeCloseTo(7.8658, 4);
    expect(flow.outletSpeedMPerS).toBeCloseTo(19.6645, 4);
    expect(flow.exitSpeedRelativeToInlet).toBeCloseTo(2.5, 12);
    expect(flow.outletSpeedMPerS / flow.inletSpeedMPerS).toBeCloseTo(flow.exitSpeedRelativeToInlet, 12);
  });

  it("slows the air when the outlets are larger than the inlet", () => {
    // Arithmetic: 18 m³/h = 0.005 m³/s through a 40 mm circle (1.2566e-3 m²) → 3.979 m/s.
    const flow = ductAirflow({ kind: "circle", diameterMm: 40 }, [{ kind: "rectangle", widthMm: 60, heightMm: 30 }], {
      unit: "m3/h",
      value: 18,
    });
    expect(flow.inletSpeedMPerS).toBeCloseTo(3.979, 3);
    expect(flow.exitSpeedRelativeToInlet).toBeLessThan(1);
  });
});

import { DomainInputError, requirePositive } from "../input-checks";

// source: international yard and pound agreement — 1 ft = 0.3048 m exactly (NIST SP 811, B.8),
// so 1 ft³/min = 0.3048³ / 60 m³/s = 0.0004719474432 m³/s exactly.
export const CUBIC_METRES_PER_SECOND_PER_CFM = 0.3048 ** 3 / 60;
const SECONDS_PER_HOUR = 3600;
const MM2_PER_M2 = 1_000_000;

export type OpeningShape =
  | { readonly kind: "rectangle"; readonly widthMm: number; readonly heightMm: number }
  | { readonly kind: "circle"; readonly diameterMm: number }
  /** Stadium: overall length `widthMm`, thickness `heightMm`, semicircular ends of diameter `heightMm`. */
  | { readonly kind: "slot"; readonly widthMm: number; readonly heightMm: number };

export type FanFlowRating =
  | { readonly unit: "cfm"; readonly value: number }
  | { readonly unit: "m3/h"; readonly value: number };

export interface DuctAreas {
  readonly inletAreaMm2: number;
  readonly outletAreaMm2: number;
  readonly outletToInletRatio: number;
}

export interface DuctAirflow extends DuctAreas {
  readonly flowM3PerS: number;
  readonly inletSpeedMPerS: number;
  readonly outletSpeedMPerS: number;
  /** Outlet speed ÷ inlet speed, which by continuity equals inlet area ÷ outlet area. */
  readonly exitSpeedRelativeToInlet: number;
}

export function openingAreaMm2(shape: OpeningShape): number {
  switch (shape.kind) {
    case "rectangle":
      return requirePositive("widthMm", shape.widthMm) * requirePositive("heightMm", shape.heightMm);
    case "circle": {
      const radiusMm = requirePositive("diameterMm", shape.diameterMm) / 2;
      return Math.PI * radiusMm * radiusMm;
    }
    case "slot": {
      const lengthMm = requirePositive("widthMm", shape.widthMm);
      const thicknessMm = requirePositive("heightMm", shape.heightMm);
      if (lengthMm < thicknessMm) {
        throw new DomainInputError("widthMm", "a slot must be at least as long as it is thick");
      }
      const radiusMm = thicknessMm / 2;
      return (lengthMm - thicknessMm) * thicknessMm + Math.PI * radiusMm * radiusMm;
    }
  }
}

export function ductAreas(inlet: OpeningShape, outlets: readonly OpeningShape[]): DuctAreas {
  if (outlets.length === 0) throw new DomainInputError("outlets", "a duct needs at least one outlet");
  const inletAreaMm2 = openingAreaMm2(inlet);
  const outletAreaMm2 = outlets.reduce((sum, outlet) => sum + openingAreaMm2(outlet), 0);
  return { inletAreaMm2, outletAreaMm2, outletToInletRatio: outletAreaMm2 / inletAreaMm2 };
}

export function fanFlowM3PerS(rating: FanFlowRating): number {
  const value = requirePositive("value", rating.value);
  return rating.unit === "cfm" ? value * CUBIC_METRES_PER_SECOND_PER_CFM : value / SECONDS_PER_HOUR;
}

/**
 * Mean air speeds by continuity (Q = A·v, air treated as incompressible at these speeds).
 * A fan's rating is its free-air flow; a duct's back-pressure lowers the real flow, so these
 * speeds are upper bounds, but their ratio holds whatever the flow.
 */
export function ductAirflow(inlet: OpeningShape, outlets: readonly OpeningShape[], fan: FanFlowRating): DuctAirflow {
  const areas = ductAreas(inlet, outlets);
  const flowM3PerS = fanFlowM3PerS(fan);
  return {
    ...areas,
    flowM3PerS,
    inletSpeedMPerS: flowM3PerS / (areas.inletAreaMm2 / MM2_PER_M2),
    outletSpeedMPerS: flowM3PerS / (areas.outletAreaMm2 / MM2_PER_M2),
    exitSpeedRelativeToInlet: areas.inletAreaMm2 / areas.outletAreaMm2,
  };
}

import { describe, expect, it } from "vitest";
import { estimateTestPlan, type TestPlanInput } from "@/lib/estimate/plan";
import { DomainInputError } from "@/lib/input-checks";

// Two pieces: "overhang fan" of 12.4 g PLA (12.4 g ÷ 1.24 g/cm³ = 10 000 mm³) and a small
// "bridge strip" of 1.24 g (1000 mm³) sliced into 50 layers of 20 mm³.
const input: TestPlanInput = {
  pieces: [
    { id: "overhang-fan", name: "Overhang fan", filamentGrams: 12.4 },
    { id: "bridge-strip", name: "Bridge strip", filamentGrams: 1.24, layerVolumesMm3: new Array(50).fill(20) },
  ],
  variants: [
    { id: "stock", name: "Stock duct", role: "reference" },
    { id: "ring", name: "Ring duct", role: "under_test" },
    { id: "twin", name: "Twin-slot duct", role: "under_test" },
  ],
  repeats: 2,
  protocol: { material: "PLA", layerHeightMm: 0.2, maxVolumetricFlowMm3PerS: 12, fanPercent: 100 },
  printer: {
    id: "bench-a",
    name: "Bench printer A",
    maxVolumetricFlowMm3PerS: 20,
    efficiency: 0.5,
    heatUpMinutes: 5,
    changeoverMinutes: 15,
    handlingMinutesPerJob: 3,
    minLayerTimeSeconds: 8,
    hourlyRateMinor: 250,
  },
  pricing: {
    currency: "USD",
    filamentPricePerKgMinor: { PLA: 2000, PETG: 2400 },
    labourRatePerHourMinor: 3000,
    extraLabourHours: 1.5,
    contingencyBasisPoints: 1000,
  },
};

describe("test plan estimate", () => {
  const estimate = estimateTestPlan(input);

  it("prints every piece for every variant and repeat, grouped by variant", () => {
    // 2 pieces × 3 variants × 2 repeats = 12 jobs.
    expect(estimate.jobs).toHaveLength(12);
    expect(estimate.jobs.map((job) => job.variantId)).toEqual([
      ...Array(4).fill("stock"),
      ...Array(4).fill("ring"),
      ...Array(4).fill("twin"),
    ]);
    expect(estimate.variantSwitches).toBe(2);
    expect(estimate.jobs.filter((job) => job.time.changeoverMinutes > 0).map((job) => job.variantId)).toEqual(["ring", "twin"]);
  });

  it("caps the flow at the protocol's and applies the layer-time floor to sliced pieces", () => {
    // Effective flow min(20, 12) × 0.5 = 6 mm³/s. Overhang fan: 10 000 ÷ 6 = 1666.67 s = 27.78 min.
    // Bridge strip: 20 mm³ ÷ 6 = 3.33 s per layer → floor 8 s × 50 layers = 400 s = 6.67 min.
    const fan = estimate.jobs.find((job) => job.pieceId === "overhang-fan");
    const strip = estimate.jobs.find((job) => job.pieceId === "bridge-strip");
    expect(fan?.time.extrusionMinutes).toBeCloseTo(10_000 / 6 / 60, 9);
    expect(strip?.time.extrusionMinutes).toBeCloseTo(400 / 60, 9);
    // 6 jobs of each piece.
    expect(estimate.time.extrusionMinutes).toBeCloseTo(6 * (10_000 / 6 / 60) + 6 * (400 / 60), 9);
    expect(estimate.time.heatUpMinutes).toBe(12 * 5);
    expect(estimate.time.handlingMinutes).toBe(12 * 3);
    expect(estimate.time.changeoverMinutes).toBe(2 * 15);
  });

  it("totals material: volume, filament length and mass", () => {
    // 6 × 10 000 + 6 × 1000 = 66 000 mm³; 66 000 ÷ (π × 0.875²) = 27 440 mm of 1.75 mm filament;
    // 66 cm³ × 1.24 g/cm³ = 81.84 g.
    expect(estimate.volumeMm3).toBeCloseTo(66_000, 6);
    expect(estimate.filamentMetres).toBeCloseTo(66_000 / (Math.PI * 0.875 ** 2) / 1000, 9);
    expect(estimate.filamentGrams).toBeCloseTo(81.84, 9);
    expect(estimate.filamentGramsByMaterial).toEqual({ PLA: expect.closeTo(81.84, 9) });
  });

  it("splits hours into machine time and lab labour and prices them", () => {
    // Machine = extrusion + heat-up = (206.67 + 60) min = 4.4444 h; labour = changeovers 30 min
    // + handling 36 min + 1.5 h extra = 2.6 h.
    const extrusionMinutes = 6 * (10_000 / 6 / 60) + 6 * (400 / 60);
    expect(estimate.machineHours).toBeCloseTo((extrusionMinutes + 60) / 60, 9);
    expect(estimate.labourHours).toBeCloseTo(2.6, 9);
    const line = (kind: string) => estimate.cost.lines.find((l) => l.kind === kind)?.amountMinor;
    // 81.84 g × $20/kg = $1.6368 → $1.64; 4.4444 h × $2.50 = $11.111 → $11.12; 2.6 h × $30 = $78.00.
    expect(line("filament")).toBe(164);
    expect(line("machine")).toBe(1112);
    expect(line("labour")).toBe(7800);
    expect(estimate.cost.lines.reduce((sum, l) => sum + l.amountMinor, 0)).toBe(estimate.cost.totalMinor);
    expect(estimate.cost.totalMinor % 100).toBe(0);
  });

  it("keeps a variant's volume but not its mass when it prints in another material", () => {
    const withPetg = estimateTestPlan({
      ...input,
      variants: [input.variants[0]!, { id: "petg", name: "Same duct, PETG", role: "under_test", material: "PETG" }],
    });
    const petgJobs = withPetg.jobs.filter((job) => job.material === "PETG");
    expect(petgJobs).toHaveLength(4);
    // 10 000 mm³ × 1.27 g/cm³ = 12.7 g (vs 12.4 g in PLA).
    expect(petgJobs[0]?.volumeMm3).toBeCloseTo(10_000, 9);
    expect(petgJobs[0]?.filamentGrams).toBeCloseTo(12.7, 9);
    expect(Object.keys(withPetg.filamentGramsByMaterial).sort()).toEqual(["PETG", "PLA"]);
    expect(withPetg.cost.lines.filter((line) => line.kind === "filament")).toHaveLength(2);
  });

  it("rejects plans it cannot estimate", () => {
    expect(() => estimateTestPlan({ ...input, repeats: 0 })).toThrow(DomainInputError);
    expect(() => estimateTestPlan({ ...input, pieces: [] })).toThrow(DomainInputError);
    expect(() => estimateTestPlan({ ...input, variants: input.variants.slice(1) })).toThrow(/reference/);
    expect(() => estimateTestPlan({ ...input, protocol: { ...input.protocol, fanPercent: 120 } })).toThrow(DomainInputError);
    expect(() =>
      estimateTestPlan({ ...input, protocol: { ...input.protocol, material: "ABS" } }),
    ).toThrow(/no price for ABS/);
  });
});

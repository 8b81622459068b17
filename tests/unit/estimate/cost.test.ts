import { describe, expect, it } from "vitest";
import {
  estimateTestPlanCost,
  filamentCostMinor,
  grossUpForPaymentFee,
  netAfterPaymentFeeMinor,
  percentOfMinor,
  STANDARD_US_ONLINE_CARD_FEE,
  timeCostMinor,
  type PaymentFee,
  type TestPlanCostInput,
} from "@/lib/estimate/cost";
import { DomainInputError } from "@/lib/input-checks";

describe("payment-fee gross-up", () => {
  it("is the published standard US online card rate, 2.9 % + 30¢", () => {
    // source: the card processor's published standard US pricing (from memory).
    expect(STANDARD_US_ONLINE_CARD_FEE).toEqual({ rateBasisPoints: 290, fixedMinor: 30, currency: "USD" });
  });

  it.each([
    // Arithmetic: charge = (net + $0.30) / (1 − 0.029), rounded up to the cent.
    [10_000, 10_330], // ($100.00 + $0.30) / 0.971 = $103.2956… → $103.30
    [1_000, 1_061], // ($10.00 + $0.30) / 0.971 = $10.6076… → $10.61
    [100_000, 103_018], // ($1000.00 + $0.30) / 0.971 = $1030.1751… → $1030.18
    [2_500, 2_606], // ($25.00 + $0.30) / 0.971 = $26.0556… → $26.06
  ])("net %i¢ needs a charge of %i¢", (net, charge) => {
    expect(grossUpForPaymentFee(net, STANDARD_US_ONLINE_CARD_FEE)).toBe(charge);
  });

  it("after the fee the lab keeps at least the net, and one cent less would not do", () => {
    const fee = STANDARD_US_ONLINE_CARD_FEE;
    for (let net = 1; net <= 50_000; net += 37) {
      const charge = grossUpForPaymentFee(net, fee);
      // reference: fee = 2.9 % × charge + 30¢, with the percentage taken exactly (rational).
      const keptTimes10000 = charge * (10_000 - 290) - 30 * 10_000;
      const keptOneLessTimes10000 = (charge - 1) * (10_000 - 290) - 30 * 10_000;
      expect(keptTimes10000).toBeGreaterThanOrEqual(net * 10_000);
      expect(keptOneLessTimes10000).toBeLessThan(net * 10_000);
      expect(netAfterPaymentFeeMinor(charge, fee)).toBeGreaterThanOrEqual(net);
    }
  });

  it("is more than simply adding the fee on the net", () => {
    // Adding 2.9 % of $100 plus 30¢ asks for $103.20, but the fee on $103.20 is $3.2928,
    // which leaves $99.9072: short of $100.
    const naive = 10_000 + 290 + 30;
    expect(netAfterPaymentFeeMinor(naive, STANDARD_US_ONLINE_CARD_FEE)).toBeLessThan(10_000);
    expect(grossUpForPaymentFee(10_000, STANDARD_US_ONLINE_CARD_FEE)).toBeGreaterThan(naive);
  });

  it("charges nothing on nothing and refuses a 100 % rate", () => {
    expect(grossUpForPaymentFee(0, STANDARD_US_ONLINE_CARD_FEE)).toBe(0);
    expect(() => grossUpForPaymentFee(100, { rateBasisPoints: 10_000, fixedMinor: 0, currency: "USD" })).toThrow(
      DomainInputError,
    );
  });
});

describe("cost lines", () => {
  it("prices filament by the milligram, rounding up", () => {
    // Arithmetic: 250 g × $25.00/kg = $6.25; 12.345 g × $20.00/kg = $0.2469 → 25¢.
    expect(filamentCostMinor(250, 2500)).toBe(625);
    expect(filamentCostMinor(12.345, 2000)).toBe(25);
    // 0.1 + 0.2 g is 0.30000000000000004 g in binary; still 0.3 g × $10/kg = 0.3¢ → 1¢, not 2¢.
    expect(filamentCostMinor(0.1 + 0.2, 1000)).toBe(1);
  });

  it("prices time by the second, rounding up", () => {
    // Arithmetic: 2.5 h × $3.00/h = $7.50; 1 s at $36.00/h = 1¢ exactly.
    expect(timeCostMinor(2.5, 300)).toBe(750);
    expect(timeCostMinor(1 / 3600, 3600)).toBe(1);
    expect(timeCostMinor(1 / 3600, 3601)).toBe(2);
  });

  it("takes a percentage in basis points, rounding up", () => {
    // Arithmetic: 10 % of $123.45 = $12.345 → $12.35.
    expect(percentOfMinor(12_345, 1000)).toBe(1235);
  });
});

describe("test plan cost", () => {
  const input: TestPlanCostInput = {
    currency: "USD",
    filament: [
      { material: "PLA", grams: 400, pricePerKgMinor: 2500 },
      { material: "PETG", grams: 150, pricePerKgMinor: 3000 },
      { material: "PLA", grams: 100, pricePerKgMinor: 2500 },
    ],
    machineHours: 12.5,
    machineRatePerHourMinor: 300,
    labourHours: 2,
    labourRatePerHourMinor: 4000,
    contingencyBasisPoints: 1000,
  };

  it("builds a breakdown a backer can follow, summing exactly to the total", () => {
    const cost = estimateTestPlanCost(input);
    // Arithmetic: PLA 500 g × $25/kg = $12.50; PETG 150 g × $30/kg = $4.50; machine 12.5 h × $3
    // = $37.50; labour 2 h × $40 = $80.00 → subtotal $134.50; contingency 10 % = $13.45 →
    // $147.95 to keep; gross-up ($147.95 + $0.30) / 0.971 = $152.6777… → $152.68; rounded up to
    // a whole dollar → $153.00.
    expect(cost.lines.map((line) => [line.kind, line.amountMinor])).toEqual([
      ["filament", 1250],
      ["filament", 450],
      ["machine", 3750],
      ["labour", 8000],
      ["contingency", 1345],
      ["payment_fee", 15_268 - 14_795],
      ["rounding", 15_300 - 15_268],
    ]);
    expect(cost.subtotalMinor).toBe(13_450);
    expect(cost.netRequiredMinor).toBe(14_795);
    expect(cost.totalMinor).toBe(15_300);
    expect(cost.lines.reduce((sum, line) => sum + line.amountMinor, 0)).toBe(cost.totalMinor);
    expect(cost.lines[0]?.quantity).toBe("500 g × $25.00/kg");
    expect(cost.lines[2]?.quantity).toBe("12.5 h × $3.00/h");
  });

  it("leaves the lab at least its net after the processor's fee on the total", () => {
    const cost = estimateTestPlanCost(input);
    expect(netAfterPaymentFeeMinor(cost.totalMinor, STANDARD_US_ONLINE_CARD_FEE)).toBeGreaterThanOrEqual(
      cost.netRequiredMinor,
    );
  });

  it("rounds yen to a whole yen with a fee given in yen", () => {
    const yenFee: PaymentFee = { rateBasisPoints: 360, fixedMinor: 0, currency: "JPY" };
    const cost = estimateTestPlanCost({
      currency: "JPY",
      filament: [{ material: "PLA", grams: 333, pricePerKgMinor: 3000 }],
      machineHours: 1,
      machineRatePerHourMinor: 450,
      labourHours: 0.5,
      labourRatePerHourMinor: 3000,
      contingencyBasisPoints: 0,
      paymentFee: yenFee,
    });
    // Arithmetic: 333 g × ¥3000/kg = ¥999; machine ¥450; labour ¥1500 → ¥2949;
    // (¥2949 + 0) / (1 − 0.036) = ¥3059.13… → ¥3060; already whole yen, so no rounding.
    expect(cost.totalMinor).toBe(3060);
    expect(cost.lines.find((line) => line.kind === "rounding")?.amountMinor).toBe(0);
  });

  it("needs a fee in the plan's currency outside USD", () => {
    expect(() => estimateTestPlanCost({ ...input, currency: "EUR" })).toThrow(DomainInputError);
    expect(() =>
      estimateTestPlanCost({ ...input, currency: "EUR", paymentFee: STANDARD_US_ONLINE_CARD_FEE }),
    ).toThrow(/USD/);
  });

  it("refuses one material at two prices", () => {
    expect(() =>
      estimateTestPlanCost({
        ...input,
        filament: [
          { material: "PLA", grams: 1, pricePerKgMinor: 2500 },
          { material: "PLA", grams: 1, pricePerKgMinor: 2600 },
        ],
      }),
    ).toThrow(DomainInputError);
  });
});

import type { MaterialId } from "./materials";
import {
  ceilDiv,
  ceilDivBig,
  formatMoney,
  minorUnitsPerMajor,
  requireMinorAmount,
  roundUpToMultiple,
  type CurrencyCode,
} from "../money";
import { DomainInputError, requireNonNegative } from "../input-checks";
import { numberFormat } from "../intl-cache";

const BASIS_POINTS_PER_WHOLE = 10_000;
const MILLIGRAMS_PER_GRAM = 1000;
const MILLIGRAMS_PER_KG = 1_000_000;
const SECONDS_PER_HOUR = 3600;

export interface PaymentFee {
  /** Percentage part of the fee in basis points (290 = 2.9 %). */
  readonly rateBasisPoints: number;
  /** Fixed part per charge, in minor units of `currency`. */
  readonly fixedMinor: number;
  readonly currency: CurrencyCode;
}

// source: the card processor's published standard pricing for US online card payments,
// 2.9 % + 30¢ per successful domestic card charge (from memory; check the current page).
export const STANDARD_US_ONLINE_CARD_FEE: PaymentFee = { rateBasisPoints: 290, fixedMinor: 30, currency: "USD" };

// common practice: a 10 % allowance for failed prints and reprints on test work.
export const DEFAULT_CONTINGENCY_BASIS_POINTS = 1000;

export interface FilamentCostInput {
  readonly material: MaterialId;
  readonly grams: number;
  readonly pricePerKgMinor: number;
}

export interface TestPlanCostInput {
  readonly currency: CurrencyCode;
  readonly filament: readonly FilamentCostInput[];
  readonly machineHours: number;
  readonly machineRatePerHourMinor: number;
  readonly labourHours: number;
  readonly labourRatePerHourMinor: number;
  readonly contingencyBasisPoints?: number;
  /** Defaults to STANDARD_US_ONLINE_CARD_FEE for USD; required for other currencies. */
  readonly paymentFee?: PaymentFee;
  /** Goal is rounded up to a multiple of this; defaults to one whole currency unit. */
  readonly roundUpToMinor?: number;
  /** Locale for the human-readable quantity texts. */
  readonly locale?: string;
}

export type CostLineKind = "filament" | "machine" | "labour" | "contingency" | "payment_fee" | "rounding";

export interface CostLine {
  readonly kind: CostLineKind;
  readonly label: string;
  readonly quantity: string;
  readonly amountMinor: number;
}

export interface CostBreakdown {
  readonly currency: CurrencyCode;
  /** Every line; they add up exactly to totalMinor. */
  readonly lines: readonly CostLine[];
  /** Filament + machine + labour. */
  readonly subtotalMinor: number;
  /** Subtotal + contingency: what the lab must keep after the payment fee. */
  readonly netRequiredMinor: number;
  readonly totalMinor: number;
}

/** ⌈grams × price per kg⌉ in minor units; grams are taken to the milligram. */
export function filamentCostMinor(grams: number, pricePerKgMinor: number): number {
  const milligrams = Math.round(requireNonNegative("grams", grams) * MILLIGRAMS_PER_GRAM);
  return ceilDiv(milligrams * requireMinorAmount("pricePerKgMinor", pricePerKgMinor), MILLIGRAMS_PER_KG);
}

/** ⌈hours × hourly rate⌉ in minor units; hours are taken to the second. */
export function timeCostMinor(hours: number, ratePerHourMinor: number): number {
  const seconds = Math.round(requireNonNegative("hours", hours) * SECONDS_PER_HOUR);
  return ceilDiv(seconds * requireMinorAmount("ratePerHourMinor", ratePerHourMinor), SECONDS_PER_HOUR);
}

export function percentOfMinor(amountMinor: number, basisPoints: number): number {
  return ceilDiv(amountMinor * requireBasisPoints("basisPoints", basisPoints), BASIS_POINTS_PER_WHOLE);
}

/**
 * Smallest charge that still leaves `netMinor` after the fee. The processor takes
 * rate × charge + fixed from each charge, so charge − (rate × charge + fixed) ≥ net gives
 * charge ≥ (net + fixed) / (1 − rate). Simply adding rate × net + fixed on top would fall
 * short, because the fee is also taken from the fee allowance itself.
 */
export function grossUpForPaymentFee(netMinor: number, fee: PaymentFee): number {
  requireMinorAmount("netMinor", netMinor);
  if (netMinor <= 0) return netMinor;
  const rate = requireBasisPoints("rateBasisPoints", fee.rateBasisPoints);
  if (rate >= BASIS_POINTS_PER_WHOLE) throw new DomainInputError("rateBasisPoints", "must be below 100 %");
  const numerator = BigInt(netMinor + requireMinorAmount("fixedMinor", fee.fixedMinor)) * BigInt(BASIS_POINTS_PER_WHOLE);
  return Number(ceilDivBig(numerator, BigInt(BASIS_POINTS_PER_WHOLE - rate)));
}

/** What the lab keeps from a charge, with the percentage part of the fee rounded against the lab. */
export function netAfterPaymentFeeMinor(chargeMinor: number, fee: PaymentFee): number {
  requireMinorAmount("chargeMinor", chargeMinor);
  return chargeMinor - percentOfMinor(chargeMinor, fee.rateBasisPoints) - fee.fixedMinor;
}

export function estimateTestPlanCost(input: TestPlanCostInput): CostBreakdown {
  const { currency } = input;
  const money = (amountMinor: number) => formatMoney(amountMinor, currency, input.locale);
  const hours = (value: number) => `${formatDecimal(value, 2, input.locale)} h`;

  const filamentLines = groupFilamentByMaterial(input.filament).map(
    ({ material, grams, pricePerKgMinor }): CostLine => ({
      kind: "filament",
      label: `${material} filament`,
      quantity: `${formatDecimal(grams, 1, input.locale)} g × ${money(pricePerKgMinor)}/kg`,
      amountMinor: filamentCostMinor(grams, pricePerKgMinor),
    }),
  );
  const machineLine: CostLine = {
    kind: "machine",
    label: "Machine time",
    quantity: `${hours(input.machineHours)} × ${money(input.machineRatePerHourMinor)}/h`,
    amountMinor: timeCostMinor(input.machineHours, input.machineRatePerHourMinor),
  };
  const labourLine: CostLine = {
    kind: "labour",
    label: "Lab labour",
    quantity: `${hours(input.labourHours)} × ${money(input.labourRatePerHourMinor)}/h`,
    amountMinor: timeCostMinor(input.labourHours, input.labourRatePerHourMinor),
  };
  const directLines = [...filamentLines, machineLine, labourLine];
  const subtotalMinor = sumLines(directLines);

  const contingencyBasisPoints = input.contingencyBasisPoints ?? DEFAULT_CONTINGENCY_BASIS_POINTS;
  const contingencyLine: CostLine = {
    kind: "contingency",
    label: "Contingency (failed prints, reprints)",
    quantity: `${formatBasisPoints(contingencyBasisPoints, input.locale)} of ${money(subtotalMinor)}`,
    amountMinor: percentOfMinor(subtotalMinor, contingencyBasisPoints),
  };
  const netRequiredMinor = subtotalMinor + contingencyLine.amountMinor;

  const fee = resolvePaymentFee(input);
  const chargeMinor = grossUpForPaymentFee(netRequiredMinor, fee);
  const feeLine: CostLine = {
    kind: "payment_fee",
    label: "Payment processing allowance",
    quantity: `${formatBasisPoints(fee.rateBasisPoints, input.locale)} + ${money(fee.fixedMinor)}, grossed up so ${money(netRequiredMinor)} reaches the lab`,
    amountMinor: chargeMinor - netRequiredMinor,
  };

  const stepMinor = input.roundUpToMinor ?? minorUnitsPerMajor(currency);
  const totalMinor = roundUpToMultiple(chargeMinor, stepMinor);
  const roundingLine: CostLine = {
    kind: "rounding",
    label: "Rounding up",
    quantity: `to a multiple of ${money(stepMinor)}`,
    amountMinor: totalMinor - chargeMinor,
  };

  return {
    currency,
    lines: [...directLines, contingencyLine, feeLine, roundingLine],
    subtotalMinor,
    netRequiredMinor,
    totalMinor,
  };
}

function resolvePaymentFee(input: TestPlanCostInput): PaymentFee {
  const fee = input.paymentFee ?? (input.currency === "USD" ? STANDARD_US_ONLINE_CARD_FEE : undefined);
  if (!fee) throw new DomainInputError("paymentFee", `no default payment fee for ${input.currency}; pass one`);
  if (fee.currency !== input.currency) {
    throw new DomainInputError("paymentFee", `fee is in ${fee.currency} but the plan is in ${input.currency}`);
  }
  return fee;
}

function groupFilamentByMaterial(uses: readonly FilamentCostInput[]): FilamentCostInput[] {
  const byMaterial = new Map<MaterialId, FilamentCostInput>();
  for (const use of uses) {
    const existing = byMaterial.get(use.material);
    if (existing && existing.pricePerKgMinor !== use.pricePerKgMinor) {
      throw new DomainInputError("filament", `${use.material} is listed with two different prices`);
    }
    byMaterial.set(use.material, { ...use, grams: (existing?.grams ?? 0) + use.grams });
  }
  return [...byMaterial.values()];
}

function requireBasisPoints(field: string, basisPoints: number): number {
  if (!Number.isSafeInteger(basisPoints) || basisPoints < 0) {
    throw new DomainInputError(field, `must be a whole number of basis points ≥ 0, got ${basisPoints}`);
  }
  return basisPoints;
}

function sumLines(lines: readonly CostLine[]): number {
  return lines.reduce((sum, line) => sum + line.amountMinor, 0);
}

function formatDecimal(value: number, fractionDigits: number, locale = "en-US"): string {
  return numberFormat(locale, { maximumFractionDigits: fractionDigits }).format(value);
}

function formatBasisPoints(basisPoints: number, locale = "en-US"): string {
  return numberFormat(locale, { style: "percent", maximumFractionDigits: 2 }).format(
    basisPoints / BASIS_POINTS_PER_WHOLE,
  );
}

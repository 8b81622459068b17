import { DomainInputError } from "./input-checks";
import { numberFormat } from "./intl-cache";

// Minor-unit exponents from the ISO 4217 currency code list ("minor unit" column).
const MINOR_UNIT_EXPONENTS = {
  USD: 2,
  EUR: 2,
  GBP: 2,
  CAD: 2,
  AUD: 2,
  NZD: 2,
  CHF: 2,
  SEK: 2,
  NOK: 2,
  DKK: 2,
  PLN: 2,
  CZK: 2,
  MXN: 2,
  JPY: 0,
  KRW: 0,
  ISK: 0,
  CLP: 0,
  KWD: 3,
  BHD: 3,
  JOD: 3,
} as const satisfies Record<string, number>;

export type CurrencyCode = keyof typeof MINOR_UNIT_EXPONENTS;

export const CURRENCY_CODES = Object.keys(MINOR_UNIT_EXPONENTS) as CurrencyCode[];

export interface Money {
  readonly amountMinor: number;
  readonly currency: CurrencyCode;
}

export function isCurrencyCode(value: string): value is CurrencyCode {
  return Object.prototype.hasOwnProperty.call(MINOR_UNIT_EXPONENTS, value);
}

export function minorUnitExponent(currency: CurrencyCode): number {
  return MINOR_UNIT_EXPONENTS[currency];
}

export function minorUnitsPerMajor(currency: CurrencyCode): number {
  return 10 ** minorUnitExponent(currency);
}

export function requireMinorAmount(field: string, amountMinor: number): number {
  if (!Number.isSafeInteger(amountMinor)) {
    throw new DomainInputError(field, `must be a whole number of minor units, got ${amountMinor}`);
  }
  return amountMinor;
}

/** ⌈numerator / denominator⌉ for safe integers, exact (no floating-point division). */
export function ceilDiv(numerator: number, denominator: number): number {
  return Number(ceilDivBig(BigInt(numerator), BigInt(denominator)));
}

export function ceilDivBig(numerator: bigint, denominator: bigint): bigint {
  if (denominator <= 0n) throw new DomainInputError("denominator", "must be > 0");
  const quotient = numerator / denominator;
  const remainder = numerator % denominator;
  return remainder > 0n ? quotient + 1n : quotient;
}

/** Rounds up to the next multiple of `stepMinor` (e.g. 100 for whole dollars). */
export function roundUpToMultiple(amountMinor: number, stepMinor: number): number {
  if (!Number.isSafeInteger(stepMinor) || stepMinor <= 0) {
    throw new DomainInputError("stepMinor", `must be a whole number > 0, got ${stepMinor}`);
  }
  return ceilDiv(requireMinorAmount("amountMinor", amountMinor), stepMinor) * stepMinor;
}

/** Exact decimal text of a minor amount, e.g. 10330 USD → "103.30", 1500 JPY → "1500". */
export function minorToDecimalString(amountMinor: number, currency: CurrencyCode): string {
  requireMinorAmount("amountMinor", amountMinor);
  const exponent = minorUnitExponent(currency);
  const sign = amountMinor < 0 ? "-" : "";
  const digits = Math.abs(amountMinor).toString().padStart(exponent + 1, "0");
  if (exponent === 0) return sign + digits;
  return `${sign}${digits.slice(0, -exponent)}.${digits.slice(-exponent)}`;
}

export function formatMoney(amountMinor: number, currency: CurrencyCode, locale = "en-US"): string {
  const exponent = minorUnitExponent(currency);
  const format = numberFormat(locale, {
    style: "currency",
    currency,
    minimumFractionDigits: exponent,
    maximumFractionDigits: exponent,
  });
  // A decimal string is formatted exactly, with no binary floating-point step in between.
  return format.format(minorToDecimalString(amountMinor, currency) as `${number}`);
}

/**
 * Reads a typed non-negative decimal ("35", "35.5", "1,234.56") as an integer scaled by 10^places,
 * without floating point; undefined when it is not such a number or has more decimals than places.
 */
export function parseScaledDecimal(text: string, places: number): number | undefined {
  const match = /^(\d+)(?:\.(\d*))?$/.exec(text.trim().replace(/,/g, ""));
  if (!match) return undefined;
  const fraction = match[2] ?? "";
  if (fraction.length > places) return undefined;
  const scaled = Number(match[1]) * 10 ** places + Number(fraction.padEnd(places, "0") || "0");
  return Number.isSafeInteger(scaled) ? scaled : undefined;
}

/** An amount typed in major units, in minor units of the currency (ISO 4217 exponent). */
export function parseMajorAmount(text: string, currency: CurrencyCode): number | undefined {
  return parseScaledDecimal(text, minorUnitExponent(currency));
}

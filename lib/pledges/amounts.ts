import { RuleViolation } from "../rule-violation";
import { formatMoney } from "../format";
import { isCurrencyCode, minorUnitExponent, minorUnitsPerMajor, parseMajorAmount, type CurrencyCode } from "../money";

/*
 * Pledge bounds, per currency, in minor units (ISO 4217 exponents from lib/money.ts).
 *
 * - The lab's own policy (not a standard): at least 5 and at most 1,000 major units for currencies
 *   whose major unit is worth roughly a dollar; zero-decimal currencies whose unit is small get their
 *   own figures. Suggested amounts are 10/25/50/100 on the same scale.
 * - The processor's minimum charge: Stripe's "Minimum and maximum charge amounts" table, from memory
 *   (USD 0.50, EUR 0.50, GBP 0.30, JPY 50, …). A currency missing from that list assumes 50 minor
 *   units, as the local fake does. The pledge minimum is the larger of the two.
 */

type LabPolicy = { minMajor: number; maxMajor: number; suggestedMajor: readonly number[] };

const DEFAULT_POLICY: LabPolicy = { minMajor: 5, maxMajor: 1_000, suggestedMajor: [10, 25, 50, 100] };

// Zero-decimal currencies whose unit is a small fraction of a dollar (lab policy, rounded).
const POLICY_OVERRIDES: Partial<Record<CurrencyCode, LabPolicy>> = {
  JPY: { minMajor: 500, maxMajor: 150_000, suggestedMajor: [1_500, 4_000, 8_000, 15_000] },
  KRW: { minMajor: 5_000, maxMajor: 1_300_000, suggestedMajor: [13_000, 33_000, 65_000, 130_000] },
  ISK: { minMajor: 500, maxMajor: 140_000, suggestedMajor: [1_400, 3_500, 7_000, 14_000] },
  CLP: { minMajor: 5_000, maxMajor: 950_000, suggestedMajor: [10_000, 25_000, 50_000, 100_000] },
};

/** Stripe's published minimum charge, minor units (from memory; see above). */
const PROCESSOR_MINIMUM_MINOR: Partial<Record<CurrencyCode, number>> = {
  USD: 50,
  AUD: 50,
  CAD: 50,
  CHF: 50,
  EUR: 50,
  NZD: 50,
  GBP: 30,
  JPY: 50,
  DKK: 250,
  NOK: 300,
  SEK: 300,
  PLN: 200,
  CZK: 1_500,
  MXN: 1_000,
};
const PROCESSOR_FALLBACK_MINIMUM_MINOR = 50;

export type PledgeBounds = {
  currency: CurrencyCode;
  minMinor: number;
  maxMinor: number;
  /** Minor units, smallest first. */
  suggestedMinor: readonly number[];
};

export function processorMinimumMinor(currency: CurrencyCode): number {
  return PROCESSOR_MINIMUM_MINOR[currency] ?? PROCESSOR_FALLBACK_MINIMUM_MINOR;
}

function requireCurrency(currency: string): CurrencyCode {
  if (!isCurrencyCode(currency)) throw new RuleViolation(422, "unsupported_currency", `Pledges in ${currency} are not supported.`);
  return currency;
}

export function pledgeBounds(currencyText: string): PledgeBounds {
  const currency = requireCurrency(currencyText);
  const policy = POLICY_OVERRIDES[currency] ?? DEFAULT_POLICY;
  const perMajor = minorUnitsPerMajor(currency);
  const minMinor = Math.max(policy.minMajor * perMajor, processorMinimumMinor(currency));
  const maxMinor = policy.maxMajor * perMajor;
  const suggestedMinor = policy.suggestedMajor.map((major) => major * perMajor).filter((minor) => minor >= minMinor && minor <= maxMinor);
  return { currency, minMinor, maxMinor, suggestedMinor };
}

/** "Between $5 and $1,000" — the sentence the form shows beside the amount. */
export function describeBounds(bounds: PledgeBounds): string {
  return `Between ${formatMoney(bounds.minMinor, bounds.currency)} and ${formatMoney(bounds.maxMinor, bounds.currency)}.`;
}

/** The problem with an amount already in minor units, or null when it is within the bounds. */
export function pledgeAmountProblem(amountMinor: number, bounds: PledgeBounds): string | null {
  if (!Number.isSafeInteger(amountMinor)) return "Amount must be a whole number of minor units.";
  if (amountMinor < bounds.minMinor) return `Amount must be at least ${formatMoney(bounds.minMinor, bounds.currency)}.`;
  if (amountMinor > bounds.maxMinor) return `Amount can be at most ${formatMoney(bounds.maxMinor, bounds.currency)}.`;
  return null;
}

export type ParsedAmount = { ok: true; amountMinor: number } | { ok: false; message: string };

/** Reads a typed amount ("25", "25.50", "1,000") in the campaign's currency and checks the bounds. */
export function parsePledgeAmount(text: string, currencyText: string): ParsedAmount {
  const bounds = pledgeBounds(currencyText);
  const trimmed = text.trim();
  if (trimmed === "") return { ok: false, message: "Amount is required: pick one or type it." };
  const exponent = minorUnitExponent(bounds.currency);
  const amountMinor = parseMajorAmount(trimmed, bounds.currency);
  if (amountMinor === undefined) {
    const example = exponent === 0 ? "2500" : `25 or 25.${"5".padEnd(exponent, "0")}`;
    const decimals = exponent === 0 ? "no decimals" : `at most ${exponent} decimal${exponent === 1 ? "" : "s"}`;
    return { ok: false, message: `Amount must be a number such as ${example}, with ${decimals}.` };
  }
  const problem = pledgeAmountProblem(amountMinor, bounds);
  return problem ? { ok: false, message: problem } : { ok: true, amountMinor };
}

/** As parsePledgeAmount, but throws a 422 RuleViolation naming the field `amount`. */
export function requirePledgeAmount(text: string, currency: string): number {
  const parsed = parsePledgeAmount(text, currency);
  if (!parsed.ok) throw new RuleViolation(422, "invalid_amount", parsed.message, "amount");
  return parsed.amountMinor;
}

/** The amount as the form's input shows it: "25", "25.50", "2500" (JPY). */
export function amountInputValue(amountMinor: number, currency: CurrencyCode): string {
  const perMajor = minorUnitsPerMajor(currency);
  if (amountMinor % perMajor === 0) return String(amountMinor / perMajor);
  const exponent = minorUnitExponent(currency);
  return `${Math.floor(amountMinor / perMajor)}.${String(amountMinor % perMajor).padStart(exponent, "0")}`;
}

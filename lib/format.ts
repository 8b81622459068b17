import { formatMoney as formatExactMoney, isCurrencyCode, minorUnitExponent } from "./money";
import { numberFormat, dateTimeFormat } from "./intl-cache";

/** Display form: whole amounts without decimals ("$400"), others exact ("$1,234.56"). */
export function formatMoney(minor: number, currency: string, locale = "en-US"): string {
  if (!isCurrencyCode(currency)) throw new RangeError(`Unsupported currency ${currency}`);
  const perMajor = 10 ** minorUnitExponent(currency);
  if (minor % perMajor !== 0) return formatExactMoney(minor, currency, locale);
  return numberFormat(locale, { style: "currency", currency, maximumFractionDigits: 0 }).format(minor / perMajor);
}

export function formatDate(date: Date, timeZone: string, locale = "en-US"): string {
  return dateTimeFormat(locale, { timeZone, dateStyle: "medium" }).format(date);
}

export function formatDateTime(date: Date, timeZone: string, locale = "en-US"): string {
  return dateTimeFormat(locale, {
    timeZone,
    year: "numeric",
    month: "short",
    day: "numeric",
    hour: "numeric",
    minute: "2-digit",
    timeZoneName: "short",
  }).format(date);
}

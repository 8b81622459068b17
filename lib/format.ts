/** ISO 4217 minor-unit exponent as the platform's Intl data knows it (USD 2, JPY 0, BHD 3). */
export function minorUnitExponent(currency: string): number {
  return new Intl.NumberFormat("en", { style: "currency", currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

export function formatMoney(minor: number, currency: string, locale = "en-US"): string {
  const exponent = minorUnitExponent(currency);
  const whole = Number.isInteger(minor / 10 ** exponent);
  return new Intl.NumberFormat(locale, {
    style: "currency",
    currency,
    minimumFractionDigits: whole ? 0 : exponent,
    maximumFractionDigits: exponent,
  }).format(minor / 10 ** exponent);
}

export function formatDate(date: Date, timeZone: string, locale = "en-US"): string {
  return new Intl.DateTimeFormat(locale, { timeZone, dateStyle: "medium" }).format(date);
}

export function formatDateTime(date: Date, timeZone: string, locale = "en-US"): string {
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    year: "numeric",
    month: "short",
    day: "numeric",
    hour: "numeric",
    minute: "2-digit",
    timeZoneName: "short",
  }).format(date);
}

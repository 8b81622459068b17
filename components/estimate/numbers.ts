/** Number display for the calculator's figures (en-US, like formatMoney). */
export function formatNumber(value: number, maximumFractionDigits = 1, minimumFractionDigits = 0): string {
  return new Intl.NumberFormat("en-US", { maximumFractionDigits, minimumFractionDigits }).format(value);
}

export function formatSignificant(value: number, digits = 3): string {
  return new Intl.NumberFormat("en-US", { maximumSignificantDigits: digits }).format(value);
}

/** Hours as "2.35 h", or minutes when under an hour so small plans stay readable ("42 min"). */
export function formatHours(hours: number): string {
  if (hours > 0 && hours < 1) return `${formatNumber(hours * 60, 0)} min`;
  return `${formatNumber(hours, 2)} h`;
}

import { percentOfMinor } from "../estimate/cost";
import { dateTimeFormat } from "../intl-cache";
import { isCurrencyCode, minorToDecimalString } from "../money";
import { zonedMidnight } from "../time-zone";

/*
 * The host's ledger: every money movement as the ledger table holds it (signed from the lab's
 * point of view), grouped by campaign and by calendar month in the lab's time zone, with the
 * processor's fees as a separate computed allowance — an estimate, since the ledger records what
 * was charged, not what the processor kept.
 */

export const LEDGER_KINDS = ["pledge_payment", "pledge_refund", "membership_payment", "fund_allocation", "fund_release", "processor_fee"] as const;
export type LedgerKind = (typeof LEDGER_KINDS)[number];

export const ledgerKindLabels: Record<LedgerKind, string> = {
  pledge_payment: "Pledge payment",
  pledge_refund: "Pledge refund",
  membership_payment: "Membership payment",
  fund_allocation: "Lab fund → campaign",
  fund_release: "Campaign → lab fund",
  processor_fee: "Processor fee",
};

export type LedgerRow = {
  id: string;
  kind: LedgerKind;
  amountMinor: number;
  currency: string;
  campaignId: string | null;
  campaignTitle: string | null;
  pledgeId: string | null;
  membershipId: string | null;
  memo: string | null;
  externalRef: string;
  occurredAt: Date;
};

/** The lab's card-fee rate (lab_settings: basis points plus a fixed part per charge). */
export type FeeRate = { basisPoints: number; fixedMinor: number };

/** Card charges: the processor takes its fee from each. Refunds do not give the fee back (from memory: Stripe's pricing page). */
const CHARGED_KINDS: readonly LedgerKind[] = ["pledge_payment", "membership_payment"];

/** The estimated processor fee on one ledger row: rate × amount (rounded up) + fixed part, on charges only. */
export function estimatedFeeMinor(row: Pick<LedgerRow, "kind" | "amountMinor">, fee: FeeRate): number {
  if (!CHARGED_KINDS.includes(row.kind) || row.amountMinor <= 0) return 0;
  return percentOfMinor(row.amountMinor, fee.basisPoints) + fee.fixedMinor;
}

/** "2026-03" — the calendar month of an instant on the lab's wall clock. */
export function monthKey(instant: Date, timeZone: string): string {
  const parts = dateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit" }).formatToParts(instant);
  const field = (type: string) => parts.find((part) => part.type === type)?.value ?? "";
  return `${field("year")}-${field("month")}`;
}

const MONTH = /^(\d{4})-(0[1-9]|1[0-2])$/;

export function isMonthKey(value: string): boolean {
  return MONTH.test(value);
}

/** [start, end) instants of the months `from` … `to` inclusive (either may be open) in the lab's zone. */
export function monthRange(from: string | undefined, to: string | undefined, timeZone: string): { start?: Date; end?: Date } {
  const bound = (key: string, next: boolean) => {
    const match = MONTH.exec(key);
    if (!match) throw new RangeError(`Not a month: ${key}`);
    let year = Number(match[1]);
    let month = Number(match[2]) + (next ? 1 : 0);
    if (month === 13) {
      month = 1;
      year++;
    }
    return zonedMidnight(year, month, 1, timeZone);
  };
  return { ...(from ? { start: bound(from, false) } : {}), ...(to ? { end: bound(to, true) } : {}) };
}

/** "2026-03-14 09:05" on the lab's wall clock (24-hour), the way a spreadsheet reads a date-time. */
export function labDateTime(instant: Date, timeZone: string): string {
  const parts = dateTimeFormat("en-CA", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
  }).formatToParts(instant);
  const field = (type: string) => parts.find((part) => part.type === type)?.value ?? "";
  return `${field("year")}-${field("month")}-${field("day")} ${field("hour")}:${field("minute")}`;
}

/**
 * Cash in and out (payments, refunds, fees) apart from lab-fund transfers: an allocation moves money
 * from the fund to a campaign inside the lab, so it is neither income nor spending.
 */
export type LedgerTotal = {
  currency: string;
  /** Cash received: pledge and membership payments. */
  inMinor: number;
  /** Cash paid back or out: refunds and recorded fees (negative). */
  outMinor: number;
  /** inMinor + outMinor. */
  netMinor: number;
  /** Lab-fund money moved to campaigns: allocations less returns (positive = support given). */
  labFundMinor: number;
  estimatedFeesMinor: number;
  movements: number;
};

const TRANSFER_KINDS: readonly LedgerKind[] = ["fund_allocation", "fund_release"];

export type CampaignTotal = LedgerTotal & { campaignId: string | null; campaignTitle: string | null };
export type MonthTotal = LedgerTotal & { month: string };

function emptyTotal(currency: string): LedgerTotal {
  return { currency, inMinor: 0, outMinor: 0, netMinor: 0, labFundMinor: 0, estimatedFeesMinor: 0, movements: 0 };
}

function add(total: LedgerTotal, row: LedgerRow, fee: FeeRate): void {
  if (TRANSFER_KINDS.includes(row.kind)) total.labFundMinor -= row.amountMinor;
  else {
    if (row.amountMinor >= 0) total.inMinor += row.amountMinor;
    else total.outMinor += row.amountMinor;
    total.netMinor += row.amountMinor;
  }
  total.estimatedFeesMinor += estimatedFeeMinor(row, fee);
  total.movements++;
}

/**
 * Totals per campaign (rows without one — membership income — under a null campaign), per month
 * in the lab's zone, and overall; each per currency, since amounts in two currencies never add.
 * Months come newest first; campaigns in the order they first appear.
 */
export function ledgerTotals(rows: readonly LedgerRow[], timeZone: string, fee: FeeRate): { byCampaign: CampaignTotal[]; byMonth: MonthTotal[]; overall: LedgerTotal[] } {
  const campaigns = new Map<string, CampaignTotal>();
  const months = new Map<string, MonthTotal>();
  const overall = new Map<string, LedgerTotal>();
  for (const row of rows) {
    const campaignKey = `${row.campaignId ?? ""}|${row.currency}`;
    let campaign = campaigns.get(campaignKey);
    if (!campaign) campaigns.set(campaignKey, (campaign = { ...emptyTotal(row.currency), campaignId: row.campaignId, campaignTitle: row.campaignTitle }));
    add(campaign, row, fee);

    const month = monthKey(row.occurredAt, timeZone);
    const monthKeyed = `${month}|${row.currency}`;
    let monthTotal = months.get(monthKeyed);
    if (!monthTotal) months.set(monthKeyed, (monthTotal = { ...emptyTotal(row.currency), month }));
    add(monthTotal, row, fee);

    let all = overall.get(row.currency);
    if (!all) overall.set(row.currency, (all = emptyTotal(row.currency)));
    add(all, row, fee);
  }
  const byMonth = [...months.values()].sort((a, b) => b.month.localeCompare(a.month) || a.currency.localeCompare(b.currency));
  return { byCampaign: [...campaigns.values()], byMonth, overall: [...overall.values()] };
}

export const LEDGER_CSV_COLUMNS = [
  "occurred_at_lab_time",
  "occurred_at_utc",
  "kind",
  "amount",
  "currency",
  "estimated_processor_fee",
  "campaign",
  "campaign_id",
  "pledge_id",
  "membership_id",
  "memo",
  "reference",
] as const;

/** One CSV record per row: amounts as exact signed decimals in major units (ISO 4217 exponents). */
export function ledgerCsvRecord(row: LedgerRow, timeZone: string, fee: FeeRate): Record<(typeof LEDGER_CSV_COLUMNS)[number], string> {
  const decimal = (minor: number) => (isCurrencyCode(row.currency) ? minorToDecimalString(minor, row.currency) : String(minor));
  const feeMinor = estimatedFeeMinor(row, fee);
  return {
    occurred_at_lab_time: labDateTime(row.occurredAt, timeZone),
    occurred_at_utc: row.occurredAt.toISOString(),
    kind: row.kind,
    amount: decimal(row.amountMinor),
    currency: row.currency,
    estimated_processor_fee: feeMinor === 0 ? "" : decimal(feeMinor),
    campaign: row.campaignTitle ?? "",
    campaign_id: row.campaignId ?? "",
    pledge_id: row.pledgeId ?? "",
    membership_id: row.membershipId ?? "",
    memo: row.memo ?? "",
    reference: row.externalRef,
  };
}

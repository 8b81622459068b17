import { and, desc, eq, gte, lt } from "drizzle-orm";
import { monthRange, type FeeRate, type LedgerRow } from "../../lib/ledger/summary";
import type { Db } from "../client";
import { campaigns, ledgerEntries } from "../schema";
import { getLabSettings } from "./campaigns";

export type LedgerQuery = { kind?: LedgerRow["kind"]; campaignId?: string; start?: Date; end?: Date };

/** Every ledger movement matching the filters, newest first, with its campaign's title. For hosts only. */
export function listLedger(db: Db, query: LedgerQuery): LedgerRow[] {
  return db
    .select({
      id: ledgerEntries.id,
      kind: ledgerEntries.kind,
      amountMinor: ledgerEntries.amountMinor,
      currency: ledgerEntries.currency,
      campaignId: ledgerEntries.campaignId,
      campaignTitle: campaigns.title,
      pledgeId: ledgerEntries.pledgeId,
      membershipId: ledgerEntries.membershipId,
      memo: ledgerEntries.memo,
      externalRef: ledgerEntries.externalRef,
      occurredAt: ledgerEntries.occurredAt,
    })
    .from(ledgerEntries)
    .leftJoin(campaigns, eq(campaigns.id, ledgerEntries.campaignId))
    .where(
      and(
        query.kind ? eq(ledgerEntries.kind, query.kind) : undefined,
        query.campaignId ? eq(ledgerEntries.campaignId, query.campaignId) : undefined,
        query.start ? gte(ledgerEntries.occurredAt, query.start) : undefined,
        query.end ? lt(ledgerEntries.occurredAt, query.end) : undefined,
      ),
    )
    .orderBy(desc(ledgerEntries.occurredAt), desc(ledgerEntries.id))
    .all();
}

/** Campaigns that have ledger movements, for the filter's list. */
export function listLedgerCampaigns(db: Db) {
  return db
    .selectDistinct({ id: campaigns.id, title: campaigns.title })
    .from(ledgerEntries)
    .innerJoin(campaigns, eq(campaigns.id, ledgerEntries.campaignId))
    .orderBy(campaigns.title)
    .all();
}

/** The ledger page's and the CSV export's one read: the filtered rows with the lab's zone and fee rate. */
export function loadLedgerView(db: Db, filter: { kind?: LedgerRow["kind"]; campaign?: string; from?: string; to?: string }) {
  const settings = getLabSettings(db);
  const range = monthRange(filter.from, filter.to, settings.timeZone);
  const rows = listLedger(db, { kind: filter.kind, campaignId: filter.campaign, ...range });
  const fee: FeeRate = { basisPoints: settings.feeBasisPoints, fixedMinor: settings.feeFixedMinor };
  return { rows, timeZone: settings.timeZone, fee, labCurrency: settings.currency };
}

import { stringify } from "csv-stringify/sync";
import { LEDGER_CSV_COLUMNS, ledgerCsvRecord, type FeeRate, type LedgerRow } from "./summary";

/**
 * The ledger as CSV (RFC 4180 quoting by csv-stringify): a header row, then one record per
 * movement in the order given. CRLF line ends, as RFC 4180 specifies and spreadsheets expect.
 */
export function ledgerCsv(rows: readonly LedgerRow[], timeZone: string, fee: FeeRate): string {
  return stringify(
    rows.map((row) => ledgerCsvRecord(row, timeZone, fee)),
    { header: true, columns: [...LEDGER_CSV_COLUMNS], record_delimiter: "windows" },
  );
}

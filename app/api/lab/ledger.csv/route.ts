import { getDb } from "@/db";
import { loadLedgerView } from "@/db/queries/ledger";
import { ledgerCsv } from "@/lib/ledger/csv";
import { ledgerFilterSchema } from "@/lib/validation/ledger";
import { apiRoute, parseSearchParams } from "@/server/api-route";

export const dynamic = "force-dynamic";

/** GET /api/lab/ledger.csv?kind=&campaign=&from=YYYY-MM&to=YYYY-MM — the ledger page's rows as CSV, hosts only. */
export const GET = apiRoute({ role: "host" }, async ({ request }) => {
  const filter = parseSearchParams(request, ledgerFilterSchema);
  const { rows, timeZone, fee } = loadLedgerView(getDb(), filter);
  const name = ["proofbay-ledger", filter.from, filter.to].filter(Boolean).join("-");
  return new Response(ledgerCsv(rows, timeZone, fee), {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${name}.csv"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
});

import { getDb } from "@/db";
import { cachedLabRates, printerProfile } from "@/db/queries/pricing";
import { calculatorSummary, estimateForCalculator } from "@/lib/estimate/calculator";
import { estimateRequestSchema } from "@/lib/validation/estimate";
import { apiRoute, parseJsonBody } from "@/server/api-route";
import { HttpError } from "@/server/http-error";

/** Public: prices a test plan from filament amounts and a protocol on one of the lab's printers. */
export const POST = apiRoute({ role: "visitor" }, async ({ request }) => {
  const input = await parseJsonBody(request, estimateRequestSchema);
  const { pricing, printers } = cachedLabRates(getDb());
  const printer = input.printerSlug
    ? printers.find((candidate) => candidate.slug === input.printerSlug)
    : (printers.find((candidate) => candidate.status === "available" && candidate.materials.includes(input.material)) ?? printers[0]);
  if (!printer) {
    throw new HttpError(422, "invalid_input", "No such printer in the lab.", { printerSlug: `Pick one of: ${printers.map((p) => p.slug).join(", ")}` });
  }
  if (!printer.materials.includes(input.material)) {
    throw new HttpError(422, "invalid_input", `${printer.name} does not print ${input.material}.`, {
      material: `${printer.name} prints ${printer.materials.join(", ")}.`,
    });
  }
  return calculatorSummary(estimateForCalculator(input, printerProfile(printer), pricing));
});

import { asc, eq } from "drizzle-orm";
import { estimateTestPlan, type PlanPricing, type PlanPrinter, type TestPlanEstimate, type TestPlanInput } from "@/lib/estimate/plan";
import { isMaterialId, type MaterialId } from "@/lib/estimate/materials";
import { isCurrencyCode } from "@/lib/money";
import type { Db } from "../client";
import {
  filamentPrices,
  labSettings,
  printers,
  testPlanPieces,
  testPlans,
  testPlanVariants,
  type LabSettings,
  type Printer,
  type TestPlan,
  type TestPlanPiece,
  type TestPlanVariant,
} from "../schema";

export function printerProfile(printer: Printer): PlanPrinter {
  return {
    id: printer.id,
    name: printer.name,
    maxVolumetricFlowMm3PerS: printer.maxFlowMm3PerS,
    efficiency: printer.efficiency,
    heatUpMinutes: printer.heatUpMinutes,
    changeoverMinutes: printer.changeoverMinutes,
    handlingMinutesPerJob: printer.handlingMinutesPerJob,
    hourlyRateMinor: printer.hourlyRateMinor,
  };
}

/** The lab's rates in the shape the estimation engine takes. */
export function labPricing(
  settings: Pick<LabSettings, "currency" | "labourRateMinorPerHour" | "planLabourHours" | "contingencyPercent" | "feeBasisPoints" | "feeFixedMinor">,
  prices: { material: string; pricePerKgMinor: number }[]): PlanPricing {
  if (!isCurrencyCode(settings.currency)) throw new Error(`Lab currency ${settings.currency} is not supported`);
  const filamentPricePerKgMinor: Partial<Record<MaterialId, number>> = {};
  for (const price of prices) if (isMaterialId(price.material)) filamentPricePerKgMinor[price.material] = price.pricePerKgMinor;
  return {
    currency: settings.currency,
    filamentPricePerKgMinor,
    labourRatePerHourMinor: settings.labourRateMinorPerHour,
    extraLabourHours: settings.planLabourHours,
    contingencyBasisPoints: settings.contingencyPercent * 100,
    paymentFee: { rateBasisPoints: settings.feeBasisPoints, fixedMinor: settings.feeFixedMinor, currency: settings.currency },
  };
}

export function loadPricing(db: Db): PlanPricing {
  const settings = db.select().from(labSettings).where(eq(labSettings.id, 1)).get();
  if (!settings) throw new Error("Lab settings are missing: run `npm run db:seed` or create them as an admin.");
  return labPricing(settings, db.select().from(filamentPrices).all());
}

export function listPrinters(db: Db): Printer[] {
  return db.select().from(printers).orderBy(asc(printers.name)).all();
}

type PlanRow = Pick<TestPlan, "material" | "layerHeightMm" | "maxFlowMm3PerS" | "fanPercent" | "repeats">;

/** A stored test plan in the estimation engine's terms; jobs run variant by variant. */
export function testPlanInput(
  plan: PlanRow,
  pieces: readonly Pick<TestPlanPiece, "id" | "name" | "filamentGrams">[],
  variants: readonly Pick<TestPlanVariant, "id" | "name" | "isReference">[],
  printer: PlanPrinter,
  pricing: PlanPricing,
): TestPlanInput {
  if (!isMaterialId(plan.material)) throw new Error(`Unknown material ${plan.material}`);
  return {
    pieces: pieces.map(({ id, name, filamentGrams }) => ({ id, name, filamentGrams })),
    variants: variants.map(({ id, name, isReference }) => ({ id, name, role: isReference ? "reference" : "under_test" })),
    repeats: plan.repeats,
    protocol: {
      material: plan.material,
      layerHeightMm: plan.layerHeightMm,
      maxVolumetricFlowMm3PerS: plan.maxFlowMm3PerS,
      fanPercent: plan.fanPercent,
    },
    printer,
    pricing,
  };
}

/** Prices a campaign's stored plan at the lab's current rates; undefined without a plan or printer. */
export function estimateCampaignPlan(db: Db, campaignId: string): TestPlanEstimate | undefined {
  const plan = db.select().from(testPlans).where(eq(testPlans.campaignId, campaignId)).get();
  if (!plan?.printerId) return undefined;
  const printer = db.select().from(printers).where(eq(printers.id, plan.printerId)).get();
  if (!printer) return undefined;
  const pieces = db.select().from(testPlanPieces).where(eq(testPlanPieces.testPlanId, plan.id)).orderBy(asc(testPlanPieces.position)).all();
  const variants = db
    .select()
    .from(testPlanVariants)
    .where(eq(testPlanVariants.testPlanId, plan.id))
    .orderBy(asc(testPlanVariants.position))
    .all();
  return estimateTestPlan(testPlanInput(plan, pieces, variants, printerProfile(printer), loadPricing(db)));
}

export type LabRates = { pricing: PlanPricing; printers: Printer[] };

/** Another process (a seed, a second app instance) may change rates; this bounds how stale they get. */
const RATES_TTL_MS = 5_000;
const ratesCache = new WeakMap<Db, { rates: LabRates; loadedAt: number }>();

/**
 * Rates and printers for the estimate API, which is hot: read once every few seconds instead of
 * on each request. Saving settings in this process forgets the cache at once.
 */
export function cachedLabRates(db: Db, now = Date.now()): LabRates {
  const cached = ratesCache.get(db);
  if (cached && now - cached.loadedAt < RATES_TTL_MS) return cached.rates;
  const rates = { pricing: loadPricing(db), printers: listPrinters(db) };
  ratesCache.set(db, { rates, loadedAt: now });
  return rates;
}

export function forgetCachedLabRates(db: Db): void {
  ratesCache.delete(db);
}

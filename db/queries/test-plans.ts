import { eq, inArray } from "drizzle-orm";
import { deadlineInstant, deadlineProblem } from "@/lib/campaign/deadline";
import { campaignSlugBase, firstFreeSlug } from "@/lib/campaign/plan-pieces";
import { averageFlowMm3PerS } from "@/lib/estimate/print-time";
import { estimateTestPlan, type PlanPricing, type TestPlanEstimate } from "@/lib/estimate/plan";
import { isCurrencyCode, parseMajorAmount } from "@/lib/money";
import { RuleViolation } from "@/lib/rule-violation";
import { DEADLINE_MAX_DAYS, DEADLINE_MIN_DAYS, type PublishTestPlanInput, type TestPlanDraft } from "@/lib/validation/test-plan";
import type { Db } from "../client";
import {
  campaigns,
  filamentPrices,
  labSettings,
  printers,
  proposals,
  testPieces,
  testPlanPieces,
  testPlans,
  testPlanVariants,
  type Campaign,
  type Printer,
  type TestPiece,
} from "../schema";
import { labPricing, printerProfile, testPlanInput } from "./pricing";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
const immediate = { behavior: "immediate" } as const;

export type ResolvedPlan = {
  printer: Printer;
  pieces: { id: string; name: string; filamentGrams: number; libraryPieceId: string }[];
  variants: { id: string; name: string; isReference: boolean }[];
};

/**
 * Checks an edited plan against the lab: the printer exists and prints the material, every piece
 * is an active library piece. Errors name the form field they belong to.
 */
export function resolvePlan(plan: TestPlanDraft, labPrinters: readonly Printer[], library: ReadonlyMap<string, TestPiece>): ResolvedPlan {
  const printer = labPrinters.find((candidate) => candidate.id === plan.printerId);
  if (!printer) throw new RuleViolation(422, "unknown_printer", "No such printer in the lab.", "printerId");
  if (!printer.materials.includes(plan.material)) {
    throw new RuleViolation(
      422,
      "material_not_printable",
      `${printer.name} does not print ${plan.material}; it prints ${printer.materials.join(", ")}.`,
      "material",
    );
  }
  const pieces = plan.pieces.map((piece, index) => {
    const found = library.get(piece.libraryPieceId);
    if (!found || !found.active) {
      throw new RuleViolation(422, "unknown_piece", "This piece is not in the library (or was deactivated).", `pieces.${index}.libraryPieceId`);
    }
    return { id: `piece-${index + 1}`, name: found.name, filamentGrams: piece.filamentGrams, libraryPieceId: found.id };
  });
  const variants = plan.variants.map((variant, index) => ({ id: `variant-${index + 1}`, name: variant.name, isReference: index === 0 }));
  return { printer, pieces, variants };
}

/** The estimation engine on a resolved plan: the same call `estimateCampaignPlan` makes on stored rows. */
export function estimateResolvedPlan(plan: TestPlanDraft, resolved: ResolvedPlan, pricing: PlanPricing): TestPlanEstimate {
  return estimateTestPlan(testPlanInput(plan, resolved.pieces, resolved.variants, printerProfile(resolved.printer), pricing));
}

export function loadLibraryPieces(db: Db | Tx, ids: readonly string[]): Map<string, TestPiece> {
  if (ids.length === 0) return new Map();
  const rows = db.select().from(testPieces).where(inArray(testPieces.id, [...new Set(ids)])).all();
  return new Map(rows.map((piece) => [piece.id, piece]));
}

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places;

/** What the plan editor shows while the host edits: cost lines, hours, jobs, filament. */
export type PlanEstimateSummary = {
  jobs: number;
  variantSwitches: number;
  filamentGrams: number;
  filamentMetres: number;
  hours: { extrusion: number; heatUp: number; changeover: number; handling: number; machine: number; labour: number; total: number };
  printer: { id: string; name: string; averageFlowMm3PerS: number };
  cost: { currency: string; lines: { kind: string; label: string; quantity: string; amountMinor: number }[]; subtotalMinor: number; totalMinor: number };
};

export function planEstimateSummary(estimate: TestPlanEstimate, plan: TestPlanDraft, printer: Printer): PlanEstimateSummary {
  const hours = (minutes: number) => round(minutes / 60, 3);
  return {
    jobs: estimate.jobs.length,
    variantSwitches: estimate.variantSwitches,
    filamentGrams: round(estimate.filamentGrams, 1),
    filamentMetres: round(estimate.filamentMetres, 2),
    hours: {
      extrusion: hours(estimate.time.extrusionMinutes),
      heatUp: hours(estimate.time.heatUpMinutes),
      changeover: hours(estimate.time.changeoverMinutes),
      handling: hours(estimate.time.handlingMinutes),
      machine: round(estimate.machineHours, 3),
      labour: round(estimate.labourHours, 3),
      total: hours(estimate.time.totalMinutes),
    },
    printer: {
      id: printer.id,
      name: printer.name,
      averageFlowMm3PerS: round(averageFlowMm3PerS(Math.min(printer.maxFlowMm3PerS, plan.maxFlowMm3PerS), printer.efficiency), 2),
    },
    cost: {
      currency: estimate.cost.currency,
      lines: estimate.cost.lines.map(({ kind, label, quantity, amountMinor }) => ({ kind, label, quantity, amountMinor })),
      subtotalMinor: estimate.cost.subtotalMinor,
      totalMinor: estimate.cost.totalMinor,
    },
  };
}

/* ---------- Publishing ---------- */

export type PublishResult = { campaign: Pick<Campaign, "id" | "slug" | "goalMinor" | "currency">; created: boolean };

/**
 * Publishes an accepted proposal's test plan: the campaign (open), its test plan, pieces and
 * variants in one IMMEDIATE transaction, priced at the lab's current rates. A proposal gets one
 * campaign: publishing again (a double click, a second tab) answers the campaign that exists.
 */
export function publishTestPlan(
  db: Db,
  proposalId: string,
  input: PublishTestPlanInput,
  options: { hostId: string; now?: Date },
): PublishResult {
  const now = options.now ?? new Date();
  return db.transaction((tx) => {
    const proposal = tx.select({ id: proposals.id, state: proposals.state }).from(proposals).where(eq(proposals.id, proposalId)).get();
    if (!proposal) throw new RuleViolation(404, "not_found", "No such proposal.");
    const existing = tx
      .select({ id: campaigns.id, slug: campaigns.slug, goalMinor: campaigns.goalMinor, currency: campaigns.currency })
      .from(campaigns)
      .where(eq(campaigns.proposalId, proposalId))
      .get();
    if (existing) return { campaign: existing, created: false };
    if (proposal.state !== "accepted") {
      throw new RuleViolation(409, "not_accepted", `This proposal is ${proposal.state}; only accepted proposals get a test plan.`);
    }

    const settings = tx.select().from(labSettings).where(eq(labSettings.id, 1)).get();
    if (!settings || !isCurrencyCode(settings.currency)) throw new Error("Lab settings are missing or have an unsupported currency.");
    const pricing = labPricing(settings, tx.select().from(filamentPrices).all());
    const resolved = resolvePlan(input, tx.select().from(printers).all(), loadLibraryPieces(tx, input.pieces.map((piece) => piece.libraryPieceId)));
    const estimate = estimateResolvedPlan(input, resolved, pricing);

    const deadlineIssue = deadlineProblem(input.deadline, now, settings.timeZone, DEADLINE_MIN_DAYS, DEADLINE_MAX_DAYS);
    if (deadlineIssue) throw new RuleViolation(422, "bad_deadline", deadlineIssue, "deadline");

    let goalMinor = estimate.cost.totalMinor;
    let goalOverrideReason: string | null = null;
    if (input.goalOverride !== undefined) {
      const override = parseMajorAmount(input.goalOverride, settings.currency);
      if (override === undefined || override <= 0) {
        throw new RuleViolation(422, "bad_goal", `Enter the goal as an amount in ${settings.currency}, like 450.00.`, "goalOverride");
      }
      const reason = input.goalOverrideReason?.trim() ?? "";
      if (reason.length < 10) {
        throw new RuleViolation(422, "override_reason_required", "A goal set by hand needs a reason (10+ characters); backers see it.", "goalOverrideReason");
      }
      goalMinor = override;
      goalOverrideReason = reason;
    }

    const slug = firstFreeSlug(campaignSlugBase(input.title), (candidate) =>
      Boolean(tx.select({ id: campaigns.id }).from(campaigns).where(eq(campaigns.slug, candidate)).get()),
    );
    const campaignId = crypto.randomUUID();
    tx.insert(campaigns)
      .values({
        id: campaignId,
        slug,
        proposalId,
        title: input.title,
        summary: input.summary,
        state: "open",
        goalMinor,
        currency: settings.currency,
        goalOverrideReason,
        deadline: deadlineInstant(input.deadline, settings.timeZone),
        openedAt: now,
        hostId: options.hostId,
        createdAt: now,
      })
      .run();
    const planId = crypto.randomUUID();
    tx.insert(testPlans)
      .values({
        id: planId,
        campaignId,
        material: input.material,
        layerHeightMm: input.layerHeightMm,
        maxFlowMm3PerS: input.maxFlowMm3PerS,
        fanPercent: input.fanPercent,
        repeats: input.repeats,
        printerId: resolved.printer.id,
        estimatedHours: round(estimate.time.totalMinutes / 60, 1),
      })
      .run();
    tx.insert(testPlanPieces)
      .values(
        resolved.pieces.map((piece, index) => ({
          testPlanId: planId,
          name: piece.name,
          filamentGrams: piece.filamentGrams,
          libraryPieceId: piece.libraryPieceId,
          position: index + 1,
        })),
      )
      .run();
    tx.insert(testPlanVariants)
      .values(resolved.variants.map((variant, index) => ({ testPlanId: planId, name: variant.name, isReference: variant.isReference, position: index + 1 })))
      .run();
    return { campaign: { id: campaignId, slug, goalMinor, currency: settings.currency }, created: true };
  }, immediate);
}

/** The campaign an accepted proposal became, if it was published. */
export function campaignForProposal(db: Db, proposalId: string) {
  return db.select({ id: campaigns.id, slug: campaigns.slug, title: campaigns.title }).from(campaigns).where(eq(campaigns.proposalId, proposalId)).get();
}

import { eq } from "drizzle-orm";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { getLabSettings } from "@/db/queries/campaigns";
import { estimateCampaignPlan } from "@/db/queries/pricing";
import { acceptProposal, createProposal } from "@/db/queries/proposal-commands";
import { createTestPiece, setTestPieceActive } from "@/db/queries/test-pieces";
import { publishTestPlan } from "@/db/queries/test-plans";
import { seedDemo } from "@/db/seed";
import { campaigns, printers, testPieces, testPlanPieces, testPlans, testPlanVariants, users } from "@/db/schema";
import { addCalendarDays, calendarDateInZone } from "@/lib/campaign/deadline";
import { formatDateTime } from "@/lib/format";
import { RuleViolation } from "@/lib/rule-violation";
import { publishTestPlanSchema, type PublishTestPlanInput } from "@/lib/validation/test-plan";
import type { Viewer } from "@/server/auth";
import { createTempDb } from "../helpers/temp-db";

const session = vi.hoisted(() => ({ viewer: null as Viewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => session.viewer,
  auth: async () => (session.viewer ? { user: session.viewer } : null),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;

type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
let POST: Handler;
let publishAction: typeof import("@/app/lab/proposals/[id]/plan/actions").publishTestPlanAction;
beforeAll(async () => {
  ({ POST } = (await import("@/app/api/lab/test-plans/estimate/route")) as unknown as { POST: Handler });
  ({ publishTestPlanAction: publishAction } = await import("@/app/lab/proposals/[id]/plan/actions"));
});
afterAll(() => temp.cleanup());

const appUrl = "http://localhost:3000";
const userByEmail = (email: string) => temp.db.select().from(users).where(eq(users.email, email)).get()!;
const host = userByEmail("host@harbor-street.example");
const supporter = userByEmail("supporter@harbor-street.example");
const asViewer = (user: typeof host): Viewer => ({ id: user.id, email: user.email ?? "", name: user.name, role: user.role });
const printerBySlug = (slug: string) => temp.db.select().from(printers).where(eq(printers.slug, slug)).get()!;
const pieceBySlug = (slug: string) => temp.db.select().from(testPieces).where(eq(testPieces.slug, slug)).get()!;
const { timeZone } = getLabSettings(temp.db);
const today = calendarDateInZone(new Date(), timeZone);

let counter = 0;
function acceptedProposal(extra: Record<string, unknown> = {}) {
  counter++;
  const proposal = createProposal(
    temp.db,
    userByEmail("ines.varga@backers.example").id,
    {
      title: `Purge bucket flap design ${counter}`,
      kind: "part",
      printerType: "corexy",
      why: "The flap sticks and drops purge blobs on the bed; a better one would stop that.",
      descriptionMd: "",
      uploadIds: [],
      ...extra,
    } as Parameters<typeof createProposal>[2],
    { submit: true },
  );
  acceptProposal(temp.db, proposal.id, { appUrl, safetyNote: "Enclosed printer, filtered and ventilated; attended." });
  return proposal;
}

function planInput(overrides: Partial<PublishTestPlanInput> = {}): PublishTestPlanInput {
  return publishTestPlanSchema.parse({
    printerId: printerBySlug("bay-1-kestrel").id,
    material: "PLA",
    layerHeightMm: 0.2,
    maxFlowMm3PerS: 24,
    fanPercent: 100,
    repeats: 2,
    pieces: [
      { libraryPieceId: pieceBySlug("overhang-ladder").id, filamentGrams: 18 },
      { libraryPieceId: pieceBySlug("bridge-span-set").id, filamentGrams: 14.5 },
    ],
    variants: [{ name: "Stock part" }, { name: "Flap, short hinge" }, { name: "Flap, long hinge" }],
    title: "Purge bucket flaps against the stock one",
    summary: "Two printed purge-bucket flaps against the stock one: overhangs and bridges printed after each purge.",
    deadline: addCalendarDays(today, 14),
    ...overrides,
  });
}

function refusal(run: () => unknown): RuleViolation {
  try {
    run();
  } catch (error) {
    if (error instanceof RuleViolation) return error;
    throw error;
  }
  throw new Error("expected a refusal");
}

async function estimate(body: unknown) {
  const response = await POST(new Request("http://localhost/api/lab/test-plans/estimate", { method: "POST", body: JSON.stringify(body) }), {
    params: Promise.resolve({}),
  });
  return { status: response.status, body: await response.json() };
}

describe("publishing a test plan", () => {
  it("creates one open campaign whose goal equals the stored plan's estimate (estimateCampaignPlan)", () => {
    const proposal = acceptedProposal();
    const input = planInput();
    const { campaign, created } = publishTestPlan(temp.db, proposal.id, input, { hostId: host.id });
    expect(created).toBe(true);
    const stored = temp.db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()!;
    expect(stored).toMatchObject({ state: "open", proposalId: proposal.id, hostId: host.id, goalOverrideReason: null, currency: "USD" });
    const recomputed = estimateCampaignPlan(temp.db, campaign.id);
    expect(recomputed?.cost.totalMinor).toBe(stored.goalMinor);
    // 2 pieces × 3 variants × 2 repeats = 12 jobs (the plan's own arithmetic).
    expect(recomputed?.jobs).toHaveLength(12);

    const plan = temp.db.select().from(testPlans).where(eq(testPlans.campaignId, campaign.id)).get()!;
    expect(plan).toMatchObject({ material: "PLA", repeats: 2, maxFlowMm3PerS: 24, printerId: input.printerId });
    const pieces = temp.db.select().from(testPlanPieces).where(eq(testPlanPieces.testPlanId, plan.id)).all();
    expect(pieces.map((piece) => [piece.name, piece.filamentGrams, piece.libraryPieceId, piece.position])).toEqual([
      ["Overhang ladder (5°/10°/15°)", 18, pieceBySlug("overhang-ladder").id, 1],
      ["Bridge span set", 14.5, pieceBySlug("bridge-span-set").id, 2],
    ]);
    const variants = temp.db.select().from(testPlanVariants).where(eq(testPlanVariants.testPlanId, plan.id)).all();
    expect(variants.map((variant) => [variant.name, variant.isReference])).toEqual([
      ["Stock part", true],
      ["Flap, short hinge", false],
      ["Flap, long hinge", false],
    ]);
    // The deadline date closes at the end of that day on the lab's wall clock (America/Chicago in the seed).
    expect(formatDateTime(stored.deadline, timeZone)).toMatch(/11:59 PM C[DS]T$/);
    expect(calendarDateInZone(stored.deadline, timeZone)).toBe(input.deadline);
  });

  it("the editor's live estimate (POST /api/lab/test-plans/estimate) shows the goal that publishing stores", async () => {
    session.viewer = asViewer(host);
    const proposal = acceptedProposal();
    const input = planInput({ repeats: 3 });
    const { status, body } = await estimate(input);
    expect(status).toBe(200);
    expect(body.jobs).toBe(2 * 3 * 3);
    expect(body.cost.lines.reduce((sum: number, line: { amountMinor: number }) => sum + line.amountMinor, 0)).toBe(body.cost.totalMinor);
    const { campaign } = publishTestPlan(temp.db, proposal.id, input, { hostId: host.id });
    expect(campaign.goalMinor).toBe(body.cost.totalMinor);
  });

  it("publishing twice answers the same campaign and creates no second one", async () => {
    const proposal = acceptedProposal();
    const first = publishTestPlan(temp.db, proposal.id, planInput(), { hostId: host.id });
    const second = publishTestPlan(temp.db, proposal.id, planInput({ title: "A different title this time" }), { hostId: host.id });
    expect(second).toEqual({ campaign: first.campaign, created: false });
    // Through the server action too, as a double click would.
    session.viewer = asViewer(host);
    const [a, b] = await Promise.all([publishAction(proposal.id, planInput()), publishAction(proposal.id, planInput())]);
    expect(a).toMatchObject({ ok: true, data: { slug: first.campaign.slug, created: false } });
    expect(b).toEqual(a);
    expect(temp.db.select().from(campaigns).where(eq(campaigns.proposalId, proposal.id)).all()).toHaveLength(1);
  });

  it("a goal set by hand needs a reason, which is stored for backers", () => {
    const withoutReason = publishTestPlanSchema.safeParse({ ...planInput(), goalOverride: "450" });
    expect(withoutReason.success).toBe(false);
    expect(withoutReason.error?.issues.map((issue) => issue.path.join("."))).toContain("goalOverrideReason");

    const proposal = acceptedProposal();
    const refused = refusal(() => publishTestPlan(temp.db, proposal.id, { ...planInput(), goalOverride: "450", goalOverrideReason: undefined }, { hostId: host.id }));
    expect(refused).toMatchObject({ status: 422, field: "goalOverrideReason" });
    expect(temp.db.select().from(campaigns).where(eq(campaigns.proposalId, proposal.id)).all()).toHaveLength(0);

    const reason = "The lab adds a spare flap of each design in case one breaks during handling.";
    const { campaign } = publishTestPlan(temp.db, proposal.id, planInput({ goalOverride: "450.00", goalOverrideReason: reason }), { hostId: host.id });
    // 450.00 USD = 45,000 cents (ISO 4217: USD has 2 minor digits).
    expect(temp.db.select().from(campaigns).where(eq(campaigns.id, campaign.id)).get()).toMatchObject({ goalMinor: 45_000, goalOverrideReason: reason });
  });

  it("refuses a printer that cannot print the material, naming the material field", async () => {
    const proposal = acceptedProposal({ kind: "material", material: "ASA" });
    // The seeded Wren prints PLA, PETG and TPU only.
    const input = planInput({ printerId: printerBySlug("bay-2-wren").id, material: "ASA" });
    const refused = refusal(() => publishTestPlan(temp.db, proposal.id, input, { hostId: host.id }));
    expect(refused).toMatchObject({ status: 422, code: "material_not_printable", field: "material" });
    expect(refused.message).toContain("PLA, PETG, TPU");
    expect(temp.db.select().from(campaigns).where(eq(campaigns.proposalId, proposal.id)).all()).toHaveLength(0);

    session.viewer = asViewer(host);
    const live = await estimate(input);
    expect(live.status).toBe(422);
    expect(live.body.error.fields).toHaveProperty("material");
    // The enclosed Heron prints ASA.
    expect((await estimate({ ...input, printerId: printerBySlug("bay-3-heron").id })).status).toBe(200);
  });

  it("keeps the deadline 3 to 90 days ahead in the lab's time zone", () => {
    const proposal = acceptedProposal();
    for (const days of [2, 91]) {
      const refused = refusal(() => publishTestPlan(temp.db, proposal.id, planInput({ deadline: addCalendarDays(today, days) }), { hostId: host.id }));
      expect(refused).toMatchObject({ status: 422, field: "deadline" });
    }
    expect(publishTestPlan(temp.db, proposal.id, planInput({ deadline: addCalendarDays(today, 90) }), { hostId: host.id }).created).toBe(true);
  });

  it("refuses pieces that left the library, proposals not accepted, and non-hosts", async () => {
    const piece = createTestPiece(temp.db, { name: "Stringing comb", description: "", filamentGrams: 6, meshUploadId: undefined });
    setTestPieceActive(temp.db, piece.id, false);
    const proposal = acceptedProposal();
    const input = planInput({ pieces: [{ libraryPieceId: piece.id, filamentGrams: 6 }] });
    expect(refusal(() => publishTestPlan(temp.db, proposal.id, input, { hostId: host.id }))).toMatchObject({ status: 422, field: "pieces.0.libraryPieceId" });

    const waiting = createProposal(
      temp.db,
      supporter.id,
      { title: "Not yet accepted proposal", kind: "part", printerType: "corexy", why: "Long enough reason for the test.", descriptionMd: "", uploadIds: [] } as Parameters<typeof createProposal>[2],
      { submit: true },
    );
    expect(refusal(() => publishTestPlan(temp.db, waiting.id, planInput(), { hostId: host.id }))).toMatchObject({ status: 409, code: "not_accepted" });

    session.viewer = asViewer(supporter);
    expect(await publishAction(proposal.id, planInput())).toMatchObject({ ok: false, status: 403 });
    expect((await estimate(planInput())).status).toBe(403);
    session.viewer = null;
    expect((await estimate(planInput())).status).toBe(401);
  });

  it("names invalid plan fields in the estimate's 422", async () => {
    session.viewer = asViewer(host);
    const { status, body } = await estimate({ ...planInput(), repeats: 0, variants: [{ name: "Stock part" }], pieces: [] });
    expect(status).toBe(422);
    expect(Object.keys(body.error.fields)).toEqual(expect.arrayContaining(["repeats", "variants", "pieces"]));
  });
});

beforeEach(() => {
  session.viewer = null;
});

import { eq } from "drizzle-orm";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { insertGeneratedProposals } from "@/bench/triage";
import { acceptProposal, createProposal, declineProposal, mergeProposal, startReview } from "@/db/queries/proposal-commands";
import { listTriagePage } from "@/db/queries/triage";
import { seedDemo } from "@/db/seed";
import { outbox, proposalFollowers, proposals, proposalVotes, users } from "@/db/schema";
import { RuleViolation } from "@/lib/rule-violation";
import { FTS_MAX_TERMS, toFtsMatchQuery, triageQuerySchema, type TriageQueryInput } from "@/lib/validation/triage";
import type { Viewer } from "@/server/auth";
import { createTempDb } from "../helpers/temp-db";

/* The signed-in account each request sees; the real Auth.js is replaced so a test picks the role. */
const session = vi.hoisted(() => ({ viewer: null as Viewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => session.viewer,
  auth: async () => (session.viewer ? { user: session.viewer } : null),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const temp = createTempDb();
seedDemo(temp.db);
insertGeneratedProposals(temp.db, 400, { seed: 7 });
process.env.DATABASE_PATH = temp.file;

type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
let GET: Handler;
let actions: typeof import("@/app/lab/proposals/actions");
beforeAll(async () => {
  ({ GET } = (await import("@/app/api/lab/proposals/route")) as unknown as { GET: Handler });
  actions = await import("@/app/lab/proposals/actions");
});
afterAll(() => temp.cleanup());

const sqlite = temp.db.$client;
const appUrl = "http://localhost:3000";

function userByEmail(email: string) {
  const user = temp.db.select().from(users).where(eq(users.email, email)).get();
  if (!user) throw new Error(`no user ${email}`);
  return user;
}
const host = userByEmail("host@harbor-street.example");
const supporter = userByEmail("supporter@harbor-street.example");
const asViewer = (user: typeof host): Viewer => ({ id: user.id, email: user.email ?? "", name: user.name, role: user.role });

const page = (input: TriageQueryInput) => listTriagePage(temp.db, triageQuerySchema.parse(input));

/** Independent count straight from the rows, in plain SQL. */
function countRows(where: string, ...args: unknown[]): number {
  return (sqlite.prepare(`select count(*) as n from proposal where ${where}`).get(...args) as { n: number }).n;
}

function submitted(title: string, extra: Record<string, unknown> = {}, proposerEmail = "ines.varga@backers.example") {
  return createProposal(
    temp.db,
    userByEmail(proposerEmail).id,
    {
      title,
      kind: "part",
      printerType: "corexy",
      why: "A reason that is long enough to be a real reason.",
      descriptionMd: "",
      uploadIds: [],
      ...extra,
    } as Parameters<typeof createProposal>[2],
    { submit: true },
  );
}

function mailTo(email: string, template: string) {
  return temp.db
    .select()
    .from(outbox)
    .all()
    .filter((message) => message.toAddress === email && message.template === template);
}

describe("FTS5 query sanitising", () => {
  it("quotes every chunk, ANDs them and prefix-matches the last", () => {
    expect(toFtsMatchQuery("ring duct")).toBe('"ring" "duct"*');
    expect(toFtsMatchQuery('title:"x')).toBe('"title:""x"*');
    expect(toFtsMatchQuery("duct OR nozzle")).toBe('"duct" "OR" "nozzle"*');
  });

  it("drops chunks with no letter or digit, and says undefined when nothing is left", () => {
    expect(toFtsMatchQuery("  ")).toBeUndefined();
    expect(toFtsMatchQuery("- * ( ) \"")).toBeUndefined();
    expect(toFtsMatchQuery("* duct")).toBe('"duct"*');
    expect(toFtsMatchQuery(undefined)).toBeUndefined();
  });

  it(`keeps at most ${FTS_MAX_TERMS} terms`, () => {
    const query = toFtsMatchQuery(Array.from({ length: 30 }, (_, i) => `w${i}`).join(" "));
    expect(query?.split(" ")).toHaveLength(FTS_MAX_TERMS);
  });

  it("never lets FTS5 syntax through to the engine, whatever is typed", () => {
    const nasty = ['"', "title:duct", "duct OR", "NEAR(ring duct)", "*", "-duct", "^ring", 'a"b', "(", "AND", "Überhang", "0.6 mm", "{title why}: x", "duct NOT ring"];
    for (const q of nasty) {
      expect(() => page({ state: ["submitted", "accepted", "declined", "merged"], q })).not.toThrow();
    }
  });
});

describe("the triage query", () => {
  it("defaults to submitted proposals, most votes first, 25 a page, with the true total", () => {
    const result = page({});
    expect(result.pageSize).toBe(25);
    expect(result.page).toBe(1);
    expect(result.total).toBe(countRows("state = 'submitted'"));
    expect(result.rows).toHaveLength(Math.min(25, result.total));
    expect(result.rows.every((row) => row.state === "submitted")).toBe(true);
    const votes = result.rows.map((row) => row.voteCount);
    expect(votes).toEqual([...votes].sort((a, b) => b - a));
  });

  it("filters by several states, kind and printer type together", () => {
    const result = page({ state: ["submitted", "declined"], kind: "duct", printerType: "corexy", pageSize: "100" });
    expect(result.total).toBe(countRows("state in ('submitted', 'declined') and kind = 'duct' and printer_type = 'corexy'"));
    expect(result.total).toBeGreaterThan(0);
    for (const row of result.rows) {
      expect(["submitted", "declined"]).toContain(row.state);
      expect(row).toMatchObject({ kind: "duct", printerType: "corexy" });
    }
  });

  it("never lists drafts: the seeded draft is not a state one can ask for", () => {
    expect(triageQuerySchema.safeParse({ state: "draft" }).success).toBe(false);
    const all = page({ state: ["submitted", "accepted", "declined", "merged"], pageSize: "100" });
    expect(all.total).toBe(countRows("state <> 'draft'"));
  });

  it("searches title, why and description, prefix-matching the last word", () => {
    // Seeded: "Twin-inlet ring duct for the Kestrel" (accepted), with "ring" in its title.
    const ring = page({ state: ["accepted"], q: "twin inl" });
    expect(ring.rows.map((row) => row.slug)).toContain("twin-inlet-ring-duct-for-the-kestrel");
    // Words spread over title and description: only the seeded PETG bridging proposal has "Three PETG spools"; "spo" is a prefix.
    expect(page({ state: ["accepted"], q: "three petg spo" }).rows.map((row) => row.slug)).toEqual(["petg-bridging-with-100-percent-fan"]);
    // Words from the why text alone: "buckles" is in the submitted TPU proposal's why.
    expect(page({ q: "buckles" }).rows.map((row) => row.slug)).toEqual(["short-path-tpu-feeding-on-a-bed-slinger"]);
  });

  it("agrees with a plain substring count for a whole word (independent check)", () => {
    const states = ["submitted", "accepted", "declined", "merged"];
    const result = page({ state: states, q: "nozzle", pageSize: "100" });
    const expected = countRows(
      "state <> 'draft' and (lower(title) like '%nozzle%' or lower(why) like '%nozzle%' or lower(description_md) like '%nozzle%')",
    );
    expect(result.total).toBe(expected);
    expect(result.total).toBeGreaterThan(10);
  });

  it("sorts by age: desc is oldest first, asc newest first", () => {
    const oldest = page({ state: ["submitted", "declined"], sort: "age", dir: "desc", pageSize: "50" }).rows.map((row) => row.createdAt);
    expect(oldest).toEqual([...oldest].sort((a, b) => a - b));
    const newest = page({ state: ["submitted", "declined"], sort: "age", dir: "asc", pageSize: "50" }).rows.map((row) => row.createdAt);
    expect(newest).toEqual([...newest].sort((a, b) => b - a));
    const fewest = page({ sort: "votes", dir: "asc", pageSize: "50" }).rows.map((row) => row.voteCount);
    expect(fewest).toEqual([...fewest].sort((a, b) => a - b));
  });

  it("pages through a filter without repeating or skipping a row", () => {
    const filter: TriageQueryInput = { state: ["submitted", "merged"], kind: "nozzle", sort: "votes", dir: "desc" };
    const whole = page({ ...filter, pageSize: "100" });
    expect(whole.total).toBeLessThanOrEqual(100);
    const seen: string[] = [];
    for (let n = 1; n <= Math.ceil(whole.total / 7); n++) seen.push(...page({ ...filter, pageSize: "7", page: String(n) }).rows.map((row) => row.id));
    expect(seen).toEqual(whole.rows.map((row) => row.id));
    expect(new Set(seen).size).toBe(whole.total);
  });

  it("answers the last page for a page past the end", () => {
    const result = page({ page: "999", pageSize: "10" });
    expect(result.page).toBe(Math.max(1, Math.ceil(result.total / 10)));
    expect(result.rows.length).toBeGreaterThan(0);
  });

  it("flags proposals that need a safety note (ASA: strong fume caution)", () => {
    const asa = submitted("ASA warp on long brackets", { kind: "material", material: "ASA" });
    const row = page({ q: "ASA warp long" }).rows.find((candidate) => candidate.id === asa.id);
    expect(row?.needsSafetyNote).toBe(true);
    const pla = submitted("PLA warp on long brackets", { kind: "material", material: "PLA" });
    expect(page({ q: "PLA warp long" }).rows.find((candidate) => candidate.id === pla.id)?.needsSafetyNote).toBe(false);
  });

  it("refuses a page size over 100 and an unknown sort", () => {
    expect(triageQuerySchema.safeParse({ pageSize: "101" }).success).toBe(false);
    expect(triageQuerySchema.safeParse({ sort: "title" }).success).toBe(false);
    expect(triageQuerySchema.parse({ state: "submitted,accepted" }).state).toEqual(["submitted", "accepted"]);
  });
});

describe("GET /api/lab/proposals", () => {
  const get = (query: string) => GET(new Request(`http://localhost/api/lab/proposals${query}`), { params: Promise.resolve({}) });

  beforeEach(() => {
    session.viewer = asViewer(host);
  });

  it("answers a host with a page in the documented shape", async () => {
    const response = await get("?state=submitted&state=accepted&kind=duct&sort=age&dir=desc&pageSize=5");
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(Object.keys(body).sort()).toEqual(["page", "pageSize", "rows", "total"]);
    expect(body.total).toBe(countRows("state in ('submitted', 'accepted') and kind = 'duct'"));
    expect(body.rows).toHaveLength(5);
    expect(Object.keys(body.rows[0]).sort()).toEqual(
      ["createdAt", "id", "kind", "needsSafetyNote", "printerType", "proposerName", "reviewStartedAt", "slug", "state", "submittedAt", "title", "voteCount"].sort(),
    );
    expect(typeof body.rows[0].submittedAt).toBe("number");
  });

  it("searches through the route, with FTS syntax taken as plain text", async () => {
    const body = await (await get(`?state=accepted&q=${encodeURIComponent('twin "inlet')}`)).json();
    expect(body.rows.map((row: { slug: string }) => row.slug)).toContain("twin-inlet-ring-duct-for-the-kestrel");
  });

  it("names bad parameters in a 422", async () => {
    const response = await get("?pageSize=500&state=draft");
    expect(response.status).toBe(422);
    const body = await response.json();
    expect(body.error.code).toBe("invalid_input");
    expect(Object.keys(body.error.fields)).toEqual(expect.arrayContaining(["pageSize", "state.0"]));
  });

  it("refuses a supporter with 403 and a visitor with 401", async () => {
    session.viewer = asViewer(supporter);
    const forbidden = await get("");
    expect(forbidden.status).toBe(403);
    expect((await forbidden.json()).error.code).toBe("forbidden");
    session.viewer = null;
    const anonymous = await get("");
    expect(anonymous.status).toBe(401);
    expect((await anonymous.json()).error.code).toBe("unauthenticated");
  });
});

describe("host decisions", () => {
  it("decline stores the reason and queues one mail to the proposer's address", () => {
    const proposal = temp.db.select().from(proposals).where(eq(proposals.slug, "spring-steel-sheet-texture-and-first-layer-grip")).get();
    if (!proposal) throw new Error("seed changed");
    const reason = "Sheet texture is a finishing choice, not something our print tests measure well.";
    declineProposal(temp.db, proposal.id, reason, { appUrl });
    const mails = mailTo("ingrid.oyelaran@backers.example", "proposal-declined");
    expect(mails).toHaveLength(1);
    expect(mails[0]?.payload).toMatchObject({ reason, proposalTitle: proposal.title });
    expect(mails[0]?.state).toBe("queued");
    expect(() => declineProposal(temp.db, proposal.id, reason, { appUrl })).toThrow(RuleViolation);
  });

  it("accept refuses a heated-styrene test without a safety note (422), then accepts with one and mails", () => {
    const asa = submitted("ASA outdoor bracket fatigue", { kind: "material", material: "ASA" }, "tomasz.lindqvist@backers.example");
    let refusal: unknown;
    try {
      acceptProposal(temp.db, asa.id, { appUrl });
    } catch (error) {
      refusal = error;
    }
    expect(refusal).toBeInstanceOf(RuleViolation);
    expect(refusal).toMatchObject({ status: 422, code: "safety_note_required", field: "safetyNote" });
    expect(temp.db.select().from(proposals).where(eq(proposals.id, asa.id)).get()?.state).toBe("submitted");
    expect(mailTo("tomasz.lindqvist@backers.example", "proposal-accepted")).toHaveLength(0);

    const note = "Enclosed printer with its filter running, room ventilated, nobody at the printer during the run.";
    const accepted = acceptProposal(temp.db, asa.id, { safetyNote: note, appUrl });
    expect(accepted).toMatchObject({ state: "accepted", safetyNote: note });
    expect(mailTo("tomasz.lindqvist@backers.example", "proposal-accepted")).toHaveLength(1);
  });

  it("merge moves votes and followers (someone on both keeps one), marks the duplicate and mails its proposer", () => {
    const target = submitted("Angled wipe brush for the purge line", {}, "aiko.brennan@backers.example");
    const source = submitted("Wipe brush at an angle", {}, "mateo.okonkwo@backers.example");
    const [a, b, c] = ["freya.castellanos@backers.example", "kwame.haugland@backers.example", "leilani.petrov@backers.example"].map(
      (email) => userByEmail(email).id,
    );
    const now = new Date();
    for (const [proposalId, userId] of [[source.id, a], [source.id, b], [target.id, b], [target.id, c]] as const) {
      temp.db.insert(proposalVotes).values({ proposalId, userId: userId!, createdAt: now }).run();
      temp.db.insert(proposalFollowers).values({ proposalId, userId: userId!, createdAt: now }).onConflictDoNothing().run();
    }
    sqlite.prepare("update proposal set vote_count = (select count(*) from proposal_vote where proposal_id = proposal.id) where id in (?, ?)").run(source.id, target.id);

    const merged = mergeProposal(temp.db, source.id, target.id, { appUrl });
    expect(merged).toMatchObject({ state: "merged", mergedIntoId: target.id });
    const votersOf = (id: string) => temp.db.select().from(proposalVotes).where(eq(proposalVotes.proposalId, id)).all().map((vote) => vote.userId).sort();
    expect(votersOf(target.id)).toEqual([a, b, c].sort());
    expect(votersOf(source.id)).toEqual([]);
    expect(temp.db.select().from(proposals).where(eq(proposals.id, target.id)).get()?.voteCount).toBe(3);
    const followers = temp.db.select().from(proposalFollowers).where(eq(proposalFollowers.proposalId, target.id)).all().map((row) => row.userId);
    expect(followers).toEqual(expect.arrayContaining([userByEmail("mateo.okonkwo@backers.example").id, a, b, c]));
    const mails = mailTo("mateo.okonkwo@backers.example", "proposal-merged");
    expect(mails).toHaveLength(1);
    expect(mails[0]?.payload).toMatchObject({ survivorTitle: target.title });
  });

  it("refuses to merge into itself, a declined or a merged proposal with 409", () => {
    const source = submitted("Filament runout sensor placement");
    const declined = submitted("Runout sensor, declined version");
    declineProposal(temp.db, declined.id, "Not something we can measure fairly.", { appUrl });
    const mergedAway = temp.db.select().from(proposals).where(eq(proposals.slug, "ring-duct-with-two-inlets")).get();
    const attempt = (targetId: string) => {
      try {
        mergeProposal(temp.db, source.id, targetId, { appUrl });
      } catch (error) {
        return error;
      }
      return undefined;
    };
    expect(attempt(source.id)).toMatchObject({ status: 409, code: "merge_into_self" });
    expect(attempt(declined.id)).toMatchObject({ status: 409, code: "merge_target_closed" });
    expect(attempt(mergedAway!.id)).toMatchObject({ status: 409, code: "merge_target_closed" });
    expect(temp.db.select().from(proposals).where(eq(proposals.id, source.id)).get()?.state).toBe("submitted");
  });

  it("start review marks only submitted proposals not yet under review", () => {
    const fresh = submitted("Bed probe offset drift with temperature");
    const accepted = temp.db.select().from(proposals).where(eq(proposals.state, "accepted")).get();
    expect(startReview(temp.db, [fresh.id, accepted!.id])).toBe(1);
    expect(temp.db.select().from(proposals).where(eq(proposals.id, fresh.id)).get()?.reviewStartedAt).toBeInstanceOf(Date);
    expect(startReview(temp.db, [fresh.id])).toBe(0);
  });
});

describe("the triage table's server actions", () => {
  beforeEach(() => {
    session.viewer = asViewer(host);
  });

  it("bulk decline declines the waiting ones with one reason, mails each proposer and names what it skipped", async () => {
    const one = submitted("Spam entry number one please ignore", {}, "soren.achterberg@backers.example");
    const two = submitted("Spam entry number two please ignore", {}, "nadia.quispe@backers.example");
    const accepted = temp.db.select().from(proposals).where(eq(proposals.state, "accepted")).get()!;
    const result = await actions.declineSelectedAction({ ids: [one.id, two.id, accepted.id], reason: "Duplicate test entries, not real proposals." });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.data.declined).toBe(2);
    expect(result.data.skipped).toEqual([{ id: accepted.id, message: expect.stringContaining("accepted") }]);
    expect(mailTo("soren.achterberg@backers.example", "proposal-declined")).toHaveLength(1);
    expect(mailTo("nadia.quispe@backers.example", "proposal-declined")).toHaveLength(1);
  });

  it("bulk actions check the role and the reason first", async () => {
    const waiting = submitted("Cable chain strain relief");
    const short = await actions.declineSelectedAction({ ids: [waiting.id], reason: "no" });
    expect(short).toMatchObject({ ok: false, status: 422, fields: { reason: expect.any(String) } });
    session.viewer = asViewer(supporter);
    expect(await actions.startReviewAction({ ids: [waiting.id] })).toMatchObject({ ok: false, status: 403 });
    session.viewer = null;
    expect(await actions.declineSelectedAction({ ids: [waiting.id], reason: "Long enough reason here." })).toMatchObject({ ok: false, status: 401 });
    session.viewer = asViewer(host);
    expect(await actions.startReviewAction({ ids: [waiting.id] })).toMatchObject({ ok: true, data: { started: 1, skipped: 0 } });
  });

  it("a refused merge comes back on the target field, for the picker to show", async () => {
    const waiting = submitted("Hotend sock wear over 100 hours");
    const result = await actions.mergeProposalAction(waiting.id, { targetId: waiting.id });
    expect(result).toMatchObject({ ok: false, status: 409, fields: { targetId: "A proposal cannot be merged into itself." } });
    const accept = await actions.acceptProposalAction(submitted("ABS enclosure temperature map", { kind: "material", material: "ABS" }).id, {});
    expect(accept).toMatchObject({ ok: false, status: 422, fields: { safetyNote: expect.stringContaining("ABS") } });
  });
});

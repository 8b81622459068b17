import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import {
  castVote,
  createProposal,
  detachOwnUploads,
  startReview,
  submitProposal,
  updateProposal,
  voteAllowance,
  voteStatus,
  withdrawVote,
} from "@/db/queries/proposal-commands";
import { getProposalBySlug, listBoardProposals, listProposalsByProposer, votedProposalIds } from "@/db/queries/proposal-reads";
import { seedDemo, seedId } from "@/db/seed";
import { memberships, proposalVotes, uploads, users } from "@/db/schema";
import { RuleViolation } from "@/lib/rule-violation";
import { zonedMidnight } from "@/lib/time-zone";
import { proposalDraftSchema, proposalSubmissionSchema } from "@/lib/validation/proposal";
import { createTempDb } from "../helpers/temp-db";

const temp = createTempDb();
seedDemo(temp.db);
const db = temp.db;
afterAll(() => temp.cleanup());

// Seeded accounts (db/seed-data.ts): Jules is a supporter without a membership, Mina a Reel member
// (8 votes a month), b02 (Tomasz) another supporter without one.
const jules = seedId("user", "supporter");
const mina = seedId("user", "member");
const tomasz = seedId("user", "b02");

const FAR_FUTURE = new Date("2100-01-01T00:00:00Z");

/** A supporter on the Spool plan (3 votes a month, db/seed-data.ts PLANS) whose membership runs until 2100. */
function spoolMember(key: string): string {
  const id = `test-${key}`;
  db.insert(users).values({ id, name: `Spool ${key}`, email: `${key}@spool.example`, role: "supporter" }).run();
  db.insert(memberships)
    .values({ userId: id, planCode: "spool", status: "active", currentPeriodEnd: FAR_FUTURE, startedAt: new Date("2020-01-01T00:00:00Z") })
    .run();
  return id;
}

function violation(run: () => unknown): { status: number; code: string } {
  try {
    run();
  } catch (error) {
    if (error instanceof RuleViolation) return { status: error.status, code: error.code };
    throw error;
  }
  throw new Error("expected a RuleViolation");
}

const draftInput = (title: string) => proposalDraftSchema.parse({ title, kind: "duct", printerType: "corexy" });
const submissionInput = (title: string) =>
  proposalSubmissionSchema.parse({
    title,
    kind: "duct",
    printerType: "corexy",
    why: "A longer nozzle-side lip might stop the far side of the part from curling at speed.",
    descriptionMd: "## Idea\n- one inlet, two outlets",
    ductDetails: {
      inlet: { kind: "rectangle", widthMm: 20, heightMm: 15 },
      outlets: [{ kind: "rectangle", widthMm: 22, heightMm: 3 }],
      fan: { description: "50 mm radial blower", rating: { unit: "cfm", value: 5 } },
    },
  });

let serial = 0;
function submitted(proposerId = jules, now = new Date("2031-01-10T12:00:00Z")) {
  return createProposal(db, proposerId, submissionInput(`Vote target number ${++serial}`), { submit: true, now });
}

describe("proposal drafts and submission", () => {
  it("saves a draft with a working title and submits it once the details are there", () => {
    const created = new Date("2031-01-05T15:00:00Z");
    const draft = createProposal(db, jules, draftInput("Lipped side duct"), { now: created });
    expect(draft).toMatchObject({ state: "draft", slug: "lipped-side-duct", submittedAt: null, proposerId: jules });
    // The draft's empty "why" would not pass the submission rules.
    expect(proposalSubmissionSchema.safeParse({ title: draft.title, kind: "duct", printerType: "corexy" }).success).toBe(false);
    // Nobody votes on a draft.
    expect(violation(() => castVote(db, mina, draft.id))).toEqual({ status: 409, code: "not_votable" });

    const edited = updateProposal(db, jules, draft.id, draftInput("Lipped side duct, v2"), new Date("2031-01-06T15:00:00Z"));
    expect(edited).toMatchObject({ state: "draft", title: "Lipped side duct, v2", slug: "lipped-side-duct" });

    const submittedAt = new Date("2031-01-07T15:00:00Z");
    const sent = submitProposal(db, jules, draft.id, submissionInput("Lipped side duct, v2"), submittedAt);
    expect(sent.state).toBe("submitted");
    expect(sent.submittedAt?.toISOString()).toBe(submittedAt.toISOString());
    expect(sent.ductDetails?.outlets).toHaveLength(1);

    expect(listProposalsByProposer(db, jules).map((row) => row.id)).toContain(draft.id);
    expect(listBoardProposals(db, { sort: "newest" }).map((row) => row.id)).toContain(draft.id);
    // Submitting twice is refused; editing a submitted, unreviewed proposal is still allowed.
    expect(violation(() => submitProposal(db, jules, draft.id, submissionInput("Lipped side duct, v2")))).toEqual({
      status: 409,
      code: "already_submitted",
    });
    expect(updateProposal(db, jules, draft.id, submissionInput("Lipped side duct, v3")).title).toBe("Lipped side duct, v3");
  });

  it("keeps drafts off the public board", () => {
    const draft = createProposal(db, jules, draftInput("Private draft duct"));
    expect(listBoardProposals(db, { sort: "votes" }).some((row) => row.id === draft.id)).toBe(false);
    expect(getProposalBySlug(db, draft.slug)?.proposal.state).toBe("draft");
  });

  it("lets nobody but the proposer edit or submit", () => {
    const draft = createProposal(db, jules, draftInput("Someone else's duct"));
    expect(violation(() => updateProposal(db, tomasz, draft.id, draftInput("Taken over")))).toEqual({ status: 403, code: "forbidden" });
    expect(violation(() => submitProposal(db, tomasz, draft.id, submissionInput("Taken over and sent")))).toEqual({
      status: 403,
      code: "forbidden",
    });
    expect(violation(() => detachOwnUploads(db, tomasz, draft.id, []))).toEqual({ status: 403, code: "forbidden" });
    expect(getProposalBySlug(db, draft.slug)?.proposal.title).toBe("Someone else's duct");
  });

  it("refuses edits once a host has started reviewing", () => {
    const proposal = submitted();
    expect(startReview(db, [proposal.id])).toBe(1);
    expect(violation(() => updateProposal(db, jules, proposal.id, submissionInput("Too late to change")))).toEqual({
      status: 409,
      code: "not_editable",
    });
    expect(violation(() => detachOwnUploads(db, jules, proposal.id, []))).toEqual({ status: 409, code: "not_editable" });
  });

  it("takes the proposer's removed uploads off the proposal and leaves the rest", () => {
    const draft = createProposal(db, jules, draftInput("Duct with photos"));
    const row = (name: string, ownerId: string) => ({
      sha256: name.padEnd(64, "0"),
      kind: "photo" as const,
      mimeType: "image/png",
      sizeBytes: 10,
      originalName: name,
      ownerId,
      proposalId: draft.id,
    });
    const [kept, removed, foreign] = db
      .insert(uploads)
      .values([row("kept", jules), row("removed", jules), row("foreign", tomasz)])
      .returning()
      .all();
    expect(detachOwnUploads(db, jules, draft.id, [kept!.id])).toBe(1);
    const attached = (id: string) => db.select().from(uploads).where(eq(uploads.id, id)).get()?.proposalId;
    expect(attached(kept!.id)).toBe(draft.id);
    expect(attached(removed!.id)).toBeNull();
    // Another person's file is not the proposer's to remove.
    expect(attached(foreign!.id)).toBe(draft.id);
  });
});

describe("votes", () => {
  it("are for Filament Club members only", () => {
    const proposal = submitted();
    expect(violation(() => castVote(db, jules, proposal.id))).toEqual({ status: 403, code: "members_only" });
    expect(voteAllowance(db, jules)).toEqual({ allowance: 0, votesLeft: 0 });
  });

  it("count a member's vote once", () => {
    const proposal = submitted();
    const before = voteAllowance(db, mina);
    const status = castVote(db, mina, proposal.id);
    expect(status).toMatchObject({ proposalId: proposal.id, voteCount: 1, votedByMe: true, allowance: 8 });
    expect(status.votesLeft).toBe(before.votesLeft - 1);
    expect(violation(() => castVote(db, mina, proposal.id))).toEqual({ status: 409, code: "already_voted" });
    expect(voteStatus(db, mina, proposal.id).voteCount).toBe(1);
    expect(votedProposalIds(db, mina, [proposal.id]).has(proposal.id)).toBe(true);
  });

  it("stop at the plan's monthly allowance, and a withdrawn vote comes back", () => {
    const member = spoolMember("allowance");
    const now = new Date("2031-06-15T17:00:00Z");
    const targets = [1, 2, 3, 4].map(() => submitted(jules, new Date("2031-06-01T12:00:00Z")));
    expect(targets.slice(0, 3).map((target) => castVote(db, member, target.id, now).votesLeft)).toEqual([2, 1, 0]);
    expect(violation(() => castVote(db, member, targets[3]!.id, now))).toEqual({ status: 409, code: "no_votes_left" });

    const withdrawn = withdrawVote(db, member, targets[0]!.id, now);
    expect(withdrawn).toMatchObject({ votedByMe: false, voteCount: 0, votesLeft: 1 });
    expect(violation(() => withdrawVote(db, member, targets[0]!.id, now))).toEqual({ status: 409, code: "not_voted" });
    expect(castVote(db, member, targets[3]!.id, now)).toMatchObject({ votedByMe: true, voteCount: 1, votesLeft: 0 });
  });

  it("start again at midnight on the 1st in the lab's time zone, not in UTC", () => {
    const member = spoolMember("boundary");
    // The lab is in America/Chicago (db/seed-data.ts LAB). Central Standard Time is UTC−6 until US
    // daylight time begins on the second Sunday of March (9 March 2031), so 1 March 2031 00:00 there
    // is 06:00 UTC (IANA time zone database).
    const boundary = zonedMidnight(2031, 3, 1, "America/Chicago");
    expect(boundary.toISOString()).toBe("2031-03-01T06:00:00.000Z");
    const minutes = (n: number) => new Date(boundary.getTime() + n * 60_000);
    const targets = [1, 2, 3, 4, 5].map(() => submitted(jules, new Date("2031-02-20T12:00:00Z")));

    // 28 February, 23:00–23:20 in Chicago — already 1 March in UTC.
    for (const [index, target] of targets.slice(0, 3).entries()) castVote(db, member, target.id, minutes(-60 + index * 10));
    expect(violation(() => castVote(db, member, targets[3]!.id, minutes(-1)))).toEqual({ status: 409, code: "no_votes_left" });
    expect(voteAllowance(db, member, minutes(-1)).votesLeft).toBe(0);

    // 1 March, 00:01 in Chicago: a new month and three new votes. Counting in UTC would still see three.
    expect(voteAllowance(db, member, minutes(1)).votesLeft).toBe(3);
    expect(castVote(db, member, targets[3]!.id, minutes(1)).votesLeft).toBe(2);
    expect(castVote(db, member, targets[4]!.id, minutes(2)).votesLeft).toBe(1);
  });
});

/*
 * Real concurrency: separate processes, each with its own connection, vote at the same instant.
 * better-sqlite3 is synchronous, so calls inside one process could never overlap.
 */
describe("concurrent votes", () => {
  const root = process.cwd();
  const dir = mkdtempSync(path.join(os.tmpdir(), "proofbay-vote-race-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const script = path.join(dir, "vote.mts");
  writeFileSync(
    script,
    `import { openDatabase } from ${JSON.stringify(path.join(root, "db/client.ts"))};
import { castVote } from ${JSON.stringify(path.join(root, "db/queries/proposal-commands.ts"))};
const [file, userId, proposalId, startAt] = process.argv.slice(2);
const db = openDatabase(file);
while (Date.now() < Number(startAt)) {}
try {
  const status = castVote(db, userId, proposalId);
  console.log(JSON.stringify({ ok: true, votesLeft: status.votesLeft }));
} catch (error) {
  console.log(JSON.stringify({ ok: false, status: error.status ?? 500, code: error.code ?? String(error) }));
}
`,
  );

  type Outcome = { ok: true; votesLeft: number } | { ok: false; status: number; code: string };
  function race(votes: { userId: string; proposalId: string }[]): Promise<Outcome[]> {
    const startAt = Date.now() + 4000;
    return Promise.all(
      votes.map(
        ({ userId, proposalId }) =>
          new Promise<Outcome>((resolve, reject) => {
            const child = spawn(path.join(root, "node_modules/.bin/tsx"), [script, temp.file, userId, proposalId, String(startAt)], { cwd: root });
            let out = "";
            let err = "";
            child.stdout.on("data", (chunk) => (out += chunk));
            child.stderr.on("data", (chunk) => (err += chunk));
            child.on("close", () => {
              try {
                resolve(JSON.parse(out.trim().split("\n").at(-1) ?? "") as Outcome);
              } catch {
                reject(new Error(`vote process said: ${out} ${err}`));
              }
            });
          }),
      ),
    );
  }

  it("a double vote from two requests at once counts once", async () => {
    const proposal = submitted();
    const outcomes = await race([1, 2, 3, 4].map(() => ({ userId: mina, proposalId: proposal.id })));
    expect(outcomes.filter((outcome) => outcome.ok)).toHaveLength(1);
    expect(outcomes.filter((outcome) => !outcome.ok)).toEqual(Array(3).fill({ ok: false, status: 409, code: "already_voted" }));
    const rows = db
      .select()
      .from(proposalVotes)
      .where(and(eq(proposalVotes.proposalId, proposal.id), eq(proposalVotes.userId, mina)))
      .all();
    expect(rows).toHaveLength(1);
    expect(voteStatus(db, mina, proposal.id).voteCount).toBe(1);
  }, 30_000);

  it("the last vote of the month goes to one proposal when several are cast at once", async () => {
    const member = spoolMember("race");
    const spent = [1, 2].map(() => submitted());
    for (const target of spent) castVote(db, member, target.id);
    const targets = [1, 2, 3].map(() => submitted());
    const outcomes = await race(targets.map((target) => ({ userId: member, proposalId: target.id })));
    expect(outcomes.filter((outcome) => outcome.ok)).toEqual([{ ok: true, votesLeft: 0 }]);
    expect(outcomes.filter((outcome) => !outcome.ok)).toEqual(Array(2).fill({ ok: false, status: 409, code: "no_votes_left" }));
    expect(voteAllowance(db, member).votesLeft).toBe(0);
  }, 30_000);
});

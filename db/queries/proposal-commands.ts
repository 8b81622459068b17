import { and, eq, gte, inArray, isNull, lt, notInArray, sql } from "drizzle-orm";
import {
  assertCanEdit,
  assertCanSubmit,
  assertDecidable,
  assertMergeable,
  assertVotable,
  needsSafetyNote,
  votesLeft,
} from "@/lib/proposals/rules";
import { RuleViolation } from "@/lib/rule-violation";
import { monthInZone } from "@/lib/time-zone";
import type { ProposalDraftInput, ProposalSubmissionInput } from "@/lib/validation/proposal";
import type { Db } from "../client";
import {
  labSettings,
  proposalFollowers,
  proposals,
  proposalVotes,
  uploads,
  users,
  type Proposal,
} from "../schema";
import { memberPerks } from "./memberships";
import { enqueueMail } from "./outbox";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/*
 * Every command runs in one IMMEDIATE transaction: it takes the write lock before reading, so two
 * requests racing (a double click, two votes at once) are serialised and each sees the other.
 */
const immediate = { behavior: "immediate" } as const;

function loadProposal(tx: Tx, id: string): Proposal {
  const proposal = tx.select().from(proposals).where(eq(proposals.id, id)).get();
  if (!proposal) throw new RuleViolation(404, "not_found", "No such proposal.");
  return proposal;
}

function slugify(title: string): string {
  const base = title
    .toLowerCase()
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/%/g, " percent ")
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 60);
  // "new" and "edit" are routes under /proposals, so a proposal can never take them.
  return !base || reservedSlugs.has(base) ? `${base || "proposal"}-proposal` : base;
}

const reservedSlugs = new Set(["new", "edit"]);

function uniqueSlug(tx: Tx, title: string): string {
  const base = slugify(title);
  for (let n = 1; ; n++) {
    const slug = n === 1 ? base : `${base}-${n}`;
    if (!tx.select({ id: proposals.id }).from(proposals).where(eq(proposals.slug, slug)).get()) return slug;
  }
}

/** The caller's own uploads, unattached or already on this proposal, are attached to it. */
function attachOwnUploads(tx: Tx, ownerId: string, proposalId: string, uploadIds: readonly string[]): void {
  if (uploadIds.length === 0) return;
  tx.update(uploads)
    .set({ proposalId })
    .where(
      and(
        inArray(uploads.id, [...uploadIds]),
        eq(uploads.ownerId, ownerId),
        sql`(${uploads.proposalId} is null or ${uploads.proposalId} = ${proposalId})`,
      ),
    )
    .run();
}

function proposalFields(input: ProposalDraftInput | ProposalSubmissionInput) {
  return {
    title: input.title,
    kind: input.kind,
    printerType: input.printerType,
    why: input.why,
    descriptionMd: input.descriptionMd,
    material: input.kind === "material" ? (input.material ?? null) : null,
    ductDetails: input.kind === "duct" ? (input.ductDetails ?? null) : null,
  };
}

export function createProposal(
  db: Db,
  proposerId: string,
  input: ProposalDraftInput,
  options: { submit?: boolean; now?: Date } = {},
): Proposal {
  const now = options.now ?? new Date();
  return db.transaction((tx) => {
    const id = crypto.randomUUID();
    tx.insert(proposals)
      .values({
        id,
        slug: uniqueSlug(tx, input.title),
        ...proposalFields(input),
        proposerId,
        state: options.submit ? "submitted" : "draft",
        submittedAt: options.submit ? now : null,
        createdAt: now,
        updatedAt: now,
      })
      .run();
    tx.insert(proposalFollowers).values({ proposalId: id, userId: proposerId, createdAt: now }).onConflictDoNothing().run();
    attachOwnUploads(tx, proposerId, id, input.uploadIds);
    return loadProposal(tx, id);
  }, immediate);
}

export function updateProposal(db: Db, userId: string, id: string, input: ProposalDraftInput, now = new Date()): Proposal {
  return db.transaction((tx) => {
    assertCanEdit(loadProposal(tx, id), userId);
    tx.update(proposals).set({ ...proposalFields(input), updatedAt: now }).where(eq(proposals.id, id)).run();
    attachOwnUploads(tx, userId, id, input.uploadIds);
    return loadProposal(tx, id);
  }, immediate);
}

/** Submits a draft; the caller has validated the full submission schema against its fields. */
export function submitProposal(db: Db, userId: string, id: string, input: ProposalSubmissionInput, now = new Date()): Proposal {
  return db.transaction((tx) => {
    assertCanSubmit(loadProposal(tx, id), userId);
    tx.update(proposals)
      .set({ ...proposalFields(input), state: "submitted", submittedAt: now, updatedAt: now })
      .where(eq(proposals.id, id))
      .run();
    attachOwnUploads(tx, userId, id, input.uploadIds);
    return loadProposal(tx, id);
  }, immediate);
}

/**
 * Takes the caller's own uploads off a proposal they may still edit, except those in `keepIds`:
 * what the form's remove button means. The files stay in the caller's uploads.
 */
export function detachOwnUploads(db: Db, userId: string, id: string, keepIds: readonly string[]): number {
  return db.transaction((tx) => {
    assertCanEdit(loadProposal(tx, id), userId);
    return tx
      .update(uploads)
      .set({ proposalId: null })
      .where(
        and(
          eq(uploads.proposalId, id),
          eq(uploads.ownerId, userId),
          keepIds.length > 0 ? notInArray(uploads.id, [...keepIds]) : undefined,
        ),
      )
      .run().changes;
  }, immediate);
}

/* ---------- Votes ---------- */

export type VoteStatus = { proposalId: string; voteCount: number; votedByMe: boolean; votesLeft: number; allowance: number };

function recountVotes(tx: Tx, proposalIds: readonly string[]): void {
  for (const proposalId of proposalIds) {
    tx.update(proposals)
      .set({ voteCount: sql`(select count(*) from ${proposalVotes} where ${proposalVotes.proposalId} = ${proposalId})` })
      .where(eq(proposals.id, proposalId))
      .run();
  }
}

/** The member's monthly allowance from their plan while the membership gives perks; 0 otherwise. */
function monthlyAllowance(tx: Tx | Db, userId: string, now: Date): number {
  return memberPerks(tx, userId, now)?.monthlyVotes ?? 0;
}

function labTimeZone(tx: Tx | Db): string {
  return tx.select({ timeZone: labSettings.timeZone }).from(labSettings).where(eq(labSettings.id, 1)).get()?.timeZone ?? "UTC";
}

/** Votes cast this calendar month in the lab's time zone; withdrawing a vote gives it back. */
function votesUsedThisMonth(tx: Tx | Db, userId: string, now: Date): number {
  const { start, end } = monthInZone(now, labTimeZone(tx));
  const row = tx
    .select({ count: sql<number>`count(*)` })
    .from(proposalVotes)
    .where(and(eq(proposalVotes.userId, userId), gte(proposalVotes.createdAt, start), lt(proposalVotes.createdAt, end)))
    .get();
  return row?.count ?? 0;
}

export function voteStatus(db: Db | Tx, userId: string, proposalId: string, now = new Date()): VoteStatus {
  const proposal = db.select({ voteCount: proposals.voteCount }).from(proposals).where(eq(proposals.id, proposalId)).get();
  if (!proposal) throw new RuleViolation(404, "not_found", "No such proposal.");
  const mine = db
    .select({ userId: proposalVotes.userId })
    .from(proposalVotes)
    .where(and(eq(proposalVotes.proposalId, proposalId), eq(proposalVotes.userId, userId)))
    .get();
  const allowance = monthlyAllowance(db, userId, now);
  return {
    proposalId,
    voteCount: proposal.voteCount,
    votedByMe: mine !== undefined,
    allowance,
    votesLeft: votesLeft(allowance, votesUsedThisMonth(db, userId, now)),
  };
}

/** The member's monthly allowance and what is left of it now, for pages that list many proposals. */
export function voteAllowance(db: Db, userId: string, now = new Date()): Pick<VoteStatus, "allowance" | "votesLeft"> {
  const allowance = monthlyAllowance(db, userId, now);
  return { allowance, votesLeft: votesLeft(allowance, votesUsedThisMonth(db, userId, now)) };
}

export function castVote(db: Db, userId: string, proposalId: string, now = new Date()): VoteStatus {
  return db.transaction((tx) => {
    assertVotable(loadProposal(tx, proposalId));
    const allowance = monthlyAllowance(tx, userId, now);
    if (allowance === 0) throw new RuleViolation(403, "members_only", "Voting is for Filament Club members.");
    const already = tx
      .select({ userId: proposalVotes.userId })
      .from(proposalVotes)
      .where(and(eq(proposalVotes.proposalId, proposalId), eq(proposalVotes.userId, userId)))
      .get();
    if (already) throw new RuleViolation(409, "already_voted", "You already voted for this proposal.");
    if (votesLeft(allowance, votesUsedThisMonth(tx, userId, now)) === 0) {
      throw new RuleViolation(409, "no_votes_left", `You have used this month's ${allowance} votes; new votes arrive on the 1st.`);
    }
    tx.insert(proposalVotes).values({ proposalId, userId, createdAt: now }).run();
    tx.insert(proposalFollowers).values({ proposalId, userId, createdAt: now }).onConflictDoNothing().run();
    recountVotes(tx, [proposalId]);
    return voteStatus(tx, userId, proposalId, now);
  }, immediate);
}

export function withdrawVote(db: Db, userId: string, proposalId: string, now = new Date()): VoteStatus {
  return db.transaction((tx) => {
    assertVotable(loadProposal(tx, proposalId));
    const removed = tx
      .delete(proposalVotes)
      .where(and(eq(proposalVotes.proposalId, proposalId), eq(proposalVotes.userId, userId)))
      .run();
    if (removed.changes === 0) throw new RuleViolation(409, "not_voted", "You have not voted for this proposal.");
    recountVotes(tx, [proposalId]);
    return voteStatus(tx, userId, proposalId, now);
  }, immediate);
}

/* ---------- Host decisions ---------- */

function proposer(tx: Tx, proposal: Proposal) {
  const user = tx.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, proposal.proposerId)).get();
  if (!user?.email) throw new Error(`Proposer of ${proposal.id} has no e-mail address`);
  return { email: user.email, name: user.name };
}

/** Marks submitted proposals as under review: from then on their proposers cannot edit them. */
export function startReview(db: Db, ids: readonly string[], now = new Date()): number {
  if (ids.length === 0) return 0;
  return db
    .update(proposals)
    .set({ reviewStartedAt: now })
    .where(and(inArray(proposals.id, [...ids]), eq(proposals.state, "submitted"), isNull(proposals.reviewStartedAt)))
    .run().changes;
}

export function acceptProposal(
  db: Db,
  id: string,
  options: { safetyNote?: string; appUrl: string; now?: Date },
): Proposal {
  const now = options.now ?? new Date();
  return db.transaction((tx) => {
    const proposal = loadProposal(tx, id);
    assertDecidable(proposal);
    const settings = tx.select({ require: labSettings.requireSafetyNote }).from(labSettings).where(eq(labSettings.id, 1)).get();
    const safetyNote = options.safetyNote?.trim() || proposal.safetyNote;
    if (settings?.require && needsSafetyNote(proposal.kind, proposal.material) && !safetyNote) {
      throw new RuleViolation(
        422,
        "safety_note_required",
        `Heating ${proposal.material} needs a safety note (fumes, ventilation, temperature) before this proposal is accepted.`,
        "safetyNote",
      );
    }
    tx.update(proposals)
      .set({ state: "accepted", safetyNote: safetyNote ?? null, decidedAt: now, reviewStartedAt: proposal.reviewStartedAt ?? now, updatedAt: now })
      .where(eq(proposals.id, id))
      .run();
    const to = proposer(tx, proposal);
    enqueueMail(
      tx,
      {
        dedupeKey: `proposal-accepted:${id}:${to.email}`,
        toAddress: to.email,
        template: "proposal-accepted",
        subject: `The lab accepted “${proposal.title}”`,
        payload: { name: to.name, proposalTitle: proposal.title, proposalUrl: `${options.appUrl}/proposals/${proposal.slug}` },
      },
      now,
    );
    return loadProposal(tx, id);
  }, immediate);
}

export function declineProposal(db: Db, id: string, reason: string, options: { appUrl: string; now?: Date }): Proposal {
  const now = options.now ?? new Date();
  return db.transaction((tx) => {
    const proposal = loadProposal(tx, id);
    assertDecidable(proposal);
    tx.update(proposals)
      .set({ state: "declined", declineReason: reason, decidedAt: now, reviewStartedAt: proposal.reviewStartedAt ?? now, updatedAt: now })
      .where(eq(proposals.id, id))
      .run();
    const to = proposer(tx, proposal);
    enqueueMail(
      tx,
      {
        dedupeKey: `proposal-declined:${id}:${to.email}`,
        toAddress: to.email,
        template: "proposal-declined",
        subject: `About your proposal “${proposal.title}”`,
        payload: { name: to.name, proposalTitle: proposal.title, reason, proposalUrl: `${options.appUrl}/proposals/${proposal.slug}` },
      },
      now,
    );
    return loadProposal(tx, id);
  }, immediate);
}

/**
 * Merges a duplicate into a survivor: every vote and follower moves across (someone on both
 * keeps one), the duplicate becomes `merged`, and its proposer is told.
 */
export function mergeProposal(db: Db, sourceId: string, targetId: string, options: { appUrl: string; now?: Date }): Proposal {
  const now = options.now ?? new Date();
  return db.transaction((tx) => {
    const source = loadProposal(tx, sourceId);
    const target = loadProposal(tx, targetId);
    assertMergeable(source, target);
    tx.run(sql`insert or ignore into ${proposalVotes} (proposal_id, user_id, created_at)
      select ${targetId}, user_id, created_at from ${proposalVotes} where proposal_id = ${sourceId}`);
    tx.delete(proposalVotes).where(eq(proposalVotes.proposalId, sourceId)).run();
    tx.run(sql`insert or ignore into ${proposalFollowers} (proposal_id, user_id, created_at)
      select ${targetId}, user_id, created_at from ${proposalFollowers} where proposal_id = ${sourceId}`);
    tx.delete(proposalFollowers).where(eq(proposalFollowers.proposalId, sourceId)).run();
    tx.update(proposals)
      .set({ state: "merged", mergedIntoId: targetId, decidedAt: now, reviewStartedAt: source.reviewStartedAt ?? now, updatedAt: now })
      .where(eq(proposals.id, sourceId))
      .run();
    recountVotes(tx, [sourceId, targetId]);
    const to = proposer(tx, source);
    enqueueMail(
      tx,
      {
        dedupeKey: `proposal-merged:${sourceId}:${to.email}`,
        toAddress: to.email,
        template: "proposal-merged",
        subject: `“${source.title}” was merged into “${target.title}”`,
        payload: {
          name: to.name,
          proposalTitle: source.title,
          survivorTitle: target.title,
          survivorUrl: `${options.appUrl}/proposals/${target.slug}`,
        },
      },
      now,
    );
    return loadProposal(tx, sourceId);
  }, immediate);
}

"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { createProposal, detachOwnUploads, submitProposal, updateProposal } from "@/db/queries/proposal-commands";
import { getProposalFacts } from "@/db/queries/proposal-reads";
import type { Proposal, ProposalState } from "@/db/schema";
import { RuleViolation } from "@/lib/rule-violation";
import { proposalDraftSchema, proposalSubmissionSchema } from "@/lib/validation/proposal";
import { guardedAction, parseInput, type ActionResult } from "@/server/action";

export type SavedProposal = { id: string; slug: string; state: ProposalState };

const proposalIdSchema = z.string().min(1).max(64).nullable();

function saved(proposal: Proposal): SavedProposal {
  revalidatePath("/proposals");
  revalidatePath(`/proposals/${proposal.slug}`);
  revalidatePath("/account/proposals");
  return { id: proposal.id, slug: proposal.slug, state: proposal.state };
}

/** The uploads the form still lists stay on the proposal; the caller's others come off it. */
function keepOnlyListedUploads(userId: string, proposalId: string, uploadIds: readonly string[]): void {
  detachOwnUploads(getDb(), userId, proposalId, uploadIds);
}

/**
 * "Save draft": a new draft, or changes to one. A proposal already submitted keeps to the
 * submission rules, so saving it never lowers it below what the lab was sent.
 */
export async function saveProposalDraft(proposalId: string | null, values: unknown): Promise<ActionResult<SavedProposal>> {
  return guardedAction("supporter", (viewer) => {
    const id = parseInput(proposalIdSchema, proposalId);
    const db = getDb();
    if (id === null) return saved(createProposal(db, viewer.id, parseInput(proposalDraftSchema, values)));
    const facts = getProposalFacts(db, id);
    if (!facts) throw new RuleViolation(404, "not_found", "No such proposal.");
    const input = facts.state === "draft" ? parseInput(proposalDraftSchema, values) : parseInput(proposalSubmissionSchema, values);
    const proposal = updateProposal(db, viewer.id, id, input);
    keepOnlyListedUploads(viewer.id, id, input.uploadIds);
    return saved(proposal);
  });
}

/**
 * "Submit to the lab": creates and submits at once, submits a draft, or saves changes to a
 * submitted proposal the lab has not started reviewing — always against the submission rules.
 */
export async function submitProposalToLab(proposalId: string | null, values: unknown): Promise<ActionResult<SavedProposal>> {
  return guardedAction("supporter", (viewer) => {
    const id = parseInput(proposalIdSchema, proposalId);
    const input = parseInput(proposalSubmissionSchema, values);
    const db = getDb();
    if (id === null) return saved(createProposal(db, viewer.id, input, { submit: true }));
    const facts = getProposalFacts(db, id);
    if (!facts) throw new RuleViolation(404, "not_found", "No such proposal.");
    const proposal = facts.state === "draft" ? submitProposal(db, viewer.id, id, input) : updateProposal(db, viewer.id, id, input);
    keepOnlyListedUploads(viewer.id, id, input.uploadIds);
    return saved(proposal);
  });
}

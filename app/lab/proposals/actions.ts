"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { acceptProposal, declineProposal, mergeProposal, startReview } from "@/db/queries/proposal-commands";
import { env } from "@/lib/env";
import { RuleViolation } from "@/lib/rule-violation";
import { acceptSchema, declineSchema, mergeSchema } from "@/lib/validation/proposal";
import { bulkDeclineSchema, bulkIdsSchema } from "@/lib/validation/triage";
import { guardedAction, parseInput } from "@/server/action";

/** Bulk: marks the selected submitted proposals as under review (their proposers can no longer edit). */
export async function startReviewAction(input: unknown) {
  return guardedAction("host", () => {
    const { ids } = parseInput(bulkIdsSchema, input);
    const started = startReview(getDb(), ids);
    revalidatePath("/lab/proposals");
    return { started, skipped: ids.length - started };
  });
}

/**
 * Bulk: declines each selected proposal with one reason (clear duplicates, spam), each in its own
 * transaction with its own e-mail; ones already decided are skipped and named.
 */
export async function declineSelectedAction(input: unknown) {
  return guardedAction("host", () => {
    const { ids, reason } = parseInput(bulkDeclineSchema, input);
    const db = getDb();
    let declined = 0;
    const skipped: { id: string; message: string }[] = [];
    for (const id of ids) {
      try {
        declineProposal(db, id, reason, { appUrl: env.appUrl });
        declined++;
      } catch (error) {
        if (!(error instanceof RuleViolation)) throw error;
        skipped.push({ id, message: error.message });
      }
    }
    revalidatePath("/lab/proposals");
    return { declined, skipped };
  });
}

const idSchema = z.string().min(1).max(80);

export async function acceptProposalAction(id: string, input: unknown) {
  return guardedAction("host", () => {
    const { safetyNote } = parseInput(acceptSchema, input);
    const proposal = acceptProposal(getDb(), parseInput(idSchema, id), { safetyNote, appUrl: env.appUrl });
    revalidatePath(`/lab/proposals/${proposal.id}`);
    return { id: proposal.id, state: proposal.state };
  });
}

export async function declineProposalAction(id: string, input: unknown) {
  return guardedAction("host", () => {
    const { reason } = parseInput(declineSchema, input);
    const proposal = declineProposal(getDb(), parseInput(idSchema, id), reason, { appUrl: env.appUrl });
    revalidatePath(`/lab/proposals/${proposal.id}`);
    return { id: proposal.id, state: proposal.state };
  });
}

/** Merge refusals (into itself, a declined or merged proposal) belong beside the target picker. */
export async function mergeProposalAction(id: string, input: unknown) {
  return guardedAction("host", () => {
    const { targetId } = parseInput(mergeSchema, input);
    try {
      const proposal = mergeProposal(getDb(), parseInput(idSchema, id), targetId, { appUrl: env.appUrl });
      revalidatePath(`/lab/proposals/${proposal.id}`);
      return { id: proposal.id, state: proposal.state };
    } catch (error) {
      if (error instanceof RuleViolation && !error.field && error.status === 409) {
        throw new RuleViolation(error.status, error.code, error.message, "targetId");
      }
      throw error;
    }
  });
}

import { getMaterial, isMaterialId } from "../estimate/materials";
import { RuleViolation } from "../rule-violation";
import { PTFE_LIMIT_CELSIUS } from "../safety";

export type ProposalStateName = "draft" | "submitted" | "accepted" | "declined" | "merged";

export type ProposalFacts = {
  id: string;
  state: ProposalStateName;
  proposerId: string;
  reviewStartedAt: Date | null;
};

/** A proposer may edit while it is a draft, or submitted and no host has started reviewing it. */
export function isEditable(proposal: ProposalFacts): boolean {
  return proposal.state === "draft" || (proposal.state === "submitted" && proposal.reviewStartedAt === null);
}

export function assertCanEdit(proposal: ProposalFacts, userId: string): void {
  if (proposal.proposerId !== userId) throw new RuleViolation(403, "forbidden", "Only the person who proposed it can edit this proposal.");
  if (!isEditable(proposal)) {
    throw new RuleViolation(409, "not_editable", "The lab has started reviewing this proposal, so it can no longer be edited.");
  }
}

export function assertCanSubmit(proposal: ProposalFacts, userId: string): void {
  assertCanEdit(proposal, userId);
  if (proposal.state !== "draft") throw new RuleViolation(409, "already_submitted", "This proposal was already submitted.");
}

/** Hosts decide on submitted proposals only: each decision happens once. */
export function assertDecidable(proposal: ProposalFacts): void {
  if (proposal.state !== "submitted") {
    throw new RuleViolation(409, "already_decided", `This proposal is ${proposal.state}; only submitted proposals can be decided.`);
  }
}

/** Members vote on proposals still waiting for the lab's decision. */
export function assertVotable(proposal: ProposalFacts): void {
  if (proposal.state !== "submitted") throw new RuleViolation(409, "not_votable", "Only submitted proposals take votes.");
}

/**
 * A duplicate merges into a live proposal: never into itself, a declined or merged one, or a
 * draft nobody else can see.
 */
export function assertMergeable(source: ProposalFacts, target: ProposalFacts): void {
  if (source.id === target.id) throw new RuleViolation(409, "merge_into_self", "A proposal cannot be merged into itself.");
  assertDecidable(source);
  if (target.state === "declined" || target.state === "merged" || target.state === "draft") {
    throw new RuleViolation(409, "merge_target_closed", `Cannot merge into a ${target.state} proposal; pick a submitted or accepted one.`);
  }
}

/**
 * Material tests that heat styrenics (fumes) or plastics that print at the PTFE limit or above need the
 * lab to write down its precautions before accepting them.
 */
export function needsSafetyNote(kind: string, material: string | null): boolean {
  if (kind !== "material" || !material || !isMaterialId(material)) return false;
  const { fumeCaution, nozzleTemperatureCelsius } = getMaterial(material);
  return fumeCaution === "strong" || nozzleTemperatureCelsius.min >= PTFE_LIMIT_CELSIUS;
}

export function votesLeft(monthlyAllowance: number, usedThisMonth: number): number {
  return Math.max(0, monthlyAllowance - usedThisMonth);
}

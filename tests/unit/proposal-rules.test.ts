import { describe, expect, it } from "vitest";
import {
  assertCanEdit,
  assertCanSubmit,
  assertMergeable,
  isEditable,
  needsSafetyNote,
  votesLeft,
  type ProposalFacts,
} from "@/lib/proposals/rules";
import { RuleViolation } from "@/lib/rule-violation";

const base: ProposalFacts = { id: "p1", state: "submitted", proposerId: "u1", reviewStartedAt: null };
const statusOf = (run: () => void) => {
  try {
    run();
    return 200;
  } catch (error) {
    if (error instanceof RuleViolation) return error.status;
    throw error;
  }
};

describe("proposal rules", () => {
  it("lets the proposer edit until review starts, nobody else ever", () => {
    expect(isEditable({ ...base, state: "draft" })).toBe(true);
    expect(isEditable(base)).toBe(true);
    expect(isEditable({ ...base, reviewStartedAt: new Date() })).toBe(false);
    expect(isEditable({ ...base, state: "accepted" })).toBe(false);
    expect(statusOf(() => assertCanEdit(base, "u2"))).toBe(403);
    expect(statusOf(() => assertCanEdit({ ...base, reviewStartedAt: new Date() }, "u1"))).toBe(409);
    expect(statusOf(() => assertCanSubmit(base, "u1"))).toBe(409);
    expect(statusOf(() => assertCanSubmit({ ...base, state: "draft" }, "u1"))).toBe(200);
  });

  it("refuses merges into itself, into declined, merged or draft proposals (409)", () => {
    const target: ProposalFacts = { ...base, id: "p2" };
    expect(statusOf(() => assertMergeable(base, base))).toBe(409);
    expect(statusOf(() => assertMergeable(base, { ...target, state: "declined" }))).toBe(409);
    expect(statusOf(() => assertMergeable(base, { ...target, state: "merged" }))).toBe(409);
    expect(statusOf(() => assertMergeable(base, { ...target, state: "draft" }))).toBe(409);
    expect(statusOf(() => assertMergeable({ ...base, state: "accepted" }, target))).toBe(409);
    expect(statusOf(() => assertMergeable(base, { ...target, state: "accepted" }))).toBe(200);
  });

  it("asks for a safety note for styrenics and plastics printed above the PTFE limit (PRODUCT.md cautions)", () => {
    expect(needsSafetyNote("material", "ASA")).toBe(true);
    expect(needsSafetyNote("material", "ABS")).toBe(true);
    expect(needsSafetyNote("material", "PC")).toBe(true);
    expect(needsSafetyNote("material", "PA")).toBe(true);
    expect(needsSafetyNote("material", "PETG")).toBe(false);
    expect(needsSafetyNote("material", "PLA")).toBe(false);
    expect(needsSafetyNote("duct", "ASA")).toBe(false);
  });

  it("counts votes left in the month and never below zero", () => {
    expect(votesLeft(8, 3)).toBe(5);
    expect(votesLeft(3, 5)).toBe(0);
  });
});

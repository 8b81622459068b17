"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { createTestPiece, setTestPieceActive, updateTestPiece } from "@/db/queries/test-pieces";
import { testPieceActiveSchema, testPieceSchema } from "@/lib/validation/test-plan";
import { guardedAction, parseInput } from "@/server/action";

const idSchema = z.string().min(1).max(80);

function revalidateLibrary() {
  revalidatePath("/lab/pieces");
}

export async function createTestPieceAction(input: unknown) {
  return guardedAction("admin", () => {
    const piece = createTestPiece(getDb(), parseInput(testPieceSchema, input));
    revalidateLibrary();
    return { id: piece.id };
  });
}

export async function updateTestPieceAction(id: string, input: unknown) {
  return guardedAction("admin", () => {
    const piece = updateTestPiece(getDb(), parseInput(idSchema, id), parseInput(testPieceSchema, input));
    revalidateLibrary();
    return { id: piece.id };
  });
}

export async function setTestPieceActiveAction(input: unknown) {
  return guardedAction("admin", () => {
    const { id, active } = parseInput(testPieceActiveSchema, input);
    const piece = setTestPieceActive(getDb(), id, active);
    revalidateLibrary();
    return { id: piece.id, active: piece.active };
  });
}

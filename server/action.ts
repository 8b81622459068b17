import "server-only";
import type { z } from "zod";
import { DomainInputError } from "@/lib/input-checks";
import type { Role } from "@/lib/roles";
import { RuleViolation } from "@/lib/rule-violation";
import type { Viewer } from "./auth";
import { requireRole } from "./guards";
import { fieldErrors, HttpError } from "./http-error";

export type ActionFailure = { ok: false; status: number; code: string; message: string; fields?: Record<string, string> };
export type ActionResult<T> = { ok: true; data: T } | ActionFailure;

/**
 * The one wrapper for server actions (public POST endpoints): checks the role first, then runs
 * the body, turning rule, input and HTTP errors into a result the form can show.
 */
export async function guardedAction<T>(role: Exclude<Role, "visitor">, body: (viewer: Viewer) => T | Promise<T>): Promise<ActionResult<T>> {
  try {
    const viewer = await requireRole(role);
    return { ok: true, data: await body(viewer) };
  } catch (error) {
    if (error instanceof HttpError) return { ok: false, status: error.status, code: error.code, message: error.message, fields: error.fields };
    if (error instanceof RuleViolation) {
      return {
        ok: false,
        status: error.status,
        code: error.code,
        message: error.message,
        fields: error.field ? { [error.field]: error.message } : undefined,
      };
    }
    if (error instanceof DomainInputError) {
      return { ok: false, status: 422, code: "invalid_input", message: error.message, fields: { [error.field]: error.message } };
    }
    throw error;
  }
}

/** Parses action input with the shared schema, throwing a 422 HttpError that names each field. */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  const result = schema.safeParse(input);
  if (!result.success) {
    const fields = fieldErrors(result.error);
    throw new HttpError(422, "invalid_input", `Check these fields: ${Object.keys(fields).join(", ")}`, fields);
  }
  return result.data;
}

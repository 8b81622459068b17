import "server-only";
import { NextResponse } from "next/server";
import type { z } from "zod";
import { DomainInputError } from "@/lib/input-checks";
import { RuleViolation } from "@/lib/rule-violation";
import type { Role } from "@/lib/roles";
import type { Viewer } from "./auth";
import { requireRole } from "./guards";
import { HttpError, validationError } from "./http-error";

type Context<Params> = { request: Request; params: Params; viewer: Viewer | null };

/**
 * Wraps a route handler: checks the role first (when one is named), maps HttpError to the JSON
 * error shape, and hides anything unexpected behind a 500 without leaking its details.
 */
export function apiRoute<Params = Record<string, string>>(
  options: { role: Exclude<Role, "visitor"> | "visitor" },
  handler: (context: Context<Params>) => Promise<Response | object>,
) {
  return async (request: Request, segment: { params: Promise<Params> }): Promise<Response> => {
    try {
      const viewer = options.role === "visitor" ? null : await requireRole(options.role);
      const result = await handler({ request, params: await segment.params, viewer });
      return result instanceof Response ? result : NextResponse.json(result);
    } catch (error) {
      if (error instanceof HttpError) return NextResponse.json(error.toBody(), { status: error.status });
      if (error instanceof RuleViolation) {
        const fields = error.field ? { [error.field]: error.message } : undefined;
        return NextResponse.json(new HttpError(error.status, error.code, error.message, fields).toBody(), { status: error.status });
      }
      if (error instanceof DomainInputError) {
        const body = new HttpError(422, "invalid_input", error.message, { [error.field]: error.message }).toBody();
        return NextResponse.json(body, { status: 422 });
      }
      console.error(error);
      return NextResponse.json({ error: { code: "internal", message: "Something went wrong on our side." } }, { status: 500 });
    }
  };
}

export async function parseJsonBody<S extends z.ZodType>(request: Request, schema: S): Promise<z.output<S>> {
  let raw: unknown;
  try {
    raw = await request.json();
  } catch {
    throw new HttpError(400, "malformed_json", "The request body is not valid JSON.");
  }
  const result = schema.safeParse(raw);
  if (!result.success) throw validationError(result.error);
  return result.data;
}

export function parseSearchParams<S extends z.ZodType>(request: Request, schema: S): z.output<S> {
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const result = schema.safeParse(params);
  if (!result.success) throw validationError(result.error);
  return result.data;
}

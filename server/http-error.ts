import type { ZodError } from "zod";

export type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string> } };

/** A failure with its HTTP status; route handlers turn it into Proofbay's JSON error shape. */
export class HttpError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 422 | 429,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
  }

  toBody(): ErrorBody {
    return { error: { code: this.code, message: this.message, ...(this.fields ? { fields: this.fields } : {}) } };
  }
}

export function fieldErrors(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".") || "_";
    fields[key] ??= issue.message;
  }
  return fields;
}

export function validationError(error: ZodError): HttpError {
  const fields = fieldErrors(error);
  const names = Object.keys(fields).join(", ");
  return new HttpError(422, "invalid_input", `Check these fields: ${names}`, fields);
}

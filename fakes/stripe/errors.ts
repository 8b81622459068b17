export type StripeErrorType = "invalid_request_error" | "idempotency_error" | "card_error" | "api_error";

export interface StripeErrorFields {
  type?: StripeErrorType;
  message: string;
  param?: string;
  code?: string;
  decline_code?: string;
  /** Extra top-level members Stripe adds to some errors (the failed `payment_intent`, say). */
  extra?: Record<string, unknown>;
}

/** An error the fake answers with, in Stripe's `{ error: { type, message, param?, code? } }` shape. */
export class StripeApiError extends Error {
  readonly status: number;
  readonly fields: StripeErrorFields;

  constructor(status: number, fields: StripeErrorFields) {
    super(fields.message);
    this.status = status;
    this.fields = fields;
  }

  toJSON(): { error: Record<string, unknown> } {
    const { type = "invalid_request_error", message, param, code, decline_code, extra } = this.fields;
    const error: Record<string, unknown> = {};
    if (code !== undefined) error.code = code;
    if (decline_code !== undefined) error.decline_code = decline_code;
    // Stripe links every coded error to its page in the error-code reference.
    if (code !== undefined) error.doc_url = `https://stripe.com/docs/error-codes/${code.replace(/_/g, "-")}`;
    error.message = message;
    if (param !== undefined) error.param = param;
    if (extra) Object.assign(error, extra);
    error.type = type;
    return { error };
  }
}

export function invalidRequest(message: string, param?: string, code?: string): StripeApiError {
  return new StripeApiError(400, { message, ...(param === undefined ? {} : { param }), ...(code === undefined ? {} : { code }) });
}

export function missingParam(param: string): StripeApiError {
  return new StripeApiError(400, { message: `Missing required param: ${param}.`, param, code: "parameter_missing" });
}

export function unknownParam(param: string): StripeApiError {
  return new StripeApiError(400, { message: `Received unknown parameter: ${param}`, param, code: "parameter_unknown" });
}

/**
 * "No such price: 'price_123'". Stripe answers 404 when the id is in the URL and 400 when a
 * parameter names an object that does not exist.
 */
export function noSuch(kind: string, id: string, param: string, status: 400 | 404): StripeApiError {
  return new StripeApiError(status, { message: `No such ${kind}: '${id}'`, param, code: "resource_missing" });
}

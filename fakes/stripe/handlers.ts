import { http, HttpResponse, type HttpHandler } from "msw";
import type { Engine, RequestContext } from "./engine";
import { StripeApiError } from "./errors";
import { canonicalJson, parseForm, parseFormBody } from "./form";
import { newId } from "./ids";
import { PAGINATION_PARAMS, Params, pagination, rangeFilter } from "./params";
import * as billing from "./resources/billing";
import * as catalog from "./resources/catalog";
import * as checkout from "./resources/checkout";
import * as payments from "./resources/payments";
import { idempotencyScope } from "./store";

type Method = "GET" | "POST" | "DELETE";

interface Call {
  params: Params;
  request: RequestContext;
  /** Path parameters from the route (`:id`). */
  id: string;
}

type Operation = (call: Call) => unknown;

const IDEMPOTENCY_TTL_SECONDS = 24 * 60 * 60;

/**
 * The msw handlers for Stripe's REST API (`*\/v1/...`), over one engine. The same list runs
 * in-process under `setupServer` and over HTTP through `@mswjs/http-middleware`.
 */
export function createApiHandlers(engine: Engine, options: { fallback?: boolean } = {}): HttpHandler[] {
  const route = (method: Method, path: string, operation: Operation): HttpHandler => {
    const register = method === "GET" ? http.get : method === "POST" ? http.post : http.delete;
    return register(`*/v1${path}`, async ({ request, params }) => {
      const id = typeof params.id === "string" ? decodeURIComponent(params.id) : "";
      return respond(engine, method, request, id, operation);
    });
  };
  const retrieve = (kind: Parameters<Engine["require"]>[0], extra: string[] = []): Operation => ({ params, id }) => {
    params.allow(["expand", ...extra]);
    return engine.require(kind, id, { param: "id", status: 404 });
  };

  const handlers = [
    route("POST", "/customers", ({ params, request }) => catalog.createCustomer(engine, params, request)),
    route("GET", "/customers", ({ params }) => catalog.listCustomers(engine, params)),
    route("GET", "/customers/:id", retrieve("customer")),
    route("POST", "/customers/:id", ({ params, request, id }) => catalog.updateCustomer(engine, id, params, request)),

    route("POST", "/products", ({ params, request }) => catalog.createProduct(engine, params, request)),
    route("GET", "/products", ({ params }) => catalog.listProducts(engine, params)),
    route("GET", "/products/:id", retrieve("product")),
    route("POST", "/products/:id", ({ params, request, id }) => catalog.updateProduct(engine, id, params, request)),

    route("POST", "/prices", ({ params, request }) => catalog.createPrice(engine, params, request)),
    route("GET", "/prices", ({ params }) => catalog.listPrices(engine, params)),
    route("GET", "/prices/:id", retrieve("price")),
    route("POST", "/prices/:id", ({ params, request, id }) => catalog.updatePrice(engine, id, params, request)),

    route("POST", "/checkout/sessions", ({ params, request }) => checkout.createSession(engine, params, request)),
    route("GET", "/checkout/sessions", ({ params }) => checkout.listSessions(engine, params)),
    route("GET", "/checkout/sessions/:id", ({ params, id }) => {
      params.allow(["expand"]);
      return engine.require("checkout.session", id, { param: "session", status: 404 });
    }),
    route("POST", "/checkout/sessions/:id/expire", ({ params, request, id }) => {
      params.allow(["expand"]);
      return checkout.expireSession(engine, id, request, true);
    }),
    route("GET", "/checkout/sessions/:id/line_items", ({ params, id }) => checkout.listSessionLineItems(engine, id, params)),

    route("GET", "/payment_intents", ({ params }) => payments.listPaymentIntents(engine, params)),
    route("GET", "/payment_intents/:id", retrieve("payment_intent", ["client_secret"])),
    route("GET", "/payment_methods/:id", retrieve("payment_method")),
    route("GET", "/charges/:id", retrieve("charge")),

    route("POST", "/refunds", ({ params, request }) => payments.createRefund(engine, params, request)),
    route("GET", "/refunds", ({ params }) => payments.listRefunds(engine, params)),
    route("GET", "/refunds/:id", retrieve("refund")),
    route("POST", "/refunds/:id", ({ params, request, id }) => payments.updateRefund(engine, id, params, request)),

    route("GET", "/subscriptions", ({ params }) => billing.listSubscriptions(engine, params)),
    route("GET", "/subscriptions/:id", retrieve("subscription")),
    route("POST", "/subscriptions/:id", ({ params, request, id }) => billing.updateSubscription(engine, id, params, request)),
    route("DELETE", "/subscriptions/:id", ({ params, request, id }) => billing.cancelSubscription(engine, id, params, request)),

    route("GET", "/invoices", ({ params }) => billing.listInvoices(engine, params)),
    route("GET", "/invoices/:id", retrieve("invoice")),
    route("POST", "/invoices/:id/pay", ({ params, request, id }) => billing.payInvoice(engine, id, params, request)),

    route("GET", "/events", ({ params }) => listEvents(engine, params)),
    route("GET", "/events/:id", retrieve("event")),
  ];

  if (options.fallback) {
    // Stripe's answer for a path or method it has no endpoint for.
    handlers.push(
      http.all("*/v1/*", ({ request }) => {
        const url = new URL(request.url);
        return stripeJson(
          engine,
          request,
          404,
          new StripeApiError(404, {
            message: `Unrecognized request URL (${request.method}: ${url.pathname}). Please see https://stripe.com/docs or we can help at https://support.stripe.com/.`,
          }).toJSON(),
          newId("req"),
        );
      }),
    );
  }
  return handlers;
}

function listEvents(engine: Engine, params: Params) {
  params.allow([...PAGINATION_PARAMS, "type", "types", "created"], { ignored: ["delivery_success"] });
  const type = params.str("type");
  const types = params.strings("types");
  if (type && types.length > 0) throw new StripeApiError(400, { message: "You may only specify one of these parameters: type, types.", param: "types" });
  const created = rangeFilter(params, "created");
  // `type` accepts a trailing wildcard: `invoice.*`.
  const matches = (eventType: string, pattern: string) => (pattern.endsWith("*") ? eventType.startsWith(pattern.slice(0, -1)) : eventType === pattern);
  const items = engine.newestFirst(
    "event",
    (event) => (!type || matches(event.type, type)) && (types.length === 0 || types.some((t) => matches(event.type, t))) && (!created || created(event.created)),
  );
  return engine.list(items, pagination(params), "/v1/events");
}

async function respond(engine: Engine, method: Method, request: Request, id: string, operation: Operation): Promise<Response> {
  const requestId = newId("req");
  try {
    const apiKey = authenticate(request);
    const url = new URL(request.url);
    const form = method === "POST" ? parseFormBody(request.headers.get("content-type"), await request.text()) : parseForm(url.searchParams);
    const idempotencyKey = method === "POST" ? request.headers.get("idempotency-key") : null;

    if (idempotencyKey !== null) {
      if (idempotencyKey.length > 255) {
        throw new StripeApiError(400, { type: "idempotency_error", message: "The idempotency key provided is too long: keys can be at most 255 characters." });
      }
      engine.store.pruneIdempotency(engine.now() - IDEMPOTENCY_TTL_SECONDS);
      const scope = idempotencyScope(apiKey, idempotencyKey);
      const fingerprint = canonicalJson(form);
      const previous = engine.store.getIdempotency(scope);
      if (previous) {
        if (previous.method !== method || previous.path !== url.pathname) {
          throw new StripeApiError(400, {
            type: "idempotency_error",
            message: `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${previous.method} ${previous.path}' vs '${method} ${url.pathname}'). Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`,
          });
        }
        if (previous.fingerprint !== fingerprint) {
          throw new StripeApiError(400, {
            type: "idempotency_error",
            message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`,
          });
        }
        return new HttpResponse(previous.body, {
          status: previous.status,
          headers: { ...stripeHeaders(engine, request, requestId), "idempotency-key": idempotencyKey, "idempotent-replayed": "true", "original-request": previous.requestId },
        });
      }
      const response = run(engine, operation, { params: new Params(form), request: { requestId, idempotencyKey }, id });
      // Stripe keeps the outcome once the endpoint ran: successes and card declines. Requests that
      // failed validation are not saved, so a corrected retry with the same key goes through.
      if (response.status < 400 || response.status === 402) {
        engine.store.putIdempotency({ scope, key: idempotencyKey, method, path: url.pathname, fingerprint, status: response.status, body: response.body, requestId, createdAt: engine.now() });
      }
      return new HttpResponse(response.body, { status: response.status, headers: { ...stripeHeaders(engine, request, requestId), "idempotency-key": idempotencyKey } });
    }

    const response = run(engine, operation, { params: new Params(form), request: { requestId, idempotencyKey: null }, id });
    return new HttpResponse(response.body, { status: response.status, headers: stripeHeaders(engine, request, requestId) });
  } catch (error) {
    const apiError = toApiError(engine, error);
    return stripeJson(engine, request, apiError.status, apiError.toJSON(), requestId);
  }
}

function run(engine: Engine, operation: Operation, call: Call): { status: number; body: string } {
  try {
    const result = operation(call);
    const expanded = engine.expand(result, call.params.expand());
    return { status: 200, body: JSON.stringify(expanded, null, 2) };
  } catch (error) {
    const apiError = toApiError(engine, error);
    return { status: apiError.status, body: JSON.stringify(apiError.toJSON(), null, 2) };
  }
}

function toApiError(engine: Engine, error: unknown): StripeApiError {
  if (error instanceof StripeApiError) return error;
  engine.warnOnce(`Fake Stripe failed on a request: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`);
  return new StripeApiError(500, { type: "api_error", message: "An unknown error occurred in the local Stripe fake (see its log)." });
}

/**
 * Secret test keys only, as `Authorization: Bearer sk_test_…` (what the SDK sends) or HTTP Basic
 * with the key as the user name (what `curl -u sk_test_…:` sends). Returns the key.
 */
function authenticate(request: Request): string {
  const header = request.headers.get("authorization");
  if (!header) {
    throw new StripeApiError(401, {
      message:
        "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY'). See https://stripe.com/docs/api#authentication for details, or we can help at https://support.stripe.com/.",
    });
  }
  let key = "";
  const [scheme, value = ""] = header.trim().split(/\s+/, 2);
  if (scheme?.toLowerCase() === "bearer") key = value;
  else if (scheme?.toLowerCase() === "basic") key = Buffer.from(value, "base64").toString("utf8").split(":")[0] ?? "";
  if (!/^sk_test_[A-Za-z0-9_]+$/.test(key)) {
    const masked = key.length > 4 ? `${key.slice(0, Math.min(8, key.length - 4))}${"*".repeat(Math.max(0, key.length - 12))}${key.slice(-4)}` : key;
    const live = key.startsWith("sk_live_") || key.startsWith("rk_live_");
    const publishable = key.startsWith("pk_");
    throw new StripeApiError(401, {
      message: live
        ? "The local Stripe fake only accepts test-mode secret keys (sk_test_…); never give it a live key."
        : publishable
          ? "This API call cannot be made with a publishable API key. Please use a secret API key. You can find a list of your API keys at https://dashboard.stripe.com/account/apikeys."
          : `Invalid API Key provided: ${masked}`,
      ...(publishable ? {} : { code: "api_key_invalid" }),
    });
  }
  return key;
}

function stripeHeaders(engine: Engine, request: Request, requestId: string): Record<string, string> {
  return {
    "content-type": "application/json",
    "cache-control": "no-cache, no-store",
    "request-id": requestId,
    "stripe-version": request.headers.get("stripe-version") ?? engine.apiVersion,
  };
}

function stripeJson(engine: Engine, request: Request, status: number, body: unknown, requestId: string): Response {
  return new HttpResponse(JSON.stringify(body, null, 2), { status, headers: stripeHeaders(engine, request, requestId) });
}

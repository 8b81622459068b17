import { http, HttpResponse, type HttpHandler } from "msw";
import type Stripe from "stripe";
import type { Engine } from "./engine";
import { StripeApiError } from "./errors";
import { failNextRenewal, nextDueTime, processDueSubscriptions } from "./resources/billing";
import { expireDueSessions, settleAsyncPayment, submitCheckout, type CheckoutSubmission, type SubmissionResult } from "./resources/checkout";
import { newWebhookSecret, type Delivery, type WebhookEndpoint, type WebhookSender } from "./webhooks";
import { seededShuffle as shuffle } from "../../lib/seeded-random";

export type DeliveryMode = "auto" | "manual";

export interface AdvanceReport {
  /** Unix seconds on the fake clock after advancing. */
  now: number;
  expiredSessions: string[];
  renewed: string[];
  failedRenewals: string[];
  endedSubscriptions: string[];
}

/** Functions for tests and the demo; the same operations answer under `/__control/…` as JSON. */
export interface FakeStripeControl {
  /** Newest first, optionally of one type (`invoice.*` matches a family). */
  events(filter?: { type?: string; limit?: number }): Stripe.Event[];
  event(id: string): Stripe.Event | undefined;
  /** Sends the stored event again (same id and payload) to every endpoint that wants it. */
  replayEvent(id: string): Delivery[];
  /** Sends the same event `copies` times at once, as an at-least-once sender sometimes does. */
  duplicateEvent(id: string, copies?: number): Delivery[];
  /** Sends the given events one after another, in the given, reversed or a (seeded) shuffled order. */
  deliverEvents(ids: string[], options?: { order?: "given" | "reverse" | "shuffled"; seed?: number }): Promise<{ order: string[]; deliveries: Delivery[] }>;
  deliveries(filter?: { eventId?: string }): Delivery[];
  /** Resolves when every delivery has succeeded or run out of attempts. */
  waitForDeliveries(): Promise<void>;
  webhook(): WebhookEndpoint | null;
  /** Sets (or with `null` removes) the endpoint; a missing secret is generated and returned. */
  setWebhook(endpoint: { url: string; secret?: string; enabledEvents?: string[] } | null): WebhookEndpoint | null;
  /** `manual` records events without sending them, for tests that deliver them in their own order. */
  setDeliveryMode(mode: DeliveryMode): void;
  deliveryMode(): DeliveryMode;
  now(): number;
  /**
   * Moves the clock forward, stopping at every moment something is due on the way (sessions
   * reaching `expires_at`, subscriptions reaching a period end), so renewals happen at their own
   * times, as with Stripe's test clocks.
   */
  advanceClock(seconds: number): AdvanceReport;
  /** Makes the next renewal of a subscription (or of any, when omitted) fail `count` times. */
  failNextRenewal(subscriptionId?: string, count?: number): void;
  /** Expires open sessions whose `expires_at` has passed on the fake clock. */
  expireDueSessions(): string[];
  /** Pays (or fails to pay) a session as the hosted page's form would. */
  completeSession(sessionId: string, submission: CheckoutSubmission): SubmissionResult;
  /** Settles a session completed with `delayed: true`. */
  settleAsyncPayment(sessionId: string, outcome: "succeeded" | "failed"): Stripe.Checkout.Session;
  /** Forgets every object, event and idempotency key (the clock stays where it is). */
  reset(): void;
}

export interface ControlDeps {
  engine: Engine;
  sender: WebhookSender;
  getMode: () => DeliveryMode;
  setMode: (mode: DeliveryMode) => void;
}

export function createControl({ engine, sender, getMode, setMode }: ControlDeps): FakeStripeControl {
  const requireEvent = (id: string): Stripe.Event => {
    const event = engine.get("event", id);
    if (!event) throw new ControlError(404, "not_found", `No such event: '${id}'`);
    return event;
  };

  const processDue = (report: AdvanceReport) => {
    report.expiredSessions.push(...expireDueSessions(engine));
    const subscriptions = processDueSubscriptions(engine);
    report.renewed.push(...subscriptions.renewed);
    report.failedRenewals.push(...subscriptions.failed);
    report.endedSubscriptions.push(...subscriptions.ended);
  };

  const nextDue = (after: number): number | undefined => {
    let next = Infinity;
    for (const session of engine.store.all("checkout.session")) {
      if (session.status === "open" && session.expires_at > after) next = Math.min(next, session.expires_at);
    }
    for (const subscription of engine.store.all("subscription")) {
      const due = nextDueTime(subscription);
      if (due !== undefined && due > after) next = Math.min(next, due);
    }
    return Number.isFinite(next) ? next : undefined;
  };

  return {
    events(filter = {}) {
      const { type } = filter;
      const matches = (eventType: string) => !type || (type.endsWith("*") ? eventType.startsWith(type.slice(0, -1)) : eventType === type);
      const events = engine.newestFirst("event", (event) => matches(event.type));
      return filter.limit === undefined ? events : events.slice(0, filter.limit);
    },
    event: (id) => engine.get("event", id),
    replayEvent(id) {
      return sender.send(requireEvent(id), "replay");
    },
    duplicateEvent(id, copies = 2) {
      const event = requireEvent(id);
      return Array.from({ length: copies }, () => sender.send(event, "duplicate")).flat();
    },
    async deliverEvents(ids, options = {}) {
      const events = ids.map(requireEvent);
      const order = options.order ?? "given";
      const ordered = order === "reverse" ? [...events].reverse() : order === "shuffled" ? shuffle(events, options.seed ?? Date.now()) : events;
      const deliveries = await sender.sendInOrder(ordered, "ordered");
      return { order: ordered.map((event) => event.id), deliveries };
    },
    deliveries: (filter) => sender.deliveries(filter),
    waitForDeliveries: () => sender.idle(),
    webhook: () => sender.endpoints[0] ?? null,
    setWebhook(endpoint) {
      if (!endpoint) {
        sender.setEndpoints([]);
        return null;
      }
      let url: URL;
      try {
        url = new URL(endpoint.url);
      } catch {
        throw new ControlError(400, "invalid_url", `Not a valid URL: ${endpoint.url}`);
      }
      if (url.protocol !== "http:" && url.protocol !== "https:") throw new ControlError(400, "invalid_url", `Webhook URLs must be http or https: ${endpoint.url}`);
      const configured: WebhookEndpoint = { url: url.toString(), secret: endpoint.secret || newWebhookSecret(), enabledEvents: endpoint.enabledEvents ?? ["*"] };
      sender.setEndpoints([configured]);
      return configured;
    },
    setDeliveryMode: setMode,
    deliveryMode: getMode,
    now: () => engine.now(),
    advanceClock(seconds) {
      if (!Number.isFinite(seconds) || seconds < 0) throw new ControlError(400, "invalid_request", `seconds must be a non-negative number, got ${seconds}`);
      const report: AdvanceReport = { now: engine.now(), expiredSessions: [], renewed: [], failedRenewals: [], endedSubscriptions: [] };
      const target = engine.now() + Math.round(seconds);
      processDue(report);
      for (let step = 0; step < 100_000; step++) {
        const next = nextDue(engine.now());
        if (next === undefined || next > target) break;
        engine.clock.advanceTo(next);
        processDue(report);
      }
      engine.clock.advanceTo(target);
      processDue(report);
      report.now = engine.now();
      return report;
    },
    failNextRenewal(subscriptionId = "*", count = 1) {
      failNextRenewal(engine, subscriptionId, count);
    },
    expireDueSessions: () => expireDueSessions(engine),
    completeSession: (sessionId, submission) => submitCheckout(engine, sessionId, submission),
    settleAsyncPayment: (sessionId, outcome) => settleAsyncPayment(engine, sessionId, outcome),
    reset() {
      engine.store.reset();
    },
  };
}

class ControlError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

/** JSON over HTTP under `<base>/__control/…`; see `FakeStripeControl` for what each does. */
export function createControlHandlers(control: FakeStripeControl, base: string): HttpHandler[] {
  const at = (path: string) => `${base}/__control${path}`;
  const id = (params: Record<string, string | readonly string[] | undefined>) => decodeURIComponent(String(params.id ?? ""));

  return [
    http.get(at(""), () =>
      json(200, {
        routes: [
          "GET  /__control/events?type=&limit=",
          "GET  /__control/events/:id",
          "POST /__control/events/:id/replay",
          "POST /__control/events/:id/duplicate {copies?}",
          "POST /__control/events/deliver {ids, order?: given|reverse|shuffled, seed?}",
          "GET  /__control/deliveries?event=",
          "POST /__control/deliveries/wait",
          "GET|PUT|DELETE /__control/webhook {url, secret?, enabled_events?}",
          "PUT  /__control/webhook/mode {mode: auto|manual}",
          "GET  /__control/clock",
          "POST /__control/clock/advance {seconds?, days?}",
          "POST /__control/renewals/fail-next {subscription?, count?}",
          "POST /__control/sessions/expire-due",
          "POST /__control/sessions/:id/complete {card_number, card_expiry?, card_cvc?, card_name?, email?, delayed?}",
          "POST /__control/sessions/:id/async-payment {outcome: succeeded|failed}",
          "POST /__control/reset",
        ],
      }),
    ),
    http.get(at("/events"), ({ request }) =>
      guarded(() => {
        const url = new URL(request.url);
        const limit = url.searchParams.get("limit");
        return control.events({ ...(url.searchParams.get("type") ? { type: url.searchParams.get("type")! } : {}), ...(limit ? { limit: Number(limit) } : {}) });
      }),
    ),
    http.post(at("/events/deliver"), ({ request }) =>
      guarded(async () => {
        const body = await readJson(request);
        const ids = Array.isArray(body.ids) ? body.ids.map(String) : [];
        if (ids.length === 0) throw new ControlError(400, "invalid_request", `Give the events to send as {"ids": ["evt_…", …]}`);
        const order = body.order === "reverse" || body.order === "shuffled" ? body.order : "given";
        return control.deliverEvents(ids, { order, ...(typeof body.seed === "number" ? { seed: body.seed } : {}) });
      }),
    ),
    http.get(at("/events/:id"), ({ params }) =>
      guarded(() => {
        const event = control.event(id(params));
        if (!event) throw new ControlError(404, "not_found", `No such event: '${id(params)}'`);
        return event;
      }),
    ),
    http.post(at("/events/:id/replay"), ({ params }) => guarded(() => ({ deliveries: control.replayEvent(id(params)) }))),
    http.post(at("/events/:id/duplicate"), ({ params, request }) =>
      guarded(async () => {
        const body = await readJson(request);
        return { deliveries: control.duplicateEvent(id(params), typeof body.copies === "number" ? body.copies : 2) };
      }),
    ),
    http.get(at("/deliveries"), ({ request }) =>
      guarded(() => {
        const eventId = new URL(request.url).searchParams.get("event");
        return control.deliveries(eventId ? { eventId } : {});
      }),
    ),
    http.post(at("/deliveries/wait"), () =>
      guarded(async () => {
        await control.waitForDeliveries();
        return { ok: true };
      }),
    ),
    http.get(at("/webhook"), () => guarded(() => ({ endpoint: control.webhook(), mode: control.deliveryMode() }))),
    ...(["put", "post"] as const).map((method) =>
      http[method](at("/webhook"), ({ request }) =>
        guarded(async () => {
          const body = await readJson(request);
          if (typeof body.url !== "string") throw new ControlError(400, "invalid_request", `Give the endpoint as {"url": "http://…", "secret": "whsec_…"}`);
          const enabled = Array.isArray(body.enabled_events) ? body.enabled_events.map(String) : undefined;
          const endpoint = control.setWebhook({ url: body.url, ...(typeof body.secret === "string" ? { secret: body.secret } : {}), ...(enabled ? { enabledEvents: enabled } : {}) });
          return { endpoint, mode: control.deliveryMode() };
        }),
      ),
    ),
    http.delete(at("/webhook"), () => guarded(() => ({ endpoint: control.setWebhook(null) }))),
    http.put(at("/webhook/mode"), ({ request }) =>
      guarded(async () => {
        const body = await readJson(request);
        if (body.mode !== "auto" && body.mode !== "manual") throw new ControlError(400, "invalid_request", `mode must be "auto" or "manual"`);
        control.setDeliveryMode(body.mode);
        return { mode: control.deliveryMode() };
      }),
    ),
    http.get(at("/clock"), () => guarded(() => clockView(control.now()))),
    http.post(at("/clock/advance"), ({ request }) =>
      guarded(async () => {
        const body = await readJson(request);
        const seconds = (typeof body.seconds === "number" ? body.seconds : 0) + (typeof body.days === "number" ? body.days * 86_400 : 0);
        const report = control.advanceClock(seconds);
        return { ...report, ...clockView(report.now) };
      }),
    ),
    http.post(at("/renewals/fail-next"), ({ request }) =>
      guarded(async () => {
        const body = await readJson(request);
        control.failNextRenewal(typeof body.subscription === "string" ? body.subscription : undefined, typeof body.count === "number" ? body.count : 1);
        return { ok: true };
      }),
    ),
    http.post(at("/sessions/expire-due"), () => guarded(() => ({ expired: control.expireDueSessions() }))),
    http.post(at("/sessions/:id/complete"), ({ params, request }) =>
      guarded(async () => {
        const body = await readJson(request);
        const text = (key: string, fallback: string) => (typeof body[key] === "string" ? (body[key] as string) : fallback);
        const result = control.completeSession(id(params), {
          card: { number: text("card_number", "4242 4242 4242 4242"), expiry: text("card_expiry", "12 / 40"), cvc: text("card_cvc", "123"), name: text("card_name", "") },
          ...(typeof body.email === "string" ? { email: body.email } : {}),
          delayed: body.delayed === true,
        });
        return result;
      }),
    ),
    http.post(at("/sessions/:id/async-payment"), ({ params, request }) =>
      guarded(async () => {
        const body = await readJson(request);
        if (body.outcome !== "succeeded" && body.outcome !== "failed") throw new ControlError(400, "invalid_request", `outcome must be "succeeded" or "failed"`);
        return control.settleAsyncPayment(id(params), body.outcome);
      }),
    ),
    http.post(at("/reset"), () =>
      guarded(() => {
        control.reset();
        return { ok: true };
      }),
    ),
    http.all(at("/*"), ({ request }) => json(404, { error: { code: "not_found", message: `No control route for ${request.method} ${new URL(request.url).pathname}` } })),
  ];
}

function clockView(now: number) {
  return { now, iso: new Date(now * 1000).toISOString() };
}

async function guarded(work: () => unknown): Promise<Response> {
  try {
    return json(200, await work());
  } catch (error) {
    if (error instanceof ControlError) return json(error.status, { error: { code: error.code, message: error.message } });
    if (error instanceof StripeApiError) return json(error.status, error.toJSON());
    if (error instanceof RangeError) return json(400, { error: { code: "invalid_request", message: error.message } });
    return json(500, { error: { code: "internal_error", message: error instanceof Error ? error.message : String(error) } });
  }
}

async function readJson(request: Request): Promise<Record<string, unknown>> {
  const text = await request.text();
  if (text.trim() === "") return {};
  try {
    const parsed: unknown = JSON.parse(text);
    if (typeof parsed === "object" && parsed !== null && !Array.isArray(parsed)) return parsed as Record<string, unknown>;
  } catch {
    // Reported below.
  }
  throw new ControlError(400, "invalid_json", "The control API takes a JSON object body");
}

function json(status: number, body: unknown): Response {
  return HttpResponse.json(body as Record<string, unknown>, { status, headers: { "cache-control": "no-store" } });
}


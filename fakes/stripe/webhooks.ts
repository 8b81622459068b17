import { createHmac } from "node:crypto";
import type Stripe from "stripe";
import { newId } from "./ids";

export interface WebhookEndpoint {
  url: string;
  /** `whsec_…`: what the receiving app passes to `stripe.webhooks.constructEvent`. */
  secret: string;
  /** Event types to send; `["*"]` (the default) sends all. */
  enabledEvents?: string[];
}

export interface RetryPolicy {
  /** Attempts in all, the first included. */
  maxAttempts: number;
  /** Wait before the second attempt; each later wait doubles, up to `maxDelayMs`. */
  initialDelayMs: number;
  maxDelayMs: number;
  /** An endpoint that has not answered by then counts as failed, as at Stripe. */
  timeoutMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = { maxAttempts: 8, initialDelayMs: 1_000, maxDelayMs: 60_000, timeoutMs: 10_000 };

export type DeliveryReason = "event" | "replay" | "duplicate" | "ordered";

export interface DeliveryAttempt {
  /** Real time of the attempt, ISO 8601 (signatures use real time; see `signPayload`). */
  at: string;
  status: number | null;
  error: string | null;
  durationMs: number;
}

export interface Delivery {
  id: string;
  eventId: string;
  eventType: string;
  endpoint: string;
  reason: DeliveryReason;
  state: "pending" | "delivered" | "failed" | "abandoned";
  attempts: DeliveryAttempt[];
  nextAttemptAt: string | null;
}

export interface WebhookSenderOptions {
  retry?: Partial<RetryPolicy>;
  /** Defaults to the global fetch (which msw intercepts in-process). */
  fetch?: typeof fetch;
  onLog?: (line: string) => void;
  /** Told once per delivery when it ends (delivered or out of attempts). */
  onSettled?: (delivery: Delivery) => void;
  /** Oldest finished deliveries are forgotten beyond this. */
  maxKept?: number;
}

/**
 * The `Stripe-Signature` header exactly as Stripe builds it: `t=<unix seconds>,v1=<hex HMAC-SHA256
 * of "<t>.<raw body>" keyed with the endpoint secret>` (Stripe's "Verify webhook signatures" guide).
 * The timestamp is real time even when the fake clock has moved: receivers compare it with their
 * own clock (the SDK's default tolerance is 300 s).
 */
export function signPayload(payload: string, secret: string, timestamp = Math.floor(Date.now() / 1000)): string {
  const signature = createHmac("sha256", secret).update(`${timestamp}.${payload}`, "utf8").digest("hex");
  return `t=${timestamp},v1=${signature}`;
}

/** Stripe sends events pretty-printed with two spaces. */
export function eventPayload(event: Stripe.Event): string {
  return JSON.stringify(event, null, 2);
}

export function newWebhookSecret(): string {
  return newId("whsec");
}

interface Pending {
  delivery: Delivery;
  payload: string;
  secret: string;
  timer?: NodeJS.Timeout;
  inFlight?: Promise<void>;
}

/**
 * POSTs events to the configured endpoints and retries with exponential backoff while the endpoint
 * answers non-2xx or cannot be reached. Redirects count as failures (Stripe does not follow them).
 */
export class WebhookSender {
  private endpointList: WebhookEndpoint[] = [];
  private readonly retry: RetryPolicy;
  private readonly fetchImpl: typeof fetch | undefined;
  private readonly log: (line: string) => void;
  private readonly onSettled: (delivery: Delivery) => void;
  private readonly maxKept: number;
  private readonly all: Delivery[] = [];
  private readonly pending = new Map<string, Pending>();
  private idleWaiters: (() => void)[] = [];
  private closed = false;

  constructor(options: WebhookSenderOptions = {}) {
    this.retry = { ...DEFAULT_RETRY, ...options.retry };
    this.fetchImpl = options.fetch;
    this.log = options.onLog ?? (() => {});
    this.onSettled = options.onSettled ?? (() => {});
    this.maxKept = options.maxKept ?? 2_000;
  }

  get endpoints(): readonly WebhookEndpoint[] {
    return this.endpointList;
  }

  setEndpoints(endpoints: WebhookEndpoint[]): void {
    this.endpointList = endpoints.map((endpoint) => ({ ...endpoint, enabledEvents: endpoint.enabledEvents ?? ["*"] }));
  }

  /** Endpoints that want this event type. */
  endpointsFor(eventType: string): WebhookEndpoint[] {
    return this.endpointList.filter((endpoint) => (endpoint.enabledEvents ?? ["*"]).some((type) => type === "*" || type === eventType));
  }

  /** Starts one delivery per interested endpoint; attempts continue in the background. */
  send(event: Stripe.Event, reason: DeliveryReason): Delivery[] {
    return this.endpointsFor(event.type).map((endpoint) => {
      const entry = this.track(event, endpoint, reason);
      entry.inFlight = this.attempt(entry);
      return entry.delivery;
    });
  }

  /**
   * Delivers events one after another in the order given: each first attempt has been answered
   * before the next event goes out (retries of failed ones still follow their own schedule).
   */
  async sendInOrder(events: Stripe.Event[], reason: DeliveryReason = "ordered"): Promise<Delivery[]> {
    const deliveries: Delivery[] = [];
    for (const event of events) {
      for (const endpoint of this.endpointsFor(event.type)) {
        const entry = this.track(event, endpoint, reason);
        entry.inFlight = this.attempt(entry);
        await entry.inFlight;
        deliveries.push(entry.delivery);
      }
    }
    return deliveries;
  }

  deliveries(filter: { eventId?: string } = {}): Delivery[] {
    return this.all.filter((delivery) => filter.eventId === undefined || delivery.eventId === filter.eventId).map((delivery) => structuredClone(delivery));
  }

  /** Resolves once no delivery is in flight or waiting for a retry. */
  idle(): Promise<void> {
    if (this.pending.size === 0) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  /** Stops retrying; deliveries still pending are marked abandoned. */
  close(): void {
    this.closed = true;
    for (const entry of this.pending.values()) {
      clearTimeout(entry.timer);
      entry.delivery.state = "abandoned";
      entry.delivery.nextAttemptAt = null;
    }
    this.pending.clear();
    this.notifyIdle();
  }

  private track(event: Stripe.Event, endpoint: WebhookEndpoint, reason: DeliveryReason): Pending {
    const delivery: Delivery = {
      id: newId("we"),
      eventId: event.id,
      eventType: event.type,
      endpoint: endpoint.url,
      reason,
      state: "pending",
      attempts: [],
      nextAttemptAt: null,
    };
    this.all.push(delivery);
    this.forgetOld();
    const entry: Pending = { delivery, payload: eventPayload(event), secret: endpoint.secret };
    this.pending.set(delivery.id, entry);
    return entry;
  }

  private async attempt(entry: Pending): Promise<void> {
    const { delivery } = entry;
    if (this.closed) return;
    delivery.nextAttemptAt = null;
    const started = Date.now();
    let status: number | null = null;
    let error: string | null = null;
    try {
      const response = await (this.fetchImpl ?? fetch)(delivery.endpoint, {
        method: "POST",
        headers: {
          "content-type": "application/json; charset=utf-8",
          accept: "*/*; q=0.5, application/xml",
          "cache-control": "no-cache",
          "user-agent": "Stripe/1.0 (+https://stripe.com/docs/webhooks)",
          "stripe-signature": signPayload(entry.payload, entry.secret),
        },
        body: entry.payload,
        redirect: "manual",
        signal: AbortSignal.timeout(this.retry.timeoutMs),
      });
      status = response.status;
      // Read (and drop) the body so the connection can be reused.
      await response.arrayBuffer().catch(() => undefined);
    } catch (cause) {
      error = cause instanceof Error ? (cause.cause instanceof Error ? `${cause.message}: ${cause.cause.message}` : cause.message) : String(cause);
    }
    if (this.closed) return;
    delivery.attempts.push({ at: new Date(started).toISOString(), status, error, durationMs: Date.now() - started });
    const ok = status !== null && status >= 200 && status < 300;
    this.log(`${delivery.eventType} ${delivery.eventId} → ${delivery.endpoint}: ${status ?? error} (attempt ${delivery.attempts.length})`);

    if (ok) return this.settle(entry, "delivered");
    if (delivery.attempts.length >= this.retry.maxAttempts) return this.settle(entry, "failed");
    const delay = Math.min(this.retry.initialDelayMs * 2 ** (delivery.attempts.length - 1), this.retry.maxDelayMs);
    delivery.nextAttemptAt = new Date(Date.now() + delay).toISOString();
    entry.timer = setTimeout(() => {
      entry.timer = undefined;
      entry.inFlight = this.attempt(entry);
    }, delay);
    entry.timer.unref();
  }

  private settle(entry: Pending, state: "delivered" | "failed"): void {
    entry.delivery.state = state;
    entry.delivery.nextAttemptAt = null;
    this.pending.delete(entry.delivery.id);
    this.onSettled(structuredClone(entry.delivery));
    this.notifyIdle();
  }

  private notifyIdle(): void {
    if (this.pending.size > 0) return;
    const waiters = this.idleWaiters;
    this.idleWaiters = [];
    for (const resolve of waiters) resolve();
  }

  private forgetOld(): void {
    let excess = this.all.length - this.maxKept;
    for (let i = 0; excess > 0 && i < this.all.length; ) {
      if (this.all[i]!.state !== "pending") {
        this.all.splice(i, 1);
        excess--;
      } else i++;
    }
  }
}

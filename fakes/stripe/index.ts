import type { HttpHandler } from "msw";
import Stripe from "stripe";
import { FakeClock } from "./clock";
import { createControl, createControlHandlers, type DeliveryMode, type FakeStripeControl } from "./control";
import { Engine } from "./engine";
import { createApiHandlers } from "./handlers";
import { createPageHandlers } from "./hosted";
import { FakeStripeStore } from "./store";
import { WebhookSender, type Delivery, type RetryPolicy, type WebhookEndpoint } from "./webhooks";

export type { AdvanceReport, DeliveryMode, FakeStripeControl } from "./control";
export type { CheckoutSubmission, SubmissionResult } from "./resources/checkout";
export { FakeClock, addMonthsUtc } from "./clock";
export { FakeStripeStore } from "./store";
export { TEST_CARDS } from "./test-cards";
export { DEFAULT_RETRY, signPayload, type Delivery, type RetryPolicy, type WebhookEndpoint } from "./webhooks";

export interface FakeStripeOptions {
  /** Defaults to an in-memory store. */
  store?: FakeStripeStore;
  /** Defaults to a clock restored from the store (running with real time, plus any advances). */
  clock?: FakeClock;
  /**
   * Origin of the hosted pages and control API, e.g. `http://localhost:3003`. In-process, pick any
   * origin the tests fetch; the page and control handlers only answer there, so they never shadow
   * the app's own routes. A function when the port is only known after listening.
   */
  publicUrl?: string | (() => string);
  webhook?: { url: string; secret: string; enabledEvents?: string[] } | null;
  webhookRetry?: Partial<RetryPolicy>;
  /** `manual` keeps events from being sent until a test delivers them. Defaults to `auto`. */
  deliveryMode?: DeliveryMode;
  /** Shown in events' `api_version`; defaults to the installed SDK's pinned version. */
  apiVersion?: string;
  /** Shown on the hosted page. */
  merchantName?: string;
  /** Answer unknown `/v1/…` routes with Stripe's 404 (the HTTP server does; in-process, msw reports them). */
  fallback?: boolean;
  onLog?: (line: string) => void;
  /** For webhook deliveries; defaults to the global fetch. */
  fetch?: typeof fetch;
}

export interface FakeStripe {
  /** msw handlers: the Stripe API, the hosted pages and the control API. */
  handlers: HttpHandler[];
  control: FakeStripeControl;
  engine: Engine;
  store: FakeStripeStore;
  clock: FakeClock;
  webhooks: WebhookSender;
  /** Stops webhook retries and writes the store. */
  close(): Promise<void>;
}

/**
 * A local stand-in for the parts of Stripe Proofbay uses. Use the handlers with `setupServer`
 * from `msw/node` in tests, or serve them with `startFakeStripe` (./server.ts).
 */
export function createFakeStripe(options: FakeStripeOptions = {}): FakeStripe {
  const store = options.store ?? FakeStripeStore.memory();
  const clock = options.clock ?? new FakeClock(store.clockState);
  store.setClockState(clock.snapshot());
  clock.onChange((state) => store.setClockState(state));

  // A reserved name (RFC 2606) that never resolves, so a request that slips past msw goes nowhere.
  const publicUrl = options.publicUrl ?? "http://fake-stripe.test";
  const publicUrlOf = typeof publicUrl === "function" ? publicUrl : () => publicUrl;
  // Over HTTP the server only serves the fake, so any origin will do; in-process they are pinned.
  const base = typeof publicUrl === "string" ? publicUrl.replace(/\/$/, "") : "*";
  const log = options.onLog ?? (() => {});

  const engine = new Engine({ store, clock, apiVersion: options.apiVersion ?? Stripe.API_VERSION, publicUrl: publicUrlOf, onWarning: log });

  const onSettled = (delivery: Delivery) => {
    if (delivery.reason !== "event" || delivery.state !== "delivered") return;
    const event = store.get("event", delivery.eventId);
    if (event && event.pending_webhooks > 0) {
      event.pending_webhooks -= 1;
      store.put("event", event);
    }
  };
  const webhooks = new WebhookSender({ ...(options.webhookRetry ? { retry: options.webhookRetry } : {}), ...(options.fetch ? { fetch: options.fetch } : {}), onLog: log, onSettled });
  if (options.webhook) webhooks.setEndpoints([options.webhook satisfies WebhookEndpoint]);

  let mode: DeliveryMode = options.deliveryMode ?? "auto";
  engine.onEvent((event) => {
    const endpoints = webhooks.endpointsFor(event.type);
    if (mode !== "auto" || endpoints.length === 0) return;
    event.pending_webhooks = endpoints.length;
    store.put("event", event);
    webhooks.send(event, "event");
  });

  const control = createControl({ engine, sender: webhooks, getMode: () => mode, setMode: (next) => (mode = next) });
  const merchantName = options.merchantName ?? "Proofbay";
  const handlers = [
    ...createApiHandlers(engine, { fallback: options.fallback ?? false }),
    ...createPageHandlers(engine, base, merchantName),
    ...createControlHandlers(control, base),
  ];

  return {
    handlers,
    control,
    engine,
    store,
    clock,
    webhooks,
    close: async () => {
      webhooks.close();
      await store.close();
    },
  };
}

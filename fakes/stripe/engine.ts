import type Stripe from "stripe";
import type { FakeClock } from "./clock";
import { StripeApiError, invalidRequest, noSuch } from "./errors";
import { newId } from "./ids";
import { apiList, invoicePayment } from "./objects";
import type { FakeStripeStore, ObjectKind, ObjectKinds } from "./store";

/** Which API call caused a change; events carry it as `request`. Hosted-page and clock changes have none. */
export interface RequestContext {
  requestId: string | null;
  idempotencyKey: string | null;
}

export const NO_REQUEST: RequestContext = { requestId: null, idempotencyKey: null };

export interface EngineOptions {
  store: FakeStripeStore;
  clock: FakeClock;
  /** Written into events' `api_version`. */
  apiVersion: string;
  /** Origin of the hosted pages, e.g. http://localhost:3003 (a function: the port may be known late). */
  publicUrl: () => string;
  onWarning?: (message: string) => void;
}

type EventListener = (event: Stripe.Event) => void;

const ID_PREFIXES: [string, ObjectKind][] = [
  ["cs_test_", "checkout.session"],
  ["cus_", "customer"],
  ["prod_", "product"],
  ["price_", "price"],
  ["pi_", "payment_intent"],
  ["pm_", "payment_method"],
  ["ch_", "charge"],
  ["re_", "refund"],
  ["sub_", "subscription"],
  ["in_", "invoice"],
  ["evt_", "event"],
];

/** Shared core of the fake: the store, the clock, events and the generic list/expand behaviour. */
export class Engine {
  readonly store: FakeStripeStore;
  readonly clock: FakeClock;
  readonly apiVersion: string;
  private readonly publicUrlOf: () => string;
  private readonly listeners = new Set<EventListener>();
  private readonly warned = new Set<string>();
  private readonly onWarning: (message: string) => void;

  constructor(options: EngineOptions) {
    this.store = options.store;
    this.clock = options.clock;
    this.apiVersion = options.apiVersion;
    this.publicUrlOf = options.publicUrl;
    this.onWarning = options.onWarning ?? (() => {});
  }

  now(): number {
    return this.clock.now();
  }

  publicUrl(): string {
    return this.publicUrlOf().replace(/\/$/, "");
  }

  warnOnce(message: string): void {
    if (this.warned.has(message)) return;
    this.warned.add(message);
    this.onWarning(message);
  }

  onEvent(listener: EventListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  get<K extends ObjectKind>(kind: K, id: string): ObjectKinds[K] | undefined {
    return this.store.get(kind, id);
  }

  /** The object, or Stripe's "No such …" (404 for ids in the path, 400 for ids in parameters). */
  require<K extends ObjectKind>(kind: K, id: string, where: { param: string; status: 400 | 404 }): ObjectKinds[K] {
    const object = this.store.get(kind, id);
    if (!object) throw noSuch(humanKind(kind), id, where.param, where.status);
    return object;
  }

  put<K extends ObjectKind>(kind: K, object: ObjectKinds[K]): ObjectKinds[K] {
    return this.store.put(kind, object);
  }

  /**
   * Records an event with a snapshot of the object as it is now. `before` (a snapshot taken
   * before the change) yields `previous_attributes` the way Stripe reports them: only what changed.
   */
  emit(type: Stripe.Event.Type, object: { id: string; object: string }, request: RequestContext, before?: unknown): Stripe.Event {
    const snapshot = clone(object);
    const data: { object: unknown; previous_attributes?: unknown } = { object: snapshot };
    if (before !== undefined) {
      const previous = diff(before, snapshot);
      if (previous && typeof previous === "object") data.previous_attributes = previous;
    }
    const event = {
      id: newId("evt"),
      object: "event",
      api_version: this.apiVersion,
      created: this.now(),
      data,
      livemode: false,
      pending_webhooks: 0,
      request: { id: request.requestId, idempotency_key: request.idempotencyKey },
      type,
    } as unknown as Stripe.Event;
    this.store.put("event", event);
    for (const listener of this.listeners) listener(event);
    return event;
  }

  /** Runs `change` on the stored object and records one event for it, with what changed. */
  update<K extends ObjectKind>(kind: K, object: ObjectKinds[K], type: Stripe.Event.Type | null, request: RequestContext, change: (object: ObjectKinds[K]) => void): ObjectKinds[K] {
    const before = clone(object);
    change(object);
    this.store.put(kind, object);
    if (type) this.emit(type, object, request, before);
    return object;
  }

  /**
   * A Stripe list page over `items` (newest first): `limit`, `starting_after`, `ending_before`,
   * `has_more`, and `url` without the query.
   */
  list<T extends { id: string }>(items: T[], page: { limit: number; startingAfter?: string; endingBefore?: string }, url: string): Stripe.ApiList<T> {
    let start = 0;
    let end = items.length;
    if (page.startingAfter) {
      const index = items.findIndex((item) => item.id === page.startingAfter);
      if (index === -1) throw cursorMissing(page.startingAfter, "starting_after");
      start = index + 1;
    }
    if (page.endingBefore) {
      const index = items.findIndex((item) => item.id === page.endingBefore);
      if (index === -1) throw cursorMissing(page.endingBefore, "ending_before");
      end = index;
      start = Math.max(0, end - page.limit);
      return apiList(items.slice(start, end), url, start > 0);
    }
    const data = items.slice(start, start + page.limit);
    return apiList(data, url, start + page.limit < end);
  }

  /** Newest first: Stripe lists in reverse creation order. */
  newestFirst<K extends ObjectKind>(kind: K, filter: (object: ObjectKinds[K]) => boolean = () => true): ObjectKinds[K][] {
    return this.store.all(kind).filter(filter).reverse();
  }

  /**
   * Applies `expand[]` to a response the way Stripe does: ids become the objects they name,
   * dotted paths go deeper (at most four levels), `data.` walks into list pages, and a few
   * properties exist only when expanded (`line_items` on sessions, `payments` on invoices).
   */
  expand(value: unknown, paths: string[]): unknown {
    if (paths.length === 0) return value;
    const result = clone(value);
    for (const path of paths) {
      const segments = path.split(".");
      if (segments.length > 4) {
        throw invalidRequest(`You cannot expand more than 4 levels of a property. Property: ${path}`, "expand");
      }
      this.expandPath(result, segments, path);
    }
    return result;
  }

  private expandPath(target: unknown, segments: string[], fullPath: string): void {
    const [head, ...rest] = segments;
    if (head === undefined || target === null || typeof target !== "object") return;
    const record = target as Record<string, unknown>;

    if (record.object === "list" && head === "data" && Array.isArray(record.data)) {
      for (const item of record.data) this.expandPath(item, rest, fullPath);
      return;
    }

    const current = record[head];
    // An object here was expanded by an earlier path (`payment_intent` before `payment_intent.latest_charge`).
    if (current === null || typeof current !== "object") record[head] = this.expandable(record, head, fullPath);
    if (rest.length > 0) this.expandPath(record[head], rest, fullPath);
  }

  private expandable(owner: Record<string, unknown>, property: string, fullPath: string): unknown {
    const value = owner[property];
    if (owner.object === "checkout.session" && property === "line_items" && typeof owner.id === "string") {
      const items = this.store.extras.sessionLineItems[owner.id] ?? [];
      return apiList(clone(items), `/v1/checkout/sessions/${owner.id}/line_items`);
    }
    if (owner.object === "invoice" && property === "payments" && typeof owner.id === "string") {
      return apiList(this.invoicePayments(owner.id), `/v1/invoice_payments`);
    }
    if (value === null && property in owner) return null;
    const kind = typeof value === "string" ? kindOfId(value) : undefined;
    if (typeof value === "string" && kind) {
      const object = this.store.get(kind, value);
      // Dangling ids stay ids, as with objects that were deleted.
      return object ? clone(object) : value;
    }
    throw invalidRequest(`This property cannot be expanded (${fullPath}).`, "expand");
  }

  private invoicePayments(invoiceId: string): Stripe.InvoicePayment[] {
    const invoice = this.store.get("invoice", invoiceId);
    if (!invoice) return [];
    const intentId = this.store.extras.invoicePaymentIntents[invoiceId];
    const intent = intentId ? this.store.get("payment_intent", intentId) : undefined;
    return intent ? [invoicePayment({ now: intent.created, invoice, paymentIntent: intent })] : [];
  }
}

export function kindOfId(id: string): ObjectKind | undefined {
  return ID_PREFIXES.find(([prefix]) => id.startsWith(prefix))?.[1];
}

export function clone<T>(value: T): T {
  return structuredClone(value);
}

function humanKind(kind: ObjectKind): string {
  return kind === "checkout.session" ? "checkout.session" : kind;
}

function cursorMissing(id: string, param: string): StripeApiError {
  const kind = kindOfId(id);
  return noSuch(kind ? humanKind(kind) : "object", id, param, 400);
}

/** What `before` had where it differs from `after`, nested like Stripe's `previous_attributes`. */
function diff(before: unknown, after: unknown): unknown {
  if (isPlainObject(before) && isPlainObject(after)) {
    const changed: Record<string, unknown> = {};
    for (const key of new Set([...Object.keys(before), ...Object.keys(after)])) {
      if (JSON.stringify(before[key]) === JSON.stringify(after[key])) continue;
      const nested = isPlainObject(before[key]) && isPlainObject(after[key]) ? diff(before[key], after[key]) : before[key];
      changed[key] = nested === undefined ? null : nested;
    }
    return Object.keys(changed).length > 0 ? changed : undefined;
  }
  return JSON.stringify(before) === JSON.stringify(after) ? undefined : before;
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

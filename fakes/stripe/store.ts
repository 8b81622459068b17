import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import type Stripe from "stripe";
import type { ClockState } from "./clock";

/** Every kind of object the fake keeps, by its Stripe `object` name. */
export interface ObjectKinds {
  customer: Stripe.Customer;
  product: Stripe.Product;
  price: Stripe.Price;
  "checkout.session": Stripe.Checkout.Session;
  payment_intent: Stripe.PaymentIntent;
  payment_method: Stripe.PaymentMethod;
  charge: Stripe.Charge;
  refund: Stripe.Refund;
  subscription: Stripe.Subscription;
  invoice: Stripe.Invoice;
  event: Stripe.Event;
}

export type ObjectKind = keyof ObjectKinds;

const KINDS: readonly ObjectKind[] = [
  "customer",
  "product",
  "price",
  "checkout.session",
  "payment_intent",
  "payment_method",
  "charge",
  "refund",
  "subscription",
  "invoice",
  "event",
];

export interface IdempotencyRecord {
  /** The key as the caller sent it, scoped to the API key that sent it. */
  scope: string;
  key: string;
  method: string;
  path: string;
  /** Canonical JSON of the decoded parameters, compared on reuse. */
  fingerprint: string;
  status: number;
  body: string;
  requestId: string;
  /** Unix seconds on the fake clock; Stripe keeps keys for at least 24 hours. */
  createdAt: number;
}

/** State that is the fake's own bookkeeping, not a Stripe object. */
export interface Extras {
  /** Checkout Session id → its line items (Stripe only returns them when expanded or listed). */
  sessionLineItems: Record<string, Stripe.LineItem[]>;
  /** Subscription id (or "*" for any) → how many coming renewals should fail. */
  failingRenewals: Record<string, number>;
  /** Session id → how the hosted page was completed, for the delayed-payment trigger. */
  pendingAsyncPayments: Record<string, { paymentMethod: string }>;
  /** Invoice id → the payment intent that pays it (the API shows it only through `payments`). */
  invoicePaymentIntents: Record<string, string>;
  /** What a Checkout Session passes on to the objects it creates when it completes. */
  sessionOptions: Record<string, SessionOptions>;
}

export interface SessionOptions {
  paymentIntentData: { metadata: Record<string, string>; description: string | null; receiptEmail: string | null } | null;
  subscriptionData: { metadata: Record<string, string>; description: string | null } | null;
}

interface StoreFile {
  version: typeof FORMAT_VERSION;
  clock: ClockState;
  objects: { [K in ObjectKind]?: ObjectKinds[K][] };
  extras: Extras;
  idempotency: IdempotencyRecord[];
}

export interface StoreOptions {
  /** JSON file; when set, state survives restarts. Without it the store lives in memory (tests). */
  filePath?: string;
  saveIntervalMs?: number;
  onSaveError?: (error: unknown) => void;
}

const FORMAT_VERSION = 1;
const DEFAULT_SAVE_INTERVAL_MS = 300;

/**
 * The fake's state: Stripe objects by kind in creation order, idempotency records, the clock and
 * a little bookkeeping. Changes are written at most once per interval (to a temp file, then
 * renamed, so a crash never leaves half a file).
 */
export class FakeStripeStore {
  private objects = emptyObjects();
  private idempotency = new Map<string, IdempotencyRecord>();
  extras: Extras = emptyExtras();
  clockState: ClockState = { offsetSeconds: 0, frozenAt: null };

  /** True when the state came from an existing store file. */
  restored = false;
  private dirty = false;
  private timer: NodeJS.Timeout | undefined;
  private saving: Promise<void> | undefined;
  private closed = false;

  private constructor(private readonly options: StoreOptions) {}

  static async open(options: StoreOptions = {}): Promise<FakeStripeStore> {
    const store = new FakeStripeStore(options);
    if (options.filePath) store.load(await readStoreFile(options.filePath));
    return store;
  }

  /** An in-memory store, synchronously (tests and in-process handlers). */
  static memory(): FakeStripeStore {
    return new FakeStripeStore({});
  }

  get<K extends ObjectKind>(kind: K, id: string): ObjectKinds[K] | undefined {
    return this.objects[kind].get(id) as ObjectKinds[K] | undefined;
  }

  /** Inserts or replaces; a replaced object keeps its place in creation order. */
  put<K extends ObjectKind>(kind: K, object: ObjectKinds[K]): ObjectKinds[K] {
    this.objects[kind].set(object.id, object);
    this.markDirty();
    return object;
  }

  /** Oldest first. */
  all<K extends ObjectKind>(kind: K): ObjectKinds[K][] {
    return [...this.objects[kind].values()] as ObjectKinds[K][];
  }

  count(kind: ObjectKind): number {
    return this.objects[kind].size;
  }

  getIdempotency(scope: string): IdempotencyRecord | undefined {
    return this.idempotency.get(scope);
  }

  putIdempotency(record: IdempotencyRecord): void {
    this.idempotency.set(record.scope, record);
    this.markDirty();
  }

  pruneIdempotency(olderThan: number): void {
    for (const [scope, record] of this.idempotency) {
      if (record.createdAt < olderThan) this.idempotency.delete(scope);
    }
  }

  setClockState(state: ClockState): void {
    this.clockState = state;
    this.markDirty();
  }

  reset(): void {
    this.objects = emptyObjects();
    this.idempotency.clear();
    this.extras = emptyExtras();
    this.markDirty();
  }

  markDirty(): void {
    if (!this.options.filePath) return;
    this.dirty = true;
    this.armTimer();
  }

  /** Writes pending changes now; the store keeps working in memory afterwards. */
  async flush(): Promise<void> {
    clearTimeout(this.timer);
    this.timer = undefined;
    while (this.saving) await this.saving;
    const filePath = this.options.filePath;
    if (!filePath || !this.dirty) return;

    this.dirty = false;
    const contents = JSON.stringify(this.snapshot());
    let failed = false;
    this.saving = writeStoreFile(filePath, contents)
      .catch((error: unknown) => {
        // Retried on the next change rather than on a timer, so a read-only disk doesn't log every interval.
        failed = true;
        this.dirty = true;
        this.options.onSaveError?.(error);
      })
      .finally(() => {
        this.saving = undefined;
      });
    await this.saving;
    if (this.dirty && !failed && !this.closed) this.armTimer();
  }

  async close(): Promise<void> {
    this.closed = true;
    await this.flush();
  }

  private armTimer(): void {
    if (this.timer || this.saving || this.closed) return;
    this.timer = setTimeout(() => {
      this.timer = undefined;
      void this.flush();
    }, this.options.saveIntervalMs ?? DEFAULT_SAVE_INTERVAL_MS);
    this.timer.unref();
  }

  private snapshot(): StoreFile {
    const objects: StoreFile["objects"] = {};
    for (const kind of KINDS) (objects as Record<string, unknown[]>)[kind] = [...this.objects[kind].values()];
    return { version: FORMAT_VERSION, clock: this.clockState, objects, extras: this.extras, idempotency: [...this.idempotency.values()] };
  }

  private load(file: StoreFile | undefined): void {
    if (!file) return;
    this.restored = true;
    this.clockState = file.clock;
    this.extras = { ...emptyExtras(), ...file.extras };
    for (const kind of KINDS) {
      const map = this.objects[kind] as Map<string, ObjectKinds[ObjectKind]>;
      for (const object of file.objects[kind] ?? []) map.set(object.id, object);
    }
    for (const record of file.idempotency) this.idempotency.set(record.scope, record);
  }
}

export function idempotencyScope(apiKey: string, idempotencyKey: string): string {
  // Stripe scopes keys to the account; the fake has one account per API key.
  return `${apiKey}\u0000${idempotencyKey}`;
}

function emptyObjects(): { [K in ObjectKind]: Map<string, ObjectKinds[K]> } {
  return Object.fromEntries(KINDS.map((kind) => [kind, new Map()])) as { [K in ObjectKind]: Map<string, ObjectKinds[K]> };
}

function emptyExtras(): Extras {
  return { sessionLineItems: {}, failingRenewals: {}, pendingAsyncPayments: {}, invoicePaymentIntents: {}, sessionOptions: {} };
}

async function readStoreFile(filePath: string): Promise<StoreFile | undefined> {
  let raw: string;
  try {
    raw = await readFile(filePath, "utf8");
  } catch (error) {
    if (error instanceof Error && "code" in error && error.code === "ENOENT") return undefined;
    throw error;
  }
  const parsed: unknown = JSON.parse(raw);
  if (!isStoreFile(parsed)) {
    throw new Error(`${filePath} is not a fake Stripe store (version ${FORMAT_VERSION}); delete it or pick another STRIPE_FAKE_STORE`);
  }
  return parsed;
}

async function writeStoreFile(filePath: string, contents: string): Promise<void> {
  await mkdir(path.dirname(filePath), { recursive: true });
  const tempPath = `${filePath}.${process.pid}.tmp`;
  await writeFile(tempPath, contents);
  await rename(tempPath, filePath);
}

function isStoreFile(value: unknown): value is StoreFile {
  if (typeof value !== "object" || value === null) return false;
  const record = value as Record<string, unknown>;
  return (
    record.version === FORMAT_VERSION &&
    typeof record.clock === "object" &&
    record.clock !== null &&
    typeof record.objects === "object" &&
    record.objects !== null &&
    Array.isArray(record.idempotency) &&
    typeof record.extras === "object"
  );
}

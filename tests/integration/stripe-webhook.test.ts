import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { processorEvents } from "@/db/schema";
import { createTempDb } from "../helpers/temp-db";

const temp = createTempDb();
process.env.DATABASE_PATH = temp.file;
const secret = "whsec_proofbay_local_fake"; // the default in lib/env.ts
const stripe = new Stripe("sk_test_x", { telemetry: false });

type Handler = (request: Request) => Promise<Response>;
let POST: Handler;
beforeAll(async () => {
  ({ POST } = (await import("@/app/api/stripe/webhook/route")) as unknown as { POST: Handler });
});
afterAll(() => temp.cleanup());

const event = (id: string) =>
  JSON.stringify({ id, object: "event", type: "checkout.session.completed", created: 1_790_000_000, data: { object: {} }, livemode: false });

function deliver(body: string, header: string | null) {
  const headers = new Headers({ "content-type": "application/json" });
  if (header) headers.set("stripe-signature", header);
  return POST(new Request("http://localhost/api/stripe/webhook", { method: "POST", body, headers }));
}

describe("POST /api/stripe/webhook", () => {
  it("accepts an event signed as the processor signs (t=…,v1=HMAC-SHA256) and records its id once", async () => {
    const body = event("evt_once");
    const header = stripe.webhooks.generateTestHeaderString({ payload: body, secret });
    const first = await deliver(body, header);
    expect(first.status).toBe(200);
    expect(await first.json()).toEqual({ received: true, duplicate: false });
    const again = await deliver(body, header);
    expect(await again.json()).toEqual({ received: true, duplicate: true });
    expect(temp.db.select().from(processorEvents).all().filter((row) => row.id === "evt_once")).toHaveLength(1);
  });

  it("refuses a missing, forged or stale signature with 400 and records nothing", async () => {
    const body = event("evt_bad");
    expect((await deliver(body, null)).status).toBe(400);
    const forged = stripe.webhooks.generateTestHeaderString({ payload: body, secret: "whsec_someone_else" });
    expect((await deliver(body, forged)).status).toBe(400);
    const tampered = stripe.webhooks.generateTestHeaderString({ payload: body, secret });
    expect((await deliver(body.replace("evt_bad", "evt_bad2"), tampered)).status).toBe(400);
    // Ten minutes old: outside the SDK's five-minute tolerance.
    const stale = stripe.webhooks.generateTestHeaderString({ payload: body, secret, timestamp: Math.floor(Date.now() / 1000) - 600 });
    const response = await deliver(body, stale);
    expect(response.status).toBe(400);
    expect((await response.json()).error.code).toBe("invalid_signature");
    expect(temp.db.select().from(processorEvents).all().some((row) => row.id.startsWith("evt_bad"))).toBe(false);
  });
});

import { expect, test } from "@playwright/test";
import Stripe from "stripe";
import { plainPort } from "./support/ports";

/** The stack runs the fake Stripe three ports above the app, with its webhook pointed at the app. */
const fakeStripe = `http://localhost:${plainPort + 3}`;

type Delivery = { eventType: string; state: string; attempts: { status: number | null }[] };

test("a payment on the fake processor reaches the app's webhook signed, and a replay is accepted once more", async ({ request }) => {
  const stripe = new Stripe("sk_test_proofbay_local_fake", { host: "localhost", port: plainPort + 3, protocol: "http", telemetry: false });
  const session = await stripe.checkout.sessions.create({
    mode: "payment",
    customer_email: "ada@backers.example",
    success_url: `http://localhost:${plainPort}/?paid={CHECKOUT_SESSION_ID}`,
    cancel_url: `http://localhost:${plainPort}/`,
    line_items: [{ quantity: 1, price_data: { currency: "usd", unit_amount: 2500, product_data: { name: "Pledge" } } }],
  });
  // Pay on the hosted test page with the published test card that always succeeds.
  const paid = await request.post(`${fakeStripe}/__control/sessions/${session.id}/complete`, {
    data: { card_number: "4242424242424242", card_expiry: "12/30", card_cvc: "123" },
  });
  expect((await paid.json()).outcome).toBe("paid");
  await request.post(`${fakeStripe}/__control/deliveries/wait`);
  const deliveries = (await (await request.get(`${fakeStripe}/__control/deliveries`)).json()) as Delivery[];
  const completed = deliveries.find((delivery) => delivery.eventType === "checkout.session.completed");
  expect(completed?.state).toBe("delivered");
  expect(completed?.attempts.at(-1)?.status).toBe(200);

  const events = (await (await request.get(`${fakeStripe}/__control/events?type=checkout.session.completed`)).json()) as { id: string }[];
  const replay = await request.post(`${fakeStripe}/__control/events/${events[0]?.id}/replay`);
  expect(replay.ok()).toBe(true);
  await request.post(`${fakeStripe}/__control/deliveries/wait`);
  const after = (await (await request.get(`${fakeStripe}/__control/deliveries`)).json()) as Delivery[];
  expect(after.filter((delivery) => delivery.eventType === "checkout.session.completed" && delivery.state === "delivered")).toHaveLength(2);
});

import { http, HttpResponse, type HttpHandler } from "msw";
import type Stripe from "stripe";
import { NO_REQUEST, type Engine } from "./engine";
import { PAGE_HEADERS, renderCheckoutPage, renderInvoicePage, renderNoticePage, renderReceiptPage } from "./pages";
import { expireSession, submitCheckout, type SubmissionResult } from "./resources/checkout";

/**
 * The hosted pages at `<base>/pay/<session id>` (the session's `url`), plus the receipt and
 * invoice pages its objects link to. The Pay button is a plain form POST; success answers
 * 303 to `success_url`.
 */
export function createPageHandlers(engine: Engine, base: string, merchantName: string): HttpHandler[] {
  const at = (path: string) => `${base}${path}`;
  const sessionId = (params: Record<string, string | readonly string[] | undefined>) => decodeURIComponent(String(params.id ?? ""));

  return [
    http.get(at("/pay/:id"), ({ params }) => {
      const session = engine.get("checkout.session", sessionId(params));
      if (session?.status === "open" && session.expires_at <= engine.now()) expireSession(engine, session.id, NO_REQUEST, false);
      if (!session || session.status !== "open") return unavailable(session, "This checkout link is not valid.");
      return html(200, renderCheckoutPage(pageModel(engine, session, merchantName)));
    }),

    http.post(at("/pay/:id"), async ({ params, request }) => {
      const form = new URLSearchParams(await request.text());
      const field = (name: string) => form.get(name) ?? "";
      const result = submitCheckout(engine, sessionId(params), {
        card: { number: field("card_number"), expiry: field("card_expiry"), cvc: field("card_cvc"), name: field("card_name") },
        email: field("email"),
      });
      return answer(engine, result, merchantName, { email: field("email"), name: field("card_name"), expiry: field("card_expiry") });
    }),

    http.get(at("/receipts/:id"), ({ params }) => {
      const charge = engine.get("charge", sessionId(params));
      if (!charge) return html(404, renderNoticePage("Receipt not found", "There is no receipt with this id."));
      return html(200, renderReceiptPage(charge, merchantName));
    }),

    http.get(at("/invoices/:id"), ({ params }) => {
      const invoice = engine.get("invoice", sessionId(params));
      if (!invoice) return html(404, renderNoticePage("Invoice not found", "There is no invoice with this id."));
      return html(200, renderInvoicePage(invoice, merchantName));
    }),
  ];
}

function answer(engine: Engine, result: SubmissionResult, merchantName: string, values: { email: string; name: string; expiry: string }): Response {
  switch (result.outcome) {
    case "paid":
    case "processing":
      if (result.redirectTo) return new HttpResponse(null, { status: 303, headers: { location: result.redirectTo, "cache-control": "no-store" } });
      return html(200, renderNoticePage("Payment complete", `Thank you — ${merchantName} has received your test payment. You can close this page.`));
    case "declined":
      // 402, as Stripe answers a declined card; the page shows the error and keeps the session open.
      return html(
        402,
        renderCheckoutPage({
          ...pageModel(engine, result.session, merchantName),
          values,
          error: { field: "card", message: `${result.message} Try another card.`, code: result.code, declineCode: result.declineCode },
        }),
      );
    case "invalid":
      return html(400, renderCheckoutPage({ ...pageModel(engine, result.session, merchantName), values, error: { field: result.field, message: result.message } }));
    case "unavailable":
      return unavailable(result.session, result.message);
  }
}

function unavailable(session: Stripe.Checkout.Session | undefined, fallback: string): Response {
  if (!session) return html(404, renderNoticePage("Checkout not found", fallback));
  if (session.status === "complete") {
    const link = session.success_url ? { href: session.success_url.replaceAll("{CHECKOUT_SESSION_ID}", session.id), label: "Continue" } : undefined;
    return html(409, renderNoticePage("Already paid", "This checkout session is complete; nothing more to pay.", link));
  }
  const link = session.cancel_url ? { href: session.cancel_url, label: "Go back" } : undefined;
  return html(410, renderNoticePage("Checkout expired", "This checkout session has expired. Go back and start again.", link));
}

function pageModel(engine: Engine, session: Stripe.Checkout.Session, merchantName: string) {
  const customer = typeof session.customer === "string" ? engine.get("customer", session.customer) : undefined;
  return {
    session,
    lineItems: engine.store.extras.sessionLineItems[session.id] ?? [],
    merchantName,
    knownEmail: session.customer_email ?? customer?.email ?? null,
  };
}

function html(status: number, body: string): Response {
  return new HttpResponse(body, { status, headers: PAGE_HEADERS });
}

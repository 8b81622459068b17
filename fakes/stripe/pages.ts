import type Stripe from "stripe";
import { TEST_CARDS } from "./test-cards";

/**
 * The fake's own hosted pages: plain HTML with inline CSS, no JavaScript. They are clearly a test
 * stand-in and borrow nothing of the card processor's look.
 */

export interface CheckoutPageModel {
  session: Stripe.Checkout.Session;
  lineItems: Stripe.LineItem[];
  merchantName: string;
  /** Email already known (customer_email or the customer's), shown read-only. */
  knownEmail: string | null;
  values?: { email?: string; name?: string; expiry?: string };
  error?: { field: string; message: string; code?: string; declineCode?: string };
}

const CSS = `
:root { --ink: #1b2330; --paper: #f7f5f0; --accent: #0e5e5b; --line: #d9d4c7; --soft: #ece8de; --error: #9b2c2c; }
* { box-sizing: border-box; }
body { margin: 0; background: var(--paper); color: var(--ink); font: 16px/1.5 system-ui, -apple-system, "Segoe UI", sans-serif; }
.banner { background: var(--accent); color: #fff; padding: 10px 16px; font-size: 14px; text-align: center; }
.banner strong { font-weight: 650; }
main { max-width: 880px; margin: 32px auto; padding: 0 16px; display: grid; gap: 32px; grid-template-columns: 1fr 1fr; }
@media (max-width: 760px) { main { grid-template-columns: 1fr; } }
h1 { font-size: 20px; margin: 0 0 4px; }
h2 { font-size: 15px; text-transform: uppercase; letter-spacing: .06em; color: #5a6270; margin: 24px 0 8px; }
.total { font-size: 32px; font-weight: 700; margin: 8px 0 16px; }
.items { list-style: none; padding: 0; margin: 0; border-top: 1px solid var(--line); }
.items li { display: flex; justify-content: space-between; gap: 16px; padding: 10px 0; border-bottom: 1px solid var(--line); }
.items .qty { color: #5a6270; font-size: 14px; }
form { background: #fff; border: 1px solid var(--line); border-radius: 10px; padding: 20px; }
label { display: block; font-size: 14px; font-weight: 600; margin: 14px 0 4px; }
input { width: 100%; font: inherit; padding: 10px 12px; border: 1px solid var(--line); border-radius: 6px; background: #fff; color: var(--ink); }
input[readonly] { background: var(--soft); }
input:focus { outline: 2px solid var(--accent); outline-offset: 1px; }
input[aria-invalid="true"] { border-color: var(--error); }
.row { display: grid; grid-template-columns: 1fr 1fr; gap: 12px; }
button { margin-top: 20px; width: 100%; font: inherit; font-weight: 650; padding: 12px; border: 0; border-radius: 6px; background: var(--accent); color: #fff; cursor: pointer; }
button:hover { filter: brightness(1.1); }
.error { margin: 0 0 12px; padding: 10px 12px; border-radius: 6px; background: #f8e9e7; color: var(--error); border: 1px solid #e6c4bf; }
.field-error { color: var(--error); font-size: 14px; margin: 4px 0 0; }
.cards { font-size: 14px; background: var(--soft); border-radius: 8px; padding: 12px 14px; margin-top: 20px; }
.cards code { font-family: ui-monospace, SFMono-Regular, Menlo, monospace; }
.cards ul { margin: 6px 0 0; padding-left: 18px; }
.meta { font-size: 13px; color: #5a6270; word-break: break-all; }
a { color: var(--accent); }
.notice { max-width: 560px; margin: 48px auto; padding: 24px; background: #fff; border: 1px solid var(--line); border-radius: 10px; }
`;

const CSP = ["default-src 'none'", "style-src 'unsafe-inline'", "img-src data:", "base-uri 'none'", "frame-ancestors 'none'"].join("; ");

export const PAGE_HEADERS = {
  "content-type": "text/html; charset=utf-8",
  "cache-control": "no-store",
  "content-security-policy": CSP,
  "referrer-policy": "no-referrer",
  "x-content-type-options": "nosniff",
} as const;

export function renderCheckoutPage(model: CheckoutPageModel): string {
  const { session, lineItems, error } = model;
  const currency = session.currency ?? "usd";
  const recurring = lineItems.find((item) => item.price?.recurring)?.price?.recurring ?? null;
  const per = recurring ? ` per ${recurring.interval_count > 1 ? `${recurring.interval_count} ${recurring.interval}s` : recurring.interval}` : "";
  const total = formatMoney(session.amount_total ?? 0, currency);
  const fieldError = (field: string) => (error?.field === field ? `<p class="field-error" id="${field}-error">${escapeHtml(error.message)}</p>` : "");
  const invalid = (field: string) => (error?.field === field ? ` aria-invalid="true" aria-describedby="${field}-error"` : "");
  const emailValue = model.knownEmail ?? model.values?.email ?? "";
  const banner = error && (error.field === "card" || error.field === "unavailable") ? `<p class="error" role="alert">${escapeHtml(error.message)}</p>` : "";

  const items = lineItems
    .map(
      (item) => `<li><span>${escapeHtml(item.description ?? "Item")}<br><span class="qty">Qty ${item.quantity ?? 1}${
        (item.quantity ?? 1) > 1 ? ` × ${formatMoney(item.price?.unit_amount ?? 0, currency)}` : ""
      }</span></span><span>${formatMoney(item.amount_total, currency)}${item.price?.recurring ? escapeHtml(per) : ""}</span></li>`,
    )
    .join("");

  return page(
    `Pay ${model.merchantName}`,
    `<main>
  <section aria-label="Order summary">
    <h1>${escapeHtml(model.merchantName)}</h1>
    <div class="total">${total}<span style="font-size:16px;font-weight:400">${escapeHtml(per)}</span></div>
    <ul class="items">${items}</ul>
    <div class="cards">
      <strong>Test card numbers</strong> (any future expiry, any 3-digit CVC):
      <ul>
        <li><code>${groupCard(TEST_CARDS.succeeds)}</code> — succeeds</li>
        <li><code>${groupCard(TEST_CARDS.declined)}</code> — declined</li>
        <li><code>${groupCard(TEST_CARDS.insufficientFunds)}</code> — insufficient funds</li>
      </ul>
    </div>
    <p class="meta">Session ${escapeHtml(session.id)}<br>Open until ${new Date(session.expires_at * 1000).toISOString().replace(".000", "")}</p>
  </section>
  <section aria-label="Payment">
    <form method="post" action="/pay/${encodeURIComponent(session.id)}" novalidate>
      ${banner}
      <label for="email">Email</label>
      <input id="email" name="email" type="email" autocomplete="email" value="${escapeHtml(emailValue)}"${model.knownEmail ? " readonly" : ""}${invalid("email")}>
      ${fieldError("email")}
      <label for="card_number">Card number</label>
      <input id="card_number" name="card_number" inputmode="numeric" autocomplete="cc-number" placeholder="4242 4242 4242 4242"${invalid("number")}>
      ${fieldError("number")}
      <div class="row">
        <div>
          <label for="card_expiry">Expiry (MM / YY)</label>
          <input id="card_expiry" name="card_expiry" inputmode="numeric" autocomplete="cc-exp" placeholder="12 / 34" value="${escapeHtml(model.values?.expiry ?? "")}"${invalid("expiry")}>
          ${fieldError("expiry")}
        </div>
        <div>
          <label for="card_cvc">CVC</label>
          <input id="card_cvc" name="card_cvc" inputmode="numeric" autocomplete="cc-csc" placeholder="123"${invalid("cvc")}>
          ${fieldError("cvc")}
        </div>
      </div>
      <label for="card_name">Name on card</label>
      <input id="card_name" name="card_name" autocomplete="cc-name" value="${escapeHtml(model.values?.name ?? "")}">
      <button type="submit">${session.mode === "subscription" ? "Subscribe" : "Pay"} ${total}${escapeHtml(per)}</button>
      ${session.cancel_url ? `<p style="text-align:center;margin:16px 0 0"><a href="${escapeHtml(session.cancel_url)}">Cancel and go back</a></p>` : ""}
    </form>
  </section>
</main>`,
  );
}

export function renderNoticePage(title: string, message: string, link?: { href: string; label: string }): string {
  return page(
    title,
    `<div class="notice"><h1>${escapeHtml(title)}</h1><p>${escapeHtml(message)}</p>${link ? `<p><a href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></p>` : ""}</div>`,
  );
}

export function renderReceiptPage(charge: Stripe.Charge, merchantName: string): string {
  const card = charge.payment_method_details?.card;
  const refunded = charge.amount_refunded > 0 ? `<p>Refunded: ${formatMoney(charge.amount_refunded, charge.currency)}</p>` : "";
  return page(
    `Receipt from ${merchantName}`,
    `<div class="notice"><h1>Receipt from ${escapeHtml(merchantName)}</h1>
<p class="total">${formatMoney(charge.amount, charge.currency)}</p>
<p>Paid ${new Date(charge.created * 1000).toISOString().slice(0, 10)}${card ? ` with a test card ending ${escapeHtml(card.last4 ?? "")}` : ""}.</p>${refunded}
<p class="meta">${escapeHtml(charge.id)}</p></div>`,
  );
}

export function renderInvoicePage(invoice: Stripe.Invoice, merchantName: string): string {
  const lines = invoice.lines.data
    .map((line) => `<li><span>${escapeHtml(line.description ?? "")}</span><span>${formatMoney(line.amount, line.currency)}</span></li>`)
    .join("");
  return page(
    `Invoice ${invoice.number ?? invoice.id}`,
    `<div class="notice"><h1>Invoice ${escapeHtml(invoice.number ?? invoice.id)} from ${escapeHtml(merchantName)}</h1>
<p class="total">${formatMoney(invoice.total, invoice.currency)}</p>
<p>Status: ${escapeHtml(invoice.status ?? "draft")}</p><ul class="items">${lines}</ul>
<p class="meta">${escapeHtml(invoice.id)}</p></div>`,
  );
}

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>${escapeHtml(title)} · test payment</title>
<style>${CSS}</style>
</head>
<body>
<div class="banner" role="note"><strong>Test payment page</strong> — local stand-in for the card processor; no real money.</div>
${body}
</body>
</html>`;
}

/** Amounts in minor units as the page shows them ("NZ$25.00"). */
export function formatMoney(amount: number, currency: string): string {
  const format = new Intl.NumberFormat("en", { style: "currency", currency: currency.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return escapeHtml(format.format(amount / 10 ** digits));
}

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

/** Safe for text and for quoted attribute values. */
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (char) => HTML_ESCAPES[char] ?? char);
}

function groupCard(number: string): string {
  return number.replace(/(\d{4})(?=\d)/g, "$1 ");
}

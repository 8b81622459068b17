import { createHash } from "node:crypto";
import type { CardDetails, ChargeFailure } from "./objects";

/**
 * The card processor's published test numbers (Stripe's "Testing" documentation) that the hosted
 * page accepts. Anything else is refused before any payment is attempted.
 */
export const TEST_CARDS = {
  succeeds: "4242424242424242",
  declined: "4000000000000002",
  insufficientFunds: "4000000000009995",
} as const;

export const USE_TEST_CARD_MESSAGE =
  "Use a test card number: 4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined, 4000 0000 0000 9995 has insufficient funds.";

// Wording of the decline messages and seller messages as Stripe returns them for these cards.
const DECLINES: Record<string, ChargeFailure> = {
  [TEST_CARDS.declined]: {
    code: "card_declined",
    declineCode: "generic_decline",
    message: "Your card was declined.",
    sellerMessage: "The bank did not return any further details with this decline.",
  },
  [TEST_CARDS.insufficientFunds]: {
    code: "card_declined",
    declineCode: "insufficient_funds",
    message: "Your card has insufficient funds.",
    sellerMessage: "The bank returned the decline code `insufficient_funds`.",
  },
};

export interface CardForm {
  number: string;
  expiry: string;
  cvc: string;
  name: string;
}

export type CardCheck =
  | { ok: true; card: CardDetails; failure: ChargeFailure | null }
  | { ok: false; field: "number" | "expiry" | "cvc"; message: string };

/** Validates the form the way the payment page would, then says what the test number does. */
export function checkCard(form: CardForm, now: number): CardCheck {
  const number = form.number.replace(/[\s-]/g, "");
  if (number === "") return { ok: false, field: "number", message: "Your card number is incomplete." };
  if (number !== TEST_CARDS.succeeds && !(number in DECLINES)) return { ok: false, field: "number", message: USE_TEST_CARD_MESSAGE };

  const expiry = /^\s*(\d{1,2})\s*\/\s*(\d{2}|\d{4})\s*$/.exec(form.expiry);
  if (!expiry) return { ok: false, field: "expiry", message: "Your card's expiration date is incomplete." };
  const month = Number(expiry[1]);
  const yearText = expiry[2]!;
  const year = yearText.length === 2 ? 2000 + Number(yearText) : Number(yearText);
  if (month < 1 || month > 12) return { ok: false, field: "expiry", message: "Your card's expiration date is invalid." };
  const today = new Date(now * 1000);
  const currentYear = today.getUTCFullYear();
  const currentMonth = today.getUTCMonth() + 1;
  if (year < currentYear) return { ok: false, field: "expiry", message: "Your card's expiration year is in the past." };
  if (year === currentYear && month < currentMonth) return { ok: false, field: "expiry", message: "Your card's expiration date is in the past." };

  if (!/^\d{3,4}$/.test(form.cvc.trim())) return { ok: false, field: "cvc", message: "Your card's security code is incomplete." };

  return {
    ok: true,
    card: {
      brand: "visa",
      last4: number.slice(-4),
      expMonth: month,
      expYear: year,
      fingerprint: createHash("sha256").update(number).digest("base64url").slice(0, 16),
      country: "US",
      funding: "credit",
    },
    failure: DECLINES[number] ?? null,
  };
}

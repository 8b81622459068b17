import { randomBytes } from "node:crypto";

const ALPHABET = "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

export type IdPrefix =
  | "cus"
  | "prod"
  | "price"
  | "cs_test"
  | "pi"
  | "pm"
  | "ch"
  | "re"
  | "sub"
  | "si"
  | "in"
  | "il"
  | "inpay"
  | "evt"
  | "req"
  | "li"
  | "we"
  | "whsec";

// Lengths of the random part as seen on test-mode objects; Checkout Session ids are the long ones.
const LENGTHS: Partial<Record<IdPrefix, number>> = { cs_test: 58, whsec: 32, req: 14, cus: 14, prod: 14, sub: 24 };

export function newId(prefix: IdPrefix): string {
  const length = LENGTHS[prefix] ?? 24;
  const bytes = randomBytes(length);
  let body = "";
  for (const byte of bytes) body += ALPHABET[byte % ALPHABET.length];
  return `${prefix}_${prefix === "cs_test" ? `a1${body.slice(2)}` : body}`;
}

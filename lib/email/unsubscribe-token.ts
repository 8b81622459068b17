import { createHmac, timingSafeEqual } from "node:crypto";
import { isOptionalCategory, type OptionalEmailCategory } from "./categories";

/**
 * One-click unsubscribe tokens (RFC 8058): `<payload>.<signature>`, both base64url. The payload
 * names one person and one category; the signature is HMAC-SHA256 under a key derived from the
 * auth secret for this purpose only. Tokens do not expire: a link in an old mail must keep
 * working, and the most a token can do is turn one kind of mail off for the person it names.
 */
export type UnsubscribeClaim = { userId: string; category: OptionalEmailCategory };

const VERSION = 1;

function tokenKey(secret: string): Buffer {
  return createHmac("sha256", secret).update("proofbay:email-unsubscribe:v1").digest();
}

function sign(payload: string, secret: string): Buffer {
  return createHmac("sha256", tokenKey(secret)).update(payload).digest();
}

export function signUnsubscribeToken(claim: UnsubscribeClaim, secret: string): string {
  const payload = Buffer.from(JSON.stringify({ v: VERSION, u: claim.userId, c: claim.category })).toString("base64url");
  return `${payload}.${sign(payload, secret).toString("base64url")}`;
}

/** The claim of a genuine token, or null for anything forged, altered or malformed. */
export function verifyUnsubscribeToken(token: string, secret: string): UnsubscribeClaim | null {
  const parts = token.split(".");
  if (parts.length !== 2) return null;
  const [payload, signature] = parts as [string, string];
  const given = Buffer.from(signature, "base64url");
  const expected = sign(payload, secret);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return null;
  let decoded: unknown;
  try {
    decoded = JSON.parse(Buffer.from(payload, "base64url").toString("utf8"));
  } catch {
    return null;
  }
  if (typeof decoded !== "object" || decoded === null) return null;
  const { v, u, c } = decoded as Record<string, unknown>;
  if (v !== VERSION || typeof u !== "string" || u === "" || typeof c !== "string" || !isOptionalCategory(c)) return null;
  return { userId: u, category: c };
}

import { createCipheriv, createDecipheriv, createHmac, randomBytes, timingSafeEqual } from "node:crypto";

/*
 * Pair tickets: the server hands one out with every pair it shows and a vote must bring it back.
 * `<payload>.<signature>`, both base64url; HMAC-SHA256 under a key derived from the auth secret for
 * this purpose only. A ticket names the judge, the campaign, the pair and which photo was on the
 * left, and when it was shown; it is single-use (its nonce is stored with the vote, uniquely),
 * lives 10 minutes, and is refused when the vote comes sooner than a person could look at two
 * photos (1.5 s).
 *
 * Image tokens: the pair's photos are fetched through opaque per-pair tokens, sealed with
 * AES-256-GCM (authenticated, and unreadable, so neither the upload id nor the photo id shows).
 */

export const PAIR_TICKET_LIFETIME_MS = 10 * 60_000;
/** Faster than this from showing to voting is not a person comparing two photos. */
export const MIN_JUDGING_MS = 1500;
/** Clocks of one server do not drift, but allow a little for a ticket issued in another process. */
const CLOCK_SKEW_MS = 5_000;
export const IMAGE_TOKEN_LIFETIME_MS = 30 * 60_000;

const VERSION = 1;

export type PairTicket = {
  nonce: string;
  userId: string;
  campaignId: string;
  photoAId: string;
  photoBId: string;
  leftPhotoId: string;
  shownAt: number;
};

export type TicketProblem = "forged" | "expired" | "too_fast" | "not_yours" | "other_campaign";

function key(secret: string, purpose: string): Buffer {
  return createHmac("sha256", secret).update(`proofbay:${purpose}:v${VERSION}`).digest();
}

function sign(payload: string, secret: string): Buffer {
  return createHmac("sha256", key(secret, "blind-pair-ticket")).update(payload).digest();
}

export function issuePairTicket(ticket: Omit<PairTicket, "nonce">, secret: string, nonce = randomBytes(16).toString("base64url")): string {
  const body = { v: VERSION, n: nonce, u: ticket.userId, c: ticket.campaignId, a: ticket.photoAId, b: ticket.photoBId, l: ticket.leftPhotoId, t: ticket.shownAt };
  const payload = Buffer.from(JSON.stringify(body)).toString("base64url");
  return `${payload}.${sign(payload, secret).toString("base64url")}`;
}

/** The ticket's claim when it is genuine, else why it is refused. Expiry and speed are judged at `now`. */
export function readPairTicket(
  token: string,
  secret: string,
  expected: { userId: string; campaignId: string; now: number },
): { ok: true; ticket: PairTicket } | { ok: false; problem: TicketProblem } {
  const parts = token.split(".");
  if (parts.length !== 2) return { ok: false, problem: "forged" };
  const [payload, signature] = parts as [string, string];
  const given = Buffer.from(signature, "base64url");
  const wanted = sign(payload, secret);
  if (given.length !== wanted.length || !timingSafeEqual(given, wanted)) return { ok: false, problem: "forged" };
  let decoded: unknown;
  try {
    decoded = JSON.parse(Buffer.from(payload, "base64url").toString("utf8"));
  } catch {
    return { ok: false, problem: "forged" };
  }
  const ticket = asTicket(decoded);
  if (!ticket) return { ok: false, problem: "forged" };
  if (ticket.userId !== expected.userId) return { ok: false, problem: "not_yours" };
  if (ticket.campaignId !== expected.campaignId) return { ok: false, problem: "other_campaign" };
  const age = expected.now - ticket.shownAt;
  if (age > PAIR_TICKET_LIFETIME_MS || age < -CLOCK_SKEW_MS) return { ok: false, problem: "expired" };
  if (age < MIN_JUDGING_MS) return { ok: false, problem: "too_fast" };
  return { ok: true, ticket };
}

function asTicket(value: unknown): PairTicket | null {
  if (typeof value !== "object" || value === null) return null;
  const { v, n, u, c, a, b, l, t } = value as Record<string, unknown>;
  const strings = [n, u, c, a, b, l];
  if (v !== VERSION || !strings.every((s) => typeof s === "string" && s !== "") || typeof t !== "number" || !Number.isFinite(t)) return null;
  if (l !== a && l !== b) return null;
  return { nonce: n as string, userId: u as string, campaignId: c as string, photoAId: a as string, photoBId: b as string, leftPhotoId: l as string, shownAt: t };
}

/* ---------- Image tokens ---------- */

export type ImageClaim = { photoId: string; userId: string; expiresAt: number };

export function sealImageToken(claim: ImageClaim, secret: string): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv("aes-256-gcm", key(secret, "blind-pair-image"), iv);
  const plain = Buffer.from(JSON.stringify({ p: claim.photoId, u: claim.userId, e: claim.expiresAt }));
  const sealed = Buffer.concat([cipher.update(plain), cipher.final()]);
  return Buffer.concat([iv, sealed, cipher.getAuthTag()]).toString("base64url");
}

/** The claim of a genuine token (expired or not: the caller decides), or null for anything altered. */
export function openImageToken(token: string, secret: string): ImageClaim | null {
  const bytes = Buffer.from(token, "base64url");
  if (bytes.length < 12 + 16 + 2) return null;
  try {
    const decipher = createDecipheriv("aes-256-gcm", key(secret, "blind-pair-image"), bytes.subarray(0, 12));
    decipher.setAuthTag(bytes.subarray(bytes.length - 16));
    const plain = Buffer.concat([decipher.update(bytes.subarray(12, bytes.length - 16)), decipher.final()]);
    const { p, u, e } = JSON.parse(plain.toString("utf8")) as Record<string, unknown>;
    if (typeof p !== "string" || typeof u !== "string" || typeof e !== "number") return null;
    return { photoId: p, userId: u, expiresAt: e };
  } catch {
    return null;
  }
}

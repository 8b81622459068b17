import { createHash } from "node:crypto";
import { and, eq, gt } from "drizzle-orm";
import type { Db } from "../client";
import { verificationTokens } from "../schema";

/** Auth.js stores sign-in tokens as SHA-256 of token + secret, hex; hash the same way to look one up. */
export function hashVerificationToken(token: string, secret: string): string {
  return createHash("sha256").update(`${token}${secret}`).digest("hex");
}

export function isSignInTokenLive(db: Db, email: string, token: string, secret: string, now: Date): boolean {
  const row = db
    .select({ expires: verificationTokens.expires })
    .from(verificationTokens)
    .where(
      and(
        eq(verificationTokens.identifier, email),
        eq(verificationTokens.token, hashVerificationToken(token, secret)),
        gt(verificationTokens.expires, now),
      ),
    )
    .get();
  return row !== undefined;
}

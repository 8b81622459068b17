import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { unsubscribeFromCategory } from "@/db/queries/email-preferences";
import { users } from "@/db/schema";
import { env } from "@/lib/env";
import { verifyUnsubscribeToken, type UnsubscribeClaim } from "@/lib/email/unsubscribe-token";
import { HttpError } from "./http-error";

/** The verified claim of an unsubscribe token, or a 400 naming the field; 404 when its account is gone. */
export function claimOfUnsubscribeToken(token: string | null | undefined): UnsubscribeClaim {
  const claim = token && env.authSecret ? verifyUnsubscribeToken(token, env.authSecret) : null;
  if (!claim) {
    throw new HttpError(400, "invalid_token", "This unsubscribe link is not valid: it was changed or not made by Proofbay.", {
      token: "not a valid unsubscribe token",
    });
  }
  if (!getDb().select({ id: users.id }).from(users).where(eq(users.id, claim.userId)).get()) {
    throw new HttpError(404, "not_found", "The account this unsubscribe link was made for no longer exists.");
  }
  return claim;
}

/** Turns the token's category off for the token's person, at once; repeating it changes nothing more. */
export function unsubscribeWithToken(token: string | null | undefined, now = new Date()): UnsubscribeClaim {
  const claim = claimOfUnsubscribeToken(token);
  if (!unsubscribeFromCategory(getDb(), claim.userId, claim.category, now)) {
    throw new HttpError(404, "not_found", "The account this unsubscribe link was made for no longer exists.");
  }
  return claim;
}

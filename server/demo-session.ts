import "server-only";
import { randomBytes } from "node:crypto";
import { cookies } from "next/headers";
import { getDb } from "@/db";
import { sessions } from "@/db/schema";
import { env } from "@/lib/env";

const SESSION_DAYS = 30;

/** Auth.js names its cookie by scheme; a session row plus this cookie is a signed-in browser. */
function sessionCookieName(): string {
  return env.appUrl.startsWith("https://") ? "__Secure-authjs.session-token" : "authjs.session-token";
}

/**
 * Starts a database session for a seeded account without e-mail. Callers must check demo mode
 * first; this exists so a person trying the demo can switch roles in one click.
 */
export async function startDemoSession(userId: string): Promise<void> {
  if (!env.demoMode) throw new Error("Demo sessions are disabled outside demo mode.");
  const token = randomBytes(32).toString("hex");
  const expires = new Date(Date.now() + SESSION_DAYS * 24 * 3600 * 1000);
  getDb().insert(sessions).values({ sessionToken: token, userId, expires }).run();
  (await cookies()).set(sessionCookieName(), token, {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: env.appUrl.startsWith("https://"),
    expires,
  });
}

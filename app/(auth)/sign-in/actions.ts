"use server";

import { AuthError } from "next-auth";
import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { findUserByEmail } from "@/db/queries/users";
import { demoAccountEmails } from "@/lib/demo-accounts";
import { env } from "@/lib/env";
import { signInRequestSchema } from "@/lib/validation/sign-in";
import { signIn, signOut } from "@/server/auth";
import { startDemoSession } from "@/server/demo-session";
import { fieldErrors } from "@/server/http-error";

export type SignInFormState = { error?: string; fields?: Record<string, string>; email?: string };

export async function requestSignInLink(_previous: SignInFormState, formData: FormData): Promise<SignInFormState> {
  const parsed = signInRequestSchema.safeParse({
    email: formData.get("email"),
    callbackUrl: formData.get("callbackUrl") ?? undefined,
  });
  const email = String(formData.get("email") ?? "");
  if (!parsed.success) return { error: "Check the e-mail address.", fields: fieldErrors(parsed.error), email };
  try {
    await signIn("nodemailer", { email: parsed.data.email, redirectTo: parsed.data.callbackUrl });
  } catch (error) {
    // signIn ends by throwing Next's redirect to the "check your e-mail" page; let that through.
    if (error instanceof AuthError) {
      console.error("sign-in link failed", error);
      return { error: "We could not send the sign-in e-mail just now. Try again in a minute.", email };
    }
    throw error;
  }
  return {};
}

/** Demo mode only: one click signs in as a seeded account, so each role can be tried. */
export async function signInAsDemoAccount(formData: FormData): Promise<void> {
  if (!env.demoMode) redirect("/sign-in");
  const email = String(formData.get("email") ?? "");
  if (!(demoAccountEmails as readonly string[]).includes(email)) redirect("/sign-in");
  const user = findUserByEmail(getDb(), email);
  if (!user) redirect("/sign-in?error=unknown-demo-account");
  await startDemoSession(user.id);
  redirect(user.role === "supporter" ? "/account" : "/lab");
}

export async function signOutAction(): Promise<void> {
  await signOut({ redirectTo: "/" });
}

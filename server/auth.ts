import "server-only";
import { DrizzleAdapter } from "@auth/drizzle-adapter";
import NextAuth from "next-auth";
import Nodemailer from "next-auth/providers/nodemailer";
import { cache } from "react";
import { createElement } from "react";
import { getDb } from "@/db";
import { hasActiveMembership } from "@/db/queries/users";
import { accounts, sessions, users, verificationTokens, type StoredRole } from "@/db/schema";
import { renderEmail } from "@/emails/render";
import { SignInLinkEmail } from "@/emails/sign-in-link";
import { env } from "@/lib/env";
import { effectiveRole, type Role } from "@/lib/roles";
import { sendMail } from "./mailer";

/** OWASP ASVS (V2.7) caps out-of-band codes at 10 minutes; the library default is a day. */
export const MAGIC_LINK_MINUTES = 10;

declare module "next-auth" {
  interface Session {
    user: { id: string; email: string; name: string | null; role: Role };
  }
}

/**
 * The e-mailed link opens our confirmation page rather than the token endpoint itself, so a mail
 * scanner that pre-fetches links cannot spend the token: only the button on that page does.
 */
export function confirmationUrl(callbackUrl: string): string {
  const source = new URL(callbackUrl);
  return `${source.origin}/sign-in/confirm?${source.searchParams.toString()}`;
}

export const { handlers, auth, signIn, signOut } = NextAuth(() => ({
  adapter: DrizzleAdapter(getDb(), {
    usersTable: users,
    accountsTable: accounts,
    sessionsTable: sessions,
    verificationTokensTable: verificationTokens,
  }),
  secret: env.authSecret,
  trustHost: true,
  session: { strategy: "database" },
  pages: { signIn: "/sign-in", verifyRequest: "/sign-in/check-email", error: "/sign-in/error" },
  providers: [
    Nodemailer({
      server: { host: env.smtp.host, port: env.smtp.port },
      from: env.smtp.from,
      maxAge: MAGIC_LINK_MINUTES * 60,
      async sendVerificationRequest({ identifier, url }) {
        // Sent directly, not through the outbox: the link must arrive at once and lives 10 minutes.
        const mail = await renderEmail(
          createElement(SignInLinkEmail, { url: confirmationUrl(url), minutesValid: MAGIC_LINK_MINUTES }),
          { kind: "account" },
        );
        await sendMail({ to: identifier, subject: "Your Proofbay sign-in link", ...mail });
      },
    }),
  ],
  callbacks: {
    session({ session, user }) {
      const stored = (user as typeof user & { role: StoredRole }).role;
      const role = effectiveRole(stored, hasActiveMembership(getDb(), user.id, new Date()));
      return { ...session, user: { id: user.id, email: user.email, name: user.name ?? null, role } };
    },
  },
}));

export type Viewer = { id: string; email: string; name: string | null; role: Role };

/** The signed-in account for this request, read once per request; null for a visitor. */
export const getViewer = cache(async (): Promise<Viewer | null> => {
  const session = await auth();
  return session?.user ?? null;
});

import { extractLinks, waitForMessage } from "../../../fakes/smtp/client";

/** The fake inbox listens two ports above the app it serves (see lib/env.ts). */
export function inboxUrlFor(appPort: number): string {
  return `http://localhost:${appPort + 2}`;
}

export async function latestSignInLink(appPort: number, email: string, since: string): Promise<string> {
  const message = await waitForMessage(inboxUrlFor(appPort), email, { since, subjectIncludes: "sign-in link", timeoutMs: 10_000 });
  const link = extractLinks(message.html ?? "").find((href) => href.includes("/sign-in/confirm"));
  if (!link) throw new Error(`No confirmation link in the mail to ${email}`);
  return link;
}

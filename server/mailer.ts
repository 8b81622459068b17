import "server-only";
import type { Transporter } from "nodemailer";
import { env } from "@/lib/env";
import { createSmtpTransport, type OutgoingMail, type SendMail } from "./mail-transport";

export type { OutgoingMail } from "./mail-transport";

const cache = globalThis as unknown as { proofbayMailer?: { transporter: Transporter; send: SendMail } };

/** One pooled SMTP transport per process. Pointing SMTP_* at a real provider is the only change needed. */
function mailer() {
  cache.proofbayMailer ??= createSmtpTransport(env.smtp);
  return cache.proofbayMailer;
}

export function getMailer(): Transporter {
  return mailer().transporter;
}

export async function sendMail(mail: OutgoingMail): Promise<void> {
  await mailer().send(mail);
}

export async function checkSmtp(timeoutMs = 2_000): Promise<{ ok: boolean; error?: string }> {
  const timeout = new Promise<never>((_, reject) => setTimeout(() => reject(new Error("timed out")), timeoutMs));
  try {
    await Promise.race([getMailer().verify(), timeout]);
    return { ok: true };
  } catch (error) {
    return { ok: false, error: error instanceof Error ? error.message : String(error) };
  }
}

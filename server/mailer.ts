import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";

const cache = globalThis as unknown as { proofbayMailer?: Transporter };

/** One SMTP transport per process. Pointing SMTP_* at a real provider is the only change needed. */
export function getMailer(): Transporter {
  cache.proofbayMailer ??= nodemailer.createTransport({
    host: env.smtp.host,
    port: env.smtp.port,
    secure: env.smtp.secure,
    ignoreTLS: !env.smtp.secure && env.smtp.user === undefined,
    auth: env.smtp.user ? { user: env.smtp.user, pass: env.smtp.password ?? "" } : undefined,
    connectionTimeout: 5_000,
  });
  return cache.proofbayMailer;
}

export type OutgoingMail = { to: string; subject: string; html: string; text: string; headers?: Record<string, string> };

export async function sendMail(mail: OutgoingMail): Promise<void> {
  const result = await getMailer().sendMail({ from: env.smtp.from, ...mail });
  const failed = [...(result.rejected ?? []), ...(result.pending ?? [])];
  if (failed.length > 0) throw new Error(`Mail to ${failed.join(", ")} was not accepted`);
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

import "server-only";
import { claimDueMail, markMailFailed, markMailSent, messageIdFor } from "@/db/queries/outbox";
import type { Db } from "@/db/client";
import type { OutboxMessage } from "@/db/schema";
import { renderEmail } from "@/emails/render";
import { isTemplateName, templateElement, type TemplateProps } from "@/emails/registry";
import type { OutgoingMail } from "./mailer";

export type SendMail = (mail: OutgoingMail) => Promise<void>;

const BATCH = 25;

async function deliver(message: OutboxMessage, send: SendMail, domain: string): Promise<void> {
  if (!isTemplateName(message.template)) throw new Error(`Unknown e-mail template ${message.template}`);
  const element = templateElement(message.template, message.payload as TemplateProps[typeof message.template]);
  const { html, text } = await renderEmail(element);
  await send({
    to: message.toAddress,
    subject: message.subject,
    html,
    text,
    headers: { "Message-ID": messageIdFor(message.dedupeKey, domain) },
  });
}

/** One pass: claim what is due, send it, record each outcome. Returns how many were sent. */
export async function drainOutbox(db: Db, send: SendMail, options: { now?: () => Date; domain: string }): Promise<number> {
  const now = options.now ?? (() => new Date());
  let sent = 0;
  for (;;) {
    const batch = claimDueMail(db, now(), BATCH);
    if (batch.length === 0) return sent;
    for (const message of batch) {
      try {
        await deliver(message, send, options.domain);
        markMailSent(db, message.id, now());
        sent++;
      } catch (error) {
        markMailFailed(db, message, error instanceof Error ? error.message : String(error), now());
      }
    }
  }
}

/** Polls the outbox in the app process; passes never overlap. */
export function startOutboxWorker(db: Db, send: SendMail, options: { intervalMs: number; domain: string }): () => void {
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    drainOutbox(db, send, { domain: options.domain })
      .catch((error) => console.error("outbox pass failed", error))
      .finally(() => {
        running = false;
      });
  }, options.intervalMs);
  timer.unref();
  return () => clearInterval(timer);
}

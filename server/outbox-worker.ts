import { claimDueMail, markMailFailed, markManyMailSent, messageIdFor, SEND_LEASE_MS } from "../db/queries/outbox";
import type { Db } from "../db/client";
import type { OutboxMessage } from "../db/schema";
import { renderEmail } from "../emails/render";
import type { EmailFooter } from "../emails/email-footer";
import { isTemplateName, templateElement, type TemplateProps } from "../emails/registry";
import { emailCategoryInfo, isOptionalCategory } from "../lib/email/categories";
import { signUnsubscribeToken } from "../lib/email/unsubscribe-token";
import { PermanentSendError, type OutgoingMail, type SendMail } from "./mail-transport";

// No server-only guard and relative imports: the mail bench runs this worker in a plain Node process.

export type { SendMail } from "./mail-transport";

export type OutboxWorkerOptions = {
  /** Right-hand side of every Message-ID; keep it stable, or a resend would look like a new message. */
  domain: string;
  /** Where unsubscribe and preference links point, and the secret that signs the unsubscribe token. */
  links: { appUrl: string; unsubscribeSecret: string };
  now?: () => Date;
  /** Messages claimed per transaction. */
  batchSize?: number;
  /** Sends in flight at once (the SMTP pool spreads them over its connections). */
  concurrency?: number;
  leaseMs?: number;
  /** Asked between batches; true ends the pass early (the next poll carries on). */
  shouldYield?: () => boolean;
};

const DEFAULT_BATCH = 100;
const DEFAULT_CONCURRENCY = 10;

export function unsubscribeUrlFor(appUrl: string, token: string): string {
  return `${appUrl}/api/email/unsubscribe?token=${encodeURIComponent(token)}`;
}

/** The rendered message with its headers: a stable Message-ID, and for optional mail the RFC 8058 pair. */
export async function composeMail(message: OutboxMessage, options: Pick<OutboxWorkerOptions, "domain" | "links">): Promise<OutgoingMail> {
  if (!isTemplateName(message.template)) throw new PermanentSendError(`Unknown e-mail template ${message.template}`);
  const element = templateElement(message.template, message.payload as TemplateProps[typeof message.template]);
  const headers: Record<string, string> = { "Message-ID": messageIdFor(message.dedupeKey, options.domain) };
  let footer: EmailFooter | undefined = isOptionalCategory(message.category) ? undefined : { kind: "account" };
  if (isOptionalCategory(message.category) && message.userId !== null) {
    const token = signUnsubscribeToken({ userId: message.userId, category: message.category }, options.links.unsubscribeSecret);
    const unsubscribeUrl = unsubscribeUrlFor(options.links.appUrl, token);
    headers["List-Unsubscribe"] = `<${unsubscribeUrl}>`;
    headers["List-Unsubscribe-Post"] = "List-Unsubscribe=One-Click";
    footer = {
      kind: "optional",
      categoryLabel: emailCategoryInfo[message.category].label,
      unsubscribeUrl,
      preferencesUrl: `${options.links.appUrl}/account/email`,
    };
  }
  const { html, text } = await renderEmail(element, footer);
  return { to: message.toAddress, subject: message.subject, html, text, headers };
}

async function inParallel<T>(items: readonly T[], limit: number, work: (item: T) => Promise<void>): Promise<void> {
  let next = 0;
  const lanes = Array.from({ length: Math.min(limit, items.length) }, async () => {
    while (next < items.length) await work(items[next++]!);
  });
  await Promise.all(lanes);
}

/**
 * Records accepted messages in small groups: every commit waits for the disk (synchronous=FULL,
 * ~5 ms here), and better-sqlite3 blocks the event loop meanwhile, so one commit per message would
 * cap a fan-out near 200 a second. A group is written within RECORD_DELAY_MS of its first
 * acceptance, so that is also the widest gap between the server's 250 and our record of it.
 */
export const RECORD_DELAY_MS = 20;
const RECORD_GROUP = 50;

class SentRecorder {
  private ids: string[] = [];
  private timer: NodeJS.Timeout | undefined;

  constructor(
    private readonly db: Db,
    private readonly now: () => Date,
  ) {}

  add(id: string): void {
    this.ids.push(id);
    if (this.ids.length >= RECORD_GROUP) this.flush();
    else this.timer ??= setTimeout(() => this.flush(), RECORD_DELAY_MS);
  }

  flush(): void {
    clearTimeout(this.timer);
    this.timer = undefined;
    const ids = this.ids;
    this.ids = [];
    markManyMailSent(this.db, ids, this.now());
  }
}

/**
 * One pass: claim what is due (the claim is committed before anything is sent), send it over the
 * pooled transport with several sends in flight, and record each outcome the moment the server
 * answers. Returns how many were sent.
 *
 * Guarantee: a message is queued once per (recipient, event) and handed to SMTP again only when
 * an attempt failed or its worker stopped before recording the outcome. The only window for a
 * duplicate is between the server's 250 reply and the commit of `sent` (RECORD_DELAY_MS plus one
 * disk sync); a resend then carries the same Message-ID, so a receiver that drops repeated
 * Message-IDs keeps exactly one.
 */
export async function drainOutbox(db: Db, send: SendMail, options: OutboxWorkerOptions): Promise<number> {
  const now = options.now ?? (() => new Date());
  const concurrency = options.concurrency ?? DEFAULT_CONCURRENCY;
  const recorder = new SentRecorder(db, now);
  let sent = 0;
  try {
    for (;;) {
      if (options.shouldYield?.()) return sent;
      const batch = claimDueMail(db, now(), options.batchSize ?? DEFAULT_BATCH, { leaseMs: options.leaseMs ?? SEND_LEASE_MS });
      if (batch.length === 0) return sent;
      await inParallel(batch, concurrency, async (message) => {
        try {
          await send(await composeMail(message, options));
        } catch (error) {
          markMailFailed(db, message, error instanceof Error ? error.message : String(error), now(), error instanceof PermanentSendError);
          return;
        }
        recorder.add(message.id);
        sent++;
      });
    }
  } finally {
    recorder.flush();
  }
}

/** Polls the outbox in the app process; passes never overlap. */
export function startOutboxWorker(db: Db, send: SendMail, options: OutboxWorkerOptions & { intervalMs: number }): () => void {
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    drainOutbox(db, send, options)
      .catch((error) => console.error("outbox pass failed", error))
      .finally(() => {
        running = false;
      });
  }, options.intervalMs);
  timer.unref();
  return () => clearInterval(timer);
}

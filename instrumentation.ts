/** Runs once when the server starts: the e-mail outbox and the goal-or-refund sweep run inside the app process. */
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.NEXT_PHASE === "phase-production-build") return;
  const [{ getDb }, { sendMail }, { startOutboxWorker }, { env }, { backgroundShouldYield }] = await Promise.all([
    import("@/db"),
    import("@/server/mailer"),
    import("@/server/outbox-worker"),
    import("@/lib/env"),
    import("@/server/foreground-pressure"),
  ]);
  // Optional mail carries a signed unsubscribe link, so the worker needs the secret to send anything.
  if (env.authSecret) {
    const links = { appUrl: env.appUrl, unsubscribeSecret: env.authSecret };
    // A burst of payment webhooks is acknowledged first; the receipts follow (server/foreground-pressure.ts).
    startOutboxWorker(getDb(), sendMail, { intervalMs: 1_000, domain: new URL(env.appUrl).hostname, links, shouldYield: backgroundShouldYield });
  } else {
    console.error("The e-mail outbox is not being sent: set AUTH_SECRET (it signs the unsubscribe links).");
  }
  // Goal-or-refund: deadlines and refunds are swept every 30 s (safe to run in several processes).
  const [{ startRefundSweeper }, { getStripe }] = await Promise.all([import("@/server/refund-sweeper"), import("@/server/stripe")]);
  startRefundSweeper(getDb(), getStripe(), { intervalMs: 30_000, appUrl: env.appUrl });
}

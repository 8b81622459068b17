/** Runs once when the server starts: the e-mail outbox is sent from inside the app process. */
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.NEXT_PHASE === "phase-production-build") return;
  const [{ getDb }, { sendMail }, { startOutboxWorker }, { env }] = await Promise.all([
    import("@/db"),
    import("@/server/mailer"),
    import("@/server/outbox-worker"),
    import("@/lib/env"),
  ]);
  startOutboxWorker(getDb(), sendMail, { intervalMs: 1_000, domain: new URL(env.appUrl).hostname });
}

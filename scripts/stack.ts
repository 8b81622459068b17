/**
 * Starts Proofbay the way the demo and the end-to-end tests need it: a migrated, seeded SQLite
 * file, the fake SMTP inbox, and the built app (`next start`) pointed at both.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { migrateDatabase, openDatabase } from "../db/client";
import { seedDemo, seedId } from "../db/seed";
import { seedReportPhotos } from "../db/seed-reports";
import { startFakeInbox, type FakeInbox } from "../fakes/smtp/inbox";
import { startFakeStripe, type RunningFakeStripe } from "../fakes/stripe/server";
import { parseEnv } from "../lib/env";

export type StackOptions = {
  port: number;
  databasePath: string;
  demo: boolean;
  /** Start from an empty database file (tests); the demo keeps its data across restarts. */
  fresh: boolean;
  quiet?: boolean;
  /** `dev` runs `next dev` (hot reload) instead of the built app. */
  nextCommand?: "start" | "dev";
};

export type RunningStack = { appUrl: string; inbox: FakeInbox; stripe: RunningFakeStripe; app: ChildProcess; stop(): Promise<void> };

/** A secret kept beside the database so sessions survive a restart of the demo. */
function loadOrCreateSecret(databasePath: string): string {
  const file = path.join(path.dirname(path.resolve(databasePath)), ".auth-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  const secret = randomBytes(32).toString("base64url");
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

function prepareDatabase(databasePath: string, fresh: boolean) {
  if (fresh) for (const suffix of ["", "-wal", "-shm"]) rmSync(`${databasePath}${suffix}`, { force: true });
  const db = openDatabase(databasePath);
  migrateDatabase(db);
  const summary = seedDemo(db);
  db.$client.close();
  return summary;
}

async function waitForHttp(url: string, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      const response = await fetch(url);
      if (response.status < 500) return;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 150));
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms`);
}

export async function startStack(options: StackOptions): Promise<RunningStack> {
  const env = parseEnv({ ...process.env, PORT: String(options.port), DATABASE_PATH: options.databasePath });
  prepareDatabase(options.databasePath, options.fresh);
  // Generated photos for the seeded report need files, so they are written after the synchronous seed.
  const photoDb = openDatabase(options.databasePath);
  try {
    await seedReportPhotos(photoDb, env.uploadsDir, seedId);
  } finally {
    photoDb.$client.close();
  }
  const authSecret = process.env.AUTH_SECRET ?? loadOrCreateSecret(options.databasePath);

  const inbox = await startFakeInbox({
    smtpPort: env.smtp.port,
    httpPort: env.inboxPort,
    storePath: options.fresh ? undefined : path.join(path.dirname(path.resolve(options.databasePath)), "inbox.json"),
    quiet: options.quiet,
  });

  const stripe = await startFakeStripe({
    port: env.stripe.fakePort,
    storePath: options.fresh ? undefined : path.join(path.dirname(path.resolve(options.databasePath)), "stripe.json"),
    webhook: { url: `${env.appUrl}/api/stripe/webhook`, secret: env.stripe.webhookSecret },
    quiet: true,
  });

  const nextCommand = options.nextCommand ?? "start";
  const app = spawn(path.join("node_modules", ".bin", "next"), [nextCommand, "-p", String(options.port)], {
    stdio: options.quiet ? ["ignore", "ignore", "inherit"] : "inherit",
    env: {
      ...process.env,
      NODE_ENV: nextCommand === "dev" ? "development" : "production",
      NEXT_TELEMETRY_DISABLED: "1",
      PORT: String(options.port),
      DATABASE_PATH: options.databasePath,
      AUTH_SECRET: authSecret,
      PROOFBAY_DEMO: options.demo ? "1" : "0",
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(env.smtp.port),
      INBOX_PORT: String(env.inboxPort),
      STRIPE_API_URL: stripe.url,
      STRIPE_SECRET_KEY: env.stripe.secretKey,
      STRIPE_WEBHOOK_SECRET: env.stripe.webhookSecret,
    },
  });

  const stop = async () => {
    if (app.exitCode === null) {
      app.kill("SIGTERM");
      await new Promise((resolve) => app.once("exit", resolve));
    }
    await Promise.all([inbox.close(), stripe.close()]);
  };

  await waitForHttp(`${env.appUrl}/api/health`, nextCommand === "dev" ? 120_000 : 30_000).catch(async (error) => {
    await stop();
    throw error;
  });
  return { appUrl: env.appUrl, inbox, stripe, app, stop };
}

export function stopOnSignals(stack: RunningStack): void {
  const shutdown = () => void stack.stop().then(() => process.exit(0));
  process.once("SIGINT", shutdown);
  process.once("SIGTERM", shutdown);
  stack.app.once("exit", (code) => {
    void Promise.all([stack.inbox.close(), stack.stripe.close()]).then(() => process.exit(code ?? 1));
  });
}

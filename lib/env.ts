import { z } from "zod";

/**
 * Every setting Proofbay reads from the environment, parsed once. Nothing else reads process.env.
 * Ports of the local fakes derive from PORT so two demos can run side by side.
 */
const schema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    PORT: z.coerce.number().int().min(1).max(65535).default(3000),
    APP_URL: z.url().optional(),
    DATABASE_PATH: z.string().min(1).default("data/proofbay.db"),
    /** Content-addressed store of uploaded photos and models; outside public/, served only through /api/uploads. */
    UPLOADS_DIR: z.string().min(1).default("data/uploads"),
    AUTH_SECRET: z.string().min(16).optional(),
    PROOFBAY_DEMO: z.enum(["0", "1"]).default("0"),
    SMTP_HOST: z.string().min(1).default("127.0.0.1"),
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).optional(),
    SMTP_SECURE: z.enum(["0", "1"]).default("0"),
    SMTP_USER: z.string().optional(),
    SMTP_PASSWORD: z.string().optional(),
    MAIL_FROM: z.string().min(3).default("Harbor Street Print Lab <lab@proofbay.localhost>"),
    INBOX_PORT: z.coerce.number().int().min(1).max(65535).optional(),
    STRIPE_SECRET_KEY: z.string().startsWith("sk_").default("sk_test_proofbay_local_fake"),
    STRIPE_WEBHOOK_SECRET: z.string().startsWith("whsec_").default("whsec_proofbay_local_fake"),
    /** Where the Stripe SDK sends requests; unset means Stripe itself, the demo points it at the fake. */
    STRIPE_API_URL: z.url().optional(),
  })
  .transform((raw) => {
    const port = raw.PORT;
    return {
      nodeEnv: raw.NODE_ENV,
      port,
      appUrl: (raw.APP_URL ?? `http://localhost:${port}`).replace(/\/$/, ""),
      databasePath: raw.DATABASE_PATH,
      uploadsDir: raw.UPLOADS_DIR,
      authSecret: raw.AUTH_SECRET,
      demoMode: raw.PROOFBAY_DEMO === "1",
      smtp: {
        host: raw.SMTP_HOST,
        port: raw.SMTP_PORT ?? port + 1,
        secure: raw.SMTP_SECURE === "1",
        user: raw.SMTP_USER,
        password: raw.SMTP_PASSWORD,
        from: raw.MAIL_FROM,
      },
      inboxPort: raw.INBOX_PORT ?? port + 2,
      stripe: {
        secretKey: raw.STRIPE_SECRET_KEY,
        webhookSecret: raw.STRIPE_WEBHOOK_SECRET,
        apiUrl: raw.STRIPE_API_URL,
        /** The local fake's port in the demo and tests. */
        fakePort: port + 3,
      },
    };
  });

export type Env = z.output<typeof schema>;

export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = schema.safeParse(source);
  if (!result.success) {
    const problems = result.error.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Invalid environment:\n  ${problems.join("\n  ")}`);
  }
  assertDemoModeIsLocal(result.data);
  return result.data;
}

const loopbackHosts = new Set(["localhost", "127.0.0.1", "[::1]"]);

/** The one-click demo sign-in must never be reachable on a real deployment. */
function assertDemoModeIsLocal(parsed: Env): void {
  if (parsed.demoMode && !loopbackHosts.has(new URL(parsed.appUrl).hostname)) {
    throw new Error(`Invalid environment:\n  PROOFBAY_DEMO: demo mode is allowed only on localhost, not ${parsed.appUrl}`);
  }
}

export const env: Env = parseEnv(process.env);

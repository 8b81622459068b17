import { startFakeStripe } from "./server";

function readPort(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65_535) {
    console.error(`${name} must be a port number (0-65535), got "${raw}"`);
    process.exit(1);
  }
  return port;
}

// PORT+3 beside the app (3000), its SMTP (3001) and inbox (3002).
const port = readPort("STRIPE_FAKE_PORT", 3003);
const storePath = process.env.STRIPE_FAKE_STORE || undefined;
const webhookUrl = process.env.STRIPE_WEBHOOK_URL || undefined;
const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET || undefined;
if (webhookUrl && !webhookSecret) {
  console.error("STRIPE_WEBHOOK_URL needs STRIPE_WEBHOOK_SECRET (the whsec_… the app verifies signatures with)");
  process.exit(1);
}

const fake = await startFakeStripe({
  port,
  ...(storePath ? { storePath } : {}),
  ...(webhookUrl && webhookSecret ? { webhook: { url: webhookUrl, secret: webhookSecret } } : {}),
}).catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  return process.exit(1);
});

console.log(`Fake Stripe: ${fake.url}  (new Stripe("sk_test_…", { host: "localhost", port: ${fake.port}, protocol: "http" }))`);
console.log(`Control API: ${fake.url}/__control`);
if (webhookUrl) console.log(`Sending webhooks to ${webhookUrl}`);
if (storePath) console.log(`Keeping state in ${storePath}`);

let stopping = false;
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    // A second Ctrl-C means "now", even if the store is still being written.
    if (stopping) process.exit(1);
    stopping = true;
    fake.close().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error(error);
        process.exit(1);
      },
    );
  });
}

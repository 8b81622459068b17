import { demoAccountEmails } from "../lib/demo-accounts";
import { parseEnv } from "../lib/env";
import { startStack, stopOnSignals } from "./stack";

const env = parseEnv(process.env);
const stack = await startStack({ port: env.port, databasePath: env.databasePath, demo: true, fresh: false });
stopOnSignals(stack);

console.log(`
  Proofbay demo is running.

  App         ${stack.appUrl}
  Sign in     ${stack.appUrl}/sign-in   (one-click demo accounts, or a magic link)
  Fake inbox  ${stack.inbox.url}   (SMTP on 127.0.0.1:${stack.inbox.smtpPort})
  Fake Stripe ${stack.stripe.url}   (control API at ${stack.stripe.url}/__control)

  Demo accounts: ${demoAccountEmails.join(", ")}
  Press Ctrl+C to stop.
`);

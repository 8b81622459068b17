/**
 * The demo stack with `next dev` (hot reload) instead of the built app: seeded database, fake
 * inbox, fake Stripe. `PORT` moves it like the demo; the database defaults to data/dev-<port>.db.
 */
import { parseEnv } from "../lib/env";
import { startStack, stopOnSignals } from "./stack";

const port = Number(process.env.PORT ?? 3000);
const env = parseEnv({ ...process.env, PORT: String(port), DATABASE_PATH: process.env.DATABASE_PATH ?? `data/dev-${port}.db` });
const stack = await startStack({ port: env.port, databasePath: env.databasePath, demo: true, fresh: false, nextCommand: "dev" });
stopOnSignals(stack);
console.log(`Dev stack: app ${stack.appUrl}, inbox ${stack.inbox.url}, fake Stripe ${stack.stripe.url}`);

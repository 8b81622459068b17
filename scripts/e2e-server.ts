/** One app + fake inbox for Playwright: `tsx scripts/e2e-server.ts <port> <demo|plain>`, fresh data each run. */
import { startStack, stopOnSignals } from "./stack";

const port = Number(process.argv[2] ?? 3100);
const demo = process.argv[3] === "demo";
const stack = await startStack({ port, databasePath: `data/e2e-${port}.db`, demo, fresh: true, quiet: true });
stopOnSignals(stack);
console.log(`e2e stack on ${stack.appUrl} (demo: ${demo}), inbox ${stack.inbox.url}`);

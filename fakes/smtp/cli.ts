import { startFakeInbox } from "./inbox";

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

const smtpPort = readPort("SMTP_PORT", 3001);
const httpPort = readPort("INBOX_PORT", 3002);
const storePath = process.env.INBOX_STORE || undefined;
const dedupeByMessageId = process.env.INBOX_DEDUPE_MESSAGE_ID === "1";

const inbox = await startFakeInbox({ smtpPort, httpPort, storePath, dedupeByMessageId }).catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  return process.exit(1);
});

console.log(`Fake inbox: ${inbox.url}  (SMTP on 127.0.0.1:${inbox.smtpPort})`);
if (storePath) console.log(`Keeping mail in ${storePath}`);
if (dedupeByMessageId) console.log("Repeated Message-IDs are accepted but not stored (INBOX_DEDUPE_MESSAGE_ID=1)");

let stopping = false;
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    // A second Ctrl-C means "now", even if the store is still being written.
    if (stopping) process.exit(1);
    stopping = true;
    inbox.close().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error(error);
        process.exit(1);
      },
    );
  });
}

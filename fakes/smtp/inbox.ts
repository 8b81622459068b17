import type { Server as HttpServer } from "node:http";
import type { AddressInfo, Server as NetServer } from "node:net";
import { createHttpServer } from "./http-server";
import { MessageStore } from "./message-store";
import { ReceptionLog, type ReceptionStats } from "./receptions";
import { createSmtpReceiver } from "./smtp-receiver";
import type { StoredMessage } from "./types";

export type { MessageFilter, StoredAttachment, StoredMessage } from "./types";
export type { ReceptionStats } from "./receptions";

export interface FakeInboxOptions {
  /** 0 picks a free port; the FakeInbox reports the real one. */
  smtpPort: number;
  httpPort: number;
  /** Interface for both servers. Defaults to 127.0.0.1 so nothing is reachable from the network. */
  host?: string;
  /** JSON file; when set, messages survive restarts. */
  storePath?: string;
  quiet?: boolean;
  /** Oldest messages are dropped beyond this. Defaults to 20,000. */
  maxMessages?: number;
  /** Bigger messages are rejected with SMTP 552. Defaults to 25 MB. */
  maxMessageBytes?: number;
  /**
   * Behave like a receiving system that drops repeated Message-IDs: a message whose Message-ID
   * was received before is still accepted (250) but not stored again. Off by default, so the
   * inbox shows exactly what was sent; `receptions()` counts every acceptance either way.
   */
  dedupeByMessageId?: boolean;
}

export interface FakeInbox {
  smtpPort: number;
  httpPort: number;
  /** e.g. http://localhost:3002 */
  url: string;
  /** Newest first. */
  messages(): StoredMessage[];
  /** What SMTP accepted, counted before any duplicate suppression. */
  receptions(): ReceptionStats;
  /** Empties the inbox and the reception counts. */
  clear(): void;
  /** Stops both servers and writes the store file. Safe to call more than once. */
  close(): Promise<void>;
}

const DEFAULT_MAX_MESSAGES = 20_000;
const DEFAULT_MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

export async function startFakeInbox(options: FakeInboxOptions): Promise<FakeInbox> {
  const host = options.host ?? "127.0.0.1";
  const log = options.quiet ? () => {} : (line: string) => console.log(`[fake-inbox] ${line}`);
  const logError = options.quiet ? () => {} : (line: string) => console.error(`[fake-inbox] ${line}`);

  let smtpListening = false;
  const receptions = new ReceptionLog();
  const store = await MessageStore.open({
    filePath: options.storePath,
    maxMessages: options.maxMessages ?? DEFAULT_MAX_MESSAGES,
    onSaveError: (error) => logError(`Could not write ${options.storePath}: ${errorMessage(error)}`),
  });

  const smtp = createSmtpReceiver({
    maxMessageBytes: options.maxMessageBytes ?? DEFAULT_MAX_MESSAGE_BYTES,
    onMessage: (input) => {
      const messageId = input.headers["message-id"];
      const timesReceived = receptions.record(messageId);
      if (options.dedupeByMessageId && timesReceived > 1) {
        receptions.noteSuppressed();
        log(`duplicate ${messageId} (received ${timesReceived} times) accepted but not stored`);
        return;
      }
      const message = store.add(input);
      log(`#${message.id} to ${(message.envelope.to.join(", ") || message.to.join(", ")) || "(nobody)"}: ${message.subject}`);
    },
    // Startup failures are reported by the rejected promise instead.
    onError: (error) => {
      if (smtpListening) logError(`SMTP: ${error.message}`);
    },
  });
  let smtpPort = options.smtpPort;
  const clearAll = () => {
    store.clear();
    receptions.clear();
  };
  const http = createHttpServer({ store, smtpAddress: () => `${host}:${smtpPort}`, receptions: () => receptions.stats(), clear: clearAll });

  try {
    smtpPort = await listen(smtp.server, options.smtpPort, host, "SMTP");
    smtpListening = true;
    const httpPort = await listen(http, options.httpPort, host, "HTTP");

    let closing: Promise<void> | undefined;
    return {
      smtpPort,
      httpPort,
      url: `http://${browserHost(host)}:${httpPort}`,
      messages: () => store.list(),
      receptions: () => receptions.stats(),
      clear: clearAll,
      close: () => {
        closing ??= Promise.all([closeSmtp(smtp), closeHttp(http)]).then(() => store.close());
        return closing;
      },
    };
  } catch (error) {
    if (smtpListening) await closeSmtp(smtp);
    await store.close();
    throw error;
  }
}

function listen(server: NetServer, port: number, host: string, label: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const onError = (error: Error) => {
      server.off("listening", onListening);
      reject(new Error(`Fake inbox could not listen for ${label} on ${host}:${port}: ${error.message}`, { cause: error }));
    };
    const onListening = () => {
      server.off("error", onError);
      resolve((server.address() as AddressInfo).port);
    };
    server.once("error", onError);
    server.once("listening", onListening);
    server.listen(port, host);
  });
}

function closeSmtp(smtp: ReturnType<typeof createSmtpReceiver>): Promise<void> {
  return new Promise((resolve) => smtp.close(() => resolve()));
}

function closeHttp(http: HttpServer): Promise<void> {
  return new Promise((resolve) => {
    http.close(() => resolve());
    // Keep-alive connections from fetch would otherwise hold close() open until they time out.
    http.closeAllConnections();
  });
}

// "localhost" works in a browser for any loopback or wildcard bind; a specific interface must be named.
function browserHost(host: string): string {
  if (["127.0.0.1", "::1", "0.0.0.0", "::", "localhost"].includes(host)) return "localhost";
  return host.includes(":") ? `[${host}]` : host;
}

function errorMessage(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

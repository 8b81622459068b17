import { createServer as createHttpServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { createServer as createMswApp } from "@mswjs/http-middleware";
import { FakeClock } from "./clock";
import { createFakeStripe, type FakeStripe, type FakeStripeControl } from "./index";
import { PAGE_HEADERS, renderNoticePage } from "./pages";
import { FakeStripeStore } from "./store";
import type { RetryPolicy } from "./webhooks";

export interface StartFakeStripeOptions {
  /** 0 picks a free port; the result reports the real one. */
  port: number;
  /** Defaults to 127.0.0.1, so nothing is reachable from the network. */
  host?: string;
  /** JSON file; when set, objects, events and the clock survive restarts. */
  storePath?: string;
  webhook?: { url: string; secret: string; enabledEvents?: string[] };
  webhookRetry?: Partial<RetryPolicy>;
  quiet?: boolean;
  /** Start with the clock standing still at this unix time (tests). Ignored when the store has a clock. */
  frozenAt?: number;
  /**
   * How often to expire sessions and renew subscriptions that real time has made due. Defaults to
   * 30 s; 0 turns it off (then only `control.advanceClock` and `expireDueSessions` do it).
   */
  sweepIntervalMs?: number;
  merchantName?: string;
}

export interface RunningFakeStripe {
  /** e.g. http://localhost:3003 — point the SDK's host/port here; sessions' `url`s live here too. */
  url: string;
  port: number;
  control: FakeStripeControl;
  fake: FakeStripe;
  /** Stops the server and the retries, and writes the store. Safe to call more than once. */
  close(): Promise<void>;
}

export async function startFakeStripe(options: StartFakeStripeOptions): Promise<RunningFakeStripe> {
  const host = options.host ?? "127.0.0.1";
  const log = options.quiet ? () => {} : (line: string) => console.log(`[fake-stripe] ${line}`);
  const logError = options.quiet ? () => {} : (line: string) => console.error(`[fake-stripe] ${line}`);

  const store = options.storePath
    ? await FakeStripeStore.open({ filePath: options.storePath, onSaveError: (error) => logError(`Could not write ${options.storePath}: ${String(error)}`) })
    : FakeStripeStore.memory();
  const clock = store.restored ? new FakeClock(store.clockState) : new FakeClock(options.frozenAt === undefined ? {} : { frozenAt: options.frozenAt });

  let port = options.port;
  const fake = createFakeStripe({
    store,
    clock,
    publicUrl: () => `http://${browserHost(host)}:${port}`,
    ...(options.webhook ? { webhook: options.webhook } : {}),
    ...(options.webhookRetry ? { webhookRetry: options.webhookRetry } : {}),
    ...(options.merchantName ? { merchantName: options.merchantName } : {}),
    fallback: true,
    onLog: log,
  });
  const app = createMswApp(...fake.handlers);
  const server = createHttpServer((request, response) => {
    if (request.url === "/" && (request.method === "GET" || request.method === "HEAD")) {
      const body = renderNoticePage(
        "Local Stripe stand-in",
        `Serving the Stripe API under /v1 for test keys (sk_test_…), hosted checkout pages under /pay/, and a JSON control API under /__control. ${store.count("checkout.session")} sessions, ${store.count("event")} events so far.`,
        { href: "/__control", label: "Control API routes" },
      );
      response.writeHead(200, PAGE_HEADERS).end(body);
      return;
    }
    app(request, response);
  });

  try {
    port = await listen(server, options.port, host);
  } catch (error) {
    await fake.close();
    throw error;
  }

  const sweepMs = options.sweepIntervalMs ?? 30_000;
  const sweep =
    sweepMs > 0
      ? setInterval(() => {
          try {
            fake.control.advanceClock(0);
          } catch (error) {
            logError(`Sweep failed: ${String(error)}`);
          }
        }, sweepMs)
      : undefined;
  sweep?.unref();

  let closing: Promise<void> | undefined;
  return {
    url: `http://${browserHost(host)}:${port}`,
    port,
    control: fake.control,
    fake,
    close: () => {
      closing ??= (async () => {
        clearInterval(sweep);
        await new Promise<void>((resolve) => {
          server.close(() => resolve());
          // Keep-alive connections (the SDK's agent, fetch) would otherwise hold close() open.
          server.closeAllConnections();
        });
        await fake.close();
      })();
      return closing;
    },
  };
}

function listen(server: Server, port: number, host: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const onError = (error: Error) => {
      server.off("listening", onListening);
      reject(new Error(`Fake Stripe could not listen on ${host}:${port}: ${error.message}`, { cause: error }));
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

// "localhost" works in a browser for any loopback or wildcard bind; a specific interface must be named.
function browserHost(host: string): string {
  if (["127.0.0.1", "::1", "0.0.0.0", "::", "localhost"].includes(host)) return "localhost";
  return host.includes(":") ? `[${host}]` : host;
}

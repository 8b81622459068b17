/**
 * Budgets for the public board (issue: foundation): server response p50 under 50 ms with the
 * seeded data, and first-load JavaScript under 130 kB gzipped.
 */
import autocannon from "autocannon";
import { gzipSync } from "node:zlib";
import { startStack } from "../scripts/stack";

export type BoardFigures = {
  p50Ms: number;
  p99Ms: number;
  requestsPerSecond: number;
  firstLoadJsGzipBytes: number;
  scripts: number;
};

async function firstLoadJavaScript(appUrl: string): Promise<{ bytes: number; count: number }> {
  const html = await (await fetch(appUrl)).text();
  // Modern browsers skip noModule scripts (the legacy polyfill bundle), so they are not first-load JS.
  const sources = [...html.matchAll(/<script([^>]*)>/g)]
    .map((match) => match[1] as string)
    .filter((attributes) => !/\bnomodule\b/i.test(attributes))
    .map((attributes) => /\bsrc="([^"]+)"/.exec(attributes)?.[1])
    .filter((source): source is string => source !== undefined);
  const unique = [...new Set(sources)];
  let bytes = 0;
  for (const source of unique) {
    const body = Buffer.from(await (await fetch(new URL(source, appUrl))).arrayBuffer());
    bytes += gzipSync(body, { level: 9 }).length;
  }
  return { bytes, count: unique.length };
}

function load(url: string, connections: number, seconds: number): Promise<autocannon.Result> {
  return new Promise((resolve, reject) => {
    autocannon({ url, connections, duration: seconds }, (error, result) => (error ? reject(error) : resolve(result)));
  });
}

export async function runBoardBench(): Promise<BoardFigures> {
  const stack = await startStack({ port: 3200, databasePath: "data/bench-3200.db", demo: false, fresh: true, quiet: true });
  try {
    await load(stack.appUrl, 1, 2); // warm-up: route compilation caches, SQLite page cache
    const latency = await load(stack.appUrl, 1, 5);
    const throughput = await load(stack.appUrl, 10, 5);
    const js = await firstLoadJavaScript(stack.appUrl);
    return {
      p50Ms: latency.latency.p50,
      p99Ms: latency.latency.p99,
      requestsPerSecond: throughput.requests.average,
      firstLoadJsGzipBytes: js.bytes,
      scripts: js.count,
    };
  } finally {
    await stack.stop();
  }
}

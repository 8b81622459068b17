/**
 * Budgets for the public board (foundation issue): server response p50 under 50 ms with the
 * seeded data, and first-load JavaScript under 130 kB gzipped.
 */
import { gzipSync } from "node:zlib";
import { loadTest } from "./load";

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

export async function runBoardBench(appUrl: string): Promise<BoardFigures> {
  await loadTest({ url: appUrl, connections: 1, duration: 2 }); // warm-up: route caches, SQLite page cache
  const latency = await loadTest({ url: appUrl, connections: 1, duration: 5 });
  const throughput = await loadTest({ url: appUrl, connections: 10, duration: 5 });
  const js = await firstLoadJavaScript(appUrl);
  return {
    p50Ms: latency.latency.p50,
    p99Ms: latency.latency.p99,
    requestsPerSecond: throughput.requests.average,
    firstLoadJsGzipBytes: js.bytes,
    scripts: js.count,
  };
}

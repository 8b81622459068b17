/**
 * Latency of a host-only GET through a running app: a host session row is written straight into
 * the app's database, sequential requests carry its cookie, and the row is removed afterwards.
 */
import { randomBytes } from "node:crypto";
import { performance } from "node:perf_hooks";
import { eq } from "drizzle-orm";
import type { Db } from "../db/client";
import { sessions, users } from "../db/schema";

export type LatencyFigures = { p50Ms: number; p99Ms: number; samples: number };

export function latencyFigures(samples: number[]): LatencyFigures {
  const sorted = [...samples].sort((a, b) => a - b);
  const at = (share: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(share * sorted.length) - 1))] ?? 0;
  const round = (value: number) => Math.round(value * 1000) / 1000;
  return { p50Ms: round(at(0.5)), p99Ms: round(at(0.99)), samples: samples.length };
}

export async function timeHostGet(db: Db, appUrl: string, url: string, iterations = 200): Promise<LatencyFigures> {
  const host = db.select({ id: users.id }).from(users).where(eq(users.role, "host")).get();
  if (!host) throw new Error("The bench stack has no host account.");
  const token = randomBytes(32).toString("hex");
  db.insert(sessions).values({ sessionToken: token, userId: host.id, expires: new Date(Date.now() + 60 * 60 * 1000) }).run();
  const cookie = `${appUrl.startsWith("https://") ? "__Secure-" : ""}authjs.session-token=${token}`;
  const once = async () => {
    const response = await fetch(url, { headers: { cookie, accept: "application/json" } });
    if (response.status !== 200) throw new Error(`GET ${new URL(url).pathname} answered ${response.status}`);
    await response.arrayBuffer();
  };
  try {
    // The first request may land on a pooled keep-alive socket the server has since closed
    // ("other side closed"); one retry of that warm-up request is enough.
    await once().catch(() => once());
    for (let i = 0; i < 20; i++) await once();
    const samples: number[] = [];
    for (let i = 0; i < iterations; i++) {
      const start = performance.now();
      await once();
      samples.push(performance.now() - start);
    }
    return latencyFigures(samples);
  } finally {
    db.delete(sessions).where(eq(sessions.sessionToken, token)).run();
  }
}

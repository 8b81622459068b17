/**
 * Budget for POST /api/estimate (estimation issue): at least 2,000 requests/s at 50 concurrent
 * connections with p99 under 50 ms, load from a second process (autocannon runs in this one,
 * the app in its own `next start`).
 */
import autocannon from "autocannon";
import { loadTest } from "./load";

export type EstimateApiFigures = {
  requestsPerSecond: number;
  p50Ms: number;
  p99Ms: number;
  non2xx: number;
  errors: number;
  /** The same load on the app's emptiest route handler (the JSON 404): what Next itself costs here. */
  frameworkFloorRequestsPerSecond: number;
};

const body = JSON.stringify({
  printerSlug: "bay-1-kestrel",
  material: "PLA",
  layerHeightMm: 0.2,
  pieces: [
    { name: "Overhang ladder", filamentGrams: 18 },
    { name: "Bridge span set", filamentGrams: 14 },
    { name: "Cooling block", filamentMetres: 3 },
  ],
  variantCount: 3,
  repeats: 3,
});

export async function runEstimateApiBench(appUrl: string): Promise<EstimateApiFigures> {
  const options: autocannon.Options = {
    url: `${appUrl}/api/estimate`,
    method: "POST",
    headers: { "content-type": "application/json" },
    body,
    connections: 50,
  };
  await loadTest({ ...options, duration: 3 });
  const result = await loadTest({ ...options, duration: 10 });
  const floor = await loadTest({ url: `${appUrl}/api/bench-floor`, method: "POST", connections: 50, duration: 5 });
  return {
    frameworkFloorRequestsPerSecond: floor.requests.average,
    requestsPerSecond: result.requests.average,
    p50Ms: result.latency.p50,
    p99Ms: result.latency.p99,
    non2xx: result.non2xx,
    errors: result.errors,
  };
}

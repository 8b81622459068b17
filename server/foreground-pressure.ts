/**
 * How busy the app is with work somebody is waiting for (payment webhooks today). Background work
 * in the same process — the e-mail outbox — checks it between batches and steps aside during a
 * burst, for a bounded time, so a rush of payments is acknowledged first and its receipts follow
 * a few seconds later.
 */
const WINDOW_MS = 250;
/** More foreground requests than this inside one window counts as a burst. */
const BURST_REQUESTS = 20;
/** Background work never waits longer than this in a row, however long the burst. */
export const MAX_YIELD_MS = 30_000;

const state = globalThis as unknown as { proofbayForeground?: { windowStart: number; count: number; lastBurstCount: number; yieldingSince: number | null } };
const pressure = (state.proofbayForeground ??= { windowStart: 0, count: 0, lastBurstCount: 0, yieldingSince: null });

function roll(now: number) {
  if (now - pressure.windowStart < WINDOW_MS) return;
  // The window just finished becomes the one judged; an idle gap longer than a window counts as quiet.
  pressure.lastBurstCount = now - pressure.windowStart < 2 * WINDOW_MS ? pressure.count : 0;
  pressure.windowStart = now;
  pressure.count = 0;
}

export function noteForegroundRequest(now = Date.now()): void {
  roll(now);
  pressure.count++;
}

/** True while a burst is on and background work has not yet yielded for MAX_YIELD_MS in a row. */
export function backgroundShouldYield(now = Date.now()): boolean {
  roll(now);
  const busy = Math.max(pressure.lastBurstCount, pressure.count) > BURST_REQUESTS;
  if (!busy) {
    pressure.yieldingSince = null;
    return false;
  }
  pressure.yieldingSince ??= now;
  return now - pressure.yieldingSince < MAX_YIELD_MS;
}

/** Tests: forget every request seen. */
export function resetForegroundPressure(): void {
  Object.assign(pressure, { windowStart: 0, count: 0, lastBurstCount: 0, yieldingSince: null });
}

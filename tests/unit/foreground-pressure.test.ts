import { beforeEach, describe, expect, it } from "vitest";
import { backgroundShouldYield, MAX_YIELD_MS, noteForegroundRequest, resetForegroundPressure } from "@/server/foreground-pressure";

beforeEach(() => resetForegroundPressure());

describe("background work steps aside during a burst of payments", () => {
  it("does not yield when the app is quiet or busy only a little", () => {
    expect(backgroundShouldYield(1_000)).toBe(false);
    for (let i = 0; i < 5; i++) noteForegroundRequest(1_000 + i);
    expect(backgroundShouldYield(1_010)).toBe(false);
  });

  it("yields while more than 20 requests arrive per 250 ms window, for at most MAX_YIELD_MS in a row", () => {
    let t = 10_000;
    const burstWindow = () => {
      for (let i = 0; i < 30; i++) noteForegroundRequest(t + i);
      t += 250;
    };
    burstWindow();
    expect(backgroundShouldYield(t)).toBe(true);
    const started = t;
    while (t - started < MAX_YIELD_MS) burstWindow();
    // The burst goes on, but the outbox has waited long enough: it runs again.
    expect(backgroundShouldYield(t)).toBe(false);
  });

  it("forgets a burst once a whole quiet window has passed", () => {
    for (let i = 0; i < 30; i++) noteForegroundRequest(50_000 + i);
    expect(backgroundShouldYield(50_100)).toBe(true);
    expect(backgroundShouldYield(50_900)).toBe(false);
  });
});

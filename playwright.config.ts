import { defineConfig } from "@playwright/test";

import { demoPort, plainPort } from "./tests/e2e/support/ports";

const serverEnv = { NEXT_TELEMETRY_DISABLED: "1", AUTH_SECRET: "e2e-secret-not-for-production-0123456789" };

export default defineConfig({
  testDir: "tests/e2e",
  fullyParallel: false,
  workers: 1,
  retries: 0,
  reporter: [["list"]],
  timeout: 30_000,
  use: {
    baseURL: `http://localhost:${plainPort}`,
    screenshot: "only-on-failure",
    launchOptions: {
      executablePath: "/usr/bin/chromium",
      args: [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
      ],
    },
  },
  webServer: [
    {
      command: `npx tsx scripts/e2e-server.ts ${plainPort} plain`,
      url: `http://localhost:${plainPort}/api/health`,
      reuseExistingServer: false,
      timeout: 60_000,
      env: serverEnv,
    },
    {
      command: `npx tsx scripts/e2e-server.ts ${demoPort} demo`,
      url: `http://localhost:${demoPort}/api/health`,
      reuseExistingServer: false,
      timeout: 60_000,
      env: serverEnv,
    },
  ],
});

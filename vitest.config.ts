import { defineConfig } from "vitest/config";
import path from "node:path";

export default defineConfig({
  resolve: {
    alias: {
      "@": path.resolve(import.meta.dirname),
      // Route handlers are tested in-process; the guard only matters inside Next's bundler.
      "server-only": path.resolve(import.meta.dirname, "tests/helpers/server-only-stub.ts"),
    },
  },
  test: {
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts", "lib/**/*.test.ts"],
    environment: "node",
    pool: "forks",
    testTimeout: 20_000,
    server: { deps: { inline: ["next-auth", "@auth/core"] } },
  },
});

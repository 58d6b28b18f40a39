import { defineConfig } from "vitest/config";

// Unit tests: no Astro, no build, no browser.
export default defineConfig({
  test: {
    root: new URL("..", import.meta.url).pathname,
    include: ["test/**/*.test.ts"],
    environment: "node",
    testTimeout: 30_000,
  },
});

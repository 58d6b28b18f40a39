import { defineConfig } from "vitest/config";

// Browser tests: build the site once (globalSetup), serve dist/ on port 0, drive a system Chromium through
// playwright-core. CHROMIUM_PATH overrides /usr/bin/chromium; ARMDEX_E2E_SITE=<folder> serves an existing build; otherwise the suite builds into test-results/ (never dist/).
export default defineConfig({
  test: {
    root: new URL("..", import.meta.url).pathname,
    include: ["test/e2e/**/*.e2e.ts"],
    globalSetup: ["test/e2e/globalSetup.ts"],
    environment: "node",
    fileParallelism: false,
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});

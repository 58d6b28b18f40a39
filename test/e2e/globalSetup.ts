/**
 * Builds the site once for all browser tests (the project's own `npm run build`: arm check, then astro build) and
 * serves dist/ on port 0 under ARMDEX_BASE. ARMDEX_E2E_SKIP_BUILD=1 reuses an existing dist/.
 */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { join } from "node:path";
import type { TestProject } from "vitest/node";
import { serveStatic } from "./helpers/staticServer";
import { buildEnv } from "./helpers/buildEnv";

declare module "vitest" {
  export interface ProvidedContext {
    /** origin + base path, e.g. "http://127.0.0.1:40123/tools/armdex/" */
    siteUrl: string;
    origin: string;
    basePath: string;
    distDir: string;
  }
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const root = project.config.root;
  const distDir = join(root, "dist");
  if (process.env.ARMDEX_E2E_SKIP_BUILD !== "1") {
    const started = Date.now();
    const result = spawnSync("npm", ["run", "build"], {
      cwd: root,
      encoding: "utf8",
      env: buildEnv(),
      maxBuffer: 64 * 1024 * 1024,
    });
    if (result.status !== 0) {
      const output = `${result.stdout ?? ""}\n${result.stderr ?? ""}`.trim().split("\n").slice(-60).join("\n");
      throw new Error(`site build failed (npm run build, exit ${String(result.status ?? result.signal)}):\n${output}`);
    }
    process.stdout.write(`[e2e] site built in ${((Date.now() - started) / 1000).toFixed(1)} s\n`);
  }
  if (!existsSync(join(distDir, "index.html"))) {
    throw new Error(`no built site in ${distDir}: run \`npm run build\` or unset ARMDEX_E2E_SKIP_BUILD`);
  }
  const server = await serveStatic(distDir, process.env.ARMDEX_BASE ?? "/");
  project.provide("siteUrl", server.siteUrl);
  project.provide("origin", server.origin);
  project.provide("basePath", server.basePath);
  project.provide("distDir", distDir);
  return () => server.close();
}

/**
 * Builds the site once for all browser tests (the project's own `npm run build`: arm check, then astro build) into a
 * scratch folder under test-results/ with an empty analysis cache of its own, and serves it on port 0 under
 * ARMDEX_BASE. The user's dist/ and analysis cache are never touched. ARMDEX_E2E_SITE=<folder> serves an existing
 * build instead (no build).
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, rmSync } from "node:fs";
import { join, resolve } from "node:path";
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
  // Inside the project, as dist/ is (Astro lays out a build outside the project differently).
  const scratch = join(root, "test-results", `e2e-${process.pid}`);
  const reuse = process.env.ARMDEX_E2E_SITE;
  const distDir = reuse ? resolve(root, reuse) : join(scratch, "dist");
  if (!reuse) {
    mkdirSync(scratch, { recursive: true });
    const started = Date.now();
    const result = spawnSync("npm", ["run", "build"], {
      cwd: root,
      encoding: "utf8",
      env: buildEnv({ ARMDEX_OUT_DIR: distDir, ARMDEX_CACHE_DIR: join(scratch, "cache") }),
      maxBuffer: 64 * 1024 * 1024,
    });
    if (result.status !== 0) {
      const output = `${result.stdout ?? ""}\n${result.stderr ?? ""}`.trim().split("\n").slice(-60).join("\n");
      throw new Error(`site build failed (npm run build, exit ${String(result.status ?? result.signal)}):\n${output}`);
    }
    process.stdout.write(`[e2e] site built in ${((Date.now() - started) / 1000).toFixed(1)} s\n`);
  }
  if (!existsSync(join(distDir, "index.html"))) {
    throw new Error(`no built site in ${distDir}: build one or unset ARMDEX_E2E_SITE`);
  }
  const server = await serveStatic(distDir, process.env.ARMDEX_BASE ?? "/");
  project.provide("siteUrl", server.siteUrl);
  project.provide("origin", server.origin);
  project.provide("basePath", server.basePath);
  project.provide("distDir", distDir);
  return async () => {
    await server.close();
    if (!reuse) rmSync(scratch, { recursive: true, force: true });
  };
}

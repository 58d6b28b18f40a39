/**
 * Reproducible output: a second build of the same input, into another folder and with a separate, empty analysis
 * cache, is byte-identical to the site the suite built (itself from an empty cache of its own): no timestamps, no
 * random ids, sampling seeded, and nothing carried from one build to the other through the cache.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { afterAll, expect, inject, it } from "vitest";
import { buildEnv } from "./helpers/buildEnv";

const root = new URL("../..", import.meta.url).pathname;
const distDir = inject("distDir");
// Inside the project, as dist/ is (Astro lays out a build outside the project differently).
const scratch = join(root, "test-results", `repro-${process.pid}`);
mkdirSync(scratch, { recursive: true });
const outDir = join(scratch, "dist");
const cacheDir = join(scratch, "cache");

afterAll(() => rmSync(scratch, { recursive: true, force: true }));

function files(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else out.push(relative(dir, p));
    }
  };
  walk(dir);
  return out.sort();
}

it("two builds of the same arms are byte-identical", () => {
  expect(existsSync(cacheDir), "the second build starts from an empty cache").toBe(false);
  const env = buildEnv({ ARMDEX_OUT_DIR: outDir, ARMDEX_CACHE_DIR: cacheDir });
  const result = spawnSync("npm", ["run", "build"], { cwd: root, env, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  expect(result.status, `${result.stdout}\n${result.stderr}`.slice(-3000)).toBe(0);
  // Every arm was analysed afresh by this build, not read from a cache.
  expect(result.stdout).toMatch(/\b(\d+) analysed, 0 from the cache/);
  const first = files(distDir),
    second = files(outDir);
  expect(second).toEqual(first);
  const differing = first.filter((f) => !readFileSync(join(distDir, f)).equals(readFileSync(join(outDir, f))));
  expect(differing, "files whose bytes differ between the two builds").toEqual([]);
}, 600_000);

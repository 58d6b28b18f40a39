/**
 * Reproducible output (issue 5): a second build of the same input, into another folder, is byte-identical to the
 * dist/ the suite built (no timestamps, no random ids; sampling is seeded). The second build reuses the analysis
 * cache, so it also checks that cached analyses give the same pages as fresh ones.
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { afterAll, expect, inject, it } from "vitest";
import { buildEnv } from "./helpers/buildEnv";

const root = new URL("../..", import.meta.url).pathname;
const distDir = inject("distDir");
// Inside the project, as dist/ is (Astro lays out a build outside the project differently).
const scratch = join(root, "test-results", `repro-${process.pid}`);
mkdirSync(scratch, { recursive: true });
const outDir = join(scratch, "dist");

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
  const env = buildEnv({ ARMDEX_OUT_DIR: outDir });
  const result = spawnSync("npm", ["run", "build"], { cwd: root, env, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  expect(result.status, `${result.stdout}\n${result.stderr}`.slice(-3000)).toBe(0);
  const first = files(distDir),
    second = files(outDir);
  expect(second).toEqual(first);
  const differing = first.filter((f) => !readFileSync(join(distDir, f)).equals(readFileSync(join(outDir, f))));
  expect(differing, "files whose bytes differ between the two builds").toEqual([]);
}, 600_000);

/**
 * Interrupted builds (issue 5): SIGINT while the arms are being analysed, SIGTERM while Astro writes the site. Each
 * time the output folder must still hold the previous site, unchanged, with no temporary folder left beside it, and
 * the analysis cache must hold only complete entries. A build run to the end afterwards must then publish analyses
 * byte-identical to those of the suite's own build (dist/), which used another cache: nothing half-written by the
 * interrupted runs may leak into a later site.
 *
 * The builds run on a small catalog of three arm files (copies of demo arms) with a cache folder of their own, so
 * the analysis step starts cold and is long enough to interrupt.
 */
import { spawn, spawnSync } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { afterAll, beforeAll, expect, inject, it } from "vitest";
import { buildEnv } from "./helpers/buildEnv";

const root = new URL("../..", import.meta.url).pathname;
const suiteDist = inject("distDir");
const scratch = join(root, "test-results", `interrupt-${process.pid}`);
const armsDir = join(scratch, "arms");
const cacheDir = join(scratch, "cache");
const outDir = join(scratch, "dist");
const ARM_IDS = ["corvell-tern-7", "corvell-heron-210l", "yarrowfield-sable-600"];
const OLD_SITE: Record<string, string> = {
  "index.html": "<!doctype html><title>previous site</title>",
  "data/marker.txt": "previous build",
};

const scratchEnv = () => buildEnv({ ARMDEX_ARMS_DIR: armsDir, ARMDEX_OUT_DIR: outDir, ARMDEX_CACHE_DIR: cacheDir });

function files(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string, prefix: string) => {
    for (const entry of readdirSync(d, { withFileTypes: true })) {
      if (entry.isDirectory()) walk(join(d, entry.name), `${prefix}${entry.name}/`);
      else out.push(`${prefix}${entry.name}`);
    }
  };
  walk(dir, "");
  return out.sort();
}

/** Runs `build.ts` directly (not through npm, so the signal reaches it) and sends `signal` once `when` matches its output. */
function interruptedBuild(
  when: RegExp,
  signal: NodeJS.Signals,
): Promise<{ code: number | null; output: string; signalled: boolean }> {
  return new Promise((done) => {
    const child = spawn(join(root, "node_modules/.bin/tsx"), [join(root, "src/cli/build.ts")], {
      cwd: root,
      env: scratchEnv(),
    });
    let output = "";
    let signalled = false;
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      if (!signalled && when.test(output)) {
        signalled = true;
        // A moment into the step, so it is busy when the signal lands.
        setTimeout(() => child.kill(signal), 300);
      }
    };
    child.stdout.on("data", onData);
    child.stderr.on("data", onData);
    child.on("exit", (code) => done({ code, output, signalled }));
  });
}

function expectPreviousSiteIntact(): void {
  expect(files(outDir)).toEqual(Object.keys(OLD_SITE).sort());
  for (const [name, text] of Object.entries(OLD_SITE)) expect(readFileSync(join(outDir, name), "utf8")).toBe(text);
  // No temporary or set-aside folder beside it.
  const beside = readdirSync(scratch).filter((n) => n.startsWith("dist") && n !== "dist");
  expect(beside.map((n) => `${n}: ${files(join(scratch, n)).slice(0, 20).join(", ")}`)).toEqual([]);
}

/** Every cache entry (*.json) parses and belongs to one of the arms; temporary files are never read as entries. */
function expectCacheEntriesComplete(): void {
  let entries: string[] = [];
  try {
    entries = readdirSync(cacheDir).filter((n) => n.endsWith(".json"));
  } catch {
    return; // no cache folder yet: nothing was written
  }
  for (const name of entries) {
    const data = JSON.parse(readFileSync(join(cacheDir, name), "utf8")) as { id: string; specHash: string };
    expect(ARM_IDS).toContain(data.id);
    expect(data.specHash).toMatch(/^[0-9a-f]{64}$/);
  }
}

beforeAll(() => {
  rmSync(scratch, { recursive: true, force: true });
  mkdirSync(armsDir, { recursive: true });
  for (const id of ARM_IDS) {
    const arm = JSON.parse(readFileSync(join(root, "arms", `${id}.json`), "utf8")) as Record<string, unknown>;
    delete arm.$schema; // relative to arms/
    writeFileSync(join(armsDir, `${id}.json`), JSON.stringify(arm, null, 2));
  }
  for (const [name, text] of Object.entries(OLD_SITE)) {
    mkdirSync(dirname(join(outDir, name)), { recursive: true });
    writeFileSync(join(outDir, name), text);
  }
});

afterAll(() => rmSync(scratch, { recursive: true, force: true }));

it("SIGINT while the arms are analysed leaves the previous site and no half-written cache entry", async () => {
  const run = await interruptedBuild(/analysed \S+ in/, "SIGINT");
  expect(run.signalled, run.output).toBe(true);
  expect(run.code, run.output).not.toBe(0);
  expect(run.output).not.toMatch(/site written to/);
  expectPreviousSiteIntact();
  expectCacheEntriesComplete();
}, 300_000);

it("SIGTERM while Astro writes the site leaves the previous site and no temporary folder", async () => {
  // Astro announces its static pages as it renders them; by then the temporary output folder exists.
  const run = await interruptedBuild(/generating static routes|▶ src\/pages/, "SIGTERM");
  expect(run.signalled, run.output).toBe(true);
  expect(run.code, run.output).not.toBe(0);
  expect(run.output).not.toMatch(/site written to/);
  expectPreviousSiteIntact();
  expectCacheEntriesComplete();
}, 600_000);

it("a complete build afterwards publishes the same analyses as a build that was never interrupted, and clears what a killed build left", () => {
  // What a build killed outright (SIGKILL) would leave: its temporary folder, named after a process that is gone.
  const gone = spawnSync(process.execPath, ["-e", "process.stdout.write(String(process.pid))"], {
    encoding: "utf8",
  }).stdout;
  mkdirSync(join(scratch, `dist.building-${gone}`, "arms"), { recursive: true });
  writeFileSync(join(scratch, `dist.building-${gone}`, "index.html"), "half a site");
  const result = spawnSync(join(root, "node_modules/.bin/tsx"), [join(root, "src/cli/build.ts")], {
    cwd: root,
    env: scratchEnv(),
    encoding: "utf8",
    maxBuffer: 64 * 1024 * 1024,
  });
  expect(result.status, `${result.stdout}\n${result.stderr}`.slice(-3000)).toBe(0);
  expect(
    readdirSync(scratch)
      .filter((n) => n.startsWith("dist"))
      .sort(),
  ).toEqual(["dist"]);
  expect(readFileSync(join(outDir, "index.html"), "utf8")).not.toBe(OLD_SITE["index.html"]);
  expect(files(outDir)).not.toContain("data/marker.txt");
  for (const id of ARM_IDS) {
    // The copies lack the "$schema" line, so their spec hash differs; everything else must match byte for byte.
    const ours = readFileSync(join(outDir, "data", "arms", `${id}.json`), "utf8");
    const suite = readFileSync(join(suiteDist, "data", "arms", `${id}.json`), "utf8");
    const hashOf = (text: string) => /"specHash":"([0-9a-f]{64})"/.exec(text)?.[1];
    expect(hashOf(ours), `data/arms/${id}.json carries a spec hash`).toMatch(/^[0-9a-f]{64}$/);
    expect(hashOf(suite), `the suite build's data/arms/${id}.json carries a spec hash`).toMatch(/^[0-9a-f]{64}$/);
    expect(ours.replace(hashOf(ours)!, hashOf(suite)!) === suite, `data/arms/${id}.json equals the suite build's`).toBe(
      true,
    );
  }
}, 600_000);

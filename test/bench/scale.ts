/**
 * Catalog scale (issue 5): a generated catalog of N arm variants (default 300) is built cold (empty analysis cache,
 * no previous site), then one arm is added and the site rebuilt warm. Reports wall time of both builds, the peak
 * resident memory of the whole build (the build process and every process it starts, sampled from /proc), and the
 * per-arm analysis times the build logs.
 *
 * The variants are the demo arms scaled in size (lengths ×0.8–1.25, speeds and payload adjusted to match), with ids
 * and model names of their own: valid arms of every class the demo catalog has, not copies.
 *
 * Run alone: `npx tsx test/bench/scale.ts [--arms 300] [--keep]`; `npm run bench` runs it after the other sections.
 */
import { spawn } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { mulberry32 } from "../../src/core/math/random";
import { median } from "./stats";

type Json = Record<string, any>;

const LENGTH_KEYS = new Set([
  "aMm",
  "dMm",
  "reachMm",
  "comMm",
  "xyzMm",
  "rangeMm",
  "maxSpeedMmPerS",
  "maxAccelMmPerS2",
]);

/** Multiplies every length in the arm (DH lengths, frame offsets, centres of mass, strokes, stated reach) by `f`. */
function scaleLengths(value: unknown, f: number, key = ""): unknown {
  if (Array.isArray(value)) return value.map((v) => scaleLengths(v, f, key));
  if (value !== null && typeof value === "object") {
    return Object.fromEntries(Object.entries(value as Json).map(([k, v]) => [k, scaleLengths(v, f, k)]));
  }
  if (typeof value === "number" && LENGTH_KEYS.has(key)) return Math.round(value * f * 10) / 10;
  return value;
}

/** Variant `i` of a demo arm: scaled by f, payload by f² (rounded), rated torques by f³, an id and model of its own. */
export function variant(base: Json, i: number, rnd: () => number): Json {
  const f = 0.8 + 0.45 * rnd();
  const arm = scaleLengths(base, f) as Json;
  delete arm.$schema;
  arm.id = `${base.id}-s${String(i).padStart(3, "0")}`;
  arm.model = `${base.model} S${String(i).padStart(3, "0")}`;
  arm.ratedPayloadKg = Math.max(0.5, Math.round(base.ratedPayloadKg * f * f * 2) / 2);
  arm.massKg = Math.round(base.massKg * f ** 3 * 10) / 10;
  for (const j of arm.joints as Json[]) {
    if (j.ratedTorqueNm) j.ratedTorqueNm = Math.round(j.ratedTorqueNm * f ** 3 * 10) / 10;
    if (j.maxSpeedDegPerS) j.maxSpeedDegPerS = Math.round(j.maxSpeedDegPerS / f);
  }
  if (arm.links) for (const l of arm.links as Json[]) l.massKg = Math.round(l.massKg * f ** 3 * 100) / 100;
  if (arm.wrist?.momentNm)
    for (const k of Object.keys(arm.wrist.momentNm))
      arm.wrist.momentNm[k] = Math.round(arm.wrist.momentNm[k] * f ** 3 * 10) / 10;
  if (arm.wrist?.inertiaKgM2)
    for (const k of Object.keys(arm.wrist.inertiaKgM2))
      arm.wrist.inertiaKgM2[k] = Math.round(arm.wrist.inertiaKgM2[k] * f ** 5 * 1000) / 1000 || 0.001;
  return arm;
}

/** Writes `count` variants of the arms in `demoDir` into `dir`; returns their ids. */
export function generateCatalog(demoDir: string, dir: string, count: number, seed = 300): string[] {
  const demos = readdirSync(demoDir)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .map((f) => JSON.parse(readFileSync(join(demoDir, f), "utf8")) as Json);
  const rnd = mulberry32(seed);
  mkdirSync(dir, { recursive: true });
  const ids: string[] = [];
  for (let i = 0; i < count; i++) {
    const arm = variant(demos[i % demos.length]!, i, rnd);
    writeFileSync(join(dir, `${arm.id}.json`), `${JSON.stringify(arm, null, 2)}\n`);
    ids.push(arm.id as string);
  }
  return ids;
}

/** Resident memory (bytes) of `pid` and all its descendants, from /proc. */
function treeRssBytes(pid: number): number {
  const children = new Map<number, number[]>();
  const rss = new Map<number, number>();
  for (const name of readdirSync("/proc")) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const stat = readFileSync(`/proc/${name}/stat`, "utf8");
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      const ppid = Number(fields[1]);
      const rssPages = Number(fields[21]);
      rss.set(Number(name), rssPages * 4096);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(name)]);
    } catch {
      // the process ended while we read
    }
  }
  let total = 0;
  const stack = [pid];
  while (stack.length) {
    const p = stack.pop()!;
    total += rss.get(p) ?? 0;
    stack.push(...(children.get(p) ?? []));
  }
  return total;
}

export interface BuildRun {
  readonly seconds: number;
  readonly peakRssMb: number;
  readonly exitCode: number | null;
  /** Per-arm analysis times the build logged ("analysed <id> in <s> s"). */
  readonly analysedS: number[];
  /** Wall time of each build step the build logged ("step astro build: 12.3 s"), in order. */
  readonly steps: { readonly name: string; readonly seconds: number }[];
  readonly output: string;
}

export function timedBuild(root: string, env: NodeJS.ProcessEnv): Promise<BuildRun> {
  return new Promise((done) => {
    const t0 = performance.now();
    const child = spawn(join(root, "node_modules/.bin/tsx"), [join(root, "src/cli/build.ts")], { cwd: root, env });
    let output = "";
    let peak = 0;
    const timer = setInterval(() => {
      if (child.pid) peak = Math.max(peak, treeRssBytes(child.pid));
    }, 200);
    child.stdout.on("data", (c: Buffer) => (output += c.toString()));
    child.stderr.on("data", (c: Buffer) => (output += c.toString()));
    child.on("exit", (code) => {
      clearInterval(timer);
      const analysedS = [...output.matchAll(/analysed \S+ in ([\d.]+) s/g)].map((m) => Number(m[1]));
      const steps = [...output.matchAll(/^step (.+): ([\d.]+) s$/gm)].map((m) => ({
        name: m[1]!,
        seconds: Number(m[2]),
      }));
      done({
        seconds: (performance.now() - t0) / 1000,
        peakRssMb: peak / 2 ** 20,
        exitCode: code,
        analysedS,
        steps,
        output,
      });
    });
  });
}

function stepsText(run: BuildRun): string {
  return run.steps.map((s) => `${s.name} ${s.seconds.toFixed(1)} s`).join(", ");
}

export interface ScaleReport {
  readonly arms: number;
  readonly cold: BuildRun;
  readonly warm: BuildRun;
}

export async function runScaleBench(opts: {
  root: string;
  arms: number;
  keep?: boolean;
  log?: (line: string) => void;
}): Promise<ScaleReport> {
  const log = opts.log ?? ((l: string) => console.log(l));
  const scratch = join(opts.root, "test-results", `scale-${opts.arms}`);
  rmSync(scratch, { recursive: true, force: true });
  const armsDir = join(scratch, "arms");
  const ids = generateCatalog(join(opts.root, "arms"), armsDir, opts.arms);
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ARMDEX_ARMS_DIR: armsDir,
    ARMDEX_OUT_DIR: join(scratch, "dist"),
    ARMDEX_CACHE_DIR: join(scratch, "cache"),
    ASTRO_TELEMETRY_DISABLED: "1",
  };
  log(`scale: ${ids.length} generated arms, cold build (empty cache, no previous site)…`);
  const cold = await timedBuild(opts.root, env);
  if (opts.keep) writeFileSync(join(scratch, "cold.log"), cold.output);
  if (cold.exitCode !== 0) throw new Error(`cold build failed:\n${cold.output.slice(-3000)}`);
  log(
    `  cold build ${cold.seconds.toFixed(0)} s, peak memory ${cold.peakRssMb.toFixed(0)} MB, ${cold.analysedS.length} arms analysed, ` +
      `per arm median ${median(cold.analysedS).toFixed(2)} s, max ${Math.max(...cold.analysedS).toFixed(2)} s`,
  );
  log(`    steps: ${stepsText(cold)}`);
  // Add one arm, a variant not in the catalog yet, and rebuild.
  // (the same generator one step further: variant number N, an id the catalog does not have yet)
  const extraIds = generateCatalog(join(opts.root, "arms"), join(scratch, "extra"), opts.arms + 1);
  const extra = `${extraIds.at(-1)!}.json`;
  writeFileSync(join(armsDir, extra), readFileSync(join(scratch, "extra", extra)));
  log(`scale: added ${extra}, warm build…`);
  const warm = await timedBuild(opts.root, env);
  if (opts.keep) writeFileSync(join(scratch, "warm.log"), warm.output);
  if (warm.exitCode !== 0) throw new Error(`warm build failed:\n${warm.output.slice(-3000)}`);
  log(
    `  warm build ${warm.seconds.toFixed(0)} s, peak memory ${warm.peakRssMb.toFixed(0)} MB, ${warm.analysedS.length} arm(s) analysed`,
  );
  log(`    steps: ${stepsText(warm)}`);
  log(
    `  targets: cold ≤ 600 s ${cold.seconds <= 600 ? "met" : "MISSED"}, warm ≤ 60 s ${warm.seconds <= 60 ? "met" : "MISSED"}, ` +
      `peak ≤ 2048 MB ${Math.max(cold.peakRssMb, warm.peakRssMb) <= 2048 ? "met" : "MISSED"}`,
  );
  if (!opts.keep) rmSync(scratch, { recursive: true, force: true });
  return { arms: ids.length + 1, cold, warm };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const { parseArgs } = await import("node:util");
  const { values } = parseArgs({ options: { arms: { type: "string" }, keep: { type: "boolean" } } });
  await runScaleBench({
    root: resolve(new URL("../..", import.meta.url).pathname),
    arms: Number(values.arms ?? 300),
    keep: values.keep,
  });
}

/**
 * npm run bench: speed is measured here, never in unit tests. Reports medians (and ratios against a baseline
 * measured in the same run):
 * 1. the per-pose kernel (FK + Jacobian + singular values + both speed figures), ours vs ml-matrix objects;
 * 2. per-stage analysis times for every arm of the catalog, single-threaded; for the ortho-parallel class, the full
 *    analysis with closed-form speed maps against numeric ones (target ≤ 1 s each);
 * 3. the demo catalog's site build, arm-sheet page weight, and the side-by-side page of four arms: navigation
 *    start to drawn (compareInteractive.ts), in headless Chromium;
 * 4. a longer fuzz run (test/fuzz/longRun.ts): random valid arms through the whole analysis, property violations;
 * 5. catalog scale: a generated catalog of 300 arm variants built cold, then warm after adding one arm (build time,
 *    peak memory of the build's processes, per-arm analysis time; see scale.ts);
 * 6. cell move timing: per-call cost of the time-optimal timing of a 6-joint, 200-stage path and of a synchronised
 *    joint move (cellTiming.ts); run second, right after the analysis stages.
 * 7. cell studies of the demo cells, cold and warm, against the editor's 250 ms budget, and the placement maps of
 *    one cell's candidates at 50 mm against 5 s (cellStudy.ts).
 * Options: --arms <folder> (default arms/), --quick (fewer repetitions, 30 generated arms), --only <ids>,
 * 6. pinned revisions: collecting 300 arms × 3 revisions from a generated git history against loading the catalog,
 *    and whole builds with and without the history (revisions.ts).
 * --scale-arms <n> (default 300), --no-scale (skip section 5), --no-revisions (skip section 6), --fuzz-runs <n>
 * (default 500, 50 with --quick).
 */
import { parseArgs } from "node:util";
import { loadArms } from "../../src/catalog";
import { fastKernel, baselineKernel } from "./kernel";
import { mulberry32 } from "../../src/core/math/random";
import { workspaceEnvelope } from "../../src/core/analysis/envelope/envelope";
import { capabilityMap, DEFAULT_CAPABILITY } from "../../src/core/analysis/capability/capability";
import {
  createSpeedMapWorkspace,
  referenceOrientations,
  toolSpeedMap,
  DEFAULT_SPEED_MAP,
} from "../../src/core/analysis/speedMap/speedMap";
import { payloadAtReach, payloadInputOf, loadDiagram } from "../../src/core/analysis/payload";
import { analyseArm, MAX_OUTPUT_COLUMNS } from "../../src/core/analysis/analyseArm";
import { sphericalWristIk } from "../../src/core/kinematics/closedForm";
import { gravityDirectionInBase } from "../../src/core/kinematics/statics";
import { armFacts } from "../../src/catalog/analysis";
import { runScaleBench, timedBuild } from "./scale";
import { runRevisionBuildBench, runRevisionStageBench } from "./revisions";
import { measureCompareInteractive } from "./compareInteractive";
import { readdirSync, statSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { runFuzz } from "../fuzz/longRun";
import { median } from "./stats";
import { benchCellTiming } from "./cellTiming";
import { benchCellStudies } from "./cellStudy";

const { values } = parseArgs({
  options: {
    arms: { type: "string" },
    quick: { type: "boolean" },
    only: { type: "string" },
    "scale-arms": { type: "string" },
    "no-scale": { type: "boolean" },
    "no-revisions": { type: "boolean" },
    "fuzz-runs": { type: "string" },
  },
});
const reps = values.quick ? 3 : 7;

function timeMs(f: () => unknown): number {
  const t0 = performance.now();
  f();
  return performance.now() - t0;
}

const { arms, issues } = await loadArms([values.arms ?? "arms"]);
if (issues.some((i) => i.severity === "error")) throw new Error("invalid catalog; run armdex check");
const chosen = values.only ? arms.filter((a) => values.only!.split(",").includes(a.id)) : arms;
console.log(`node ${process.version}, ${chosen.length} arms, medians of ${reps} runs\n`);

// 1. Kernel throughput.
console.log("kernel: FK + Jacobian + singular values + guaranteed line speed + maximum tool speed, one pose");
console.log("arm                          ours poses/s   ml-matrix poses/s   ratio");
const ratios: number[] = [];
for (const arm of chosen) {
  const c = arm.chain,
    m = c.drivenCount;
  const rnd = mulberry32(7);
  const poses = Array.from({ length: 2000 }, () =>
    Float64Array.from(
      { length: m },
      (_, i) => Math.max(c.lowerSi[i]!, -3) + (Math.min(c.upperSi[i]!, 3) - Math.max(c.lowerSi[i]!, -3)) * rnd(),
    ),
  );
  const fast = fastKernel(c),
    base = baselineKernel(c);
  let sink = 0;
  const run = (k: (q: Float64Array) => number, count: number) => () => {
    for (let i = 0; i < count; i++) sink += k(poses[i % poses.length]!);
  };
  run(fast, 20000)();
  run(base, 500)();
  const fastRate = median(Array.from({ length: reps }, () => 50000 / (timeMs(run(fast, 50000)) / 1000)));
  const baseRate = median(Array.from({ length: reps }, () => 2000 / (timeMs(run(base, 2000)) / 1000)));
  ratios.push(fastRate / baseRate);
  console.log(
    `${arm.id.padEnd(28)} ${fastRate.toFixed(0).padStart(12)} ${baseRate.toFixed(0).padStart(19)} ${(fastRate / baseRate).toFixed(1).padStart(7)}×${sink === 0 ? "" : ""}`,
  );
}
console.log(`median ratio ${median(ratios).toFixed(1)}×\n`);

// 2. Per-stage analysis times, single-threaded.
console.log("analysis stages, ms (single thread):");
console.log("arm                          envelope  speed maps  payload  capability  full analysis (medians of 3)");
const fullByArm: { id: string; axes: number; ms: number }[] = [];
for (const arm of chosen) {
  const c = arm.chain,
    facts = armFacts(arm);
  const gravity = gravityDirectionInBase(facts.mountings[0] ?? "floor");
  const env = median(Array.from({ length: Math.min(reps, 3) }, () => timeMs(() => workspaceEnvelope(c))));
  // The maps as the analysis makes them: one workspace for both, the inverse condition on the published nodes.
  const maps = median(
    Array.from({ length: Math.min(reps, 3) }, () =>
      timeMs(() => {
        const workspace = createSpeedMapWorkspace();
        return referenceOrientations(c).map((o) =>
          toolSpeedMap(c, o, { ...DEFAULT_SPEED_MAP, gravity, conditionMaxColumns: MAX_OUTPUT_COLUMNS }, workspace),
        );
      }),
    ),
  );
  const pay = median(
    Array.from({ length: Math.min(reps, 3) }, () =>
      timeMs(() => {
        const input = payloadInputOf(facts, c);
        payloadAtReach(c, input);
        loadDiagram(input);
      }),
    ),
  );
  // The capability map as the analysis makes it, over the flange envelope (computed once, outside the timing).
  const envelope = workspaceEnvelope(c);
  const cap = median(
    Array.from({ length: Math.min(reps, 3) }, () =>
      timeMs(() => capabilityMap(c, envelope.layout, envelope.flange!, DEFAULT_CAPABILITY)),
    ),
  );
  const fullRuns = Array.from({ length: Math.min(reps, 3) }, () => timeMs(() => analyseArm(c, facts)));
  const full = median(fullRuns);
  fullByArm.push({ id: arm.id, axes: c.drivenCount, ms: full });
  console.log(
    `${arm.id.padEnd(28)} ${env.toFixed(0).padStart(8)} ${maps.toFixed(0).padStart(11)} ${pay.toFixed(0).padStart(8)} ${cap.toFixed(0).padStart(11)} ${full.toFixed(0).padStart(14)}`,
  );
}

{
  const six = fullByArm.filter((a) => a.axes === 6);
  if (six.length > 0) {
    const over = six.filter((a) => a.ms > 2000);
    console.log(
      `six-axis arms, full analysis: median ${median(six.map((a) => a.ms)).toFixed(0)} ms, slowest ${Math.max(...six.map((a) => a.ms)).toFixed(0)} ms; target 2000 ms each${over.length ? `; over: ${over.map((a) => a.id).join(", ")}` : ", met by all"}`,
    );
  }
}

// 2b. The ortho-parallel class (kinematics/orthoParallel.ts): full analysis with the speed maps in closed form (the
// default) against the numeric maps (closedForm: false, the baseline), interleaved in one fresh process per arm
// (timeClosedForm.ts); target ≤ 1000 ms each.
{
  const opw = chosen.filter((a) => sphericalWristIk(a.chain)?.orthoParallel);
  if (opw.length > 0) {
    console.log(`\northo-parallel arms, full analysis, medians of ${reps} runs (closed-form maps vs numeric maps):`);
    const over: string[] = [];
    const tsx = join(process.cwd(), "node_modules/.bin/tsx");
    for (const arm of opw) {
      const file = join(values.arms ?? "arms", `${arm.id}.json`);
      const r = spawnSync(tsx, [join(process.cwd(), "test/bench/timeClosedForm.ts"), file, String(reps)], {
        encoding: "utf8",
      });
      if (r.status !== 0) throw new Error(`${arm.id}: ${r.stderr}`);
      const t = JSON.parse(r.stdout.trim().split("\n").pop()!) as { closed: number[]; numeric: number[] };
      const mc = median(t.closed),
        mn = median(t.numeric);
      if (mc > 1000) over.push(arm.id);
      console.log(
        `${arm.id.padEnd(28)} ${mc.toFixed(0).padStart(6)} ms  numeric ${mn.toFixed(0).padStart(6)} ms  ratio ${(mc / mn).toFixed(2)}`,
      );
    }
    console.log(`target 1000 ms each${over.length ? `; over: ${over.join(", ")}` : ", met by all"}`);
  }
}

// 6. Cell move timing (cheap; run here so the heavy sections below do not disturb it).
{
  const r = benchCellTiming(reps);
  console.log(
    `\ncell move timing (median per call): time-optimal timing, 6 joints × 200 stages ${r.timeOptimalUs.toFixed(0)} µs ` +
      `(${r.timeOptimalScratchUs.toFixed(0)} µs with a reused scratch; move ${r.timeS.toFixed(3)} s); ` +
      `synchronised joint move ${r.jointMoveUs.toFixed(2)} µs`,
  );
}

// 7. Cell studies and placement maps of the demo cells.
await benchCellStudies(values.arms ?? "arms", reps);

// 3. Demo site: build, page weight, side-by-side page time to interactive.
{
  const base = "/tools/armdex/";
  const outDir = join(process.cwd(), "test-results", "bench-dist");
  console.log(`\ndemo site (${values.arms ?? "arms"}, base ${base}):`);
  const build = await timedBuild(process.cwd(), {
    ...process.env,
    ARMDEX_BASE: base,
    ARMDEX_OUT_DIR: outDir,
    ASTRO_TELEMETRY_DISABLED: "1",
    ...(values.arms ? { ARMDEX_ARMS_DIR: values.arms } : {}),
  });
  if (build.exitCode !== 0) throw new Error(`demo build failed:\n${build.output.slice(-3000)}`);
  console.log(
    `  build ${build.seconds.toFixed(1)} s (analyses from the cache where present), peak memory ${build.peakRssMb.toFixed(0)} MB`,
  );
  const sheets = readdirSync(join(outDir, "arms")).map((id) => ({
    id,
    kb: statSync(join(outDir, "arms", id, "index.html")).size / 1024,
  }));
  const heaviest = sheets.reduce((a, b) => (b.kb > a.kb ? b : a));
  console.log(
    `  arm sheet HTML+SVG: median ${median(sheets.map((s) => s.kb)).toFixed(0)} KB, largest ${heaviest.kb.toFixed(0)} KB (${heaviest.id}); limit 300 KB`,
  );
  const four = arms
    .filter((a) => a.chain.drivenCount >= 4)
    .slice(0, 4)
    .map((a) => a.id);
  const r = await measureCompareInteractive({ distDir: outDir, base, arms: four, runs: reps });
  console.log(
    `  side by side, 4 arms (${four.join(", ")}): drawn in median ${r.medianMs.toFixed(0)} ms over ${reps} cold loads ` +
      `(min ${Math.min(...r.runsMs).toFixed(0)} ms); target 1000 ms`,
  );
}

// 4. Longer fuzz run.
{
  const runs = Number(values["fuzz-runs"] ?? (values.quick ? 50 : 500));
  console.log(`\nfuzz: ${runs} random valid arms through the whole analysis (seed 1)`);
  const r = runFuzz({ seed: 1, runs });
  console.log(
    `  outcomes ${JSON.stringify(r.counts)}, per arm median ${r.medianMs.toFixed(0)} ms, max ${r.maxMs.toFixed(0)} ms`,
  );
  console.log(`  arms violating a property: ${r.failures.length}`);
  for (const f of r.failures.slice(0, 5)) console.log(`    arm ${f.index}: ${f.violations[0] ?? ""}`);
}

// 5. Catalog scale.
if (!values["no-scale"]) {
  console.log("\ncatalog scale (whole build: check, analyses in worker threads, site):");
  await runScaleBench({ root: process.cwd(), arms: Number(values["scale-arms"] ?? (values.quick ? 30 : 300)) });
}

// 6. Pinned revisions: reading the history (stage, 300 arms × 3 revisions) and whole builds with and without it.
if (!values["no-revisions"]) {
  console.log("\npinned revisions (history read with git, older revisions validated, diffed, analysed once):");
  const log = (l: string) => console.log(l);
  await runRevisionStageBench({ root: process.cwd(), arms: values.quick ? 30 : 300, reps: values.quick ? 3 : 5, log });
  await runRevisionBuildBench({ root: process.cwd(), arms: values.quick ? 6 : 20, reps: values.quick ? 2 : 3, log });
}

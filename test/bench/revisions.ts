/**
 * Pinned revisions (issue 15): what reading the history costs.
 *
 * 1. Stage: a generated catalog of N arms (default 300) in a throwaway git repository, committed three times (J1
 *    speed changed in each later commit): the time to collect every arm's revisions (one `git log`, one
 *    `git cat-file --batch`, each older version validated and diffed) and to make the revision page models, against
 *    the time to load and validate the catalog itself (what every build does anyway). Medians of `reps` runs.
 * 2. Build: a smaller generated catalog (default 20 arms × 3 revisions), analyses cached first, then whole site
 *    builds (`npm run build`) with the history read (ARMDEX_REVISIONS on) and without (off), taking turns; medians
 *    and their ratio. The target is 300 arms × 3 revisions within 1.5× the build without revisions; run
 *    `--build-arms 300` for that (it analyses 900 arm versions once: long on a small machine).
 *
 * Run alone: `npx tsx test/bench/revisions.ts [--arms 300] [--build-arms 20] [--reps 5] [--no-build]`.
 */
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { loadArms } from "../../src/catalog";
import { collectRevisions } from "../../src/catalog/revisions";
import { citeModel, pinnedRevisions, revisionsJson, revisionsSectionModel } from "../../src/view/revisionModel";
import { makeGitRepo, type GitRepo } from "../helpers/gitRepo";
import { generateCatalog, timedBuild } from "./scale";
import { median } from "./stats";

/** Changes every arm's J1 speed by `factor` and commits. */
function changeAndCommit(repo: GitRepo, dir: string, factor: number, date: string): void {
  for (const f of readdirSync(dir).filter((n) => n.endsWith(".json"))) {
    const arm = JSON.parse(readFileSync(join(dir, f), "utf8"));
    const j = arm.joints.find((x: { maxSpeedDegPerS?: number }) => x.maxSpeedDegPerS !== undefined);
    j.maxSpeedDegPerS = Math.max(10, Math.round(j.maxSpeedDegPerS * factor));
    writeFileSync(join(dir, f), `${JSON.stringify(arm, null, 2)}\n`);
  }
  repo.commit(`speeds ×${factor}`, date);
}

/** A catalog of `count` generated arms with three committed revisions each, in a new repository. */
function historyCatalog(root: string, count: number): { repo: GitRepo; dir: string } {
  const repo = makeGitRepo(mkdtempSync(join(tmpdir(), "armdex-rev-bench-")));
  const dir = join(repo.root, "arms");
  generateCatalog(join(root, "arms"), dir, count);
  repo.commit("catalog", "2026-01-01T09:00:00+00:00");
  changeAndCommit(repo, dir, 0.95, "2026-02-01T09:00:00+00:00");
  changeAndCommit(repo, dir, 0.9, "2026-03-01T09:00:00+00:00");
  return { repo, dir };
}

export async function runRevisionStageBench(opts: {
  root: string;
  arms: number;
  reps: number;
  log: (l: string) => void;
}) {
  const { repo, dir } = historyCatalog(opts.root, opts.arms);
  try {
    const load: number[] = [],
      collect: number[] = [],
      models: number[] = [];
    let revisions = 0;
    for (let k = 0; k < opts.reps; k++) {
      let t0 = performance.now();
      const { arms } = await loadArms([dir]);
      load.push(performance.now() - t0);
      t0 = performance.now();
      const collected = await collectRevisions(arms);
      collect.push(performance.now() - t0);
      t0 = performance.now();
      revisions = 0;
      collected.forEach((c, i) => {
        const d = c.data;
        revisions += d.revisions.length;
        revisionsSectionModel(d, "/");
        citeModel(arms[i]!, d.revisions[0]!, { baseUrl: "/" });
        revisionsJson(d);
        pinnedRevisions(d);
      });
      models.push(performance.now() - t0);
    }
    const m = { load: median(load), collect: median(collect), models: median(models) };
    opts.log(
      `revisions, stage: ${opts.arms} arms, ${revisions} revisions; medians of ${opts.reps}: load and validate the catalog ` +
        `${m.load.toFixed(0)} ms; collect revisions (git, validate, diff) ${m.collect.toFixed(0)} ms ` +
        `(${(m.collect / m.load).toFixed(2)}× the load); page models ${m.models.toFixed(1)} ms`,
    );
    return m;
  } finally {
    rmSync(repo.root, { recursive: true, force: true });
  }
}

export async function runRevisionBuildBench(opts: {
  root: string;
  arms: number;
  reps: number;
  log: (l: string) => void;
}) {
  const { repo, dir } = historyCatalog(opts.root, opts.arms);
  const scratch = join(opts.root, "test-results", `revisions-bench-${process.pid}`);
  const env = (revisions: boolean): NodeJS.ProcessEnv => ({
    ...process.env,
    ARMDEX_ARMS_DIR: dir,
    ARMDEX_OUT_DIR: join(scratch, "dist"),
    ARMDEX_CACHE_DIR: join(scratch, "cache"),
    ARMDEX_REVISIONS: revisions ? "on" : "off",
    ASTRO_TELEMETRY_DISABLED: "1",
  });
  try {
    opts.log(`revisions, build: ${opts.arms} arms × 3 revisions; analysing every revision once (cold)…`);
    const cold = await timedBuild(opts.root, env(true));
    if (cold.exitCode !== 0) throw new Error(`build failed:\n${cold.output.slice(-3000)}`);
    opts.log(`  cold build with revisions ${cold.seconds.toFixed(1)} s`);
    const on: number[] = [],
      off: number[] = [];
    for (let k = 0; k < opts.reps; k++) {
      for (const revisions of k % 2 === 0 ? [false, true] : [true, false]) {
        const run = await timedBuild(opts.root, env(revisions));
        if (run.exitCode !== 0) throw new Error(`build failed:\n${run.output.slice(-3000)}`);
        (revisions ? on : off).push(run.seconds);
      }
    }
    const ratio = median(on) / median(off);
    opts.log(
      `  warm builds, medians of ${opts.reps}: without revisions ${median(off).toFixed(1)} s, with ${median(on).toFixed(1)} s: ` +
        `${ratio.toFixed(2)}× (target ≤ 1.5× at 300 arms: ${ratio <= 1.5 ? "met" : "MISSED"} at ${opts.arms} arms)`,
    );
    return { on: median(on), off: median(off), ratio };
  } finally {
    rmSync(repo.root, { recursive: true, force: true });
    rmSync(scratch, { recursive: true, force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const { parseArgs } = await import("node:util");
  const { values } = parseArgs({
    options: {
      arms: { type: "string" },
      "build-arms": { type: "string" },
      reps: { type: "string" },
      "no-build": { type: "boolean" },
    },
  });
  const root = resolve(new URL("../..", import.meta.url).pathname);
  const log = (l: string) => console.log(l);
  const reps = Number(values.reps ?? 5);
  await runRevisionStageBench({ root, arms: Number(values.arms ?? 300), reps, log });
  if (!values["no-build"])
    await runRevisionBuildBench({ root, arms: Number(values["build-arms"] ?? 20), reps: Math.min(reps, 3), log });
}

/**
 * Full-analysis time of this tree against another commit, in the same run: the other commit is checked out into a
 * temporary git worktree (node_modules linked), and the two trees are timed in turn, arm by arm and round by round,
 * each in its own process (timeAnalysis.ts), so machine load falls on both alike. Reports per-arm medians and the
 * ratio this / other.
 * usage: tsx test/bench/against.ts <git-rev> [--this <git-rev>] [--only id,id] [--rounds 3] [--runs 1]
 * (--this: time that commit instead of the working tree, also from a temporary worktree)
 */
import { execFileSync, spawnSync } from "node:child_process";
import { copyFileSync, mkdtempSync, readdirSync, rmSync, symlinkSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { parseArgs } from "node:util";
import { median } from "./stats";

const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: { only: { type: "string" }, rounds: { type: "string" }, runs: { type: "string" }, this: { type: "string" } },
});
const rev = positionals[0];
if (!rev) throw new Error("usage: tsx test/bench/against.ts <git-rev> [--only id,id] [--rounds 3] [--runs 1]");
const rounds = Number(values.rounds ?? "3"),
  runs = Number(values.runs ?? "1");
const repo = resolve(new URL("../..", import.meta.url).pathname);
/** A temporary worktree of `r` with this tree's node_modules and timing script. */
function checkout(r: string): string {
  const dir = mkdtempSync(join(tmpdir(), "armdex-against-"));
  execFileSync("git", ["worktree", "add", "--detach", dir, r], { cwd: repo, stdio: "ignore" });
  symlinkSync(join(repo, "node_modules"), join(dir, "node_modules"));
  copyFileSync(join(repo, "test/bench/timeAnalysis.ts"), join(dir, "test/bench/timeAnalysis.ts"));
  return dir;
}
const other = checkout(rev);
const here = values.this ? checkout(values.this) : repo;
try {
  const sha = execFileSync("git", ["rev-parse", "--short", rev], { cwd: repo, encoding: "utf8" }).trim();
  const ids = readdirSync(join(other, "arms"))
    .filter((f) => f.endsWith(".json"))
    .map((f) => f.replace(/\.json$/, ""))
    .filter((id) => !values.only || values.only.split(",").includes(id));
  const tsx = join(here, "node_modules/.bin/tsx");
  const time = (tree: string, id: string): number[] => {
    const r = spawnSync(
      tsx,
      [join(tree, "test/bench/timeAnalysis.ts"), join(tree, "arms", `${id}.json`), String(runs)],
      {
        cwd: tree,
        encoding: "utf8",
      },
    );
    if (r.status !== 0) throw new Error(`${tree}: ${id}: ${r.stderr}`);
    return (JSON.parse(r.stdout.trim().split("\n").pop()!) as { ms: number[] }).ms;
  };
  console.log(
    `full analysis, ${values.this ?? "this tree"} against ${rev} (${sha}): median of ${rounds} rounds × ${runs} run(s), ms`,
  );
  console.log("arm".padEnd(26) + "this".padStart(9) + "other".padStart(9) + "  ratio");
  const ratios: number[] = [];
  for (const id of ids) {
    const mine: number[] = [],
      theirs: number[] = [];
    for (let k = 0; k < rounds; k++) {
      // Alternate which tree goes first, so a slow minute does not always fall on the same one.
      if (k % 2 === 0) {
        mine.push(...time(here, id));
        theirs.push(...time(other, id));
      } else {
        theirs.push(...time(other, id));
        mine.push(...time(here, id));
      }
    }
    const a = median(mine),
      b = median(theirs);
    ratios.push(a / b);
    console.log(`${id.padEnd(26)}${a.toFixed(0).padStart(9)}${b.toFixed(0).padStart(9)}  ${(a / b).toFixed(2)}`);
  }
  console.log(`median ratio this / other: ${median(ratios).toFixed(2)}`);
} finally {
  for (const dir of values.this ? [other, here] : [other]) {
    execFileSync("git", ["worktree", "remove", "--force", dir], { cwd: repo, stdio: "ignore" });
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * One process, one arm: loads the arm file and times its full analysis `runs` times (after one warm-up run), printing
 * the times as JSON. Used by against.ts to time two versions of the code in the same bench run; it imports only
 * names every version of the tree has had (loadArmFile, armFacts, analyseArm).
 * usage: tsx test/bench/timeAnalysis.ts <arm.json> <runs>
 */
import { loadArmFile } from "../../src/catalog/load";
import { armFacts } from "../../src/catalog/analysis";
import { analyseArm } from "../../src/core/analysis/analyseArm";

const [file, runsText] = process.argv.slice(2);
const runs = Number(runsText ?? "3");
const { arm } = await loadArmFile(file!);
if (!arm) throw new Error(`cannot load ${file}`);
analyseArm(arm.chain, armFacts(arm));
const ms: number[] = [];
for (let k = 0; k < runs; k++) {
  const t0 = performance.now();
  analyseArm(arm.chain, armFacts(arm));
  ms.push(performance.now() - t0);
}
process.stdout.write(`${JSON.stringify({ ms })}\n`);

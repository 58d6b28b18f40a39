/**
 * One process, one arm: the full analysis with the speed maps in closed form (the default for the ortho-parallel
 * class) and in numeric form (closedForm: false, the baseline), after one warm-up each, interleaved `runs` times;
 * prints the times as JSON. Used by bench.ts section 2b, one fresh process per arm so that no other section's heap
 * or compiled code weighs on it.
 * usage: tsx test/bench/timeClosedForm.ts <arm.json> <runs>
 */
import { loadArmFile } from "../../src/catalog/load";
import { armFacts } from "../../src/catalog/analysis";
import { analyseArm, DEFAULT_ANALYSIS } from "../../src/core/analysis/analyseArm";

const [file, runsText] = process.argv.slice(2);
const runs = Number(runsText ?? "7");
const { arm } = await loadArmFile(file!);
if (!arm) throw new Error(`cannot load ${file}`);
const facts = armFacts(arm);
const numericOptions = { ...DEFAULT_ANALYSIS, speedMap: { closedForm: false } };
analyseArm(arm.chain, facts);
analyseArm(arm.chain, facts, numericOptions);
const closed: number[] = [],
  numeric: number[] = [];
for (let k = 0; k < runs; k++) {
  let t0 = performance.now();
  analyseArm(arm.chain, facts);
  closed.push(performance.now() - t0);
  t0 = performance.now();
  analyseArm(arm.chain, facts, numericOptions);
  numeric.push(performance.now() - t0);
}
process.stdout.write(`${JSON.stringify({ closed, numeric })}\n`);

import { loadArms } from "../../src/catalog";
import { armFacts } from "../../src/catalog/analysis";
import { workspaceEnvelope } from "../../src/core/analysis/envelope";
import { referenceOrientations, toolSpeedMap, DEFAULT_SPEED_MAP } from "../../src/core/analysis/speedMap";
import { analyseArm, DEFAULT_ANALYSIS } from "../../src/core/analysis/analyseArm";
import { gravityDirectionInBase } from "../../src/core/analysis/mounting";
const { arms } = await loadArms(["arms"]);
const only = process.argv[2]?.split(",");
for (const arm of arms.filter(a => !only || only.includes(a.id))) {
  const c = arm.chain, facts = armFacts(arm);
  const gravity = gravityDirectionInBase(facts.mountings[0] ?? "floor");
  const t0 = performance.now(); const env = workspaceEnvelope(c); const t1 = performance.now();
  const mt: number[] = [];
  for (const o of referenceOrientations(c)) { const a = performance.now(); toolSpeedMap(c, o, { ...DEFAULT_SPEED_MAP, gravity, boundsMm: { rMax: env.flange!.maxReachMm + 20, zMin: env.flange!.minHeightMm - 20, zMax: env.flange!.maxHeightMm + 20 } }); mt.push(performance.now() - a); }
  const t2 = performance.now(); analyseArm(c, facts, DEFAULT_ANALYSIS); const t3 = performance.now();
  console.log(arm.id.padEnd(26), c.drivenCount, "env", (t1 - t0).toFixed(0), "maps", mt.map(x => x.toFixed(0)).join("+"), "full", (t3 - t2).toFixed(0));
}

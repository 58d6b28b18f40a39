/**
 * Numeric against closed-form speed maps, per arm of the spherical-wrist class (sphericalWristIk not null): the full
 * analysis (loadArmFile + armFacts + analyseArm, as timeAnalysis.ts) with `speedMap.closedForm` false, true and
 * "discovery", interleaved in one process (median of `runs`, after one warm-up each), and the published map arrays
 * compared with the numeric ones: reachable cells, largest figure differences, det J sign, branch, loci points.
 * usage: tsx test/bench/closedFormMaps.ts <runs> <arm.json>...
 */
import { loadArmFile } from "../../src/catalog/load";
import { armFacts } from "../../src/catalog/analysis";
import { analyseArm, DEFAULT_ANALYSIS } from "../../src/core/analysis/analyseArm";
import type { ArmAnalysis, SpeedMapJson } from "../../src/core/analysis/armAnalysis";
import { sphericalWristIk } from "../../src/core/kinematics/closedForm";
import { median } from "./stats";

type Mode = false | true | "discovery";
const MODES: Mode[] = [false, true];
const [runsText, ...files] = process.argv.slice(2);
const runs = Number(runsText ?? "3");

/** Published map b against a: cells reached by one only, largest figure differences, det sign and branch changes. */
function compareMaps(a: SpeedMapJson, b: SpeedMapJson): string {
  let reach = 0,
    dg = 0,
    dv = 0,
    dc = 0,
    det = 0,
    branch = 0,
    worse = 0,
    better = 0;
  for (let i = 0; i < a.guaranteedMmPerS.length; i++) {
    const ga = a.guaranteedMmPerS[i] ?? null,
      gb = b.guaranteedMmPerS[i] ?? null;
    if ((ga === null) !== (gb === null)) reach++;
    if (ga === null || gb === null) continue;
    dg = Math.max(dg, Math.abs(ga - gb));
    dv = Math.max(dv, Math.abs(a.maxMmPerS[i]! - b.maxMmPerS[i]!));
    const ca = a.inverseCondition[i],
      cb = b.inverseCondition[i];
    if (ca != null && cb != null) dc = Math.max(dc, Math.abs(ca - cb));
    if (a.detSign[i] !== b.detSign[i] && a.detSign[i] !== 0 && b.detSign[i] !== 0) det++;
    // b's best branch against a's: lower guaranteed speed, or equal (0.1 mm/s) with a lower maximum speed.
    const d = ga - gb,
      dvMax = a.maxMmPerS[i]! - b.maxMmPerS[i]!;
    if (d > 1 || (Math.abs(d) <= 0.1 && dvMax > 1)) worse++;
    if (d < -1 || (Math.abs(d) <= 0.1 && dvMax < -1)) better++;
    if (a.branchNames[a.branch[i]!] !== b.branchNames[b.branch[i]!]) branch++;
  }
  return (
    `${a.orientation}: reachable ${a.reachableCells}/${b.reachableCells}, cells reached by one only ${reach}, ` +
    `max |Δ guaranteed| ${dg} mm/s, max |Δ max speed| ${dv} mm/s, max |Δ inverse condition| ${dc.toFixed(3)}, ` +
    `det sign ≠ ${det} (both non-zero), branch ≠ ${branch}, best branch worse ${worse}, better ${better}`
  );
}

/** Loci points (published, 0.1 mm) by orientation/kind found by one analysis only. */
function compareLoci(a: ArmAnalysis, b: ArmAnalysis): string[] {
  const points = (x: ArmAnalysis) => {
    const out = new Map<string, Set<string>>();
    for (const l of x.singularities.loci) {
      const key = `${l.orientation}/${l.kind}`;
      const set = out.get(key) ?? new Set<string>();
      for (const line of l.polylinesMm) for (const p of line) set.add(`${p[0]},${p[1]}`);
      out.set(key, set);
    }
    return out;
  };
  const pa = points(a),
    pb = points(b);
  return [...new Set([...pa.keys(), ...pb.keys()])].map((key) => {
    const x = pa.get(key) ?? new Set<string>(),
      y = pb.get(key) ?? new Set<string>();
    const onlyA = [...x].filter((p) => !y.has(p)),
      onlyB = [...y].filter((p) => !x.has(p));
    return `loci ${key}: ${x.size}/${y.size} points, numeric only ${onlyA.length} [${onlyA.slice(0, 4).join(" ")}], closed only ${onlyB.length} [${onlyB.slice(0, 4).join(" ")}]`;
  });
}

for (const file of files) {
  const { arm } = await loadArmFile(file);
  if (!arm) throw new Error(`cannot load ${file}`);
  const ms = new Map<Mode, number[]>(MODES.map((m) => [m, []]));
  const last = new Map<Mode, ArmAnalysis>();
  for (let r = 0; r <= runs; r++)
    for (const mode of MODES) {
      const t0 = performance.now();
      const a = analyseArm(arm.chain, armFacts(arm), { ...DEFAULT_ANALYSIS, speedMap: { closedForm: mode } });
      if (r > 0) ms.get(mode)!.push(performance.now() - t0);
      last.set(mode, a);
    }
  console.log(`\n${arm.id} (closed form applies: ${sphericalWristIk(arm.chain) !== null})`);
  for (const mode of MODES)
    console.log(
      `  closedForm ${String(mode)}: median ${median(ms.get(mode)!).toFixed(0)} ms [${ms.get(mode)!.map((t) => t.toFixed(0))}]`,
    );
  const base = last.get(false)!;
  for (const mode of MODES.slice(1)) {
    const other = last.get(mode)!;
    for (let i = 0; i < base.speed.maps.length; i++)
      console.log(`  ${String(mode)} vs numeric, ${compareMaps(base.speed.maps[i]!, other.speed.maps[i]!)}`);
    for (const line of compareLoci(base, other)) console.log(`  ${String(mode)} vs numeric, ${line}`);
    for (const part of ["envelope", "payload", "cycle", "standardLines", "warnings"] as const)
      if (JSON.stringify(base[part]) !== JSON.stringify(other[part])) console.log(`  ${String(mode)}: ${part} differs`);
  }
}

/**
 * Bench cases for cell studies and placement maps (issues 12 and 13):
 * - the study of each demo cell, all candidates: cold (new arm chains, so every solver set-up is built) and warm (the
 *   same chains again: what the browser editor pays on each edit; budget 250 ms for 6 candidates on one core);
 * - the placement map at 50 mm of each candidate of the press-tending cell over its whole region (budget 5 s).
 * Medians of `reps` runs; the cold study is the baseline the warm one is compared with.
 */
import { loadArms, type Arm } from "../../src/catalog";
import { armFacts } from "../../src/catalog/analysis";
import { cellsDirOf, loadCells } from "../../src/catalog/cell";
import { cellStudy, compileChain, placementMap, type CellArm } from "../../src/core";
import { median } from "./stats";

function armsOf(arms: readonly Arm[], ids: readonly string[], fresh: boolean): CellArm[] {
  return ids.map((id) => {
    const a = arms.find((x) => x.id === id)!;
    // A fresh chain (compiled again) has no cached solver set-up: the cold case.
    return { id, chain: fresh ? compileChain(a.spec) : a.chain, facts: armFacts(a) };
  });
}

export async function benchCellStudies(armsDir: string, reps: number): Promise<void> {
  const { arms } = await loadArms([armsDir]);
  const { cells } = await loadCells(
    cellsDirOf(armsDir),
    arms.map((a) => a.id),
  );
  console.log("\ncell studies (single thread, medians):");
  console.log("cell                          candidates   cold ms   warm ms   warm/cold   warm vs 250 ms budget");
  for (const cell of cells) {
    const ids = cell.spec.candidates;
    const cold: number[] = [],
      warm: number[] = [];
    for (let r = 0; r < reps; r++) {
      const fresh = armsOf(arms, ids, true);
      let t0 = performance.now();
      cellStudy(cell.spec, fresh);
      cold.push(performance.now() - t0);
      t0 = performance.now();
      cellStudy(cell.spec, fresh);
      warm.push(performance.now() - t0);
    }
    const c = median(cold),
      w = median(warm);
    console.log(
      `${cell.id.padEnd(30)}${String(ids.length).padStart(10)}${c.toFixed(0).padStart(10)}${w.toFixed(0).padStart(10)}` +
        `${(w / c).toFixed(2).padStart(12)}${(w / 250).toFixed(2).padStart(12)}×`,
    );
  }
  const press = cells.find((c) => c.id === "demo-press-tending") ?? cells[0];
  if (!press) return;
  console.log(`\nplacement maps at 50 mm, ${press.id} (single thread, medians of ${Math.min(reps, 3)}):`);
  console.log("arm                          positions  feasible m²   ms     vs 5 s budget");
  for (const id of press.spec.candidates) {
    const runs: number[] = [];
    let positions = 0,
      area = 0;
    for (let r = 0; r < Math.min(reps, 3); r++) {
      const [arm] = armsOf(arms, [id], true);
      const t0 = performance.now();
      const map = placementMap(press.spec, arm!, { gridMm: 50 });
      runs.push(performance.now() - t0);
      positions = map.xMm.length * map.yMm.length;
      area = map.feasibleAreaM2;
    }
    const m = median(runs);
    console.log(
      `${id.padEnd(29)}${String(positions).padStart(9)}${area.toFixed(2).padStart(12)}${m.toFixed(0).padStart(7)}${(m / 5000).toFixed(2).padStart(10)}×`,
    );
  }
}

/**
 * Discovery seeding of the speed maps: at spaced cells, inverse kinematics from seeded random joint values (every
 * solution in closed form where the chain allows it); each new solution floods the grid (continuation.ts).
 */
import { solveIkInto } from "../../kinematics/inverse";
import { mulberry32 } from "../../math/random";
import { flood } from "./continuation";
import { closedAt, pairTwin, push, setTargetInto, storeClosed, storeQ, type MapRun } from "./state";

/** Stores every closed-form solution of a cell not held yet and floods from it; false when not available there. */
function discoverClosed(run: MapRun, cell: number): boolean {
  const { m, qTry } = run;
  const n = closedAt(run, cell);
  if (n < 0) return false;
  for (let k = 0; k < n; k++) {
    const off = (run.closedFirst[cell]! + k) * m;
    for (let i = 0; i < m; i++) qTry[i] = run.closedSol![off + i]!;
    const slot = storeClosed(run, cell, k, qTry);
    if (slot >= 0) {
      push(run, cell, slot);
      pairTwin(run, cell, slot);
      flood(run);
    }
  }
  return true;
}

/** Discovery at every `discoveryEveryCells`-th cell in both directions (and, in closed form, at every cell). */
export function discoverAndFlood(run: MapRun): void {
  const { chain, m, qTry, options, grid } = run;
  const { nx, ny } = grid;
  // Discovery at spaced cells, from seeded random joint values (every solution in closed form); each new solution
  // floods the grid.
  const rnd = mulberry32(options.seed ^ (run.orientation === "down" ? 0x9e37 : 0x7f4a));
  const every = Math.max(1, options.discoveryEveryCells);
  for (let iy = Math.floor(every / 2); iy < ny; iy += every) {
    for (let ix = Math.floor(every / 2); ix < nx; ix += every) {
      const cell = ix + iy * nx;
      if (discoverClosed(run, cell)) continue;
      for (let t = 0; t < options.discoverySeeds; t++) {
        // Every seed sets the target again: the flood from the previous seed's solution aimed it at other cells.
        setTargetInto(run, run.target, cell);
        for (let i = 0; i < m; i++) {
          const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
            hi = Math.min(chain.upperSi[i]!, Math.PI);
          // Every other seed puts some joints exactly at a limit: branches that exist only in a thin band next to
          // a limit (a wrist joint at ±180°) are found too.
          const u = rnd();
          qTry[i] = t % 2 === 1 && u < 0.15 ? lo : t % 2 === 1 && u > 0.85 ? hi : lo + (hi - lo) * rnd();
        }
        if (!solveIkInto(qTry, chain, run.target, qTry, run.ik, run.discoveryIk)) continue;
        const slot = storeQ(run, cell, qTry);
        if (slot >= 0) {
          push(run, cell, slot);
          pairTwin(run, cell, slot);
          flood(run);
        }
      }
    }
  }
  // Closed form: branches the flood did not reach from the discovery cells (cut off by joint limits or by
  // degenerate cells) are found at every cell.
  if (run.closed && run.closedContinuation && options.discoverEveryCell !== false)
    for (let cell = 0; cell < run.cells; cell++) discoverClosed(run, cell);
}

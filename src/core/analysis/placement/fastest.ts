/**
 * The fastest base position of a placement map: the cell's full cycle (study.ts) evaluated at a coarse subset of the
 * feasible positions, then refined around the best by a pattern search.
 *
 * - Coarse subset: the feasible positions on every k-th grid line in x and y, k = round(COARSE_STEP_MM / gridMm)
 *   (at least 1, doubled while that leaves more than MAX_COARSE positions), counted from the cell origin; when that
 *   gives fewer than MIN_COARSE positions, the feasible positions with the largest joint margins are added up to
 *   MIN_COARSE.
 * - Refinement: from the best coarse position, the eight neighbours at h grid steps (h = k/2 rounded up) are
 *   evaluated; the search moves to a faster one, else halves h, down to one grid step.
 * A position counts only when its whole cycle is feasible; the fastest such one is `best`.
 * @see Hooke & Jeeves, "Direct search solution of numerical and statistical problems", J. ACM 8(2), 1961 (pattern
 *   search) [from memory]
 */
import { cellStudy, type CellArm } from "../cell/study";
import type { CellSpec, PlacementSpec } from "../cell/types";

export const COARSE_STEP_MM = 200;
export const MIN_COARSE = 8;
/** Most coarse positions: the coarse spacing doubles until the subset is no larger. */
export const MAX_COARSE = 40;

export interface PlacementBest {
  readonly positionMm: [number, number, number];
  readonly yawDeg: number;
  readonly cycleTimeS: number;
}

export interface PlacementGrid {
  readonly xMm: readonly number[];
  readonly yMm: readonly number[];
  readonly feasible: readonly (readonly (0 | 1)[])[];
  readonly marginDeg: readonly (readonly (number | null)[])[];
  readonly yawDeg: readonly (readonly (number | null)[])[];
}

/** Cycle time with the base at grid node (c, r), or null when the cycle is not feasible there. */
function cycleAt(
  cell: CellSpec,
  arm: CellArm,
  placement: PlacementSpec,
  g: PlacementGrid,
  c: number,
  r: number,
): number | null {
  const yaw = g.yawDeg[r]![c] ?? placement.rpyDeg[2];
  const at: PlacementSpec = {
    positionMm: [g.xMm[c]!, g.yMm[r]!, placement.positionMm[2]],
    rpyDeg: [placement.rpyDeg[0], placement.rpyDeg[1], yaw],
  };
  const study = cellStudy({ ...cell, placements: { ...cell.placements, [arm.id]: at } }, [arm]);
  return study.arms[0]!.cycleTimeS;
}

export function fastestPlacement(
  cell: CellSpec,
  arm: CellArm,
  placement: PlacementSpec,
  g: PlacementGrid,
): { best: PlacementBest | null; coarseStepMm: number; evaluated: number } {
  const gridMm = g.xMm.length > 1 ? g.xMm[1]! - g.xMm[0]! : g.yMm.length > 1 ? g.yMm[1]! - g.yMm[0]! : COARSE_STEP_MM;
  let k = Math.max(1, Math.round(COARSE_STEP_MM / gridMm));
  const times = new Map<number, number | null>();
  const nx = g.xMm.length;
  const timeAt = (c: number, r: number): number | null => {
    const key = r * nx + c;
    if (!times.has(key)) times.set(key, cycleAt(cell, arm, placement, g, c, r));
    return times.get(key)!;
  };
  const feasibleAt = (c: number, r: number) =>
    r >= 0 && r < g.yMm.length && c >= 0 && c < nx && g.feasible[r]![c] === 1;
  const coarse: [number, number][] = [];
  const all: [number, number][] = [];
  for (let r = 0; r < g.yMm.length; r++) for (let c = 0; c < nx; c++) if (feasibleAt(c, r)) all.push([c, r]);
  const onLines = (k: number) =>
    all.filter(([c, r]) => Math.round(g.xMm[c]! / gridMm) % k === 0 && Math.round(g.yMm[r]! / gridMm) % k === 0);
  while (onLines(k).length > MAX_COARSE) k *= 2;
  coarse.push(...onLines(k));
  if (coarse.length < MIN_COARSE) {
    const rest = all
      .filter(([c, r]) => !coarse.some(([a, b]) => a === c && b === r))
      .sort((a, b) => (g.marginDeg[b[1]]![b[0]] ?? -Infinity) - (g.marginDeg[a[1]]![a[0]] ?? -Infinity));
    coarse.push(...rest.slice(0, MIN_COARSE - coarse.length));
  }
  let best: [number, number] | null = null,
    bestTime = Infinity;
  const consider = (c: number, r: number): boolean => {
    if (!feasibleAt(c, r)) return false;
    const t = timeAt(c, r);
    if (t !== null && t < bestTime - 1e-9) {
      bestTime = t;
      best = [c, r];
      return true;
    }
    return false;
  };
  for (const [c, r] of coarse) consider(c, r);
  if (best) {
    let h = Math.ceil(k / 2);
    while (h >= 1) {
      const [c0, r0] = best as [number, number];
      let moved = false;
      for (const [dc, dr] of [
        [1, 0],
        [-1, 0],
        [0, 1],
        [0, -1],
        [1, 1],
        [1, -1],
        [-1, 1],
        [-1, -1],
      ] as const)
        moved = consider(c0 + h * dc, r0 + h * dr) || moved;
      if (!moved) h = h === 1 ? 0 : Math.ceil(h / 2);
    }
  }
  const found = best as [number, number] | null;
  return {
    best: found
      ? {
          positionMm: [g.xMm[found[0]]!, g.yMm[found[1]]!, placement.positionMm[2]],
          yawDeg: g.yawDeg[found[1]]![found[0]] ?? placement.rpyDeg[2],
          cycleTimeS: bestTime,
        }
      : null,
    coarseStepMm: k * gridMm,
    evaluated: times.size,
  };
}

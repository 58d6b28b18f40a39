/**
 * Placement map of one arm for a cell: where on the placement plane the base can stand so that the tool point reaches
 * every target of the cell inside the joint ranges, and where the cycle is fastest. See README.md.
 */
import type { Chain } from "../../kinematics/chain";
import { invertRigidInto, mat4, mul4Into } from "../../math/mat4";
import { degToRad, mmToM, radToDeg } from "../../units";
import { createReachContext, reachMargin, type ReachContext } from "../cell/reach";
import { poseOfMm } from "../cell/setup";
import { resolveTargets } from "../cell/targets";
import type { CellSpec, PlacementSpec } from "../cell/types";
import { fastestPlacement, type PlacementBest } from "./fastest";
import { EXTENT_MARGIN, reachExtent, type ReachExtent } from "./reachExtent";
import type { CellArm } from "../cell/study";

export interface PlacementOptions {
  /** Grid spacing, mm (default 50). */
  readonly gridMm: number;
  /** Base yaw tried in steps of this many degrees at each position (null: the placement's yaw only). */
  readonly yawStepDeg: number | null;
}

export const DEFAULT_PLACEMENT: PlacementOptions = { gridMm: 50, yawStepDeg: null };

export interface PlacementMapJson {
  readonly cell: string;
  readonly arm: string;
  readonly gridMm: number;
  readonly planeZMm: number;
  /** Grid columns (x) and rows (y) of base positions in the cell frame, mm. */
  readonly xMm: number[];
  readonly yMm: number[];
  /** 1 where every target is reachable; rows follow yMm, columns xMm. */
  readonly feasible: (0 | 1)[][];
  readonly feasibleAreaM2: number;
  /** Smallest joint margin over the targets at each feasible position (best posture per target), deg; null elsewhere. */
  readonly marginDeg: (number | null)[][];
  /** Base yaw used at each feasible position, deg (the placement's, or the best found with a yaw step); null elsewhere. */
  readonly yawDeg: (number | null)[][] | null;
  readonly best: PlacementBest | null;
  /** The placement in the cell file (the arm's own, or the cell's), for the drawing. */
  readonly current: { readonly positionMm: number[]; readonly rpyDeg: number[] };
  /** How the fastest position was searched (which positions had their cycle evaluated). */
  readonly search: { readonly coarseStepMm: number; readonly evaluated: number };
}

/**
 * Upper bound of the distance from the base origin to the tool point, m: the sum of the fixed translations, the
 * prismatic strokes and the tool offset (triangle inequality; revolute joints do not lengthen a chain).
 */
export function reachBoundM(chain: Chain, tcpInFlange: Float64Array): number {
  let sum = 0;
  for (let i = 0; i <= chain.jointCount; i++) {
    const f = 16 * i;
    sum += Math.hypot(chain.fixed[f + 3]!, chain.fixed[f + 7]!, chain.fixed[f + 11]!);
  }
  for (let i = 0; i < chain.drivenCount; i++) {
    if (!chain.isPrismatic[chain.drivenJoint[i]!]) continue;
    const lo = chain.lowerSi[i]!,
      hi = chain.upperSi[i]!;
    sum += Number.isFinite(lo) && Number.isFinite(hi) ? Math.max(Math.abs(lo), Math.abs(hi)) : 0;
  }
  return sum + Math.hypot(tcpInFlange[3]!, tcpInFlange[7]!, tcpInFlange[11]!);
}

interface Probe {
  readonly ctx: ReachContext;
  /** The tool point's extent in the base frame, grown by EXTENT_MARGIN. */
  readonly extent: ReachExtent;
  readonly tcpFromFlange: Float64Array;
  readonly cellFromTcp: Float64Array[];
  readonly cellFromBase: Float64Array;
  readonly baseFromCell: Float64Array;
  readonly baseFromTcp: Float64Array;
  readonly baseFromFlange: Float64Array;
  readonly q: Float64Array;
  readonly hints: Float64Array[][];
}

function insideExtent(e: ReachExtent, x: number, y: number, z: number): boolean {
  const r = Math.hypot(x, y, z);
  return (
    x >= e.minM[0] &&
    x <= e.maxM[0] &&
    y >= e.minM[1] &&
    y <= e.maxM[1] &&
    z >= e.minM[2] &&
    z <= e.maxM[2] &&
    r >= e.rMinM &&
    r <= e.rMaxM
  );
}

/** The extent grown by EXTENT_MARGIN (the estimate can only fall short of the true extremes). */
function grown(e: ReachExtent): ReachExtent {
  const g = EXTENT_MARGIN.share * e.rMaxM + EXTENT_MARGIN.lengthM;
  return {
    minM: [e.minM[0] - g, e.minM[1] - g, e.minM[2] - g],
    maxM: [e.maxM[0] + g, e.maxM[1] + g, e.maxM[2] + g],
    rMinM: Math.max(0, e.rMinM - g),
    rMaxM: e.rMaxM + g,
  };
}

/** Smallest margin over the targets with the base at (x, y, z) m and yaw (rad) over the placement's roll and pitch. */
function marginAt(p: Probe, placement: PlacementSpec, x: number, y: number, z: number, yawRad: number): number | null {
  const base = poseOfMm([0, 0, 0], [placement.rpyDeg[0], placement.rpyDeg[1], radToDeg(yawRad)]);
  base[3] = x;
  base[7] = y;
  base[11] = z;
  p.cellFromBase.set(base);
  invertRigidInto(p.baseFromCell, p.cellFromBase);
  let worst = Infinity;
  for (let t = 0; t < p.cellFromTcp.length; t++) {
    mul4Into(p.baseFromTcp, p.baseFromCell, p.cellFromTcp[t]!);
    if (!insideExtent(p.extent, p.baseFromTcp[3]!, p.baseFromTcp[7]!, p.baseFromTcp[11]!)) return null;
    mul4Into(p.baseFromFlange, p.baseFromTcp, p.tcpFromFlange);
    const margin = reachMargin(p.ctx, p.baseFromFlange, p.hints[t]!, 1, p.q);
    if (margin === null) return null;
    const hints = p.hints[t]!;
    hints.unshift(Float64Array.from(p.q));
    if (hints.length > 3) hints.pop();
    worst = Math.min(worst, margin);
  }
  return worst;
}

/**
 * The placement map of one arm (see README.md).
 * @throws RangeError for a grid spacing ≤ 0 or a yaw step outside (0, 360]
 */
export function placementMap(cell: CellSpec, arm: CellArm, options: Partial<PlacementOptions> = {}): PlacementMapJson {
  const o = { ...DEFAULT_PLACEMENT, ...options };
  if (!(o.gridMm > 0)) throw new RangeError(`invalid gridMm: ${o.gridMm}`);
  if (o.yawStepDeg !== null && !(o.yawStepDeg > 0 && o.yawStepDeg <= 360))
    throw new RangeError(`invalid yawStepDeg: ${o.yawStepDeg}`);
  const placement = cell.placements?.[arm.id] ?? cell.placement;
  const flangeFromTcp = poseOfMm(cell.tool.tcp.xyzMm, cell.tool.tcp.rpyDeg);
  const tcpFromFlange = invertRigidInto(mat4(), flangeFromTcp);
  const targets = resolveTargets(cell.targets);
  const cellFromTcp = targets.map((t) => poseOfMm(t.positionMm, t.rpyDeg));
  const extent = grown(reachExtent(arm.chain, flangeFromTcp));
  const bound = Math.min(reachBoundM(arm.chain, flangeFromTcp), extent.rMaxM);
  const zM = mmToM(placement.positionMm[2]);
  // Positions within the bound of every target (the targets' bounding box grown by the bound, cut to the grid).
  const step = mmToM(o.gridMm);
  const xs = cellFromTcp.map((t) => t[3]!),
    ys = cellFromTcp.map((t) => t[7]!),
    zs = cellFromTcp.map((t) => t[11]!);
  const lo = (v: number[]) => Math.floor((Math.max(...v) - bound) / step),
    hi = (v: number[]) => Math.ceil((Math.min(...v) + bound) / step);
  const ix0 = lo(xs),
    ix1 = hi(xs),
    iy0 = lo(ys),
    iy1 = hi(ys);
  const xMm = ix1 >= ix0 ? Array.from({ length: ix1 - ix0 + 1 }, (_, k) => (ix0 + k) * o.gridMm) : [];
  const yMm = iy1 >= iy0 ? Array.from({ length: iy1 - iy0 + 1 }, (_, k) => (iy0 + k) * o.gridMm) : [];
  const probe: Probe = {
    ctx: createReachContext(arm.chain),
    extent,
    tcpFromFlange,
    cellFromTcp,
    cellFromBase: mat4(),
    baseFromCell: mat4(),
    baseFromTcp: mat4(),
    baseFromFlange: mat4(),
    q: new Float64Array(arm.chain.drivenCount),
    hints: cellFromTcp.map(() => []),
  };
  const yaws =
    o.yawStepDeg === null
      ? [placement.rpyDeg[2]]
      : Array.from({ length: Math.max(1, Math.floor(360 / o.yawStepDeg - 1e-9) + 1) }, (_, k) => k * o.yawStepDeg!);
  const feasible: (0 | 1)[][] = [],
    marginDeg: (number | null)[][] = [],
    yawDeg: (number | null)[][] = [];
  let count = 0;
  for (let r = 0; r < yMm.length; r++) {
    const fRow: (0 | 1)[] = [],
      mRow: (number | null)[] = [],
      yRow: (number | null)[] = [];
    // Serpentine order: each position starts from its neighbour's solutions.
    const cols = xMm.map((_, c) => (r % 2 ? xMm.length - 1 - c : c));
    const cells = new Array<{ margin: number | null; yaw: number | null }>(xMm.length);
    for (const c of cols) {
      const x = mmToM(xMm[c]!),
        y = mmToM(yMm[r]!);
      const near = xs.every((tx, t) => Math.hypot(tx - x, ys[t]! - y, zs[t]! - zM) <= bound + 1e-9);
      let best: number | null = null,
        bestYaw: number | null = null;
      if (near)
        for (const yaw of yaws) {
          const margin = marginAt(probe, placement, x, y, zM, degToRad(yaw));
          if (margin !== null && (best === null || margin > best + 1e-12)) {
            best = margin;
            bestYaw = yaw;
          }
        }
      cells[c] = { margin: best, yaw: bestYaw };
    }
    for (let c = 0; c < xMm.length; c++) {
      const cellValue = cells[c]!;
      const ok = cellValue.margin !== null;
      if (ok) count++;
      fRow.push(ok ? 1 : 0);
      mRow.push(
        ok ? (Number.isFinite(cellValue.margin!) ? Number(radToDeg(cellValue.margin!).toFixed(2)) : null) : null,
      );
      yRow.push(ok ? cellValue.yaw : null);
    }
    feasible.push(fRow);
    marginDeg.push(mRow);
    yawDeg.push(yRow);
  }
  const { best, coarseStepMm, evaluated } = fastestPlacement(cell, arm, placement, {
    xMm,
    yMm,
    feasible,
    marginDeg,
    yawDeg,
  });
  return {
    cell: cell.id,
    arm: arm.id,
    gridMm: o.gridMm,
    planeZMm: placement.positionMm[2],
    xMm,
    yMm,
    feasible,
    feasibleAreaM2: Number((count * step * step).toFixed(4)),
    marginDeg,
    yawDeg: o.yawStepDeg === null ? null : yawDeg,
    best,
    current: { positionMm: [...placement.positionMm], rpyDeg: [...placement.rpyDeg] },
    search: { coarseStepMm, evaluated },
  };
}

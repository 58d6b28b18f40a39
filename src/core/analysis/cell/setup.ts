/**
 * A cell seen from one arm, in SI: the base frame in the cell frame, the mounting it implies, gravity in the base
 * frame, the tool point in the flange frame, each target as a tool-point pose in the base frame and as the flange pose
 * the inverse kinematics solves for, and the part carried on each step. The one place where the cell file's mm and
 * deg become m and rad.
 */
import type { Mounting } from "../../kinematics/statics";
import { fromXyzRpyInto, invertRigidInto, mat4, mul4Into } from "../../math/mat4";
import { degToRad, mmToM, STANDARD_GRAVITY_M_PER_S2 } from "../../units";
import { gripWalk } from "./grip";
import { resolveTargets } from "./targets";
import type { CellSpec, PlacementSpec } from "./types";

export interface CellTargetSi {
  readonly name: string;
  /** Tool-point pose in the cell frame and in the base frame, row-major 4×4, m. */
  readonly cellFromTcp: Float64Array;
  readonly baseFromTcp: Float64Array;
  /** The flange pose that puts the tool point there, base frame. */
  readonly baseFromFlange: Float64Array;
}

export interface CellSetup {
  readonly placement: PlacementSpec;
  readonly cellFromBase: Float64Array;
  readonly baseFromCell: Float64Array;
  readonly mounting: Mounting;
  /** Gravity acceleration in the base frame, m/s². */
  readonly gravityInBase: [number, number, number];
  readonly flangeFromTcp: Float64Array;
  readonly targets: CellTargetSi[];
  /** Index into `targets` of each step's `to`. */
  readonly stepTarget: number[];
  /** Part carried during each step's move (before its arrival), by name, or null. */
  readonly carriedDuring: (string | null)[];
  /** Part carried after each step's arrival (grip/release done), or null. */
  readonly carriedAfter: (string | null)[];
}

/** rpy in deg (R = Rz(yaw)·Ry(pitch)·Rx(roll)) and a position in mm as a row-major 4×4 in m. */
export function poseOfMm(positionMm: readonly number[], rpyDeg: readonly number[]): Float64Array {
  return fromXyzRpyInto(
    mat4(),
    mmToM(positionMm[0]!),
    mmToM(positionMm[1]!),
    mmToM(positionMm[2]!),
    degToRad(rpyDeg[0]!),
    degToRad(rpyDeg[1]!),
    degToRad(rpyDeg[2]!),
  );
}

/**
 * Mounting implied by the base z axis in the cell frame (z up): up → floor, down → ceiling, horizontal → wall,
 * otherwise angled (within 1e-9 of the exact directions).
 */
export function mountingOf(cellFromBase: Float64Array): Mounting {
  const up = cellFromBase[10]!;
  if (up > 1 - 1e-9) return "floor";
  if (up < -1 + 1e-9) return "ceiling";
  if (Math.abs(up) < 1e-9) return "wall";
  return "angled";
}

/** The cell seen from arm `armId` (its own placement when the cell gives one). */
export function cellSetup(cell: CellSpec, armId: string): CellSetup {
  const placement = cell.placements?.[armId] ?? cell.placement;
  const cellFromBase = poseOfMm(placement.positionMm, placement.rpyDeg);
  const baseFromCell = invertRigidInto(mat4(), cellFromBase);
  const g = STANDARD_GRAVITY_M_PER_S2;
  // g_base = Rᵀ·(0, 0, −g): the third row of R, negated.
  const gravityInBase: [number, number, number] = [
    -g * cellFromBase[8]!,
    -g * cellFromBase[9]!,
    -g * cellFromBase[10]!,
  ];
  const flangeFromTcp = poseOfMm(cell.tool.tcp.xyzMm, cell.tool.tcp.rpyDeg);
  const tcpFromFlange = invertRigidInto(mat4(), flangeFromTcp);
  const resolved = resolveTargets(cell.targets);
  const targets: CellTargetSi[] = resolved.map((t) => {
    const cellFromTcp = poseOfMm(t.positionMm, t.rpyDeg);
    const baseFromTcp = mul4Into(mat4(), baseFromCell, cellFromTcp);
    return { name: t.name, cellFromTcp, baseFromTcp, baseFromFlange: mul4Into(mat4(), baseFromTcp, tcpFromFlange) };
  });
  const stepTarget = cell.cycle.map((s) => {
    const k = targets.findIndex((t) => t.name === s.to);
    if (k < 0) throw new RangeError(`invalid cycle step: unknown target ${s.to}`);
    return k;
  });
  const { carryingOnMove, carryingAfter } = gripWalk(cell.cycle);
  return {
    placement,
    cellFromBase,
    baseFromCell,
    mounting: mountingOf(cellFromBase),
    gravityInBase,
    flangeFromTcp,
    targets,
    stepTarget,
    carriedDuring: [...carryingOnMove],
    carriedAfter: [...carryingAfter],
  };
}

/**
 * Capability shares by closed-form inverse kinematics (six revolute joints, spherical wrist: kinematics/closedForm.ts):
 * at each node, every direction is solved for all (up to eight) solutions within the joint ranges; the direction
 * counts as reached when one exists for one of the rolls tried. A pose on a family of solutions (wrist centre on
 * axis 1, axes 4 and 6 in line) is solved again with the direction tilted by TILT_RAD, then numerically from the
 * node's last solution.
 */
import type { Chain } from "../../kinematics/chain";
import {
  DEGENERATE,
  MAX_CLOSED_FORM_SOLUTIONS,
  solveSphericalWristInto,
  type SphericalWristIk,
} from "../../kinematics/closedForm";
import { createIkScratch, solveIkInto, type IkOptions } from "../../kinematics/inverse";
import { directionPoseInto, type CapabilityNodes } from "./nodes";

/** Tilt of a direction whose pose is degenerate, rad: far above rounding, far below the lattice spacing. */
export const TILT_RAD = 1e-5;

const FALLBACK_IK: IkOptions = { maxIterations: 40, toleranceM: 1e-6, toleranceRad: 1e-5, task: "axis" };

export interface SharesOut {
  /** Directions reached per node (NaN outside the envelope). */
  readonly hits: Float64Array;
  /** Solves made. */
  solves: number;
}

/**
 * Counts the reached directions of every inside node. `ik` is prepared for `solveChain` (the chain with the roll
 * joint's range freed when the roll is that joint's own turn); `rollsRad` are the rolls tried per direction;
 * solutions (when kept) go to `solutions` at (node·N + k)·m.
 */
export function closedFormShares(
  chain: Chain,
  solveChain: Chain,
  ik: SphericalWristIk,
  nodes: CapabilityNodes,
  dirs: Float64Array,
  rollsRad: readonly number[],
  solutions: Float64Array | null,
): SharesOut {
  const N = dirs.length / 3,
    m = chain.drivenCount;
  const out: SharesOut = { hits: new Float64Array(nodes.inside.length).fill(NaN), solves: 0 };
  const sol = new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * m);
  const target = new Float64Array(16);
  const tilted = new Float64Array(3);
  const last = new Float64Array(m);
  const ikNum = createIkScratch(solveChain);
  // The rotation of every (direction, roll) once; per node only the position changes.
  const R = rollsRad.length;
  const frames = new Float64Array(N * R * 16);
  for (let k = 0; k < N; k++)
    for (let r = 0; r < R; r++) directionPoseInto(frames.subarray((k * R + r) * 16), dirs, k, rollsRad[r]!, 0, 0, 0);
  for (let node = 0; node < nodes.inside.length; node++) {
    if (!nodes.inside[node]) continue;
    const px = nodes.positionsM[3 * node]!,
      py = nodes.positionsM[3 * node + 1]!,
      pz = nodes.positionsM[3 * node + 2]!;
    let hits = 0,
      haveLast = false;
    for (let k = 0; k < N; k++) {
      let found = -1;
      for (let r = 0; r < rollsRad.length && found < 0; r++) {
        const f0 = (k * R + r) * 16;
        for (let i = 0; i < 16; i++) target[i] = frames[f0 + i]!;
        target[3] = px;
        target[7] = py;
        target[11] = pz;
        out.solves++;
        let c = solveSphericalWristInto(sol, ik, target, 0, undefined, true);
        if (c === DEGENERATE) {
          // Tilt the direction towards flange x (a vector across it) and solve again.
          tilted[0] = dirs[3 * k]! + TILT_RAD * target[0]!;
          tilted[1] = dirs[3 * k + 1]! + TILT_RAD * target[4]!;
          tilted[2] = dirs[3 * k + 2]! + TILT_RAD * target[8]!;
          const nrm = Math.hypot(tilted[0], tilted[1], tilted[2]);
          for (let i = 0; i < 3; i++) tilted[i] = tilted[i]! / nrm;
          directionPoseInto(target, tilted, 0, rollsRad[r]!, px, py, pz);
          out.solves++;
          c = solveSphericalWristInto(sol, ik, target, 0, undefined, true);
        }
        if (c === DEGENERATE) {
          // Numeric, tool axis only, from the node's last solution (or the zero pose).
          if (!haveLast) last.fill(0);
          out.solves++;
          if (solveIkInto(sol, solveChain, target, last, ikNum, FALLBACK_IK)) c = 1;
        }
        if (c > 0) found = 0;
      }
      if (found < 0) continue;
      hits++;
      for (let i = 0; i < m; i++) last[i] = sol[i]!;
      haveLast = true;
      if (solutions) for (let i = 0; i < m; i++) solutions[(node * N + k) * m + i] = sol[i]!;
    }
    out.hits[node] = hits;
  }
  return out;
}

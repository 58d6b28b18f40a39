/**
 * Capability map (orientation map) of the flange centre over the side view: for each node of a grid in the plane
 * through axis 1 (distance from axis 1 against height, the speed maps' plane), the share of tool directions,
 * spread evenly over the whole sphere, from which the flange centre can be put on the node within the joint
 * ranges, the roll about the tool axis free. Nodes outside the flange envelope have no value (NaN).
 *
 * Reached means: some joint values within the ranges put the flange centre on the node with flange z along the
 * direction, for some roll about it. Joint 1 is free within its range (the node stands for its whole circle about
 * axis 1 wherever joint 1 can turn there).
 *
 * Methods (capability README): closed form (six revolute joints with a spherical wrist) counts every solution;
 * otherwise a numeric continuation over (node, direction) pairs gives a lower bound (numericShares.ts).
 * The roll: when the last joint turns the flange about its own axis (applicability.ts rollJoint), adding a roll
 * only turns that joint, so its range is set aside and one roll per direction decides; otherwise the closed form
 * tries `rolls` rolls spread over a turn and the numeric solver leaves the roll to the damped step.
 *
 * @see Zacharias, Borst & Hirzinger (2007), Capturing robot workspace structure: representing robot capabilities,
 *   IEEE/RSJ IROS [from memory]; González (2010), Mathematical Geosciences 42 (Fibonacci lattice) [from memory]
 * @example the closed-form check in test/core/analysis/capability/capability.test.ts: a spherical-wrist arm with
 *   links 0.5 m and 0.4 m and unlimited joints reaches direction n at p exactly when |p − d·n − shoulder| lies in
 *   [0.1, 0.9] m, so the share at p is the area of a spherical zone over 4π.
 */
import type { Chain } from "../../kinematics/chain";
import { sphericalWristIk } from "../../kinematics/closedForm";
import { wrapNear } from "../../kinematics/closedForm";
import { mulberry32 } from "../../math/random";
import { sidePlane } from "../speedMap/plane";
import { rollJoint, toolAxisTurns, withFreeJoint } from "./applicability";
import { closedFormShares } from "./closedFormShares";
import { directionNeighbours, fibonacciSphere } from "./fibonacci";
import { capabilityNodes } from "./nodes";
import { numericShares } from "./numericShares";
import {
  DEFAULT_CAPABILITY,
  type CapabilityEnvelope,
  type CapabilityMap,
  type CapabilityOptions,
  type CapabilityResult,
} from "./types";

export * from "./types";
export { fibonacciSphere } from "./fibonacci";

/** Nearest directions each numeric solution seeds at its node. */
const DIRECTION_NEIGHBOURS = 6;

/**
 * The capability map of the flange centre, or the reason an arm has none.
 * @param chain compiled chain (SI)
 * @param layout the envelope's layout: only "revolute-base" has an axis 1 to draw the side view about
 * @param flange the flange envelope (side view at joint 1 = 0, mm)
 */
export function capabilityMap(
  chain: Chain,
  layout: string,
  flange: CapabilityEnvelope,
  options: CapabilityOptions = DEFAULT_CAPABILITY,
): CapabilityResult {
  if (layout !== "revolute-base") return { ok: false, reason: "no-axis-1" };
  if (!(Number.isInteger(options.directions) && options.directions >= 1))
    throw new RangeError(`invalid directions: ${options.directions}`);
  if (!toolAxisTurns(chain, mulberry32(options.seed ^ 0x2c1b))) return { ok: false, reason: "tool-axis-cannot-turn" };
  const m = chain.drivenCount,
    N = options.directions;
  const plane = sidePlane(chain, [0, 0, -1]);
  const nodes = capabilityNodes(plane, flange, options.gridMm);
  const dirs = fibonacciSphere(N);
  const roll = rollJoint(chain);
  const solveChain = roll >= 0 ? withFreeJoint(chain, roll) : chain;
  const ik = options.method === "auto" ? sphericalWristIk(solveChain) : null;
  const solutions = options.keepSolutions ? new Float64Array(nodes.inside.length * N * m).fill(NaN) : null;
  let rollsRad: number[] = [0];
  let rollBasis: CapabilityMap["rollBasis"] = roll >= 0 ? "last-joint" : "solver";
  let out;
  if (ik) {
    if (roll < 0) {
      const r = Math.max(1, Math.floor(options.rolls));
      rollsRad = Array.from({ length: r }, (_, i) => (2 * Math.PI * i) / r);
      rollBasis = "sampled";
    }
    out = closedFormShares(chain, solveChain, ik, nodes, dirs, rollsRad, solutions);
  } else {
    out = numericShares(
      solveChain,
      nodes,
      dirs,
      plane,
      {
        samples: options.numericSamples,
        tries: Math.max(1, options.numericTries),
        seed: options.seed,
        neighbours: directionNeighbours(dirs, DIRECTION_NEIGHBOURS),
        perDirection: Math.min(DIRECTION_NEIGHBOURS, N - 1),
      },
      solutions,
    );
  }
  if (solutions && roll >= 0) {
    // The roll joint was solved over a whole turn: any value of it gives the same flange centre and tool axis, so
    // each kept solution takes the value within the joint's own range nearest to the one solved.
    const lo = chain.lowerSi[roll]!,
      hi = chain.upperSi[roll]!;
    for (let o = roll; o < solutions.length; o += m) {
      const v = solutions[o]!;
      if (Number.isNaN(v)) continue;
      const w = wrapNear(v, v, lo, hi);
      solutions[o] = Number.isNaN(w) ? Math.min(hi, Math.max(lo, v)) : w;
    }
  }
  const share = new Float64Array(out.hits.length);
  for (let i = 0; i < share.length; i++) share[i] = out.hits[i]! / N;
  return {
    ok: true,
    map: {
      gridMm: options.gridMm,
      rMm: nodes.rMm,
      zMm: nodes.zMm,
      directions: N,
      share,
      method: ik ? "closed-form" : "numeric",
      rollBasis,
      rollsTried: rollsRad.length,
      solves: out.solves,
      directionVectors: dirs,
      nodePositionsM: nodes.positionsM,
      solutions,
    },
  };
}

/**
 * Share of the envelope's nodes (its side-view area, node by node) where at least `atLeast` of the directions are
 * reached; null when no node is inside.
 * @example shares [0.2, 0.6, NaN, 0.5] → 2 of 3 inside nodes reach half or more: 0.667
 */
export function areaShareAtLeast(share: ArrayLike<number>, atLeast: number): number | null {
  let inside = 0,
    hit = 0;
  for (let i = 0; i < share.length; i++) {
    const v = share[i]!;
    if (Number.isNaN(v)) continue;
    inside++;
    if (v >= atLeast) hit++;
  }
  return inside > 0 ? hit / inside : null;
}

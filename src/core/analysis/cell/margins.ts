/**
 * Margins of a cell target at its chosen solution: the joint values, the smallest distance to a range end, the
 * inverse condition of the tool-point Jacobian (σ_min/σ_max with linear rows divided by the characteristic length,
 * as on the sheets) and the static holding torque of each joint against its rated torque (arm links and the tool
 * load at its centre of gravity, gravity from the placement: τ = Σ Jᵀ·(−m·g)).
 * @see Craig, Introduction to Robotics, 3rd ed., ch. 5 (static forces) [from memory]
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, jacobianInto, toolPointInto } from "../../kinematics/forward";
import { bodySetOf, createHoldingScratch, holdingTorqueInto, pointHoldingTorqueInto } from "../../kinematics/statics";
import { createSingularityScratch, scaledInverseCondition } from "../../measures/singularity";
import { mToMm, radToDeg } from "../../units";
import { payloadInputOf, type PayloadSpec } from "../payload";
import type { CellSetup } from "./setup";
import { cellLoadOf } from "./load";
import type { CellSpec } from "./types";

export interface HoldingJson {
  readonly joint: string;
  /** Largest static holding torque over the loads carried at the target, N·m (N for a prismatic joint). */
  readonly torqueNm: number;
  readonly ratedNm: number;
  readonly ok: boolean;
}

export interface TargetMargins {
  /** Joints of the chosen solution at the target's first visit, deg or mm; null when out of reach. */
  readonly jointsDeg: number[] | null;
  /** Smallest distance of a revolute joint to a range end, deg; null when out of reach or no revolute joint. */
  readonly jointMarginDeg: number | null;
  /** The joint with that margin. */
  readonly tightestJoint: string | null;
  /** Smallest distance of a prismatic joint to a range end, mm, or null. */
  readonly jointMarginMm: number | null;
  readonly inverseCondition: number | null;
  /** Holding torques of the joints with a rated torque in the arm file. */
  readonly holding: HoldingJson[];
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));

/**
 * Margins at joints q (null: the target is out of reach), with the loads `carried` (part names or null for the tool
 * alone) of the target's visit: the larger holding torque counts.
 */
export function targetMargins(
  cell: CellSpec,
  setup: CellSetup,
  chain: Chain,
  facts: PayloadSpec,
  q: Float64Array | null,
  carried: readonly (string | null)[],
): TargetMargins {
  if (!q)
    return {
      jointsDeg: null,
      jointMarginDeg: null,
      tightestJoint: null,
      jointMarginMm: null,
      inverseCondition: null,
      holding: [],
    };
  const m = chain.drivenCount;
  const name = (i: number) => chain.jointNames[chain.drivenJoint[i]!]!;
  let marginRad = Infinity,
    marginM = Infinity,
    tightest: string | null = null;
  const joints: number[] = [];
  for (let i = 0; i < m; i++) {
    const prismatic = chain.isPrismatic[chain.drivenJoint[i]!] === 1;
    const d = Math.min(q[i]! - chain.lowerSi[i]!, chain.upperSi[i]! - q[i]!);
    joints.push(round(prismatic ? mToMm(q[i]!) : radToDeg(q[i]!), 2));
    if (prismatic) marginM = Math.min(marginM, d);
    else if (d < marginRad) {
      marginRad = d;
      tightest = name(i);
    }
  }
  const kin = createScratch(chain);
  forwardInto(chain, q, kin);
  const e = setup.flangeFromTcp;
  const p = toolPointInto(new Float64Array(3), kin, e[3]!, e[7]!, e[11]!);
  const jac = jacobianInto(new Float64Array(6 * m), chain, kin, p[0]!, p[1]!, p[2]!);
  const cond = scaledInverseCondition(jac, m, chain.characteristicLengthM, createSingularityScratch(m));
  return {
    jointsDeg: joints,
    jointMarginDeg: Number.isFinite(marginRad) ? round(radToDeg(marginRad), 2) : null,
    tightestJoint: tightest,
    jointMarginMm: Number.isFinite(marginM) ? round(mToMm(marginM), 1) : null,
    inverseCondition: round(cond, 4),
    holding: holdingTorques(cell, setup, chain, facts, q, carried),
  };
}

function holdingTorques(
  cell: CellSpec,
  setup: CellSetup,
  chain: Chain,
  facts: PayloadSpec,
  q: Float64Array,
  carried: readonly (string | null)[],
): HoldingJson[] {
  const m = chain.drivenCount;
  const rated = Array.from({ length: m }, (_, i) => i).filter((i) => Number.isFinite(chain.ratedEffortSi[i]!));
  if (!rated.length) return [];
  const kin = createScratch(chain);
  const h = createHoldingScratch(chain);
  const bodies = bodySetOf(payloadInputOf(facts, chain).links);
  const own = new Float64Array(m),
    load = new Float64Array(m);
  forwardInto(chain, q, kin);
  const cog = new Float64Array(3);
  holdingTorqueInto(own, chain, kin, bodies, setup.gravityInBase, h);
  const worst = new Float64Array(m);
  for (const part of new Set(carried)) {
    const l = cellLoadOf(cell, part);
    const c = toolPointInto(cog, kin, l.cogM[0], l.cogM[1], l.cogM[2]);
    pointHoldingTorqueInto(load, chain, kin, c[0]!, c[1]!, c[2]!, l.massKg, setup.gravityInBase, h);
    for (let i = 0; i < m; i++) worst[i] = Math.max(worst[i]!, Math.abs(own[i]! + load[i]!));
  }
  return rated.map((i) => {
    const torque = round(worst[i]!, 1),
      ratedNm = chain.ratedEffortSi[i]!;
    return { joint: chain.jointNames[chain.drivenJoint[i]!]!, torqueNm: torque, ratedNm, ok: worst[i]! <= ratedNm };
  });
}

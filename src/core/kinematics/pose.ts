import type { Chain } from "./chain";
import { createScratch, forwardInto, jacobianInto, linkFrameInto, toolPointInto, wristCentreInto } from "./forward";
import { createSvdScratch, singularValuesInto } from "../math/svd";

/** Everything about one pose, SI. Allocates; for hot loops use forwardInto/jacobianInto with a scratch. */
export interface PoseReport {
  /** baseFromFlange, row-major 4×4, m. */
  readonly baseFromFlange: Float64Array;
  /** Tool centre point in the base frame, m. */
  readonly tcpM: Float64Array;
  /** Wrist centre point in the base frame, m; null when the arm has none. */
  readonly wcpM: Float64Array | null;
  /** Base-frame pose of each kinematic joint's link frame, 16n. */
  readonly linkFrames: Float64Array;
  /** 6 × m geometric Jacobian of the TCP, rows (vx, vy, vz, ωx, ωy, ωz), SI. */
  readonly jacobian: Float64Array;
  /** Singular values of `jacobian` (SI, unscaled), descending; min(6, m) of them. */
  readonly singularValues: Float64Array;
  /** Yoshikawa manipulability: the product of the singular values (= √det(J·Jᵀ) for m ≥ 6, √det(Jᵀ·J) for m < 6). */
  readonly manipulability: number;
  /** σ_max / σ_min (Infinity at a singular pose). */
  readonly conditionNumber: number;
}

/**
 * Forward kinematics, Jacobian and its singular values at one pose.
 * @param qDriven driven joint values, rad or m
 * @param toolInFlangeM TCP in the flange frame, m (default: the flange origin)
 * @see Yoshikawa, Manipulability of robotic mechanisms, IJRR 4(2), 1985 (manipulability);
 *   Salisbury & Craig, IJRR 1(1), 1982 (condition number)
 */
export function poseReport(
  chain: Chain,
  qDriven: ArrayLike<number>,
  toolInFlangeM: ArrayLike<number> = [0, 0, 0],
): PoseReport {
  if (qDriven.length !== chain.drivenCount)
    throw new RangeError(`invalid joint count: ${qDriven.length}, expected ${chain.drivenCount}`);
  const s = createScratch(chain);
  forwardInto(chain, qDriven, s);
  const tcp = toolPointInto(new Float64Array(3), s, toolInFlangeM[0]!, toolInFlangeM[1]!, toolInFlangeM[2]!);
  const wcp = new Float64Array(3);
  const hasWcp = wristCentreInto(wcp, chain, s);
  const linkFrames = new Float64Array(16 * chain.jointCount);
  const tmp = new Float64Array(16);
  for (let i = 0; i < chain.jointCount; i++) linkFrames.set(linkFrameInto(tmp, chain, s, i), 16 * i);
  const m = chain.drivenCount;
  const jacobian = jacobianInto(new Float64Array(6 * m), chain, s, tcp[0]!, tcp[1]!, tcp[2]!);
  const k = Math.min(6, m);
  const sv = singularValuesInto(new Float64Array(k), jacobian, 6, m, createSvdScratch(6, m));
  let manipulability = 1;
  for (let i = 0; i < k; i++) manipulability *= sv[i]!;
  const sMin = sv[k - 1]!;
  return {
    baseFromFlange: Float64Array.from(s.flange),
    tcpM: tcp,
    wcpM: hasWcp ? wcp : null,
    linkFrames,
    jacobian,
    singularValues: sv,
    manipulability,
    conditionNumber: sMin > 0 ? sv[0]! / sMin : Infinity,
  };
}

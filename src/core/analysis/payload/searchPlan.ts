/**
 * Roles of the driven joints in the payload-at-reach search (pure): which joints are swept on a grid, which orient
 * the tool along gravity and which are held (flange spin, a vertical axis 1, a slide along gravity, the redundant
 * joint of a 7-axis arm), from facts about the chain that do not depend on the mounting.
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, wristCentreInto } from "../../kinematics/forward";
import type { PayloadMountingReport } from "./atReachTypes";
import {
  axisInBase,
  cross3,
  distanceToLine,
  dot3,
  flangeSpinSet,
  holdValue,
  homePose,
  isUncoupled,
  norm3,
  ON_AXIS_M,
  PARALLEL_SIN,
} from "./chainGeometry";

/** Roles of the driven joints for one mounting. */
export interface SearchPlan {
  readonly searched: number[];
  readonly orienting: number[];
  readonly held: { j: number; value: number; reason: string }[];
  readonly mode: PayloadMountingReport["toolDirection"];
  /** Flange = WCP + d·t̂ when the tool points along t̂ (spherical wrist): reach without solving the wrist. */
  readonly wcpFlangeDistanceM: number | null;
}

/** Everything about the chain that does not depend on the mounting. */
export interface ChainFacts {
  readonly spins: Set<number>;
  readonly orientingCandidates: number[];
  readonly structureFixedAxis: number[] | null;
  readonly wcpFlangeDistanceM: number | null;
}

export function chainFacts(chain: Chain): ChainFacts {
  const m = chain.drivenCount;
  const s = createScratch(chain);
  const home = homePose(chain);
  forwardInto(chain, home, s);
  const f = s.flange;
  const zHome = [f[2]!, f[6]!, f[10]!],
    pHome = [f[3]!, f[7]!, f[11]!];
  const spins = flangeSpinSet(chain, s);
  // Does the flange axis ever turn? Check three spread postures within the limits.
  let fixed = true;
  const q = new Float64Array(m);
  for (const frac of [0.17, 0.61, 0.83]) {
    for (let j = 0; j < m; j++) {
      const [lo, hi] = searchRange(chain, j);
      q[j] = lo + frac * (hi - lo) + (0.1 * j * (hi - lo)) / m;
    }
    forwardInto(chain, q, s);
    if (Math.hypot(s.flange[2]! - zHome[0]!, s.flange[6]! - zHome[1]!, s.flange[10]! - zHome[2]!) > 1e-9) fixed = false;
  }
  // Orienting joints: the wrist axes (when the chain has a wrist centre) or the last three driven joints of an arm
  // with six or more; the flange spin never counts (it does not turn the flange axis).
  const w = chain.wrist;
  let candidates: number[] = [];
  if (!fixed) {
    for (let j = 0; j < m; j++) {
      const k = chain.drivenJoint[j]!;
      if (spins.has(k) || chain.isPrismatic[k]) continue;
      if (w ? w.axes.includes(k) : j >= m - Math.min(3, Math.max(0, m - 3))) candidates.push(j);
    }
  }
  // Spherical shortcut: every orienting axis passes through the wrist centre and the flange lies on the flange axis
  // through it; then with the tool along t̂ the flange is at WCP + d·t̂ whatever the wrist angles.
  let wcpD: number | null = null;
  forwardInto(chain, home, s);
  const wcp = new Float64Array(3);
  if (candidates.length > 0 && wristCentreInto(wcp, chain, s)) {
    const r = [pHome[0]! - wcp[0]!, pHome[1]! - wcp[1]!, pHome[2]! - wcp[2]!];
    const d = dot3(r, zHome);
    const e = Math.hypot(r[0]! - d * zHome[0]!, r[1]! - d * zHome[1]!, r[2]! - d * zHome[2]!);
    const through = candidates.every((j) => {
      const { o, w: axis } = axisInBase(chain, s, chain.drivenJoint[j]!);
      return distanceToLine(wcp, o, axis) < ON_AXIS_M;
    });
    if (through && e < ON_AXIS_M) wcpD = d;
  }
  candidates = candidates.filter((j) => isRevoluteDriven(chain, j));
  return { spins, orientingCandidates: candidates, structureFixedAxis: fixed ? zHome : null, wcpFlangeDistanceM: wcpD };
}

function isRevoluteDriven(chain: Chain, j: number): boolean {
  return !chain.isPrismatic[chain.drivenJoint[j]!];
}

/**
 * Search range of driven joint j: its limits, or ±π rad / ±1 m where a limit is open. A revolute joint with more
 * than a full turn repeats its postures, so one turn is searched: [−π, π] when the limits allow it.
 */
export function searchRange(chain: Chain, j: number): [number, number] {
  const prismatic = chain.isPrismatic[chain.drivenJoint[j]!] === 1;
  const open = prismatic ? 1 : Math.PI;
  const lo = Number.isFinite(chain.lowerSi[j]!) ? chain.lowerSi[j]! : -open;
  const hi = Number.isFinite(chain.upperSi[j]!) ? chain.upperSi[j]! : open;
  if (!prismatic && hi - lo > 2 * Math.PI) {
    if (lo <= -Math.PI && hi >= Math.PI) return [-Math.PI, Math.PI];
    return [lo, lo + 2 * Math.PI];
  }
  return [lo, hi];
}

export function planFor(chain: Chain, facts: ChainFacts, gDir: readonly number[]): SearchPlan {
  const m = chain.drivenCount;
  const s = createScratch(chain);
  forwardInto(chain, homePose(chain), s);
  const held: SearchPlan["held"] = [];
  const mode: SearchPlan["mode"] = facts.structureFixedAxis
    ? "fixed-by-structure"
    : facts.orientingCandidates.length > 0
      ? "along-gravity"
      : "follows-posture";
  const orienting = mode === "along-gravity" ? [...facts.orientingCandidates] : [];
  // Positioning joints: neither the flange spin nor orienting.
  const positioning: number[] = [];
  for (let j = 0; j < m; j++) {
    if (facts.spins.has(chain.drivenJoint[j]!))
      held.push({ j, value: holdValue(chain, j), reason: "turns the tool about its own axis" });
    else if (!orienting.includes(j)) positioning.push(j);
  }
  // Redundant arms (more than three positioning joints, e.g. a 7-axis arm): the middle ones are held at zero in every
  // mounting, so the arm stays in its plane like a 6-axis arm.
  const redundant = new Set(mode === "along-gravity" && positioning.length > 3 ? positioning.slice(2, -1) : []);
  const searched: number[] = [];
  for (const j of positioning) {
    const k = chain.drivenJoint[j]!;
    if (redundant.has(j)) {
      held.push({ j, value: holdValue(chain, j), reason: "redundant joint held at zero (the arm in its plane)" });
      continue;
    }
    if (isUncoupled(chain, j)) {
      const { o, w } = axisInBase(chain, s, k);
      const alongGravity = norm3(cross3(w, gDir)) < PARALLEL_SIN;
      const gravityVertical = Math.abs(gDir[2]!) > 1 - 1e-12;
      // A joint that rotates the whole arm about the vertical base z axis changes neither reach nor torques.
      if (k === 0 && !chain.isPrismatic[k] && alongGravity && gravityVertical && Math.hypot(o[0]!, o[1]!) < ON_AXIS_M) {
        held.push({
          j,
          value: holdValue(chain, j),
          reason: "turns the arm about the vertical axis 1: no change in reach or holding torque",
        });
        continue;
      }
      // A slide along a vertical gravity line shifts the load along its own line of action.
      if (chain.isPrismatic[k] && alongGravity && gravityVertical && prismaticStaysAlong(chain, j, gDir)) {
        held.push({
          j,
          value: holdValue(chain, j),
          reason: "slides along gravity: no change in reach or holding torque",
        });
        continue;
      }
    }
    searched.push(j);
  }
  held.sort((a, b) => a.j - b.j);
  return {
    searched,
    orienting,
    held,
    mode,
    wcpFlangeDistanceM: mode === "along-gravity" ? facts.wcpFlangeDistanceM : null,
  };
}

/** The slide's axis stays parallel to gravity at three spread postures. */
function prismaticStaysAlong(chain: Chain, j: number, gDir: readonly number[]): boolean {
  const s = createScratch(chain),
    q = new Float64Array(chain.drivenCount);
  for (const frac of [0.2, 0.5, 0.9]) {
    for (let c = 0; c < chain.drivenCount; c++) {
      const [lo, hi] = searchRange(chain, c);
      q[c] = lo + ((frac + 0.13 * c) % 1) * (hi - lo);
    }
    forwardInto(chain, q, s);
    if (norm3(cross3(axisInBase(chain, s, chain.drivenJoint[j]!).w, gDir)) > PARALLEL_SIN) return false;
  }
  return true;
}

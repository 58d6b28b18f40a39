/**
 * Edge retry of the speed maps (redundant arms): empty cells next to a held cell are solved once more, from the
 * held neighbour's solutions mirrored by the arm's shoulder and wrist flips.
 *
 * Why. A redundant arm's cells fill their slots with points of one self-motion (the flood follows it), so a second
 * sheet crossing those cells finds no free slot and is not kept; where the first sheet ends (a joint at its limit at
 * the edge of the reach) the cell beyond stays empty although the other sheet reaches it (brandmoor-lyra-r7,
 * outward, (600, 1010): the held sheet stops with joint 1 at −170°, the mirrored one reaches the cell). The flips
 * turn a held solution into one of the other sheet at the same pose, without solving:
 *
 *   shoulder: (q₁ + π, −q₂, q₃ + π, q₄ …), wrist: (… q_{m−3}, q_{m−2} + π, c − q_{m−1}, q_m + π),
 *
 * (Rz(a)·R_u(b)·Rz(c) = Rz(a + π)·R_u(−b)·Rz(c + π) for any axis u ⟂ z). The wrist flip is kinematics/wristFlip.ts;
 * the shoulder flip is checked here by forward kinematics at seeded poses, and is not used when it fails. Each seed
 * is snapped to the empty cell by the discovery solver; a solution found floods its sheet (continuation.ts).
 * Deterministic and bounded: at most 4 neighbours × 3 mirrored seeds per empty cell, each cell once; the seeds are
 * taken from each neighbour's first solution only (its other slots are mostly points of the same self-motion; all
 * K of them cost six times as much on brandmoor-lyra-r7 and filled no more cells).
 * Test: edgeRetry.test.ts, sweep.test.ts (the reproduction).
 * @see Siciliano et al. (2009), Robotics: Modelling, Planning and Control, §2.12.2 (the two solutions of a spherical
 *   wrist; the shoulder of an arm with three intersecting axes is the same form) [from memory]
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto } from "../../kinematics/forward";
import { solveIkInto } from "../../kinematics/inverse";
import { wristFlipOf, type WristFlip } from "../../kinematics/wristFlip";
import { mulberry32 } from "../../math/random";
import { flood } from "./continuation";
import { push, setTargetInto, solAt, storeQ, type MapRun } from "./state";

/** Poses at which the shoulder flip is checked, and the tolerance (position relative to the chain's length). */
const CHECK_POSES = 8;
const CHECK_TOLERANCE = 1e-9;

/** `v` wrapped into (−π, π]. */
function wrapPi(v: number): number {
  return v - 2 * Math.PI * Math.ceil((v - Math.PI) / (2 * Math.PI));
}

/** Applies the shoulder flip (joints 1–3) to q in place. */
function shoulderFlip(q: Float64Array): void {
  q[0] = wrapPi(q[0]! + Math.PI);
  q[1] = -q[1]!;
  q[2] = wrapPi(q[2]! + Math.PI);
}

/** Applies the wrist flip to q in place. */
function wristFlip(q: Float64Array, w: WristFlip): void {
  q[w.a] = wrapPi(q[w.a]! + Math.PI);
  q[w.b] = w.centreRad - q[w.b]!;
  q[w.c] = wrapPi(q[w.c]! + Math.PI);
}

/**
 * Whether the shoulder flip leaves the flange pose unchanged at CHECK_POSES seeded poses (revolute joints 1–3,
 * uncoupled; positions within CHECK_TOLERANCE·L, rotation entries within CHECK_TOLERANCE).
 */
export function hasShoulderFlip(chain: Chain, seed: number): boolean {
  const m = chain.drivenCount;
  if (m < 4) return false;
  for (let i = 0; i < 3; i++) if (chain.isPrismatic[chain.drivenJoint[i]!]) return false;
  const kin = createScratch(chain);
  const rnd = mulberry32(seed ^ 0x2e77);
  const q = new Float64Array(m),
    t0 = new Float64Array(16);
  const lengthM = chain.characteristicLengthM;
  for (let p = 0; p < CHECK_POSES; p++) {
    for (let i = 0; i < m; i++) q[i] = -Math.PI + 2 * Math.PI * rnd();
    t0.set(forwardInto(chain, q, kin));
    shoulderFlip(q);
    const t1 = forwardInto(chain, q, kin);
    for (let k = 0; k < 12; k++) {
      const scale = k % 4 === 3 ? lengthM : 1;
      if (!(Math.abs(t1[k]! - t0[k]!) <= CHECK_TOLERANCE * scale)) return false;
    }
  }
  return true;
}

/**
 * The edge retry (module comment): every empty cell with a held 4-neighbour is tried once from that neighbour's
 * first solution mirrored by the shoulder flip, the wrist flip and both (the flips the chain has), in a fixed order.
 * Redundant arms only (m > 6); nothing when the chain has neither flip.
 */
export function retryEdges(run: MapRun): void {
  const { chain, m, K, count, grid, qTry, target } = run;
  if (m <= 6) return;
  const shoulder = hasShoulderFlip(chain, run.options.seed);
  const wrist = wristFlipOf(chain);
  if (!shoulder && !wrist) return;
  const { nx, ny } = grid;
  const neighbours = [0, 0, 0, 0];
  const done = run.ws.u8("edgeRetried", run.cells);
  done.fill(0);
  for (let cell = 0; cell < run.cells; cell++) {
    if (count[cell]! > 0 || done[cell]) continue;
    const ix = cell % nx,
      iy = (cell - ix) / nx;
    neighbours[0] = ix > 0 ? cell - 1 : -1;
    neighbours[1] = ix < nx - 1 ? cell + 1 : -1;
    neighbours[2] = iy > 0 ? cell - nx : -1;
    neighbours[3] = iy < ny - 1 ? cell + nx : -1;
    let found = false;
    for (let d = 0; d < 4 && !found; d++) {
      const n = neighbours[d]!;
      if (n < 0 || count[n]! === 0) continue;
      for (let variant = 0; variant < 3 && !found; variant++) {
        if ((variant !== 1 && !shoulder) || (variant !== 0 && !wrist)) continue;
        const base = solAt(run, n * K);
        for (let i = 0; i < m; i++) qTry[i] = run.pool[base + i]!;
        if (variant !== 1) shoulderFlip(qTry);
        if (variant !== 0) wristFlip(qTry, wrist!);
        setTargetInto(run, target, cell);
        found = solveIkInto(qTry, chain, target, qTry, run.ik, run.discoveryIk);
      }
    }
    done[cell] = 1;
    if (!found) continue;
    const slot = storeQ(run, cell, qTry);
    if (slot >= 0) {
      push(run, cell, slot);
      flood(run);
    }
  }
}

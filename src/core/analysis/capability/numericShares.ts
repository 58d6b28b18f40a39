/**
 * Capability shares by numeric inverse kinematics (any chain the closed form does not cover: offset wrists,
 * seven-axis arms, five-axis arms), as a continuation over the pairs (node, direction):
 *
 * 1. Seeds: seeded random joint values within the ranges (at most one turn either side of 0). Each sample's flange
 *    is turned about axis 1 into the side plane by joint 1 (when its range allows), and the pair of the nearest
 *    inside node and nearest direction is queued with the sample as its seed.
 * 2. Flood: a pair leaves the queue and is solved by damped least squares (kinematics/inverse.ts, task "axis":
 *    position and tool axis, the roll about it left to the solver) from its seed; a solution queues the pair's
 *    neighbours (the four grid neighbours with the same direction, the nearest directions at the same node) with
 *    itself as their seed. A pair is tried from at most `tries` seeds.
 *
 * Redundancy (seven joints): each step is the damped minimum-norm step, so a solution stays near its seed; the
 * self-motion at a pair is not searched. Every share is therefore a lower bound: a pair none of whose seeds
 * converges within the limits counts as not reached.
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto } from "../../kinematics/forward";
import { createIkScratch, solveIkInto, type IkOptions } from "../../kinematics/inverse";
import { wrapNear } from "../../kinematics/closedForm";
import { mulberry32 } from "../../math/random";
import { directionPoseInto, type CapabilityNodes } from "./nodes";
import type { Plane } from "../speedMap/plane";
import type { SharesOut } from "./closedFormShares";

/**
 * Flood solves: a short last Newton step from an error below 1 mm is taken unchecked (the error it leaves is of the
 * order of L·‖Δq‖², below 1 µm); tolerances as the speed maps' continuation.
 */
const FLOOD_IK: IkOptions = {
  maxIterations: 15,
  toleranceM: 1e-6,
  toleranceRad: 1e-5,
  trustFinalStepBelowM: 1e-3,
  task: "axis",
};

export interface NumericSetup {
  readonly samples: number;
  readonly tries: number;
  readonly seed: number;
  /** Nearest directions of each direction (directionNeighbours), `perDirection` each. */
  readonly neighbours: Int32Array;
  readonly perDirection: number;
}

/** The first joint's axis in the base frame (unit; the sense the joint turns about). */
function axisOneDirection(chain: Chain): number[] {
  const kin = createScratch(chain);
  forwardInto(chain, new Float64Array(chain.drivenCount), kin);
  const f = kin.motionFrames,
    ax = chain.axisLocal;
  return [0, 1, 2].map((r) => f[4 * r]! * ax[0]! + f[4 * r + 1]! * ax[1]! + f[4 * r + 2]! * ax[2]!);
}

/**
 * Counts the reached directions of every inside node by the continuation of the module doc. `solveChain` is the
 * chain the solves use (the roll joint's range freed where the roll is its own turn).
 */
export function numericShares(
  solveChain: Chain,
  nodes: CapabilityNodes,
  dirs: Float64Array,
  plane: Plane,
  setup: NumericSetup,
  solutions: Float64Array | null,
): SharesOut {
  const chain = solveChain;
  const N = dirs.length / 3,
    m = chain.drivenCount,
    cells = nodes.inside.length,
    nx = nodes.rMm.length;
  const P = cells * N;
  const reached = new Uint8Array(P),
    attempts = new Uint8Array(P);
  const sol = new Float64Array(P * m);
  // The seed of each pair's last failed attempt (single precision is ample for the 0.05 rad comparison): a new
  // seed within SAME_SEED_RAD of it is not tried again.
  const failedSeed = new Float32Array(P * m);
  const samplePool = new Float64Array(setup.samples * m);
  // Ring buffer of (pair, seed reference); a push into a full buffer is dropped (the pair keeps its other seeds).
  const capacity = 2 * P + setup.samples;
  const queue = new Int32Array(2 * capacity);
  let head = 0,
    size = 0;
  const push = (pair: number, seedRef: number) => {
    if (reached[pair] || attempts[pair]! >= setup.tries || size === capacity) return;
    const at = 2 * ((head + size) % capacity);
    queue[at] = pair;
    queue[at + 1] = seedRef;
    size++;
  };
  seedFromSamples(chain, nodes, dirs, plane, setup, samplePool, push);

  const ik = createIkScratch(chain);
  const q = new Float64Array(m),
    target = new Float64Array(16);
  const per = setup.perDirection,
    nb = setup.neighbours;
  let solves = 0;
  while (size > 0) {
    const pair = queue[2 * head]!,
      seedRef = queue[2 * head + 1]!;
    head = (head + 1) % capacity;
    size--;
    if (reached[pair] || attempts[pair]! >= setup.tries) continue;
    const node = (pair / N) | 0,
      k = pair - node * N;
    const seed = seedRef >= 0 ? sol.subarray(seedRef * m, seedRef * m + m) : samplePool.subarray(~seedRef * m);
    if (attempts[pair]! > 0 && nearSeed(failedSeed, pair * m, seed, m)) continue;
    directionPoseInto(
      target,
      dirs,
      k,
      0,
      nodes.positionsM[3 * node]!,
      nodes.positionsM[3 * node + 1]!,
      nodes.positionsM[3 * node + 2]!,
    );
    solves++;
    if (!solveIkInto(q, chain, target, seed, ik, FLOOD_IK)) {
      attempts[pair]!++;
      for (let i = 0; i < m; i++) failedSeed[pair * m + i] = seed[i]!;
      continue;
    }
    reached[pair] = 1;
    sol.set(q, pair * m);
    for (let j = 0; j < per; j++) push(node * N + nb[k * per + j]!, pair);
    const ix = node % nx;
    if (ix > 0 && nodes.inside[node - 1]) push(pair - N, pair);
    if (ix < nx - 1 && nodes.inside[node + 1]) push(pair + N, pair);
    if (node >= nx && nodes.inside[node - nx]) push(pair - nx * N, pair);
    if (node + nx < cells && nodes.inside[node + nx]) push(pair + nx * N, pair);
  }
  const hits = new Float64Array(cells).fill(NaN);
  for (let node = 0; node < cells; node++) {
    if (!nodes.inside[node]) continue;
    let h = 0;
    for (let k = 0; k < N; k++) h += reached[node * N + k]!;
    hits[node] = h;
  }
  if (solutions) for (let p = 0; p < P; p++) if (reached[p]) solutions.set(sol.subarray(p * m, p * m + m), p * m);
  return { hits, solves };
}

/** Largest joint difference (rad or m) at which two seeds count as the same start. */
const SAME_SEED_RAD = 0.05;

/** Whether `seed` lies within SAME_SEED_RAD of the m values at store[o..] in every joint. */
function nearSeed(store: Float32Array, o: number, seed: ArrayLike<number>, m: number): boolean {
  for (let i = 0; i < m; i++) if (Math.abs(store[o + i]! - seed[i]!) > SAME_SEED_RAD) return false;
  return true;
}

/**
 * Step 1 of the module doc: seeded joint samples turned into the plane by joint 1, each queued at the nearest inside
 * node and direction (seed reference −1 − sample).
 */
function seedFromSamples(
  chain: Chain,
  nodes: CapabilityNodes,
  dirs: Float64Array,
  plane: Plane,
  setup: NumericSetup,
  samplePool: Float64Array,
  push: (pair: number, seedRef: number) => void,
): void {
  const m = chain.drivenCount,
    N = dirs.length / 3,
    nx = nodes.rMm.length,
    ny = nodes.zMm.length,
    g = nodes.gridMm;
  const a = axisOneDirection(chain);
  const { o, radial, up } = plane;
  // lateral = a × radial: azimuth φ = atan2(d·lateral, d·radial) about a.
  const lat = [
    a[1]! * radial[2]! - a[2]! * radial[1]!,
    a[2]! * radial[0]! - a[0]! * radial[2]!,
    a[0]! * radial[1]! - a[1]! * radial[0]!,
  ];
  const gain0 = chain.couplingGain[0]!;
  const kin = createScratch(chain);
  const q = new Float64Array(m);
  const rnd = mulberry32(setup.seed ^ 0x6a09);
  for (let s = 0; s < setup.samples; s++) {
    for (let i = 0; i < m; i++) {
      const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
        hi = Math.min(chain.upperSi[i]!, Math.PI);
      q[i] = lo + (hi - lo) * rnd();
    }
    const f = forwardInto(chain, q, kin);
    const dx = f[3]! - o[0]!,
      dy = f[7]! - o[1]!,
      dz = f[11]! - o[2]!;
    const phi = Math.atan2(
      dx * lat[0]! + dy * lat[1]! + dz * lat[2]!,
      dx * radial[0]! + dy * radial[1]! + dz * radial[2]!,
    );
    // Turning joint 1 by −φ (kinematic) puts the flange on the +radial half-plane.
    const q0 = wrapNear(q[0]! - phi / gain0, q[0]!, chain.lowerSi[0]!, chain.upperSi[0]!);
    if (Number.isNaN(q0)) continue;
    const along = dx * a[0]! + dy * a[1]! + dz * a[2]!;
    const rho = Math.hypot(dx - along * a[0]!, dy - along * a[1]!, dz - along * a[2]!);
    // Height as the nodes measure it (plane.ts): the flange position along `up` from the base origin.
    const h = f[3]! * up[0]! + f[7]! * up[1]! + f[11]! * up[2]!;
    const ix = Math.round((rho * 1000) / g),
      iy = Math.round((h * 1000 - nodes.zMm[0]!) / g);
    if (ix >= nx || iy < 0 || iy >= ny) continue;
    const node = ix + iy * nx;
    if (!nodes.inside[node]) continue;
    // The tool axis turned by −φ about a (Rodrigues), then the nearest direction.
    const c = Math.cos(-phi),
      sn = Math.sin(-phi);
    const zx = f[2]!,
      zy = f[6]!,
      zz = f[10]!;
    const ad = (a[0]! * zx + a[1]! * zy + a[2]! * zz) * (1 - c);
    const rx = zx * c + (a[1]! * zz - a[2]! * zy) * sn + a[0]! * ad,
      ry = zy * c + (a[2]! * zx - a[0]! * zz) * sn + a[1]! * ad,
      rz = zz * c + (a[0]! * zy - a[1]! * zx) * sn + a[2]! * ad;
    let best = -2,
      k = 0;
    for (let j = 0; j < N; j++) {
      const d = rx * dirs[3 * j]! + ry * dirs[3 * j + 1]! + rz * dirs[3 * j + 2]!;
      if (d > best) {
        best = d;
        k = j;
      }
    }
    samplePool.set(q, s * m);
    samplePool[s * m] = q0;
    push(node * N + k, ~s);
  }
}

/**
 * Reach of a cell target: every inverse-kinematics solution of a flange pose inside the joint ranges, whole-turn
 * (±360°) variants included, or the reason there is none.
 *
 * - Six revolute joints with a spherical wrist: the closed-form solver (kinematics/closedForm.ts, up to 8
 *   solutions); otherwise the numeric solver (kinematics/inverse.ts) from the zero pose, a few starts spread over
 *   the joint ranges (Halton points) and the LIBRARY_SEEDS samples of a library of LIBRARY_SIZE joint samples whose
 *   flange poses lie nearest the target (nearest-neighbour seeding), duplicates merged.
 * - Fewer than six driven joints: the full pose is solved (position and whole orientation). Such an arm reaches a
 *   target only when it can take its orientation; when its tool axis keeps one direction in every pose (a SCARA, a
 *   palletizer, a gantry with a turning axis), a target tilted away from it gets that as the reason.
 * - More than six driven joints: the redundancy is sampled. The seeds hold the third driven joint (the elbow roll of
 *   the usual seven-axis arm) at steps of REDUNDANCY_STEP_DEG over its range, the other joints at a few spread
 *   values; each solve moves all joints (minimum-norm steps), so the solutions lie on the self-motion set near those
 *   values. Solutions closer than 1e-3 rad in every joint are merged.
 * - Variants: a revolute joint whose range spans more than one turn can reach the same angle one turn up or down;
 *   every such combination inside the ranges is a solution of its own (a different cable wind-up, a different move).
 *   At most MAX_VARIANTS per target are kept (the nearest to the zero pose first).
 *
 * @see Siciliano et al., Robotics: Modelling, Planning and Control, §2.12 and §3.7 (closed-form and numeric inverse
 *   kinematics) [from memory]
 */
import { withOpenRanges, type Chain } from "../../kinematics/chain";
import { sphericalWristIk, solveSphericalWristInto, type SphericalWristIk } from "../../kinematics/closedForm";
import { createScratch, forwardInto, type KinematicsScratch } from "../../kinematics/forward";
import { createIkScratch, DEFAULT_IK, solveIkInto, type IkOptions, type IkScratch } from "../../kinematics/inverse";
import { HALTON_BASES, radicalInverse } from "../../math/halton";
import { radToDeg } from "../../units";

/** Step of the sampled redundant joint, deg. */
export const REDUNDANCY_STEP_DEG = 30;
/** Most solutions kept per target (whole-turn variants included). */
export const MAX_VARIANTS = 48;
/** Spread starts besides the zero pose (arms without a closed form). */
const NUMERIC_SEEDS = 8;
/** Poses in the seed library (arms without a closed form) and the nearest ones tried per target. */
const LIBRARY_SIZE = 2048;
const LIBRARY_SEEDS = 24;
/** Solutions closer than this in every joint are one (rad; prismatic: m). */
const SAME_SOLUTION = 1e-3;

/** Starts may lie far from a solution: slow first progress is not a stall. */
const SOLVE_IK: IkOptions = { ...DEFAULT_IK, maxIterations: 100, task: "full", stallRatio: 0.95 };

/** Why a target has no solution. */
export type NoReachReason =
  | { readonly kind: "out-of-reach" }
  | { readonly kind: "orientation"; readonly requiredAxis: readonly number[]; readonly tiltDeg: number }
  | { readonly kind: "joint-limits"; readonly joint: number; readonly valueDeg: number };

export interface TargetReach {
  /** Driven-joint solutions inside the ranges, SI, distinct (whole-turn variants separate). */
  readonly solutions: Float64Array[];
  readonly reason: NoReachReason | null;
}

export interface ReachContext {
  readonly chain: Chain;
  readonly closed: SphericalWristIk | null;
  readonly ik: IkScratch;
  readonly kin: KinematicsScratch;
  /** Seeds of the numeric solver (the zero pose first). */
  readonly seeds: readonly Float64Array[];
  /** Seed library: joint samples spread over the ranges and their flange poses (null with a closed form). */
  readonly library: SeedLibrary | null;
  /** The base-frame direction the tool axis keeps in every pose, or null when the arm can tilt its tool. */
  readonly fixedToolAxis: Float64Array | null;
  /** The chain with its ranges opened, to tell "outside the ranges" from "out of reach". */
  readonly open: Chain;
  readonly openIk: IkScratch;
  readonly openClosed: SphericalWristIk | null;
  readonly openSeeds: readonly Float64Array[];
  readonly work: Float64Array;
}

export function createReachContext(chain: Chain): ReachContext {
  const m = chain.drivenCount;
  const open = withOpenRanges(chain);
  const closed = sphericalWristIk(chain);
  return {
    chain,
    closed,
    ik: createIkScratch(chain),
    kin: createScratch(chain),
    seeds: numericSeeds(chain),
    library: closed ? null : seedLibrary(chain),
    fixedToolAxis: m < 6 ? fixedToolAxisOf(chain) : null,
    open,
    openIk: createIkScratch(open),
    openClosed: sphericalWristIk(open),
    openSeeds: numericSeeds(open),
    work: new Float64Array(8 * 6),
  };
}

/**
 * A library of joint samples (Halton points over the ranges, at most one turn per joint) with their flange positions
 * and rotations: the samples nearest a target pose are good starts for the numeric solver (nearest-neighbour seeding).
 */
export interface SeedLibrary {
  readonly count: number;
  readonly q: Float64Array;
  /** Per sample: flange position (3, m) and rotation (9), 12 values. */
  readonly pose: Float64Array;
  /** Weight of the rotation term (m²): (characteristic length / 2)². */
  readonly rotationWeightM2: number;
  readonly distance: Float64Array;
  readonly order: Int32Array;
}

function seedLibrary(chain: Chain): SeedLibrary {
  const m = chain.drivenCount;
  const kin = createScratch(chain);
  const q = new Float64Array(LIBRARY_SIZE * m),
    pose = new Float64Array(LIBRARY_SIZE * 12);
  const sample = new Float64Array(m);
  for (let k = 0; k < LIBRARY_SIZE; k++) {
    for (let i = 0; i < m; i++) {
      const [lo, hi] = seedSpan(chain, i);
      sample[i] = lo + (hi - lo) * radicalInverse(k + 1, HALTON_BASES[i % HALTON_BASES.length]!);
    }
    q.set(sample, k * m);
    const f = forwardInto(chain, sample, kin);
    pose.set([f[3]!, f[7]!, f[11]!, f[0]!, f[1]!, f[2]!, f[4]!, f[5]!, f[6]!, f[8]!, f[9]!, f[10]!], k * 12);
  }
  const half = chain.characteristicLengthM / 2;
  return {
    count: LIBRARY_SIZE,
    q,
    pose,
    rotationWeightM2: half * half,
    distance: new Float64Array(LIBRARY_SIZE),
    order: new Int32Array(LIBRARY_SIZE),
  };
}

/** The `count` library samples nearest the flange pose t (position, and rotation weighted), as seeds. */
function nearestSeeds(lib: SeedLibrary, m: number, t: Float64Array, count: number): Float64Array[] {
  const d = lib.distance,
    p = lib.pose;
  const r = [t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!];
  for (let k = 0; k < lib.count; k++) {
    const o = 12 * k;
    const dx = p[o]! - t[3]!,
      dy = p[o + 1]! - t[7]!,
      dz = p[o + 2]! - t[11]!;
    let rr = 0;
    for (let j = 0; j < 9; j++) {
      const e = p[o + 3 + j]! - r[j]!;
      rr += e * e;
    }
    d[k] = dx * dx + dy * dy + dz * dz + lib.rotationWeightM2 * rr;
    lib.order[k] = k;
  }
  const idx = Array.from(lib.order).sort((a, b) => d[a]! - d[b]!);
  return idx.slice(0, count).map((k) => lib.q.slice(k * m, k * m + m));
}

/** Joint span used for seeds: the range, at most one turn (or ±2 m for a prismatic joint). */
function seedSpan(chain: Chain, i: number): [number, number] {
  const span = chain.isPrismatic[chain.drivenJoint[i]!] ? 2 : Math.PI;
  const lo = Math.max(chain.lowerSi[i]!, -span),
    hi = Math.min(chain.upperSi[i]!, span);
  return [lo, hi];
}

/** The zero pose (inside the ranges) and Halton points over the ranges; redundant arms step joint 3. */
function numericSeeds(chain: Chain): Float64Array[] {
  const m = chain.drivenCount;
  const zero = new Float64Array(m);
  for (let i = 0; i < m; i++) zero[i] = Math.min(chain.upperSi[i]!, Math.max(chain.lowerSi[i]!, 0));
  const seeds: Float64Array[] = [zero];
  const point = (k: number, fixed: number, value: number): Float64Array => {
    const q = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      const [lo, hi] = seedSpan(chain, i);
      q[i] = i === fixed ? value : lo + (hi - lo) * radicalInverse(k, HALTON_BASES[i % HALTON_BASES.length]!);
    }
    return q;
  };
  if (m > 6) {
    const [lo, hi] = [chain.lowerSi[2]!, chain.upperSi[2]!];
    const step = (REDUNDANCY_STEP_DEG * Math.PI) / 180;
    const values: number[] = [];
    for (let v = Math.max(lo, -Math.PI); v <= Math.min(hi, Math.PI) + 1e-12; v += step) values.push(v);
    let k = 1;
    for (const v of values) for (let r = 0; r < 6; r++) seeds.push(point(k++, 2, v));
  } else {
    for (let k = 1; k <= NUMERIC_SEEDS; k++) seeds.push(point(k, -1, 0));
  }
  return seeds;
}

/**
 * The direction (base frame) the flange axis keeps in every pose, or null when it turns: the flange z axis at the
 * zero pose and at eight spread poses agree to 1e-6.
 */
function fixedToolAxisOf(chain: Chain): Float64Array | null {
  const kin = createScratch(chain);
  const m = chain.drivenCount;
  const q = new Float64Array(m);
  let axis: Float64Array | null = null;
  for (let k = 0; k <= 8; k++) {
    for (let i = 0; i < m; i++) {
      const [lo, hi] = seedSpan(chain, i);
      q[i] = k === 0 ? Math.min(hi, Math.max(lo, 0)) : lo + (hi - lo) * radicalInverse(k, HALTON_BASES[i]!);
    }
    const f = forwardInto(chain, q, kin);
    const z = Float64Array.of(f[2]!, f[6]!, f[10]!);
    if (!axis) axis = z;
    else if (Math.abs(axis[0]! - z[0]!) + Math.abs(axis[1]! - z[1]!) + Math.abs(axis[2]! - z[2]!) > 1e-6) return null;
  }
  return axis;
}

/** Whether a and b are the same solution (every joint within SAME_SOLUTION). */
export function sameSolution(a: ArrayLike<number>, b: ArrayLike<number>, m: number): boolean {
  for (let i = 0; i < m; i++) if (Math.abs(a[i]! - b[i]!) > SAME_SOLUTION) return false;
  return true;
}

/** Every solution of the flange pose `baseFromFlange` (row-major 4×4, m) inside the ranges, or the reason for none. */
export function solveTarget(ctx: ReachContext, baseFromFlange: Float64Array): TargetReach {
  const chain = ctx.chain,
    m = chain.drivenCount;
  const base: Float64Array[] = [];
  const add = (q: Float64Array) => {
    canonicalInto(chain, q);
    if (!base.some((b) => sameSolution(b, q, m))) base.push(Float64Array.from(q));
  };
  const closedCount = ctx.closed ? solveSphericalWristInto(ctx.work, ctx.closed, baseFromFlange) : -1;
  if (closedCount >= 0) {
    for (let k = 0; k < closedCount; k++) add(Float64Array.from(ctx.work.subarray(6 * k, 6 * k + 6)));
  } else {
    const q = new Float64Array(m);
    const near = ctx.library ? nearestSeeds(ctx.library, m, baseFromFlange, LIBRARY_SEEDS) : [];
    for (const seed of [...ctx.seeds, ...near])
      if (solveIkInto(q, chain, baseFromFlange, seed, ctx.ik, SOLVE_IK)) add(q);
  }
  if (base.length === 0) return { solutions: [], reason: noReachReason(ctx, baseFromFlange) };
  return { solutions: withVariants(chain, base), reason: null };
}

/**
 * Revolute joints to the whole-turn value nearest zero inside the range (nearest zero when none is inside). A value
 * of exactly ±π goes to −π first (Math.round rounds half up), then up a turn only if −π is outside the range.
 */
function canonicalInto(chain: Chain, q: Float64Array): void {
  const turn = 2 * Math.PI;
  for (let i = 0; i < chain.drivenCount; i++) {
    if (chain.isPrismatic[chain.drivenJoint[i]!]) continue;
    const lo = chain.lowerSi[i]!,
      hi = chain.upperSi[i]!;
    let v = q[i]! - turn * Math.round(q[i]! / turn);
    while (v < lo - 1e-9 && v + turn <= hi + 1e-9) v += turn;
    while (v > hi + 1e-9 && v - turn >= lo - 1e-9) v -= turn;
    q[i] = v >= lo - 1e-9 && v <= hi + 1e-9 ? Math.min(hi, Math.max(lo, v)) : v;
  }
}

/** Each base solution with every whole-turn combination inside the ranges; nearest the zero pose first, capped. */
function withVariants(chain: Chain, base: readonly Float64Array[]): Float64Array[] {
  const m = chain.drivenCount,
    turn = 2 * Math.PI;
  const out: Float64Array[] = [];
  for (const q of base) {
    let set: Float64Array[] = [q];
    for (let i = 0; i < m; i++) {
      if (chain.isPrismatic[chain.drivenJoint[i]!]) continue;
      const next: Float64Array[] = [];
      for (const v of set) {
        for (let k = -2; k <= 2; k++) {
          const x = v[i]! + k * turn;
          if (x < chain.lowerSi[i]! - 1e-9 || x > chain.upperSi[i]! + 1e-9) continue;
          const c = Float64Array.from(v);
          c[i] = x;
          next.push(c);
        }
      }
      set = next;
    }
    out.push(...set);
  }
  const norm = (q: Float64Array) => q.reduce((s, v) => s + v * v, 0);
  return out.sort((a, b) => norm(a) - norm(b)).slice(0, MAX_VARIANTS);
}

/** Why no solution: a tool axis the arm cannot take, a solution only outside the ranges, or out of reach. */
function noReachReason(ctx: ReachContext, t: Float64Array): NoReachReason {
  const a = ctx.fixedToolAxis;
  if (a) {
    const c = a[0]! * t[2]! + a[1]! * t[6]! + a[2]! * t[10]!;
    const tiltDeg = radToDeg(Math.acos(Math.min(1, Math.max(-1, c))));
    if (tiltDeg > 1e-3) return { kind: "orientation", requiredAxis: Array.from(a), tiltDeg };
  }
  const m = ctx.chain.drivenCount;
  const found: Float64Array[] = [];
  const count = ctx.openClosed ? solveSphericalWristInto(ctx.work, ctx.openClosed, t) : -1;
  for (let k = 0; k < count; k++) found.push(Float64Array.from(ctx.work.subarray(6 * k, 6 * k + 6)));
  if (count < 0) {
    const q = new Float64Array(m);
    // Far outside the ranges the damped solver stalls part-way: restart it from where it stopped, a few times.
    for (const seed of ctx.openSeeds) {
      let ok = solveIkInto(q, ctx.open, t, seed, ctx.openIk, SOLVE_IK);
      for (let restart = 0; !ok && restart < 4; restart++) ok = solveIkInto(q, ctx.open, t, q, ctx.openIk, SOLVE_IK);
      if (ok) found.push(Float64Array.from(q));
    }
  }
  for (const q of found) {
    canonicalInto(ctx.chain, q);
    let worst = -1,
      excess = 0;
    for (let i = 0; i < m; i++) {
      const over = Math.max(ctx.chain.lowerSi[i]! - q[i]!, q[i]! - ctx.chain.upperSi[i]!);
      if (over > excess) {
        excess = over;
        worst = i;
      }
    }
    if (worst >= 0) {
      const prismatic = ctx.chain.isPrismatic[ctx.chain.drivenJoint[worst]!] === 1;
      return { kind: "joint-limits", joint: worst, valueDeg: prismatic ? q[worst]! * 1000 : radToDeg(q[worst]!) };
    }
  }
  return { kind: "out-of-reach" };
}

/** Smallest distance of a revolute joint to a range end, rad (Infinity without revolute joints). */
export function revoluteMarginRad(chain: Chain, q: ArrayLike<number>): number {
  let margin = Infinity;
  for (let i = 0; i < chain.drivenCount; i++) {
    if (chain.isPrismatic[chain.drivenJoint[i]!]) continue;
    margin = Math.min(margin, q[i]! - chain.lowerSi[i]!, chain.upperSi[i]! - q[i]!);
  }
  return margin;
}

/**
 * Whether the flange pose is reachable inside the ranges, and the largest smallest-joint margin over the solutions
 * found (rad): the closed form gives every solution; the numeric solver starts from `hints` (solutions at nearby
 * poses) first, then the zero pose, every `stride`-th spread start and the nearest library poses, and stops at the
 * first solution found.
 * Cheaper than solveTarget (no variants, no reason): for maps over many poses.
 */
export function reachMargin(
  ctx: ReachContext,
  baseFromFlange: Float64Array,
  hints: readonly Float64Array[],
  stride: number,
  out: Float64Array,
): number | null {
  const chain = ctx.chain,
    m = chain.drivenCount;
  let best: number | null = null;
  const consider = (q: ArrayLike<number>) => {
    const margin = revoluteMarginRad(chain, q);
    if (best === null || margin > best) {
      best = margin;
      for (let i = 0; i < m; i++) out[i] = q[i]!;
    }
  };
  const count = ctx.closed ? solveSphericalWristInto(ctx.work, ctx.closed, baseFromFlange) : -1;
  if (count >= 0) {
    for (let k = 0; k < count; k++) consider(ctx.work.subarray(6 * k, 6 * k + 6));
    return best;
  }
  const q = new Float64Array(m);
  for (const h of hints) if (solveIkInto(q, chain, baseFromFlange, h, ctx.ik, SOLVE_IK)) consider(q);
  if (best !== null) return best;
  const near = ctx.library ? nearestSeeds(ctx.library, m, baseFromFlange, LIBRARY_SEEDS) : [];
  const starts = [...ctx.seeds.filter((_, k) => k === 0 || k % stride === 0), ...near];
  for (const seed of starts)
    if (solveIkInto(q, chain, baseFromFlange, seed, ctx.ik, SOLVE_IK)) {
      consider(q);
      return best;
    }
  return best;
}

/**
 * Closed-form inverse kinematics of the ortho-parallel class: six revolute joints, axes 2 and 3 parallel, and an
 * orthogonal spherical wrist (axes 4, 5, 6 meet in the wrist centre, 4 ⟂ 5 and 5 ⟂ 6). The class of the dimension
 * drawing (dimensions.ts; Brandstötter, Angerer & Hofbaur 2014), found here from the geometry of any chain form (dh,
 * mdh, frames, dimensions), whatever its zero pose, joint senses and axis 1 to axis 2 angle.
 *
 * The chain as a product of exponentials about its axes at the kinematic zero (every motion Mᵢ the identity): axis i
 * along unit dᵢ through pᵢ, T(θ) = e^{ξ₁θ₁}⋯e^{ξ₆θ₆}·T₀ (Murray, Li & Sastry 1994, §3.2). With w₀ the wrist centre at
 * the zero pose and P = T_target·w (w: the wrist centre in the flange frame):
 * - θ₁: joints 2 and 3 turn about lines along d₂, so they keep the component of the wrist centre along d₂; turned back
 *   by θ₁, P must have it: (P − p₁)·Rot(d₁, θ₁)·d₂ = (w₀ − p₁)·d₂, a sinusoid in θ₁ (two roots: shoulder branches).
 * - θ₃: in the plane ⟂ d₂, the wrist centre lies at l + Rot(β)·v from axis 2 (l: axis 2 to axis 3, v: axis 3 to
 *   w₀, β = ±θ₃ by the sense of axis 3 against axis 2); its distance must be that of Q = Rot(d₁, −θ₁)·(P − p₁) + p₁:
 *   |l|² + |v|² + 2·l·Rot(β)·v = |q|², a sinusoid in β (two roots: elbow branches). θ₂ then turns l + Rot(β)·v onto q.
 * - the wrist: Rot(d₄,θ₄)·Rot(d₅,θ₅)·Rot(d₆,θ₆) = R_armᵀ·R_target·R₀ᵀ with R_arm = Rot(d₁,θ₁)·Rot(d₂, θ₂ + β). In
 *   the basis E = (d₄, d₅, d₄ × d₅), with d₆ = Ry(γ)·x there, it is Rx(θ₄)·Ry(θ₅ + γ)·Rx(θ₆): X-Y-X Euler angles
 *   (two solutions: the wrist flip).
 * At most 2 × 2 × 2 = 8 solutions, as kinematic joint values; closedFormKeep.ts takes them into the ranges.
 *
 * The solver is set up only when the chain passes its own round trip: the solutions of the forward kinematics of
 * seeded random poses hold those poses (orthoParallelOf returns null otherwise, and the general spherical-wrist
 * solver, closedForm.ts, is used).
 * @see Brandstötter, M., Angerer, A. & Hofbaur, M. (2014), An analytical solution of the inverse kinematics problem
 *   of industrial serial manipulators with an ortho-parallel basis and a spherical wrist, Austrian Robotics Workshop
 *   (the class) [from memory]
 * @see Murray, Li & Sastry (1994), A Mathematical Introduction to Robotic Manipulation, §2.2 (Rodrigues), §3.2
 *   (product of exponentials, Paden–Kahan subproblems) [from memory]
 * @see Craig (2005), Introduction to Robotics, 3rd ed., §2.8 (Euler angles from a rotation matrix) [from memory]
 */
import type { Chain } from "./chain";
import { createScratch, forwardInto } from "./forward";
import { mulberry32 } from "../math/random";
import { sameModuloTurns } from "../math/angles";
import { cross, dot, rotCsInto } from "../math/mat3";
import { mul4Into } from "../math/mat4";
import { drivenInRangeInto, type KeepContext } from "./closedFormKeep";

/** Result of {@link orthoParallelKinInto} when the pose lies on a family of solutions. */
const DEGENERATE = -1;
/** |sin| of the wrist's middle angle below which the wrist counts as singular (axes 4 and 6 in line). */
const WRIST_DEGENERATE = 1e-9;
/** Below this the wrist solutions are checked by forward kinematics (as the general solver does). */
const WRIST_NEAR_SINGULAR = 3.2e-5;

export interface OrthoParallelIk {
  /** Axis 1: direction and point; axis 2 direction; d₁ × d₂, d₁·d₂. */
  readonly d1: Float64Array;
  readonly p1: Float64Array;
  readonly d2: Float64Array;
  readonly d1xd2: Float64Array;
  readonly d1d2: number;
  /** (w₀ − p₁)·d₂: the wrist centre's component along axis 2. */
  readonly h: number;
  /** p₂ − p₁; the plane basis e₁, e₂ ⟂ d₂ (e₁ × e₂ = d₂). */
  readonly p21: Float64Array;
  readonly e1: Float64Array;
  readonly e2: Float64Array;
  /** Plane coordinates of l = p₃ − p₂ and v = w₀ − p₃; sense of axis 3 against axis 2 (±1). */
  readonly lx: number;
  readonly ly: number;
  readonly vx: number;
  readonly vy: number;
  readonly s3: number;
  /** p₃ − p₂ and w₀ − p₃ (3-D, for the joint rates of orthoParallelRates.ts); the wrist axes at the zero pose. */
  readonly p32: Float64Array;
  readonly wp3: Float64Array;
  readonly d4: Float64Array;
  readonly d5: Float64Array;
  readonly d6: Float64Array;
  /** Wrist: basis E (columns d₄, d₅, d₄ × d₅, row-major 3×3), K = R₀ᵀ·E·Ry(γ), γ. */
  readonly E: Float64Array;
  readonly K: Float64Array;
  readonly gamma: number;
  /** Wrist centre in the flange frame, m. */
  readonly wInFlange: Float64Array;
  /** Scale for degeneracy tests, m. */
  readonly tiny: number;
  /** Set by orthoParallelKinInto: a root was taken near a double root or the wrist near singular (check by FK). */
  check: boolean;
  /** Set when onBranch stopped the solve. */
  stopped: boolean;
  /** Set when skipSingularWrist left a branch out. */
  partial: boolean;
  /** The target being solved, and whether H = R_target·K is in the work buffer for it. */
  target: ArrayLike<number> | null;
  hReady: boolean;
  /** The target's wrist centre relative to axis 1 and its component along d₁. */
  readonly u: Float64Array;
  readonly work: Float64Array;
}

const dot3 = dot;
const cross3 = (a: ArrayLike<number>, b: ArrayLike<number>): Float64Array => Float64Array.from(cross(a, b));

/**
 * Sets the solver up from the chain's axes at the kinematic zero, or returns null when the chain is not of the class
 * (the caller has checked six revolute joints and a spherical wrist on axes 4–6 with the centre `wInFlange`).
 */
export function orthoParallelOf(chain: Chain, wInFlange: ArrayLike<number>): OrthoParallelIk | null {
  if (chain.jointCount !== 6 || chain.drivenCount !== 6) return null;
  // Frames the motions act in at the kinematic zero: W₁ = F₀, Wᵢ₊₁ = Wᵢ·Fᵢ; T₀ = W₆·F₆.
  const frames: Float64Array[] = [chain.fixed.slice(0, 16)];
  for (let i = 1; i <= 6; i++)
    frames.push(mul4Into(new Float64Array(16), frames[i - 1]!, chain.fixed.subarray(16 * i, 16 * i + 16)));
  const dir = (i: number) => {
    const f = frames[i]!,
      a = chain.axisLocal.subarray(3 * i, 3 * i + 3);
    return Float64Array.of(dot3(f.subarray(0, 3), a), dot3(f.subarray(4, 7), a), dot3(f.subarray(8, 11), a));
  };
  const point = (i: number) => Float64Array.of(frames[i]![3]!, frames[i]![7]!, frames[i]![11]!);
  const d = [0, 1, 2, 3, 4, 5].map(dir);
  const p = [0, 1, 2].map(point);
  const T0 = frames[6]!;
  const w0 = Float64Array.from([0, 1, 2], (r) => dot3(T0.subarray(4 * r, 4 * r + 3), wInFlange) + T0[4 * r + 3]!);
  const L = chain.characteristicLengthM;
  const [d1, d2, d3, d4, d5, d6] = d as [
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
  ];
  const d1xd2 = cross3(d1, d2);
  if (Math.hypot(...d1xd2) < 1e-6) return null;
  if (Math.hypot(...cross3(d2, d3)) > 1e-9) return null;
  if (Math.abs(dot3(d4, d5)) > 1e-9 || Math.abs(dot3(d5, d6)) > 1e-9) return null;
  // Plane basis ⟂ d₂.
  const seed = Math.abs(d2[0]!) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const e1raw = cross3(d2, seed),
    e1 = e1raw.map((x) => x / Math.hypot(...e1raw)),
    e2 = cross3(d2, e1);
  const l = p[2]!.map((x, i) => x - p[1]![i]!),
    v = w0.map((x, i) => x - p[2]![i]!);
  const lx = dot3(l, e1),
    ly = dot3(l, e2),
    vx = dot3(v, e1),
    vy = dot3(v, e2);
  if (Math.hypot(lx, ly) < 1e-6 * L || Math.hypot(vx, vy) < 1e-6 * L) return null;
  // Wrist basis E = (d₄, d₅, n) as columns; d₆ = Ry(γ)·x in it.
  const n = cross3(d4, d5);
  const E = Float64Array.of(d4[0]!, d5[0]!, n[0]!, d4[1]!, d5[1]!, n[1]!, d4[2]!, d5[2]!, n[2]!);
  const gamma = Math.atan2(-dot3(d6, n), dot3(d6, d4));
  const cg = Math.cos(gamma),
    sg = Math.sin(gamma);
  // K = R₀ᵀ·E·Ry(γ); Ry(γ) = [[c, 0, s], [0, 1, 0], [−s, 0, c]].
  const K = new Float64Array(9);
  for (let i = 0; i < 3; i++) {
    // Row i of R₀ᵀ·E: column i of R₀ against the columns of E.
    const r = [0, 1, 2].map((j) => T0[i]! * E[j]! + T0[4 + i]! * E[3 + j]! + T0[8 + i]! * E[6 + j]!);
    K[i * 3] = r[0]! * cg - r[2]! * sg;
    K[i * 3 + 1] = r[1]!;
    K[i * 3 + 2] = r[0]! * sg + r[2]! * cg;
  }
  const ik: OrthoParallelIk = {
    d1,
    p1: p[0]!,
    d2,
    d1xd2,
    d1d2: dot3(d1, d2),
    h: dot3(
      w0.map((x, i) => x - p[0]![i]!),
      d2,
    ),
    p21: p[1]!.map((x, i) => x - p[0]![i]!),
    e1,
    e2,
    lx,
    ly,
    vx,
    vy,
    s3: dot3(d2, d3) > 0 ? 1 : -1,
    p32: l,
    wp3: v,
    d4,
    d5,
    d6,
    E,
    K,
    gamma,
    wInFlange: Float64Array.from(wInFlange),
    tiny: 1e-9 * L,
    check: false,
    stopped: false,
    partial: false,
    target: null,
    hReady: false,
    u: new Float64Array(4),
    work: new Float64Array(40),
  };
  return roundTrips(chain, ik) ? ik : null;
}

/** The solver's own acceptance: 16 seeded random poses (kinematic values) are among the solutions of their FK. */
function roundTrips(chain: Chain, ik: OrthoParallelIk): boolean {
  const rnd = mulberry32(0x0b7e);
  const open = { ...chain, couplingGain: identity6(), couplingOffset: new Float64Array(6) };
  const kin = createScratch(open);
  const q = new Float64Array(6),
    sol = new Float64Array(48);
  for (let trial = 0; trial < 16; trial++) {
    for (let i = 0; i < 6; i++) q[i] = (rnd() * 2 - 1) * 3;
    const count = orthoParallelKinInto(ik, forwardInto(open, q, kin), sol);
    let found = false;
    for (let s = 0; s < count && !found; s++) found = sameModuloTurns(sol, s * 6, q, 0, 6, 1e-9);
    if (!found) return false;
  }
  return true;
}

function identity6(): Float64Array {
  const g = new Float64Array(36);
  for (let i = 0; i < 6; i++) g[i * 7] = 1;
  return g;
}

/**
 * Roots θ of a·cos θ + b·sin θ = c into out[o], out[o + 1], their cosines into out[o + 2], out[o + 3] and sines
 * into out[o + 4], out[o + 5]; their count (0, 1 or 2), −1 when |(a, b)| ≤ tiny. Sets ik.check near a double root.
 */
function sinusoidRoots(
  ik: OrthoParallelIk,
  out: Float64Array,
  o: number,
  a: number,
  b: number,
  c: number,
  tiny: number,
): number {
  const r = Math.sqrt(a * a + b * b);
  if (r <= tiny) return -1;
  const x = c / r;
  if (x > 1 + 1e-12 || x < -1 - 1e-12) return 0;
  if (x > 1 - 1e-9 || x < -1 + 1e-9) ik.check = true;
  const xc = Math.min(1, Math.max(-1, x));
  const phi = Math.atan2(b, a),
    dd = Math.acos(xc);
  // Each root's cosine and sine from cos(φ ± δ), sin(φ ± δ) (no further trigonometric calls).
  const cp = a / r,
    sp = b / r,
    sd = Math.sqrt(1 - xc * xc);
  out[o] = phi + dd;
  out[o + 2] = cp * xc - sp * sd;
  out[o + 4] = sp * xc + cp * sd;
  if (dd < 1e-12) return 1;
  out[o + 1] = phi - dd;
  out[o + 3] = cp * xc + sp * sd;
  out[o + 5] = sp * xc - cp * sd;
  return 2;
}

// Work buffer offsets.
const W_T1 = 0,
  W_B = 6,
  W_R1 = 12,
  W_R2 = 21,
  W_H = 30;

/**
 * Every kinematic solution (θ₁..θ₆, 6 per solution, at most 8) for the flange pose T (row-major 4×4, m) into
 * kinSol; returns the count or −1 (DEGENERATE: wrist centre on axis 1 or 2, or axes 4 and 6 in line). Sets ik.check
 * when a solution should be confirmed by forward kinematics. With `range`, branches whose joints 1–3 are out of
 * their ranges are left out; `onBranch(from, count)` is called after each branch's wrist solutions and stops the
 * solve when it returns true; with `skipSingularWrist`, a branch whose wrist is singular (axes 4 and 6 in line: a
 * family) is left out instead of making the whole pose DEGENERATE, and ik.partial is set. Allocates nothing.
 */
export function orthoParallelKinInto(
  ik: OrthoParallelIk,
  T: ArrayLike<number>,
  kinSol: Float64Array,
  range: KeepContext | null = null,
  onBranch: ((from: number, count: number) => boolean) | null = null,
  skipSingularWrist = false,
): number {
  const w = ik.work,
    d2 = ik.d2;
  const u = targetInto(ik, T);
  const a = u[0]! * d2[0]! + u[1]! * d2[1]! + u[2]! * d2[2]! - ik.d1d2 * u[3]!,
    b = u[0]! * ik.d1xd2[0]! + u[1]! * ik.d1xd2[1]! + u[2]! * ik.d1xd2[2]!;
  const n1 = sinusoidRoots(ik, w, W_T1, a, b, ik.h - ik.d1d2 * u[3]!, ik.tiny);
  if (n1 < 0) return DEGENERATE;
  ik.stopped = false;
  ik.partial = false;
  let count = 0;
  for (let i1 = 0; i1 < n1 && !ik.stopped; i1++) {
    const t1 = w[W_T1 + i1]!;
    count = armBranchesInto(
      ik,
      kinSol,
      count,
      t1,
      w[W_T1 + 2 + i1]!,
      w[W_T1 + 4 + i1]!,
      range,
      onBranch,
      skipSingularWrist,
    );
    if (count < 0) return DEGENERATE;
  }
  return count;
}

/**
 * The solutions with θ₁ given, for a target whose wrist centre lies on axis 1 (every θ₁ is one: a family): the elbow
 * and wrist branches at each of `samples` values of θ₁ spread over [lo, hi] (kinematic values), branches out of range
 * left out as in orthoParallelKinInto. Returns the count (at most kinSol.length / 6), −1 (DEGENERATE) when the wrist
 * centre is off axis 1, the arm's lateral offset keeps it off, or a branch's wrist is singular too.
 */
export function orthoParallelFamilyInto(
  ik: OrthoParallelIk,
  T: ArrayLike<number>,
  kinSol: Float64Array,
  samples: number,
  lo: number,
  hi: number,
  range: KeepContext | null = null,
): number {
  const u = targetInto(ik, T),
    d2 = ik.d2;
  const a = u[0]! * d2[0]! + u[1]! * d2[1]! + u[2]! * d2[2]! - ik.d1d2 * u[3]!,
    b = u[0]! * ik.d1xd2[0]! + u[1]! * ik.d1xd2[1]! + u[2]! * ik.d1xd2[2]!;
  if (Math.hypot(a, b) > ik.tiny || Math.abs(ik.h - ik.d1d2 * u[3]!) > ik.tiny) return DEGENERATE;
  ik.stopped = false;
  let count = 0;
  for (let i = 0; i < samples && (count + 4) * 6 <= kinSol.length; i++) {
    const t1 = samples === 1 ? 0.5 * (lo + hi) : lo + ((hi - lo) * i) / (samples - 1);
    count = armBranchesInto(ik, kinSol, count, t1, Math.cos(t1), Math.sin(t1), range, null);
    if (count < 0) return DEGENERATE;
  }
  return count;
}

/**
 * The target's wrist centre relative to axis 1, u = P − p₁, into ik.u (u[3] = u·d₁); H = R_target·K (shared by every
 * branch) is left to hInto, for targets whose position is reached at all; resets ik.check.
 */
function targetInto(ik: OrthoParallelIk, T: ArrayLike<number>): Float64Array {
  ik.check = false;
  const wf = ik.wInFlange,
    d1 = ik.d1,
    u = ik.u;
  u[0] = T[0]! * wf[0]! + T[1]! * wf[1]! + T[2]! * wf[2]! + T[3]! - ik.p1[0]!;
  u[1] = T[4]! * wf[0]! + T[5]! * wf[1]! + T[6]! * wf[2]! + T[7]! - ik.p1[1]!;
  u[2] = T[8]! * wf[0]! + T[9]! * wf[1]! + T[10]! * wf[2]! + T[11]! - ik.p1[2]!;
  u[3] = u[0]! * d1[0]! + u[1]! * d1[1]! + u[2]! * d1[2]!;
  ik.target = T;
  ik.hReady = false;
  return u;
}

/** H = R_target·K into the work buffer, once per target, when a branch first needs its wrist. */
function hInto(ik: OrthoParallelIk): void {
  const w = ik.work,
    K = ik.K,
    T = ik.target!;
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++)
      w[W_H + i * 3 + j] = T[i * 4]! * K[j]! + T[i * 4 + 1]! * K[3 + j]! + T[i * 4 + 2]! * K[6 + j]!;
  ik.hReady = true;
}

/**
 * The elbow and wrist branches at θ₁ = t1 (cosine c1, sine s1), appended to kinSol from `count`; the new count or
 * DEGENERATE. Sets ik.stopped when onBranch asks to stop.
 */
function armBranchesInto(
  ik: OrthoParallelIk,
  kinSol: Float64Array,
  count: number,
  t1: number,
  c1: number,
  s1: number,
  range: KeepContext | null,
  onBranch: ((from: number, count: number) => boolean) | null,
  skipSingularWrist = false,
): number {
  const w = ik.work,
    d1 = ik.d1,
    u = ik.u;
  const ux = u[0]!,
    uy = u[1]!,
    uz = u[2]!;
  const { lx, ly, vx, vy } = ik;
  const a3 = lx * vx + ly * vy,
    b3 = ly * vx - lx * vy,
    ll = lx * lx + ly * ly + vx * vx + vy * vy;
  // Q − p₁ = Rot(d₁, −θ₁)·u (Rodrigues), then q = Q − p₂ in the plane ⟂ d₂.
  const kx = d1[1]! * uz - d1[2]! * uy,
    ky = d1[2]! * ux - d1[0]! * uz,
    kz = d1[0]! * uy - d1[1]! * ux;
  const f = u[3]! * (1 - c1);
  const qx0 = ux * c1 - kx * s1 + d1[0]! * f - ik.p21[0]!,
    qy0 = uy * c1 - ky * s1 + d1[1]! * f - ik.p21[1]!,
    qz0 = uz * c1 - kz * s1 + d1[2]! * f - ik.p21[2]!;
  const qx = qx0 * ik.e1[0]! + qy0 * ik.e1[1]! + qz0 * ik.e1[2]!,
    qy = qx0 * ik.e2[0]! + qy0 * ik.e2[1]! + qz0 * ik.e2[2]!;
  if (qx * qx + qy * qy < ik.tiny * ik.tiny) return DEGENERATE;
  const n3 = sinusoidRoots(ik, w, W_B, a3, b3, 0.5 * (qx * qx + qy * qy - ll), ik.tiny * ik.tiny);
  if (n3 <= 0) return count;
  rotCsInto(w, W_R1, d1, c1, s1);
  for (let i3 = 0; i3 < n3; i3++) {
    const beta = w[W_B + i3]!,
      cb = w[W_B + 2 + i3]!,
      sb = w[W_B + 4 + i3]!;
    const sx = lx + vx * cb - vy * sb,
      sy = ly + vx * sb + vy * cb;
    // θ₂ turns s onto q: its cosine and sine from the two products, then φ = θ₂ + β by the sum formulas.
    const y2 = sx * qy - sy * qx,
      x2 = sx * qx + sy * qy,
      r2 = Math.sqrt(x2 * x2 + y2 * y2);
    const c2 = x2 / r2,
      s2 = y2 / r2;
    const t2 = Math.atan2(y2, x2);
    // A branch whose first three joints cannot be brought into their ranges loses both wrist solutions in the
    // keep step (the same test on the same values): its wrist is not solved.
    if (range && !armInRange(range, kinSol, count, t1, t2, ik.s3 * beta)) continue;
    const from = count;
    const next = wristInto(ik, kinSol, count, t1, t2, ik.s3 * beta, c2 * cb - s2 * sb, s2 * cb + c2 * sb);
    if (next < 0) {
      if (!skipSingularWrist) return DEGENERATE;
      ik.partial = true;
      continue;
    }
    count = next;
    if (onBranch && onBranch(from, count)) {
      ik.stopped = true;
      return count;
    }
  }
  return count;
}

/** Whether joints 1–3 of branch (t1, t2, t3), written to kinSol slot s, can be brought into their ranges. */
function armInRange(range: KeepContext, kinSol: Float64Array, s: number, t1: number, t2: number, t3: number): boolean {
  kinSol[s * 6] = t1;
  kinSol[s * 6 + 1] = t2;
  kinSol[s * 6 + 2] = t3;
  return drivenInRangeInto(range.q6, range.chain, kinSol, s, 3, range.coupled);
}

/**
 * The wrist of branch (θ₁, θ₂, θ₃), with cos φ, sin φ of φ = θ₂ + β: both solutions (the second is the wrist flip
 * θ₄ ± π, −θ₅, θ₆ ± π, from the first without more trigonometry) appended to kinSol; the new count or DEGENERATE.
 */
function wristInto(
  ik: OrthoParallelIk,
  kinSol: Float64Array,
  count: number,
  t1: number,
  t2: number,
  t3: number,
  cphi: number,
  sphi: number,
): number {
  const w = ik.work,
    E = ik.E;
  // G = Rot(d₁,θ₁)·Rot(d₂,φ)·E row by row; the wrist's M = Gᵀ·H needs entries (0,0), (1,0), (2,0), (0,1), (0,2).
  if (!ik.hReady) hInto(ik);
  rotCsInto(w, W_R2, ik.d2, cphi, sphi);
  let m00 = 0,
    m10 = 0,
    m20 = 0,
    m01 = 0,
    m02 = 0;
  for (let i = 0; i < 3; i++) {
    const r0 = w[W_R1 + i * 3]!,
      r1 = w[W_R1 + i * 3 + 1]!,
      r2 = w[W_R1 + i * 3 + 2]!;
    // Row i of Rot₁·Rot₂, then of G.
    const x0 = r0 * w[W_R2]! + r1 * w[W_R2 + 3]! + r2 * w[W_R2 + 6]!,
      x1 = r0 * w[W_R2 + 1]! + r1 * w[W_R2 + 4]! + r2 * w[W_R2 + 7]!,
      x2 = r0 * w[W_R2 + 2]! + r1 * w[W_R2 + 5]! + r2 * w[W_R2 + 8]!;
    const g0 = x0 * E[0]! + x1 * E[3]! + x2 * E[6]!,
      g1 = x0 * E[1]! + x1 * E[4]! + x2 * E[7]!,
      g2 = x0 * E[2]! + x1 * E[5]! + x2 * E[8]!;
    const h0 = w[W_H + i * 3]!;
    m00 += g0 * h0;
    m10 += g1 * h0;
    m20 += g2 * h0;
    m01 += g0 * w[W_H + i * 3 + 1]!;
    m02 += g0 * w[W_H + i * 3 + 2]!;
  }
  const sb = Math.sqrt(m10 * m10 + m20 * m20);
  if (sb < WRIST_DEGENERATE) return DEGENERATE;
  if (sb < WRIST_NEAR_SINGULAR) ik.check = true;
  const t4 = Math.atan2(m10, -m20),
    b5 = Math.atan2(sb, m00),
    t6 = Math.atan2(m01, m02);
  for (let flip = 0; flip < 2 && (count + 1) * 6 <= kinSol.length; flip++) {
    const o = count * 6;
    kinSol[o] = t1;
    kinSol[o + 1] = t2;
    kinSol[o + 2] = t3;
    // atan2(−y, −x) = atan2(y, x) ∓ π; atan2(−s, c) = −atan2(s, c).
    kinSol[o + 3] = flip === 0 ? t4 : t4 > 0 ? t4 - Math.PI : t4 + Math.PI;
    kinSol[o + 4] = (flip === 0 ? b5 : -b5) - ik.gamma;
    kinSol[o + 5] = flip === 0 ? t6 : t6 > 0 ? t6 - Math.PI : t6 + Math.PI;
    count++;
  }
  return count;
}

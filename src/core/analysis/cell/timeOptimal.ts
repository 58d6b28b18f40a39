/**
 * Time-optimal path parameterisation (TOPP) by reachability analysis, rest to rest, for a joint path sampled at N
 * stages of a path parameter s: the fastest timing s(t) under every driven joint's speed and acceleration limit
 * and an optional cap on the tool-point speed.
 *
 * Along the path q(s): q̇ = q′·ṡ and q̈ = q′·s̈ + q″·ṡ². With x = ṡ² and u = s̈, every limit is linear in (u, x):
 *   speed        |q′ᵢⱼ|·ṡ ≤ vⱼ          ⇔ x ≤ (vⱼ / |q′ᵢⱼ|)²
 *   acceleration |q′ᵢⱼ·u + q″ᵢⱼ·x| ≤ aⱼ
 *   tool speed   |p′ᵢ|·ṡ ≤ cap          ⇔ x ≤ (cap / |p′ᵢ|)²
 * and the stages are linked by x₍ᵢ₊₁₎ = xᵢ + 2·Δsᵢ·uᵢ (constant s̈ over a stage). The acceleration limits of stage
 * i hold at both its ends: at sᵢ with (uᵢ, xᵢ) and at sᵢ₊₁ with (uᵢ, xᵢ + 2·Δsᵢ·uᵢ) (the "first-order
 * interpolation" scheme; with the limits at the start only, the "collocation" scheme, a 3R test path overshot its
 * acceleration limits by 5 % between stages at 201 stages, against 0.002 % here). A backward pass builds each stage's
 * controllable set Kᵢ (the x from which the end can still be reached at rest, K₍N−1₎ = {0}); a forward pass from
 * x₀ = 0 then takes, at each stage, the largest u that keeps x₍ᵢ₊₁₎ in K₍ᵢ₊₁₎. Time = Σ 2·Δsᵢ / (√xᵢ + √x₍ᵢ₊₁₎),
 * exact for constant s̈ over a stage.
 *
 * The greedy pass gives the fastest timing of this discrete problem when a higher speed at one stage never lowers
 * the highest speed the next can reach: 1 + 2·Δsᵢ·r ≥ 0 for every acceleration band (r = −q″/q′ of the band), which
 * holds when Δs ≤ |q′|/(2·|q″|), i.e. on fine grids away from singularities. Where it fails the timing is still a
 * real motion within every limit, only possibly slower than the optimum.
 *
 * Each stage's set is a two-variable linear programme (maximise and minimise x over a polygon in (u, x)). It is
 * solved exactly by Fourier–Motzkin elimination of u: every constraint is a lower bound u ≥ p + r·x or an upper
 * bound u ≤ p′ + r′·x, and x is feasible iff every lower bound lies under every upper bound; each pair gives one
 * half-line in x (the x of the two boundaries' intersection). With m joints that is O(m²) pairs per stage.
 *
 * q′ and q″ come from the samples by three-point finite differences (pathDerivativesInto).
 * @see Pham & Pham, "A new approach to time-optimal path parameterization based on reachability analysis", IEEE
 *   Trans. Robotics 34(3):645–659, 2018 (the backward and forward passes; the collocation and interpolation
 *   schemes; the greedy pass's optimality) [from memory: which section says what]; Bobrow, Dubowsky & Gibson,
 *   Int. J. Robotics Research 4(3), 1985 (the problem in the (s, ṡ) plane)
 */
import { trapezoidTimeS } from "../cycle/cycle";
import { CELL_TIME_TO_TOP_SPEED_S, effectiveAccelInto } from "./jointMove";

/** |q′| below this (rad or m per unit of s) counts as zero: the joint's speed does not depend on ṡ there. */
const DQ_ZERO = 1e-12;

export interface ToolSpeedCap {
  /** The cap on the tool-point speed, m/s. */
  readonly capMPerS: number;
  /** |dp/ds| at each stage (N values, ≥ 0): tool-point speed per unit ṡ. */
  readonly toolSpeedPerUnitS: Float64Array;
}

export interface TimeOptimalInput {
  /** Path parameter at the N ≥ 2 stages, strictly increasing (m of tool-point arc length, or a 0..1 parameter). */
  readonly s: Float64Array;
  /** Driven joint values at the stages, N × m row-major, rad or m. */
  readonly q: Float64Array;
  /** m joint speed limits, > 0 (rad/s or m/s). */
  readonly maxSpeedSi: ArrayLike<number>;
  /** m joint acceleration limits, > 0, or NaN: full speed in `assumedTimeToTopSpeedS`. */
  readonly maxAccelSi: ArrayLike<number>;
  readonly toolSpeedCap?: ToolSpeedCap | undefined;
  /** Default CELL_TIME_TO_TOP_SPEED_S (0.25 s). */
  readonly assumedTimeToTopSpeedS?: number | undefined;
}

export type TimeLimitKind = "speed" | "acceleration" | "tool-speed";

export interface TimeLimit {
  readonly kind: TimeLimitKind;
  /** Driven-joint index; null for the tool speed. */
  readonly joint: number | null;
  /** Share of the move's time during which this limit is the most used one, 0..1. */
  readonly shareOfTime: number;
}

export interface TimeOptimalResult {
  /** Rest-to-rest time, s; Infinity when not feasible. */
  readonly timeS: number;
  /** False when the path cannot be followed as one move: the speed must drop to zero inside it (see blockedAt). */
  readonly feasible: boolean;
  /** Where and why the path is blocked: the first such stage, its s, and the limit that allows no speed there. */
  readonly blockedAt: {
    readonly stage: number;
    readonly s: number;
    readonly kind: TimeLimitKind;
    readonly joint: number | null;
  } | null;
  /** The limit that is the most used one over the largest share of the time; null when nothing moves. */
  readonly limitedBy: TimeLimit | null;
  /** ṡ at each stage (0 at both ends; Infinity over a stretch where nothing limits the speed). */
  readonly sDotProfile: Float64Array;
  /** Largest tool-point speed over the stages, m/s; null without a tool-speed cap input. */
  readonly peakToolSpeedMPerS: number | null;
  /** Per joint: true where the acceleration limit was assumed. */
  readonly accelAssumed: readonly boolean[];
}

/** Reusable buffers for timeOptimal (grown on demand); one per caller, not shared between concurrent calls. */
export interface TimeOptimalScratch {
  dq: Float64Array;
  ddq: Float64Array;
  xCap: Float64Array;
  kLo: Float64Array;
  kHi: Float64Array;
  x: Float64Array;
  accel: Float64Array;
  w: Float64Array;
  r: Float64Array;
  bc: Float64Array;
  bd: Float64Array;
  bucket: Float64Array;
  interval: Float64Array;
}

export function createTimeOptimalScratch(): TimeOptimalScratch {
  const e = () => new Float64Array(0);
  return {
    dq: e(),
    ddq: e(),
    xCap: e(),
    kLo: e(),
    kHi: e(),
    x: e(),
    accel: e(),
    w: e(),
    r: e(),
    bc: e(),
    bd: e(),
    bucket: e(),
    interval: new Float64Array(2),
  };
}

const grow = (a: Float64Array, n: number) => (a.length >= n ? a : new Float64Array(n));

/**
 * q′(s) and q″(s) at every stage by three-point finite differences on a nonuniform grid (N ≥ 3), written into dq and
 * ddq (N × m row-major). With h₁ = sᵢ − sᵢ₋₁, h₂ = sᵢ₊₁ − sᵢ, inside:
 *   q′ᵢ = [−h₂/(h₁(h₁+h₂))]·qᵢ₋₁ + [(h₂−h₁)/(h₁h₂)]·qᵢ + [h₁/(h₂(h₁+h₂))]·qᵢ₊₁          (error O(h₁h₂))
 *   q″ᵢ = 2·[qᵢ₋₁/(h₁(h₁+h₂)) − qᵢ/(h₁h₂) + qᵢ₊₁/(h₂(h₁+h₂))]                            (O(h²) on a uniform grid,
 *                                                                                          O(h₂ − h₁) otherwise)
 * and at the ends the one-sided three-point forms (the derivative of the parabola through the three nearest
 * samples): q′ second order, q″ first order. All are exact for quadratics. N = 2: q′ = Δq/Δs, q″ = 0.
 * @see Fornberg, "Generation of finite difference formulas on arbitrarily spaced grids", Math. Comp. 51, 1988
 *   (the weights are those of the Lagrange parabola) [from memory]
 */
export function pathDerivativesInto(
  dq: Float64Array,
  ddq: Float64Array,
  s: Float64Array,
  q: Float64Array,
  m: number,
): void {
  const n = s.length;
  if (n === 2) {
    const h = s[1]! - s[0]!;
    for (let j = 0; j < m; j++) {
      const d = (q[m + j]! - q[j]!) / h;
      dq[j] = d;
      dq[m + j] = d;
      ddq[j] = 0;
      ddq[m + j] = 0;
    }
    return;
  }
  for (let i = 0; i < n; i++) {
    // The parabola through stages c−1, c, c+1 (c clamped inside), differentiated at stage i.
    const c = i === 0 ? 1 : i === n - 1 ? n - 2 : i;
    const h1 = s[c]! - s[c - 1]!,
      h2 = s[c + 1]! - s[c]!,
      hs = h1 + h2;
    // Derivative weights of the Lagrange basis at t = s_i − s_c (t = −h1, 0 or h2).
    const t = s[i]! - s[c]!;
    const wa = (2 * t - h2) / (h1 * hs),
      wb = -(2 * t + h1 - h2) / (h1 * h2),
      wc = (2 * t + h1) / (h2 * hs);
    const ga = 2 / (h1 * hs),
      gb = -2 / (h1 * h2),
      gc = 2 / (h2 * hs);
    for (let j = 0; j < m; j++) {
      const qa = q[(c - 1) * m + j]!,
        qb = q[c * m + j]!,
        qc = q[(c + 1) * m + j]!;
      dq[i * m + j] = wa * qa + wb * qb + wc * qc;
      ddq[i * m + j] = ga * qa + gb * qb + gc * qc;
    }
  }
}

function validate(input: TimeOptimalInput): number {
  const { s, q, maxSpeedSi, maxAccelSi, toolSpeedCap } = input;
  const n = s.length,
    m = maxSpeedSi.length;
  if (n < 2) throw new RangeError(`time-optimal timing: ${n} path stages (expected at least 2)`);
  if (maxAccelSi.length !== m)
    throw new RangeError(`time-optimal timing: ${m} speed limits but ${maxAccelSi.length} acceleration limits`);
  if (q.length !== n * m)
    throw new RangeError(`time-optimal timing: q has ${q.length} values (expected ${n} stages × ${m} joints)`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(s[i]!)) throw new RangeError(`time-optimal timing: s[${i}] = ${s[i]} is not finite`);
    if (i > 0 && !(s[i]! > s[i - 1]!))
      throw new RangeError(`time-optimal timing: s is not strictly increasing at stage ${i} (${s[i - 1]}, ${s[i]})`);
  }
  for (let k = 0; k < q.length; k++)
    if (!Number.isFinite(q[k]!))
      throw new RangeError(`time-optimal timing: q[${Math.floor(k / m)}][${k % m}] = ${q[k]} is not finite`);
  for (let j = 0; j < m; j++) {
    const v = maxSpeedSi[j]!,
      a = maxAccelSi[j]!;
    if (!(v > 0) || !Number.isFinite(v))
      throw new RangeError(`time-optimal timing: joint ${j + 1} speed limit ${v} (expected a finite number > 0)`);
    if (!Number.isNaN(a) && (!(a > 0) || !Number.isFinite(a)))
      throw new RangeError(`time-optimal timing: joint ${j + 1} acceleration limit ${a} (expected > 0 or NaN)`);
  }
  if (toolSpeedCap) {
    const { capMPerS, toolSpeedPerUnitS } = toolSpeedCap;
    if (!(capMPerS > 0) || !Number.isFinite(capMPerS))
      throw new RangeError(`time-optimal timing: tool speed cap ${capMPerS} m/s (expected a finite number > 0)`);
    if (toolSpeedPerUnitS.length !== n)
      throw new RangeError(
        `time-optimal timing: toolSpeedPerUnitS has ${toolSpeedPerUnitS.length} values (expected ${n})`,
      );
    for (let i = 0; i < n; i++)
      if (!(toolSpeedPerUnitS[i]! >= 0) || !Number.isFinite(toolSpeedPerUnitS[i]!))
        throw new RangeError(`time-optimal timing: toolSpeedPerUnitS[${i}] = ${toolSpeedPerUnitS[i]} (expected ≥ 0)`);
  }
  return m;
}

/** Bucket codes: j < m speed of joint j; m + j acceleration of joint j; 2m tool speed. */
function bucketLimit(b: number, m: number, shareOfTime: number): TimeLimit {
  if (b === 2 * m) return { kind: "tool-speed", joint: null, shareOfTime };
  return b < m ? { kind: "speed", joint: b, shareOfTime } : { kind: "acceleration", joint: b - m, shareOfTime };
}

/** The largest x each stage allows on its own (xCap): joint speeds and the tool cap. Infinity where none applies. */
function stageCapsInto(input: TimeOptimalInput, m: number, sc: TimeOptimalScratch, n: number): void {
  for (let i = 0; i < n; i++) sc.xCap[i] = stageCap(i, input, m, sc).cap;
}

/** Stage i's own bound on x and its bucket (j: speed of joint j, 2m: tool speed; 2m when nothing bounds it). */
function stageCap(i: number, input: TimeOptimalInput, m: number, sc: TimeOptimalScratch) {
  let cap = Infinity,
    bucket = 2 * m;
  for (let j = 0; j < m; j++) {
    const c = Math.abs(sc.dq[i * m + j]!);
    if (c <= DQ_ZERO) continue;
    const v = input.maxSpeedSi[j]! / c;
    if (v * v < cap) {
      cap = v * v;
      bucket = j;
    }
  }
  const tool = input.toolSpeedCap;
  const p = tool ? tool.toolSpeedPerUnitS[i]! : 0;
  if (tool && p > 0 && (tool.capMPerS / p) ** 2 < cap) {
    cap = (tool.capMPerS / p) ** 2;
    bucket = 2 * m;
  }
  return { cap, bucket };
}

/**
 * The 2m acceleration bands of stage i, −aⱼ ≤ c·u + d·x ≤ aⱼ in the stage's own (u, x), into sc.bc / sc.bd: band j
 * at sᵢ (c = q′ᵢⱼ, d = q″ᵢⱼ), band m + j at sᵢ₊₁, where x₍ᵢ₊₁₎ = x + 2h·u (c = q′₍ᵢ₊₁₎ⱼ + 2h·q″₍ᵢ₊₁₎ⱼ, d = q″₍ᵢ₊₁₎ⱼ).
 */
function bandsInto(i: number, h: number, m: number, sc: TimeOptimalScratch): void {
  for (let j = 0; j < m; j++) {
    sc.bc[j] = sc.dq[i * m + j]!;
    sc.bd[j] = sc.ddq[i * m + j]!;
    const d1 = sc.ddq[(i + 1) * m + j]!;
    sc.bc[m + j] = sc.dq[(i + 1) * m + j]! + 2 * h * d1;
    sc.bd[m + j] = d1;
  }
}

/**
 * Stage i's controllable interval [lo, hi] (written to `out`), given the next stage's [loNext, hiNext] and the bands
 * of bandsInto: the x in [0, xCapᵢ] for which some u keeps every band and lands x + 2h·u in the next interval.
 * Fourier–Motzkin elimination of u: band k gives u ∈ [−wₖ + rₖx, wₖ + rₖx] with wₖ = a/|c|, rₖ = −d/c (a band with
 * c = 0 bounds x alone: |d|·x ≤ a); the next interval gives u ∈ [(loNext − x)/2h, (hiNext − x)/2h]. Each
 * (lower, upper) pair must satisfy lower ≤ upper: one half-line in x per pair.
 */
function controllableInto(
  out: Float64Array,
  i: number,
  h: number,
  m: number,
  sc: TimeOptimalScratch,
  loNext: number,
  hiNext: number,
): void {
  let lo = 0,
    hi = sc.xCap[i]!;
  const inv2h = 1 / (2 * h),
    rR = -inv2h,
    pLo = loNext * inv2h,
    pHi = hiNext * inv2h;
  if (hiNext < loNext) hi = -Infinity;
  let k = 0;
  for (let b = 0; b < 2 * m; b++) {
    const c = sc.bc[b]!,
      d = sc.bd[b]!,
      a = sc.accel[b % m]!;
    if (Math.abs(c) <= DQ_ZERO) {
      if (d !== 0) hi = Math.min(hi, a / Math.abs(d));
      continue;
    }
    const w = a / Math.abs(c),
      r = -d / c;
    // Band lower ≤ next-interval upper: (r − rR)·x ≤ pHi + w (the right side is > 0: only an upper bound on x).
    if (r - rR > 0) hi = Math.min(hi, (pHi + w) / (r - rR));
    // Next-interval lower ≤ band upper: (rR − r)·x ≤ w − pLo.
    const g = rR - r,
      f = w - pLo;
    if (g > 0) hi = Math.min(hi, f / g);
    else if (g < 0) lo = Math.max(lo, f / g);
    else if (f < 0) hi = -Infinity;
    // Band pairs: (rₖ − rₗ)·x ≤ wₖ + wₗ both ways, i.e. |rₖ − rₗ|·x ≤ wₖ + wₗ.
    for (let l = 0; l < k; l++) {
      const dr = Math.abs(r - sc.r[l]!);
      if (dr > 0) hi = Math.min(hi, (w + sc.w[l]!) / dr);
    }
    sc.w[k] = w;
    sc.r[k] = r;
    k++;
  }
  out[0] = lo;
  out[1] = hi;
}

/** The largest x₍ᵢ₊₁₎ = xᵢ + 2h·u the bands of stage i allow from xᵢ (before clamping to K₍ᵢ₊₁₎). */
function greedyNext(xi: number, h: number, m: number, sc: TimeOptimalScratch): number {
  let uHi = Infinity;
  for (let b = 0; b < 2 * m; b++) {
    const c = sc.bc[b]!;
    if (Math.abs(c) > DQ_ZERO) uHi = Math.min(uHi, sc.accel[b % m]! / Math.abs(c) - (sc.bd[b]! / c) * xi);
  }
  return xi + 2 * h * uHi;
}

/**
 * Bucket of the most used limit over stage i: speeds at x = xᵢ, accelerations with u = (x₍ᵢ₊₁₎ − xᵢ)/2h at both
 * ends (the bands of bandsInto).
 */
function mostUsedAt(i: number, h: number, input: TimeOptimalInput, m: number, sc: TimeOptimalScratch): number {
  const xi = sc.x[i]!,
    sd = Math.sqrt(xi),
    u = (sc.x[i + 1]! - xi) / (2 * h);
  let best = 0,
    bestUse = -1;
  for (let j = 0; j < m; j++) {
    const speedUse = (sd * Math.abs(sc.dq[i * m + j]!)) / input.maxSpeedSi[j]!;
    const accelUse =
      Math.max(Math.abs(sc.bc[j]! * u + sc.bd[j]! * xi), Math.abs(sc.bc[m + j]! * u + sc.bd[m + j]! * xi)) /
      sc.accel[j]!;
    if (speedUse > bestUse) {
      bestUse = speedUse;
      best = j;
    }
    if (accelUse > bestUse) {
      bestUse = accelUse;
      best = m + j;
    }
  }
  const tool = input.toolSpeedCap;
  if (tool && (sd * tool.toolSpeedPerUnitS[i]!) / tool.capMPerS > bestUse) best = 2 * m;
  return best;
}

/**
 * Time-optimal rest-to-rest timing of a sampled joint path (see the module comment). Pass a scratch from
 * createTimeOptimalScratch() to reuse buffers across calls; the result's arrays are always new.
 * @example a prismatic axis q = s over 0.3 m, v = 2 m/s, a = 20 m/s², 301 stages: timeS ≈ 0.25 (the trapezoid,
 *   CHECKS C17), limitedBy { kind: "acceleration", joint: 0, … } (accelerating and braking take 0.2 s of 0.25 s)
 */
export function timeOptimal(
  input: TimeOptimalInput,
  scratch: TimeOptimalScratch = createTimeOptimalScratch(),
): TimeOptimalResult {
  const m = validate(input);
  const { s, q, toolSpeedCap } = input;
  const n = s.length;
  const sc = scratch;
  sc.dq = grow(sc.dq, n * m);
  sc.ddq = grow(sc.ddq, n * m);
  for (const key of ["xCap", "kLo", "kHi", "x"] as const) sc[key] = grow(sc[key], n);
  sc.accel = grow(sc.accel, m);
  for (const key of ["w", "r", "bc", "bd"] as const) sc[key] = grow(sc[key], 2 * m);
  sc.bucket = grow(sc.bucket, 2 * m + 1);
  const accelAssumed: boolean[] = new Array<boolean>(m).fill(false);
  effectiveAccelInto(
    sc.accel,
    input.maxSpeedSi,
    input.maxAccelSi,
    input.assumedTimeToTopSpeedS ?? CELL_TIME_TO_TOP_SPEED_S,
    accelAssumed,
  );
  pathDerivativesInto(sc.dq, sc.ddq, s, q, m);
  stageCapsInto(input, m, sc, n);
  if (n === 2) return twoStageTiming(input, m, sc, accelAssumed);

  // Backward pass: controllable sets.
  sc.kLo[n - 1] = 0;
  sc.kHi[n - 1] = 0;
  let blocked = -1;
  for (let i = n - 2; i >= 0; i--) {
    const h = s[i + 1]! - s[i]!;
    bandsInto(i, h, m, sc);
    controllableInto(sc.interval, i, h, m, sc, sc.kLo[i + 1]!, sc.kHi[i + 1]!);
    sc.kLo[i] = sc.interval[0]!;
    sc.kHi[i] = sc.interval[1]!;
    // Empty (then so is every earlier set), or no speed allowed inside the path: the move cannot be made as one.
    if (sc.kLo[i]! > sc.kHi[i]! || (i === 0 && sc.kLo[0]! > 0)) {
      blocked = i;
      break;
    }
    if (i > 0 && !(sc.kHi[i]! > 0)) blocked = i;
  }
  if (blocked >= 0) {
    const lim = bucketLimit(stageCap(blocked, input, m, sc).bucket, m, 0);
    return {
      timeS: Infinity,
      feasible: false,
      blockedAt: { stage: blocked, s: s[blocked]!, kind: lim.kind, joint: lim.joint },
      limitedBy: null,
      sDotProfile: new Float64Array(n),
      peakToolSpeedMPerS: toolSpeedCap ? 0 : null,
      accelAssumed,
    };
  }

  // Forward pass: greedy, from rest.
  sc.x[0] = 0;
  for (let i = 0; i < n - 1; i++) {
    const xi = sc.x[i]!,
      lo = sc.kLo[i + 1]!,
      hi = sc.kHi[i + 1]!;
    const h = s[i + 1]! - s[i]!;
    bandsInto(i, h, m, sc);
    // xᵢ = ∞ only where nothing at stage i limits the speed: then nothing limits u either.
    const next = xi === Infinity ? hi : greedyNext(xi, h, m, sc);
    sc.x[i + 1] = Math.max(lo, Math.min(hi, next));
  }

  // Time, the most used limit per stage, peak tool speed.
  sc.bucket.fill(0);
  let timeS = 0;
  for (let i = 0; i < n - 1; i++) {
    const h = s[i + 1]! - s[i]!;
    const dt = (2 * h) / (Math.sqrt(sc.x[i]!) + Math.sqrt(sc.x[i + 1]!));
    timeS += dt;
    if (dt > 0 && Number.isFinite(dt)) {
      bandsInto(i, h, m, sc);
      const b = mostUsedAt(i, h, input, m, sc);
      sc.bucket[b] = sc.bucket[b]! + dt;
    }
  }
  const sDotProfile = new Float64Array(n);
  let peak = 0;
  for (let i = 0; i < n; i++) {
    sDotProfile[i] = Math.sqrt(sc.x[i]!);
    const p = toolSpeedCap ? toolSpeedCap.toolSpeedPerUnitS[i]! : 0;
    if (p > 0) peak = Math.max(peak, sDotProfile[i]! * p); // p = 0 where ṡ may be ∞: no tool speed there
  }
  return {
    timeS,
    feasible: Number.isFinite(timeS),
    blockedAt: null,
    limitedBy: limitFromBuckets(sc.bucket, m, timeS),
    sDotProfile,
    peakToolSpeedMPerS: toolSpeedCap ? peak : null,
    accelAssumed,
  };
}

function limitFromBuckets(bucket: Float64Array, m: number, timeS: number): TimeLimit | null {
  let best = -1,
    bestT = 0;
  for (let b = 0; b <= 2 * m; b++)
    if (bucket[b]! > bestT) {
      bestT = bucket[b]!;
      best = b;
    }
  return best < 0 || !(timeS > 0) ? null : bucketLimit(best, m, bestT / timeS);
}

/**
 * N = 2: one stage cannot start and end at rest with a constant s̈, so the path between the two samples is taken
 * as the joint-space straight line it is (q′ constant, q″ = 0) and timed in closed form: a trapezoid in s with top
 * speed √(min xCap) over both stages and acceleration min aⱼ/|q′ⱼ| (CHECKS C17). The peak tool speed is bounded by
 * the larger |p′| of the two stages.
 */
function twoStageTiming(
  input: TimeOptimalInput,
  m: number,
  sc: TimeOptimalScratch,
  accelAssumed: boolean[],
): TimeOptimalResult {
  const d = input.s[1]! - input.s[0]!;
  let accelS = Infinity,
    accelJoint = -1;
  for (let j = 0; j < m; j++) {
    const c = Math.abs(sc.dq[j]!);
    if (c > DQ_ZERO && sc.accel[j]! / c < accelS) {
      accelS = sc.accel[j]! / c;
      accelJoint = j;
    }
  }
  const slower = sc.xCap[1]! < sc.xCap[0]! ? 1 : 0;
  const speedS = Math.sqrt(sc.xCap[slower]!);
  const common = {
    feasible: true,
    blockedAt: null,
    sDotProfile: new Float64Array(2),
    peakToolSpeedMPerS: input.toolSpeedCap ? 0 : null,
    accelAssumed,
  };
  if (speedS === Infinity) return { ...common, timeS: 0, limitedBy: null };
  const timeS = trapezoidTimeS(d, speedS, accelS);
  const cruiseS = d >= (speedS * speedS) / accelS ? d / speedS - speedS / accelS : 0;
  const speedBucket = stageCap(slower, input, m, sc).bucket;
  const limitedBy =
    cruiseS >= timeS - cruiseS || accelJoint < 0
      ? bucketLimit(speedBucket, m, cruiseS / timeS)
      : bucketLimit(m + accelJoint, m, 1 - cruiseS / timeS);
  const tool = input.toolSpeedCap?.toolSpeedPerUnitS;
  const peak = tool ? Math.min(speedS, Math.sqrt(accelS * d)) * Math.max(tool[0]!, tool[1]!) : null;
  return { ...common, timeS, limitedBy, peakToolSpeedMPerS: peak };
}

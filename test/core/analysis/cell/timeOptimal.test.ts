/**
 * Tests of src/core/analysis/cell/timeOptimal.ts: time-optimal path parameterisation by reachability analysis.
 *
 * Outside references, named beside each check:
 *   - the rest-to-rest trapezoid/triangle closed form (CHECKS C17; Biagiotti & Melchiorri 2008 ch. 3 [from memory]):
 *     on a prismatic axis q = s the time-optimal timing is that profile;
 *   - an independent Python reference (make_topp_fixture.py beside this file → topp-fixture.json): a planar 3R
 *     following a straight tool line at constant tool angle, with its own closed-form inverse kinematics, analytic
 *     path derivatives and per-stage linear programmes solved by scipy.optimize.linprog (HiGHS);
 *   - a finite-difference cross-check: the timing integrated in time, joint speeds and accelerations by central
 *     differences in time of the closed-form inverse kinematics, against the limits;
 *   - Taylor: the three-point difference formulas are exact on quadratics;
 *   - brute force: on random four-stage paths, no point of a fine grid over the two free stages is feasible and
 *     faster, and the module's own profile meets every limit.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  createTimeOptimalScratch,
  pathDerivativesInto,
  timeOptimal,
  type TimeOptimalInput,
} from "../../../../src/core/analysis/cell/timeOptimal";
import { trapezoidTimeS } from "../../../../src/core/analysis/cycle/cycle";
import { expectClose, expectRelClose } from "../../../helpers/expectClose";
import { mulberry32, uniform } from "../../../helpers/prng";

const linspace = (from: number, to: number, n: number) =>
  Float64Array.from({ length: n }, (_, i) => from + ((to - from) * i) / (n - 1));

/** Prismatic axis q = s over [0, d]: one joint, the path parameter is the joint itself. */
function prismatic(d: number, n: number, v: number, a: number): TimeOptimalInput {
  const s = linspace(0, d, n);
  return { s, q: s.slice(), maxSpeedSi: [v], maxAccelSi: [a] };
}

/**
 * Upper bound on the discretisation's extra time on a prismatic axis, per change of phase (accelerate → cruise,
 * cruise → brake, accelerate → brake), derived here: over the one stage of length h where the optimal profile
 * changes phase, the discrete motion (constant s̈ over the stage, stage ends inside the optimal set) starts and ends
 * at x ≥ x* − 2·a·h (x* = ṡ² at the change: V² for a trapezoid, a·D for a triangle), so it takes at most
 * h/√(x* − 2ah); the optimal motion needs at least h/√x* there. Every other stage is timed exactly (x = 2·a·s,
 * constant acceleration, or x = V²). Total extra time ≤ phases × (h/√(x* − 2ah) − h/√x*).
 */
function phaseBound(h: number, xStar: number, a: number, phases: number): number {
  return phases * (h / Math.sqrt(xStar - 2 * a * h) - h / Math.sqrt(xStar));
}

describe("timeOptimal on a prismatic axis q = s equals the trapezoid (CHECKS C17)", () => {
  it("trapezoid 0.3 m, 2 m/s, 20 m/s²: 0.25 s when the phase changes fall on stages (N = 31: s = 0.1, 0.2 m)", () => {
    // Accelerate over V²/2A = 0.1 m, cruise 0.1 m, brake 0.1 m: stage spacing 0.01 m puts both changes on stages,
    // so every stage is timed exactly: 0.3/2 + 2/20 = 0.25 s to rounding (1e-12).
    const r = timeOptimal(prismatic(0.3, 31, 2, 20));
    expectClose(r.timeS, 0.25, 1e-12, "trapezoid");
    expect(r.feasible).toBe(true);
    // Accelerating and braking take 2·V/A = 0.2 s of 0.25 s: the acceleration limit is the most used, 80 % of the time.
    expect(r.limitedBy).toMatchObject({ kind: "acceleration", joint: 0 });
    expectClose(r.limitedBy!.shareOfTime, 0.8, 1e-9, "share of time");
    // ṡ at stage i during the acceleration: √(2·A·sᵢ) (constant acceleration from rest); V while cruising.
    expectClose(
      r.sDotProfile.subarray(0, 11),
      Array.from(linspace(0, 0.1, 11), (si) => Math.sqrt(40 * si)),
      1e-12,
    );
    expectClose(r.sDotProfile.subarray(10, 21), new Float64Array(11).fill(2), 1e-12, "cruise");
    expect(r.sDotProfile[30]).toBe(0);
  });

  it("triangle 0.025 m, 2 m/s, 20 m/s²: 2·√(D/A) = 0.0707107 s (N = 11: the peak at D/2 is a stage)", () => {
    const r = timeOptimal(prismatic(0.025, 11, 2, 20));
    expectClose(r.timeS, 2 * Math.sqrt(0.025 / 20), 1e-12, "triangle");
    expectClose(r.limitedBy!.shareOfTime, 1, 1e-12, "accelerating or braking all the time");
  });

  it("trapezoid, phase changes between stages: within the derived bound, never faster, converging as O(h²)", () => {
    // N − 1 = 49, 199, 799: not multiples of 3, so 0.1 m and 0.2 m fall between stages.
    const errors = [50, 200, 800].map((n) => {
      const r = timeOptimal(prismatic(0.3, n, 2, 20));
      const extra = r.timeS - trapezoidTimeS(0.3, 2, 20);
      const bound = phaseBound(0.3 / (n - 1), 4, 20, 2);
      expect(extra, `N = ${n}: extra ${extra} s`).toBeGreaterThan(-1e-12); // a discrete motion is a real one
      expect(extra, `N = ${n}: extra ${extra} s, bound ${bound} s`).toBeLessThanOrEqual(bound);
      return extra;
    });
    // Second order: each 4× finer grid divides the extra time by about 16; ask for at least 8.
    expect(errors[0]! / errors[1]!).toBeGreaterThan(8);
    expect(errors[1]! / errors[2]!).toBeGreaterThan(8);
  });

  it("triangle, peak between stages: within the derived bound, never faster, converging", () => {
    // N even: the peak at D/2 falls mid-stage. One change of phase, x* = A·D = 0.5 (m/s)².
    const errors = [10, 40, 160].map((n) => {
      const r = timeOptimal(prismatic(0.025, n, 2, 20));
      const extra = r.timeS - 2 * Math.sqrt(0.025 / 20);
      const bound = phaseBound(0.025 / (n - 1), 0.5, 20, 1);
      expect(extra).toBeGreaterThan(-1e-12);
      expect(extra, `N = ${n}: extra ${extra} s, bound ${bound} s`).toBeLessThanOrEqual(bound);
      return extra;
    });
    expect(errors[0]! / errors[1]!).toBeGreaterThan(8);
    expect(errors[1]! / errors[2]!).toBeGreaterThan(8);
  });

  it("a long move is limited by speed; a tool cap below the joint speed takes over (2 m at 2 m/s, cap 1 m/s)", () => {
    // 2 m at 2 m/s, 20 m/s²: 2/2 + 2/20 = 1.1 s, cruising 0.9 s of 1.1 s. Tool point = the axis (|dp/ds| = 1):
    // with a 1 m/s cap, 2/1 + 1/20 = 2.05 s, cruising 1.95 s, peak tool speed 1 m/s. N = 401: stage spacing
    // 0.005 m puts V²/2A = 0.1 m and 0.025 m on stages, so both are exact to rounding.
    const input = prismatic(2, 401, 2, 20);
    const free = timeOptimal(input);
    expectClose(free.timeS, 1.1, 1e-12);
    expect(free.limitedBy).toMatchObject({ kind: "speed", joint: 0 });
    expectClose(free.limitedBy!.shareOfTime, 0.9 / 1.1, 1e-9);
    expect(free.peakToolSpeedMPerS).toBeNull();
    const capped = timeOptimal({
      ...input,
      toolSpeedCap: { capMPerS: 1, toolSpeedPerUnitS: new Float64Array(401).fill(1) },
    });
    expectClose(capped.timeS, 2.05, 1e-12);
    expect(capped.limitedBy).toMatchObject({ kind: "tool-speed", joint: null });
    expectClose(capped.peakToolSpeedMPerS!, 1, 1e-12);
  });

  it("NaN acceleration: full speed in 0.25 s (a = 8 m/s² for 2 m/s), flagged", () => {
    // 0.3 m at 2 m/s, 8 m/s²: V²/A = 0.5 > 0.3 → triangle 2·√(0.3/8); N = 3: the peak at 0.15 m is a stage.
    const r = timeOptimal({ ...prismatic(0.3, 3, 2, NaN) });
    expectClose(r.timeS, 2 * Math.sqrt(0.3 / 8), 1e-12);
    expect(r.accelAssumed).toEqual([true]);
  });

  it("two stages: the joint-space segment in closed form (0.3 m, 2 m/s, 20 m/s² → 0.25 s)", () => {
    // With q = 2·s over s ∈ [0, 0.15]: the joint covers 0.3 m; ṡ ≤ 1, s̈ ≤ 10: 0.15/1 + 1/10 = 0.25 s.
    const r = timeOptimal({
      s: Float64Array.of(0, 0.15),
      q: Float64Array.of(0, 0.3),
      maxSpeedSi: [2],
      maxAccelSi: [20],
    });
    expectClose(r.timeS, 0.25, 1e-12);
    expect(r.limitedBy).toMatchObject({ kind: "acceleration", joint: 0 });
    // A 0.5 m/s tool cap with |p′| = 1 then 2: ṡ ≤ min(1, 0.5/1, 0.5/2) = 0.25, s̈ ≤ 10: D = 0.15 ≥ 0.25²/10 →
    // 0.15/0.25 + 0.25/10 = 0.625 s, cruising 0.575 s of it; peak tool speed 0.25·2 = 0.5 m/s.
    const capped = timeOptimal({
      s: Float64Array.of(0, 0.15),
      q: Float64Array.of(0, 0.3),
      maxSpeedSi: [2],
      maxAccelSi: [20],
      toolSpeedCap: { capMPerS: 0.5, toolSpeedPerUnitS: Float64Array.of(1, 2) },
    });
    expectClose(capped.timeS, 0.625, 1e-12);
    expect(capped.limitedBy).toMatchObject({ kind: "tool-speed", joint: null });
    expectClose(capped.limitedBy!.shareOfTime, 0.575 / 0.625, 1e-12);
    expectClose(capped.peakToolSpeedMPerS!, 0.5, 1e-12);
  });
});

describe("timeOptimal: degenerate and bad paths", () => {
  it("nothing moves: 0 s, no limit", () => {
    const s = linspace(0, 1, 5);
    const r = timeOptimal({
      s,
      q: new Float64Array(10).fill(0.3),
      maxSpeedSi: [1, 1],
      maxAccelSi: [1, 1],
      toolSpeedCap: { capMPerS: 1, toolSpeedPerUnitS: new Float64Array(5) },
    });
    expect(r.timeS).toBe(0);
    expect(r.limitedBy).toBeNull();
    expect(r.feasible).toBe(true);
    expect(r.peakToolSpeedMPerS).toBe(0);
  });

  it("a stage inside the path that allows no speed blocks it: not feasible, with the stage, its s and the limit", () => {
    // q = s on 11 stages. A non-finite |p′| is refused; |p′| = 1e300 at stage 4 makes its tool-speed bound
    // (cap/|p′|)² = 1e-600, which is 0 in double precision: ṡ must be 0 at s = 0.4, the move cannot be one move.
    const s = linspace(0, 1, 11);
    const toolSpeedPerUnitS = new Float64Array(11).fill(1);
    toolSpeedPerUnitS[4] = Infinity;
    expect(() =>
      timeOptimal({
        s,
        q: s.slice(),
        maxSpeedSi: [1],
        maxAccelSi: [1],
        toolSpeedCap: { capMPerS: 1, toolSpeedPerUnitS },
      }),
    ).toThrow(/toolSpeedPerUnitS\[4\]/);
    toolSpeedPerUnitS[4] = 1e300;
    const r = timeOptimal({
      s,
      q: s.slice(),
      maxSpeedSi: [1],
      maxAccelSi: [1],
      toolSpeedCap: { capMPerS: 1, toolSpeedPerUnitS },
    });
    expect(r.feasible).toBe(false);
    expect(r.timeS).toBe(Infinity);
    expect(r.blockedAt).toEqual({ stage: 4, s: s[4], kind: "tool-speed", joint: null });
  });

  it("bad input: a clear error each", () => {
    const base = prismatic(1, 5, 1, 1);
    expect(() => timeOptimal({ ...base, s: Float64Array.of(0), q: Float64Array.of(0) })).toThrow(/1 path stages/);
    expect(() => timeOptimal({ ...base, s: Float64Array.of(0, 0.5, 0.5, 0.7, 1) })).toThrow(
      /strictly increasing at stage 2/,
    );
    expect(() => timeOptimal({ ...base, q: new Float64Array(4) })).toThrow(
      /q has 4 values \(expected 5 stages × 1 joints\)/,
    );
    expect(() => timeOptimal({ ...base, maxSpeedSi: [0] })).toThrow(/joint 1 speed limit 0/);
    expect(() => timeOptimal({ ...base, maxAccelSi: [-1] })).toThrow(/joint 1 acceleration limit -1/);
    expect(() => timeOptimal({ ...base, maxAccelSi: [1, 1] })).toThrow(/1 speed limits but 2 acceleration/);
    const q = base.q.slice();
    q[3] = NaN;
    expect(() => timeOptimal({ ...base, q })).toThrow(/q\[3\]\[0\] = NaN/);
  });
});

describe("pathDerivativesInto: three-point differences are exact on quadratics (Taylor)", () => {
  it("q(s) = 1 + 2s − 3s² and q(s) = 0.5s² on a nonuniform grid: q′ and q″ exact at every stage", () => {
    const s = Float64Array.of(0, 0.1, 0.35, 0.4, 0.8, 1.3);
    const m = 2,
      n = s.length;
    const q = new Float64Array(n * m);
    for (let i = 0; i < n; i++) {
      q[i * m] = 1 + 2 * s[i]! - 3 * s[i]! ** 2;
      q[i * m + 1] = 0.5 * s[i]! ** 2;
    }
    const dq = new Float64Array(n * m),
      ddq = new Float64Array(n * m);
    pathDerivativesInto(dq, ddq, s, q, m);
    const dqRef: number[] = [],
      ddqRef: number[] = [];
    for (let i = 0; i < n; i++) (dqRef.push(2 - 6 * s[i]!, s[i]!), ddqRef.push(-6, 1));
    expectClose(dq, dqRef, 1e-12, "q′");
    expectClose(ddq, ddqRef, 1e-10, "q″");
  });
});

/**
 * A random four-stage path of m joints, qⱼ = bⱼ·s + cⱼ·s² + noise of ±1 mrad, with random limits. `rough`: slopes
 * down to 0.02 (joints that barely move but curve) and high speed limits, so only the accelerations bind and two
 * joints' limits can conflict at one stage; otherwise gentle curves and low speed limits.
 */
function randomFourStagePath(rand: () => number, m: number, rough: boolean) {
  const n = 4;
  const s = new Float64Array(n);
  for (let i = 1; i < n; i++) s[i] = s[i - 1]! + uniform(rand, 0.05, 0.3);
  const q = new Float64Array(n * m);
  for (let j = 0; j < m; j++) {
    const b = uniform(rand, rough ? 0.02 : 0.5, 2) * (rand() < 0.5 ? -1 : 1),
      c = rough ? uniform(rand, -3, 3) : uniform(rand, -1, 1);
    for (let i = 0; i < n; i++) q[i * m + j] = b * s[i]! + c * s[i]! ** 2 + uniform(rand, -0.001, 0.001);
  }
  const v = Array.from({ length: m }, () => (rough ? uniform(rand, 5, 30) : uniform(rand, 0.5, 3)));
  const a = Array.from({ length: m }, () => uniform(rand, 1, 10));
  const dq = new Float64Array(n * m),
    ddq = new Float64Array(n * m);
  pathDerivativesInto(dq, ddq, s, q, m);
  return { n, s, q, v, a, dq, ddq };
}

/** The discrete problem of a four-stage path, written out from its definition (see the describe comment). */
function fourStageProblem(p: ReturnType<typeof randomFourStagePath>, m: number) {
  const { n, s, v, a, dq, ddq } = p;
  const caps = Array.from({ length: n }, (_, k) => Math.min(...v.map((vj, j) => (vj / Math.abs(dq[k * m + j]!)) ** 2)));
  const excess = (x: readonly number[]) => {
    let worst = -Infinity;
    for (let k = 0; k < n; k++) worst = Math.max(worst, x[k]! / caps[k]! - 1);
    for (let i = 0; i < n - 1; i++) {
      const u = (x[i + 1]! - x[i]!) / (2 * (s[i + 1]! - s[i]!));
      for (const k of [i, i + 1])
        for (let j = 0; j < m; j++)
          worst = Math.max(worst, Math.abs(dq[k * m + j]! * u + ddq[k * m + j]! * x[k]!) / a[j]! - 1);
    }
    return worst;
  };
  const time = (x: readonly number[]) => {
    let t = 0;
    for (let i = 0; i < n - 1; i++) t += (2 * (s[i + 1]! - s[i]!)) / (Math.sqrt(x[i]!) + Math.sqrt(x[i + 1]!));
    return t;
  };
  /**
   * Best time over a (steps × steps) grid of feasible (x₁, x₂) over (0, X₁] × (0, X₂]: X₁ = the speed bound of stage
   * 1 or what stage 0 can reach from rest (x₁ = 2Δs₀·u₀ with |q′₀ⱼ·u₀| ≤ aⱼ), whichever is lower; X₂ likewise from
   * the stop at stage 3 (x₂ = −2Δs₂·u₂ with |q′₃ⱼ·u₂| ≤ aⱼ).
   */
  const bruteForce = (steps: number) => {
    const reach = (k: number, h: number) => Math.min(...a.map((aj, j) => (2 * h * aj) / Math.abs(dq[k * m + j]!)));
    const x1Max = Math.min(caps[1]!, reach(0, s[1]! - s[0]!)),
      x2Max = Math.min(caps[2]!, reach(3, s[3]! - s[2]!));
    let best = Infinity;
    for (let g1 = 1; g1 <= steps; g1++)
      for (let g2 = 1; g2 <= steps; g2++) {
        const cand = [0, (x1Max * g1) / steps, (x2Max * g2) / steps, 0];
        if (excess(cand) <= 0) best = Math.min(best, time(cand));
      }
    return best;
  };
  /**
   * True when the largest x₍ᵢ₊₁₎ reachable from xᵢ grows with xᵢ for every band: x₍ᵢ₊₁₎ ≤ xᵢ·(1 + 2h·r) + 2h·w
   * with r = −d/c, i.e. 1 + 2h·r ≥ 0 (band at sᵢ: c = q′ᵢ, d = q″ᵢ; at sᵢ₊₁: c = q′ᵢ₊₁ + 2h·q″ᵢ₊₁, d = q″ᵢ₊₁).
   * Then a higher speed at one stage never lowers what the next can reach, and the greedy forward pass is optimal
   * (Pham & Pham 2018, the optimality of the greedy pass [from memory]).
   */
  const monotone = () => {
    for (let i = 0; i < n - 1; i++) {
      const h = s[i + 1]! - s[i]!;
      for (let j = 0; j < m; j++) {
        const c0 = dq[i * m + j]!,
          d0 = ddq[i * m + j]!,
          d1 = ddq[(i + 1) * m + j]!,
          c1 = dq[(i + 1) * m + j]! + 2 * h * d1;
        if (1 - (2 * h * d0) / c0 < 0 || 1 - (2 * h * d1) / c1 < 0) return false;
      }
    }
    return true;
  };
  return { excess, time, bruteForce, monotone };
}

describe("timeOptimal on random four-stage paths against a brute-force search", () => {
  /*
   * Four stages: x₀ = x₃ = 0 (rest to rest), x₁ and x₂ free. With uᵢ = (xᵢ₊₁ − xᵢ)/2Δsᵢ, the discrete problem is:
   * xₖ ≤ (vⱼ/|q′ₖⱼ|)² at every stage, and |q′ₖⱼ·uᵢ + q″ₖⱼ·xₖ| ≤ aⱼ at both ends k = i, i + 1 of every stage i
   * (q′, q″ from pathDerivativesInto, checked on quadratics above). Brute force: every (x₁, x₂) of a 300 × 300 grid
   * (bounds in bruteForce), kept if it meets every limit, timed by Σ 2Δs/(√xᵢ + √xᵢ₊₁). The module's profile
   * must meet every limit (1e-9 relative: rounding), and, where the greedy pass is optimal (monotone reach, see
   * fourStageProblem), be no slower than the best grid point (1e-12 relative) and at most 1 % faster (a 300-step
   * grid misses the optimum by about 1/300 of each x: well under 1 % of the time).
   */
  it("60 random paths of 2–3 joints: feasible, and optimal against the grid where the reach is monotone", () => {
    const rand = mulberry32(12);
    let compared = 0;
    for (let trial = 0; trial < 60; trial++) {
      const m = trial % 3 === 0 ? 3 : 2;
      const path = randomFourStagePath(rand, m, trial % 2 === 0);
      const problem = fourStageProblem(path, m);
      const r = timeOptimal({ s: path.s, q: path.q, maxSpeedSi: path.v, maxAccelSi: path.a });
      const x = Array.from(r.sDotProfile, (sd) => sd * sd);
      expect(problem.excess(x), `trial ${trial}: the module's profile breaks a limit`).toBeLessThanOrEqual(1e-9);
      expectRelClose(problem.time(x), r.timeS, 1e-12, `trial ${trial}: time of the profile`);
      const best = problem.bruteForce(300);
      if (problem.monotone()) {
        compared++;
        expect(r.timeS, `trial ${trial}: a grid point is faster`).toBeLessThanOrEqual(best * (1 + 1e-12));
        expect(r.timeS, `trial ${trial}: far faster than every grid point`).toBeGreaterThan(best * 0.99);
      }
      // Outside that regime only feasibility is asked (above): the greedy timing may then be slower than optimal.
    }
    expect(compared, "trials in the monotone regime").toBeGreaterThanOrEqual(15);
  });
});

// ---- Planar 3R against the Python reference -------------------------------------------------------------------

interface FixtureCase {
  readonly scenario: string;
  readonly grid: "uniform" | "graded";
  readonly n: number;
  readonly maxAccelSi: readonly (number | null)[];
  readonly toolCapMPerS: number | null;
  readonly timeS: number;
  readonly sDot: readonly number[];
  readonly limitedBy: { readonly kind: string; readonly joint: number | null; readonly shareOfTime: number };
  readonly shares: readonly { readonly kind: string; readonly joint: number | null; readonly shareOfTime: number }[];
}
interface Fixture {
  readonly arm: { readonly linkLengthsM: readonly [number, number, number] };
  readonly path: {
    readonly p0M: readonly [number, number];
    readonly p1M: readonly [number, number];
    readonly toolAngleRad: number;
    readonly lengthM: number;
  };
  readonly maxSpeedSi: readonly number[];
  readonly cases: readonly FixtureCase[];
  readonly converged: readonly { readonly scenario: string; readonly n: number; readonly timeS: number }[];
}
const fixture = JSON.parse(readFileSync(new URL("./topp-fixture.json", import.meta.url), "utf8")) as Fixture;

const [L1, L2, L3] = fixture.arm.linkLengthsM;
const { p0M: P0, p1M: P1, toolAngleRad: PHI, lengthM: LENGTH } = fixture.path;
const DIR = [(P1[0] - P0[0]) / LENGTH, (P1[1] - P0[1]) / LENGTH] as const;

/** Closed-form inverse kinematics of the planar 3R (elbow q2 > 0) at arc length s along the line: written to out[o…]. */
function ik3r(s: number, out: Float64Array, o: number): void {
  const wx = P0[0] + s * DIR[0] - L3 * Math.cos(PHI),
    wy = P0[1] + s * DIR[1] - L3 * Math.sin(PHI);
  const q2 = Math.acos((wx * wx + wy * wy - L1 * L1 - L2 * L2) / (2 * L1 * L2));
  const q1 = Math.atan2(wy, wx) - Math.atan2(L2 * Math.sin(q2), L1 + L2 * Math.cos(q2));
  out[o] = q1;
  out[o + 1] = q2;
  out[o + 2] = PHI - q1 - q2;
}

/** The stage grids of the generator (its `uniform` and `graded`). */
function grid(kind: "uniform" | "graded", n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => {
    const t = i / (n - 1);
    return kind === "uniform" ? LENGTH * t : LENGTH * (t + (0.15 * Math.sin(2 * Math.PI * t)) / (2 * Math.PI));
  });
}

function input3r(c: Pick<FixtureCase, "grid" | "n" | "maxAccelSi" | "toolCapMPerS">): TimeOptimalInput {
  const s = grid(c.grid, c.n);
  const q = new Float64Array(c.n * 3);
  for (let i = 0; i < c.n; i++) ik3r(s[i]!, q, 3 * i);
  return {
    s,
    q,
    maxSpeedSi: fixture.maxSpeedSi,
    maxAccelSi: c.maxAccelSi.map((a) => a ?? NaN),
    // s is the tool point's arc length: |dp/ds| = 1.
    toolSpeedCap: c.toolCapMPerS
      ? { capMPerS: c.toolCapMPerS, toolSpeedPerUnitS: new Float64Array(c.n).fill(1) }
      : undefined,
  };
}

describe("timeOptimal on a planar 3R straight tool line against the Python reference (topp-fixture.json)", () => {
  /*
   * Same stages, same discretisation: the only difference is that the reference differentiates the inverse
   * kinematics analytically while the module differentiates the samples (three-point formulas, truncation error
   * O(h²) in q′ and q″ on a uniform grid). So |ΔT|/T should shrink like 1/(N − 1)²: the tolerance is
   * 1/(N − 1)² (1e-4 at N = 101, 2.5e-5 at 201, 6.25e-6 at 401), and the test also checks that the difference
   * falls by at least 3× from N = 101 to 201 and 201 to 401 (4× for second order). ṡ per stage: 2/(N − 1)²
   * absolute (ṡ ≈ 1 m/s). The LP solver's own tolerance (HiGHS, 1e-7) is far below.
   */
  const scratch = createTimeOptimalScratch(); // one scratch for every call: reuse must not leak between calls
  for (const scenario of ["joints", "tool-cap-0.6", "j1-accel-assumed"]) {
    it(`${scenario}: times, ṡ profiles and the limiting constraint match at N = 101, 201, 401 and a graded grid`, () => {
      const diffs: number[] = [];
      for (const c of fixture.cases.filter((k) => k.scenario === scenario)) {
        const r = timeOptimal(input3r(c), scratch);
        const label = `${scenario}, ${c.grid} N = ${c.n}`;
        const tol = 1 / (c.n - 1) ** 2;
        expectRelClose(r.timeS, c.timeS, tol, `${label}: time`);
        expectClose(r.sDotProfile, c.sDot, 2 * tol, `${label}: ṡ`);
        if (c.grid === "uniform") diffs.push(Math.abs(r.timeS - c.timeS));
        // The most used limit and its share (classified by each side from its own derivatives): the same limit
        // where the reference's top share leads the next by more than 0.02; every share within 0.02.
        const sorted = [...c.shares].sort((a, b) => b.shareOfTime - a.shareOfTime);
        if (sorted[0]!.shareOfTime - sorted[1]!.shareOfTime > 0.02)
          expect(r.limitedBy, label).toMatchObject({ kind: c.limitedBy.kind, joint: c.limitedBy.joint });
        expect(Math.abs(r.limitedBy!.shareOfTime - sorted[0]!.shareOfTime), label).toBeLessThan(0.02);
        expect(r.accelAssumed, label).toEqual(c.maxAccelSi.map((a) => a === null));
        if (c.toolCapMPerS) expect(r.peakToolSpeedMPerS!, label).toBeLessThanOrEqual(c.toolCapMPerS * (1 + 1e-12));
      }
      expect(diffs[0]! / diffs[1]!, "101 → 201").toBeGreaterThan(3);
      expect(diffs[1]! / diffs[2]!, "201 → 401").toBeGreaterThan(3);
    });
  }

  it("converges to the reference's fine-grid time (N = 3201) as O(h): within 0.6/(N − 1) relative", () => {
    /*
     * The discretisation (constant s̈ over a stage, limits at stage ends) is first order in the stage length: the
     * reference's own N = 101, 201, 401 times lie 0.18/(N − 1) to 0.49/(N − 1) above its N = 3201 time (relative,
     * read from the fixture). Tolerance 0.6/(N − 1): 0.6 % at N = 101, 0.15 % at N = 401; the gap must also halve
     * from one N to the next (≥ 1.6×) and stay positive (the coarse timing is the slower one).
     */
    for (const conv of fixture.converged) {
      const c = fixture.cases.find((k) => k.scenario === conv.scenario)!;
      const gaps = [101, 201, 401].map((n) => {
        const r = timeOptimal(input3r({ ...c, grid: "uniform", n }));
        expectRelClose(r.timeS, conv.timeS, 0.6 / (n - 1), `${conv.scenario} N = ${n} vs N = ${conv.n}`);
        return r.timeS - conv.timeS;
      });
      expect(gaps[2]!).toBeGreaterThan(0);
      expect(gaps[0]! / gaps[1]!).toBeGreaterThan(1.6);
      expect(gaps[1]! / gaps[2]!).toBeGreaterThan(1.6);
    }
  });
});

/**
 * Largest use of the speed and acceleration limits over the timed motion, by finite differences in time: within
 * each stage s(τ) = sᵢ + ṡᵢ·τ + uᵢ·τ²/2 (the module's motion model: constant s̈ over a stage), sampled at `perStage`
 * instants; q by the closed-form inverse kinematics; q̇ ≈ (q(τ+δ) − q(τ−δ))/2δ, q̈ ≈ (q(τ+δ) − 2q(τ) + q(τ−δ))/δ²
 * with δ ≤ 1e-4 s inside the stage (truncation O(δ²) ≈ 1e-8 relative, round-off ≈ 1e-16/δ² = 1e-8).
 */
function limitUse(input: TimeOptimalInput, sDot: Float64Array, accel: readonly number[], perStage = 8) {
  const { s } = input;
  const a = new Float64Array(3),
    b = new Float64Array(3),
    c = new Float64Array(3);
  let speedUse = 0,
    accelUse = 0,
    timeS = 0;
  for (let i = 0; i + 1 < s.length; i++) {
    const h = s[i + 1]! - s[i]!,
      x0 = sDot[i]! ** 2,
      u = (sDot[i + 1]! ** 2 - x0) / (2 * h);
    const dt = (2 * h) / (sDot[i]! + sDot[i + 1]!);
    timeS += dt;
    const delta = Math.min(1e-4, dt / (4 * perStage));
    const at = (tau: number) => s[i]! + sDot[i]! * tau + (u * tau * tau) / 2;
    for (let k = 0; k < perStage; k++) {
      const tau = (dt * (k + 0.5)) / perStage;
      ik3r(at(tau - delta), a, 0);
      ik3r(at(tau), b, 0);
      ik3r(at(tau + delta), c, 0);
      for (let j = 0; j < 3; j++) {
        speedUse = Math.max(speedUse, Math.abs(c[j]! - a[j]!) / (2 * delta) / input.maxSpeedSi[j]!);
        accelUse = Math.max(accelUse, Math.abs(c[j]! - 2 * b[j]! + a[j]!) / (delta * delta) / accel[j]!);
      }
    }
  }
  return { speedUse, accelUse, timeS };
}

describe("timeOptimal on the 3R: finite-difference cross-check of the timed motion against the limits", () => {
  /*
   * The limits hold at the stages exactly; between stages ṡ² is linear in s while q′ and q″ vary, so a speed or an
   * acceleration can exceed its limit by O(h²) (the acceleration limits are imposed at both ends of each stage with
   * that stage's constant s̈; imposing them at the start only would leave an O(h) overshoot). Tolerance:
   * 4/(N − 1)² relative (4e-4 at N = 101, 2.5e-5 at N = 401), and the overshoot must shrink at least 8× from
   * N = 101 to N = 401 (second order gives 16×).
   */
  const accel = [5, 8, 12];
  it("joint speeds and accelerations stay within the limits (+ the stated tolerance); the times add up", () => {
    const over = [101, 201, 401].map((n) => {
      const input = input3r({ grid: "uniform", n, maxAccelSi: accel, toolCapMPerS: null });
      const r = timeOptimal(input);
      const use = limitUse(input, r.sDotProfile, accel);
      expectRelClose(use.timeS, r.timeS, 1e-12, "Σ stage times");
      const tol = 4 / (n - 1) ** 2;
      expect(use.speedUse, `speed use at N = ${n}`).toBeLessThanOrEqual(1 + tol);
      expect(use.accelUse, `acceleration use at N = ${n}`).toBeLessThanOrEqual(1 + tol);
      // The profile is not needlessly slow either: some limit is reached (use ≥ 0.99).
      expect(Math.max(use.speedUse, use.accelUse)).toBeGreaterThan(0.99);
      return [Math.max(use.speedUse - 1, 1e-12), Math.max(use.accelUse - 1, 1e-12)] as const;
    });
    expect(over[0]![0] / over[2]![0], "speed overshoot 101 → 401").toBeGreaterThan(8);
    expect(over[0]![1] / over[2]![1], "acceleration overshoot 101 → 401").toBeGreaterThan(8);
  });
});

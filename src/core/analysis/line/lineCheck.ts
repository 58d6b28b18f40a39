/**
 * Straight-line check: can the arm move its tool centre point (TCP) along a straight line at one constant tool
 * orientation and a commanded speed, and where does it struggle?
 *
 * Method (all SI inside; the result is in mm, deg, mm/s):
 * - The line p(s) = start + s·u (0 ≤ s ≤ length, u a unit vector) is followed by inverse kinematics by
 *   continuation: from an accepted point, a tangent predictor q + (dq/ds)·Δs, then a damped Gauss–Newton corrector
 *   on the TCP pose. The step is adaptive: it is halved while the largest joint change between neighbouring points
 *   exceeds `maxJointStepRad`, or the inverse condition falls by more than half (down to 1/64 of the sample
 *   spacing), and it grows again after easy steps. The corrector never clamps to the joint ranges, so a range
 *   violation is reported where it happens instead of being hidden as "out of reach".
 * - Task: the full pose (position and orientation) whenever the arm can hold it, also with fewer than six driven
 *   joints (SCARA, palletizer, gantry with a C axis: their tool turns about one axis, which holds "down"); the
 *   tool axis only (rotation about it free) for an arm with fewer than six joints that cannot hold the full
 *   orientation at the start. `orientationHeld` says which.
 * - Rates: q̇ = B·v with v = u·speed at zero angular velocity (B: the linear block of J⁻¹, lineRatesInto in
 *   speed.ts; the minimum-norm rates for redundant arms; least squares with an exactness check for arms with fewer
 *   than six joints). rateRatioᵢ = |q̇ᵢ| / q̇maxᵢ. The largest constant speed the line allows is
 *   commanded / max over the line and the joints of rateRatioᵢ (the ratios scale with the speed, so the figure does
 *   not depend on the commanded speed). The rule (verdict.ts): a line the arm cannot follow has no feasible
 *   speed. It is 0, and the commanded speed is not feasible, unless a start branch follows the whole line within
 *   reach, within every joint range and without a jump (no continuous solution); also 0 at a pose where the motion
 *   needs unbounded rates. Each start branch says why it does not follow (`reason`, `atFraction`, `joint`). A
 *   continuous front ↔ back change (the wrist centre passing axis 1, the arm reaching behind it with finite rates)
 *   is labelled `passesAxis1`, not a problem. Where J cannot be inverted but the
 *   motion is still possible (a line crossing a singular pose exactly), the minimum-norm rates are used.
 * - Every accepted continuation point (the samples and the adaptive steps between them) counts for the bottleneck,
 *   the nearest singularity, branch changes and range violations; the bottleneck and the nearest singularity are
 *   then refined by a golden-section search between the neighbouring points, so a narrow peak between samples is
 *   not missed. `samples` and `speedProfile` are reported at the evenly spaced sample fractions only.
 * - Branch changes: the branch name (branches.ts: front/back, elbow up/down, wrist +/−) differs between
 *   neighbouring points, or a joint changes by more than `jumpRad` between points only `minStepM` apart (a jump:
 *   no continuous solution nearby). `continuous` tells which. A line that crosses a wrist singularity exactly has
 *   q5 changing sign: the wrist changes branch without a jump ("wrist flip", continuous).
 * - Out of reach: the corrector fails even at the minimum step; the interval is closed where a solution is found
 *   again (searched at the following samples from the last solution and from seeded starts, then located by
 *   continuation backwards).
 *
 * Default start branch ("best run"): every distinct IK solution at the start (one per branch name, inside the
 * joint ranges when it can be, the one nearest the zero pose for each name) is followed along the whole line, and
 * the run kept is the fastest of those that follow the line (then the start nearest the arm's zero pose); when
 * none does, the one with the fewest problems (joint jumps, range violations, out-of-reach intervals), then the
 * highest speed its joint rates allow, then the start nearest the zero pose. Why: Armdex answers whether the arm can do this
 * line, and an integrator teaches the start point in whichever posture works, so each arm is credited with its
 * best posture instead of an arbitrary one; the other starts are listed (`startBranches`) and `startJointsSi`
 * picks the solution nearest given joints instead.
 *
 * @see Siciliano et al., Robotics: Modelling, Planning and Control, §3.5 (inverse differential kinematics) and
 *   §3.7 (inverse kinematics algorithms) [from memory]; Allgower & Georg, Introduction to Numerical Continuation
 *   Methods, ch. 2 (predictor–corrector) [from memory]; Kiefer, Proc. AMS 4(3), 1953 (golden-section search)
 *   [from memory]; DOMAIN.md "Speed" (guaranteed straight-line speed) and "Singularities"
 */
import type { Chain } from "../../kinematics/chain";
import { createContext, type Context, type Point } from "./context";
import { runLine } from "./continuation";
import { lineReport, type StartRun } from "./report";
import { discover, distance2 } from "./solutions";
import { feasibleSpeed, rateLimitedSpeed, runVerdict } from "./verdict";
import { DEFAULT_LINE_CHECK, type LineCheckInput, type LineCheckOptions, type LineCheckResult } from "./types";

/**
 * Checks one straight TCP line at constant tool orientation and commanded speed (see the module comment).
 * @param chain compiled chain (SI)
 * @param input line in the base frame (m), orientation, speed (m/s), tool offset (m), optional start joints
 * @returns plain data in mm, deg (mm for prismatic joints), mm/s; key names are the contract of `armdex line`
 * @throws RangeError on invalid input (non-finite or zero-length line, speed ≤ 0, a rotation that is not one,
 *   wrong joint count, samples < 2)
 * @example planar 3R (a = 0.5, 0.4, 0.1 m; q̇max = 90, 120, 180 °/s), line (0.3, 0.5, 0) → (0.8, −0.1, 0) m at tool
 *   angle 0.3 rad (rpyToolRotation(0, 0, 0.3)), 0.5 m/s, elbow-positive start: feasibleConstantSpeedMmPerS ≈ 697.6,
 *   bottleneck j1 at fraction ≈ 0.41 (the test in test/core/analysis/line/lineCheck.test.ts checks this against the closed
 *   form minᵢ q̇maxᵢ / |(J⁻¹u)ᵢ| minimised over the line)
 */
export function lineCheck(
  chain: Chain,
  input: LineCheckInput,
  options: Partial<LineCheckOptions> = {},
): LineCheckResult {
  const o: LineCheckOptions = { ...DEFAULT_LINE_CHECK, ...options };
  checkInput(chain, input, o);
  const startJoints = input.startJointsSi;
  const ctx = createContext(chain, input, o);
  if (!(ctx.lengthM > 0)) throw new RangeError("invalid line: start and end are the same point");
  const reference = startJoints ? Float64Array.from(startJoints) : null;
  const { candidates, k0 } = startSolutions(ctx, reference);
  const runs: StartRun[] = [];
  for (const c of candidates.slice(0, o.maxBranches)) {
    const run = runLine(ctx, c, k0);
    runs.push({
      run,
      followed: runVerdict(ctx, run) === null,
      feasible: feasibleSpeed(ctx, run),
      rateLimited: rateLimitedSpeed(run),
      problems: run.jumps + run.violations.length + run.gaps.length,
      d: distance2(ctx, c.q, null),
    });
  }
  return lineReport(ctx, input.speedMPerS, runs, bestRun(runs), reference !== null);
}

/** Throws RangeError on invalid input or options (see lineCheck). */
function checkInput(chain: Chain, input: LineCheckInput, o: LineCheckOptions): void {
  const m = chain.drivenCount;
  const finite3 = (v: ArrayLike<number> | undefined) =>
    !!v && v.length === 3 && [0, 1, 2].every((i) => Number.isFinite(v[i]));
  if (!finite3(input.startM)) throw new RangeError(`invalid startM: ${Array.from(input.startM ?? []).join(",")}`);
  if (!finite3(input.endM)) throw new RangeError(`invalid endM: ${Array.from(input.endM ?? []).join(",")}`);
  if (input.toolInFlangeM !== undefined && !finite3(input.toolInFlangeM))
    throw new RangeError(`invalid toolInFlangeM: ${Array.from(input.toolInFlangeM).join(",")}`);
  if (!(input.speedMPerS > 0) || !Number.isFinite(input.speedMPerS))
    throw new RangeError(`invalid speedMPerS: ${input.speedMPerS}`);
  if (!Number.isInteger(o.samples) || o.samples < 2) throw new RangeError(`invalid samples: ${o.samples}`);
  if (!(o.minStepM > 0) || !(o.maxJointStepRad > 0) || !(o.jumpRad > o.maxJointStepRad))
    throw new RangeError(`invalid step options: ${o.minStepM}, ${o.maxJointStepRad}, ${o.jumpRad}`);
  const r = input.baseFromToolRotation;
  if (r.length !== 9 && r.length !== 16) throw new RangeError(`invalid rotation: ${r.length} values, expected 9 or 16`);
  {
    const k = r.length === 16 ? 4 : 3;
    for (let a = 0; a < 3; a++) {
      for (let b = 0; b < 3; b++) {
        let dot = 0;
        for (let c = 0; c < 3; c++) dot += r[c * k + a]! * r[c * k + b]!;
        if (!(Math.abs(dot - (a === b ? 1 : 0)) <= 1e-6)) throw new RangeError("invalid rotation: not orthonormal");
      }
    }
    const det =
      r[0]! * (r[k + 1]! * r[2 * k + 2]! - r[k + 2]! * r[2 * k + 1]!) -
      r[1]! * (r[k]! * r[2 * k + 2]! - r[k + 2]! * r[2 * k]!) +
      r[2]! * (r[k]! * r[2 * k + 1]! - r[k + 1]! * r[2 * k]!);
    if (!(det > 0)) throw new RangeError("invalid rotation: a reflection");
  }
  const startJoints = input.startJointsSi;
  if (startJoints !== undefined && (startJoints.length !== m || !Array.from(startJoints).every(Number.isFinite))) {
    throw new RangeError(`invalid startJointsSi: ${Array.from(startJoints).join(",")}, expected ${m} values`);
  }
}

/**
 * Start solutions at the first reachable sample (the full pose first, the tool axis for chains with fewer than six
 * joints; sets ctx.rows), and that sample's index. With `reference`, only the solution nearest to it.
 */
function startSolutions(ctx: Context, reference: Float64Array | null): { candidates: Point[]; k0: number } {
  const n = ctx.options.samples,
    L = ctx.lengthM,
    m = ctx.m;
  const sampleS = (k: number) => (k === n - 1 ? L : (k * L) / (n - 1));
  const extra = reference ? [reference] : [];
  let candidates: Point[] = [];
  let k0 = 0;
  const modes = m < 6 ? [6, 5] : [6];
  for (const rows of modes) {
    ctx.rows = rows;
    for (k0 = 0; k0 < n; k0++) {
      candidates = discover(ctx, sampleS(k0), extra, reference);
      if (candidates.length > 0) break;
    }
    if (candidates.length > 0) break;
  }
  if (candidates.length === 0) ctx.rows = 6;
  if (reference && candidates.length > 0) {
    let best = candidates[0]!;
    for (const c of candidates) if (distance2(ctx, c.q, reference) < distance2(ctx, best.q, reference)) best = c;
    candidates = [best];
  }
  return { candidates, k0 };
}

/**
 * The run reported: the fastest of the runs that follow the line (nearest the zero pose among equals); when none
 * does, the one with the fewest problems (jumps, range violations, out-of-reach intervals), then the highest speed
 * its joint rates allow, then the start nearest the zero pose.
 */
function bestRun(runs: readonly StartRun[]) {
  const ranked = [...runs].sort((a, b) => {
    if (a.followed !== b.followed) return a.followed ? -1 : 1;
    if (a.problems !== b.problems) return a.problems - b.problems;
    const fa = a.rateLimited,
      fb = b.rateLimited;
    const close = Number.isFinite(fa) && Number.isFinite(fb) && Math.abs(fa - fb) <= 1e-9 * Math.max(fa, fb);
    if (fa !== fb && !close) return fb > fa ? 1 : -1;
    return a.d - b.d;
  });
  return ranked[0]?.run ?? null;
}

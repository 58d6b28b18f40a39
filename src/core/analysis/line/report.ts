/**
 * The result of a straight-line check in mm, deg (mm for prismatic joints) and mm/s, built from the runs followed
 * (SI): start branches, samples and the speed profile of the chosen run, bottleneck, nearest singularity, branch
 * changes, out-of-reach intervals and joint range violations.
 */
import type { Chain } from "../../kinematics/chain";
import { mToMm, radToDeg } from "../../units";
import { branchName } from "../../measures/branches";
import { SINGULAR_INVERSE_CONDITION } from "../../measures/singularity";
import { KINDS, type Context } from "./context";
import type { Event, Run } from "./record";
import { positionMm } from "./solutions";
import { feasibleSpeed, passesAxis1, runVerdict } from "./verdict";
import type {
  LineBranchChange,
  LineCheckResult,
  LineJointLimitViolation,
  LineOutOfReach,
  LineSample,
  LineStartBranch,
} from "./types";

/** One start solution followed over the line, with the figures that rank it. */
export interface StartRun {
  readonly run: Run;
  /** True when it follows the whole line (verdict.ts runVerdict null). */
  readonly followed: boolean;
  /** Feasible constant speed, m/s: 0 unless followed (Infinity when no joint with a speed limit moves). */
  readonly feasible: number;
  /** Speed its joint rates allow, m/s, ignoring range violations (verdict.ts rateLimitedSpeed); ranks the runs
   * that do not follow the line. */
  readonly rateLimited: number;
  /** Joint jumps plus range violations plus out-of-reach intervals. */
  readonly problems: number;
  /** Squared distance of the start joints from the zero pose (prismatic joints in characteristic lengths). */
  readonly d: number;
}

/** Joint names, units and the SI → output conversion of the driven joints. */
interface OutputJoints {
  readonly names: string[];
  readonly units: ("deg" | "mm")[];
  readonly toOut: (i: number, v: number) => number;
}

function outputJoints(chain: Chain): OutputJoints {
  const names = Array.from(chain.drivenJoint, (k) => chain.jointNames[k]!);
  const prismatic = Array.from(chain.drivenJoint, (k) => chain.isPrismatic[k] === 1);
  const units = prismatic.map((p) => (p ? "mm" : "deg") as "deg" | "mm");
  const toOut = (i: number, v: number) => (prismatic[i] ? mToMm(v) : radToDeg(v));
  return { names, units, toOut };
}

/**
 * Builds the result of lineCheck from the runs followed and the chosen one.
 * @param speed commanded speed, m/s
 * @param byReference true when the start was picked nearest given start joints
 */
export function lineReport(
  ctx: Context,
  speed: number,
  runs: readonly StartRun[],
  chosen: Run | null,
  byReference: boolean,
): LineCheckResult {
  const chain = ctx.chain,
    L = ctx.lengthM;
  const out = outputJoints(chain);
  const { names, units, toOut } = out;
  const codeName = (code: number) => branchName(ctx.frame, code);
  const summary = (x: StartRun): LineStartBranch => {
    const verdict = runVerdict(ctx, x.run);
    return {
      branch: codeName(x.run.startCode),
      startJointsDeg: Array.from(x.run.startQ, (v, i) => toOut(i, v)),
      feasibleConstantSpeedMmPerS: Number.isFinite(x.feasible) ? mToMm(x.feasible) : null,
      jumps: x.run.jumps,
      jointLimitViolations: x.run.violations.length,
      chosen: x.run === chosen,
      followed: verdict === null,
      reason: verdict ? verdict.reason : null,
      atFraction: verdict ? verdict.s / L : null,
      joint: verdict && verdict.joint >= 0 ? names[verdict.joint]! : null,
    };
  };
  const startBranches = runs.map(summary);
  const startBranch = startBranches.find((b) => b.chosen) ?? null;
  const { samples, speedProfile } = sampleReport(ctx, speed, chosen, out);
  const feasible = chosen ? feasibleSpeed(ctx, chosen) : 0;
  const followed = chosen !== null && runVerdict(ctx, chosen) === null;
  const nearestSingularity = nearestSingularityOf(ctx, chosen);
  const branchChanges: LineBranchChange[] = chosen
    ? chosen.events.map((e) => {
        const from = codeName(e.fromCode),
          to = codeName(e.toCode);
        const sM = (e.fromS + e.toS) / 2;
        return {
          fraction: sM / L,
          positionMm: positionMm(ctx, sM),
          from,
          to,
          kind: changeKind(ctx, e),
          continuous: e.continuous,
          acrossGap: e.acrossGap,
          jointChangeDeg: Array.from(e.dq, (v, i) => toOut(i, v)),
          passesAxis1: passesAxis1(e.fromCode, e.toCode, e.continuous),
          note: passesAxis1(e.fromCode, e.toCode, e.continuous)
            ? "passes axis 1: the arm reaches behind axis 1 continuously (finite joint rates); not a posture change"
            : null,
        };
      })
    : [];
  const outOfReach: LineOutOfReach[] = chosen
    ? chosen.gaps.map((g) => ({
        fromFraction: g.fromS / L,
        toFraction: g.toS / L,
        fromPositionMm: positionMm(ctx, g.fromS),
        toPositionMm: positionMm(ctx, g.toS),
      }))
    : [{ fromFraction: 0, toFraction: 1, fromPositionMm: positionMm(ctx, 0), toPositionMm: positionMm(ctx, L) }];
  const jointLimitViolations: LineJointLimitViolation[] = chosen
    ? chosen.violations.map((v) => ({
        joint: names[v.joint]!,
        jointIndex: v.joint,
        bound: v.upper ? "upper" : "lower",
        limitValue: toOut(v.joint, v.upper ? chain.upperSi[v.joint]! : chain.lowerSi[v.joint]!),
        extremeValue: toOut(v.joint, v.extreme),
        unit: units[v.joint]!,
        fromFraction: v.fromS / L,
        toFraction: v.toS / L,
        fromPositionMm: positionMm(ctx, v.fromS),
        toPositionMm: positionMm(ctx, v.toS),
      }))
    : [];
  return {
    lengthMm: mToMm(L),
    speedMmPerS: mToMm(speed),
    direction: Array.from(ctx.dir),
    orientationHeld: ctx.rows === 6 ? "full" : "tool axis",
    jointNames: names,
    jointUnits: units,
    startRule: byReference ? "nearest start joints" : "best run",
    startBranch,
    startBranches,
    followed,
    feasibleConstantSpeedMmPerS: Number.isFinite(feasible) ? mToMm(feasible) : null,
    commandedSpeedFeasible: followed && feasible >= speed * (1 - 1e-12),
    passesAxis1: branchChanges.some((c) => c.passesAxis1),
    bottleneck: bottleneckOf(ctx, speed, chosen, names),
    nearestSingularity,
    branchChanges,
    outOfReach,
    jointLimitViolations,
    jointsWithoutSpeedLimit: names.filter((_, i) => !(chain.maxSpeedSi[i]! > 0)),
    speedProfile,
    samples,
    evaluatedPoints: chosen ? chosen.evaluated : 0,
  };
}

/** Samples and the speed profile of the chosen run at the evenly spaced sample fractions. */
function sampleReport(
  ctx: Context,
  speed: number,
  chosen: Run | null,
  out: OutputJoints,
): { samples: LineSample[]; speedProfile: LineCheckResult["speedProfile"] } {
  const chain = ctx.chain,
    m = ctx.m,
    n = ctx.options.samples,
    L = ctx.lengthM,
    toOut = out.toOut;
  const sampleS = (k: number) => (k === n - 1 ? L : (k * L) / (n - 1));
  const samples: LineSample[] = [];
  const speedProfile: { fraction: number; speedMmPerS: number | null }[] = [];
  for (let k = 0; k < n; k++) {
    const s = sampleS(k),
      fraction = s / L;
    const ok = chosen !== null && chosen.samplesOk[k] === 1;
    if (!ok || !chosen) {
      samples.push({
        fraction,
        positionMm: positionMm(ctx, s),
        reachable: false,
        branch: null,
        jointsDeg: null,
        jointRatesDegPerS: null,
        rateRatios: null,
        localSpeedMmPerS: 0,
        sigmaMinScaled: null,
        inverseCondition: null,
        singularityKind: null,
      });
      speedProfile.push({ fraction, speedMmPerS: 0 });
      continue;
    }
    const q = Array.from(chosen.sampleQ.subarray(k * m, k * m + m), (v, i) => toOut(i, v));
    const ratesOk = chosen.samplesRatesOk[k] === 1;
    const rates = ratesOk
      ? Array.from(chosen.sampleRate.subarray(k * m, k * m + m), (v, i) => toOut(i, v * speed))
      : null;
    const ratios = ratesOk
      ? Array.from(chosen.sampleRate.subarray(k * m, k * m + m), (v, i) =>
          chain.maxSpeedSi[i]! > 0 ? (Math.abs(v) * speed) / chain.maxSpeedSi[i]! : null,
        )
      : null;
    let maxRatio = 0;
    if (ratios) for (const x of ratios) if (x !== null && x > maxRatio) maxRatio = x;
    const local = !ratesOk ? 0 : maxRatio > 0 ? mToMm(speed / maxRatio) : null;
    samples.push({
      fraction,
      positionMm: positionMm(ctx, s),
      reachable: true,
      branch: branchName(ctx.frame, chosen.sampleCode[k]!),
      jointsDeg: q,
      jointRatesDegPerS: rates,
      rateRatios: ratios,
      localSpeedMmPerS: local,
      sigmaMinScaled: chosen.sampleSigma[k]!,
      inverseCondition: chosen.sampleInv[k]!,
      singularityKind: KINDS[chosen.sampleKind[k]!]!,
    });
    speedProfile.push({ fraction, speedMmPerS: local });
  }
  return { samples, speedProfile };
}

/** What limits the chosen run's speed: the first out-of-reach interval, the first jump, or the worst rate ratio. */
function bottleneckOf(
  ctx: Context,
  speed: number,
  chosen: Run | null,
  names: readonly string[],
): LineCheckResult["bottleneck"] {
  const L = ctx.lengthM,
    m = ctx.m;
  if (chosen && chosen.gaps.length > 0) {
    const g = chosen.gaps[0]!;
    const s = g.fromS === 0 ? g.toS : g.fromS;
    return {
      joint: null,
      jointIndex: null,
      positionMm: positionMm(ctx, s),
      fraction: s / L,
      rateRatio: null,
      reason: "out of reach",
    };
  } else if (chosen && chosen.jumps > 0) {
    const e = chosen.events.find((x) => !x.continuous && !x.acrossGap)!;
    let arg = 0;
    for (let i = 1; i < m; i++) if (Math.abs(e.dq[i]!) > Math.abs(e.dq[arg]!)) arg = i;
    const sM = (e.fromS + e.toS) / 2;
    return {
      joint: names[arg]!,
      jointIndex: arg,
      positionMm: positionMm(ctx, sM),
      fraction: sM / L,
      rateRatio: null,
      reason: "jump",
    };
  } else if (chosen && chosen.violations.length > 0) {
    const v = runVerdict(ctx, chosen)!;
    return {
      joint: names[v.joint]!,
      jointIndex: v.joint,
      positionMm: positionMm(ctx, v.s),
      fraction: v.s / L,
      rateRatio: null,
      reason: "joint limit",
    };
  } else if (chosen && chosen.anyPoint) {
    const w = chosen.worst;
    const unbounded = w.maxRatio === Infinity;
    return {
      joint: w.argJoint >= 0 ? names[w.argJoint]! : null,
      jointIndex: w.argJoint >= 0 ? w.argJoint : null,
      positionMm: positionMm(ctx, w.s),
      fraction: w.s / L,
      rateRatio: unbounded ? null : w.maxRatio * speed,
      reason: unbounded ? "singular" : "joint rate",
    };
  }
  return null;
}

function nearestSingularityOf(ctx: Context, chosen: Run | null): LineCheckResult["nearestSingularity"] {
  if (!chosen || !chosen.anyPoint) return null;
  const p = chosen.nearest;
  return {
    kind: KINDS[p.kind]!,
    positionMm: positionMm(ctx, p.s),
    fraction: p.s / ctx.lengthM,
    inverseCondition: p.inverseCondition,
    sigmaMinScaled: p.sigmaMin,
    singular: p.inverseCondition < SINGULAR_INVERSE_CONDITION,
  };
}

/** Kind of a branch change: from the parts of the branch name that changed, or from the joints that jumped. */
function changeKind(ctx: Context, e: Event): string {
  const bits = e.fromCode ^ e.toCode;
  if (bits === 4) return "wrist flip";
  if (bits === 2) return "elbow";
  if (bits === 1) return "shoulder";
  if (bits !== 0) return "multiple";
  // Same name, joints jumped: which joints moved by more than the jump threshold.
  let wrist = false,
    axis1 = false,
    arm = false;
  for (let i = 0; i < ctx.m; i++) {
    if (Math.abs(e.dq[i]!) <= ctx.options.jumpRad) continue;
    if (i === ctx.roles.axis1) axis1 = true;
    else if (ctx.roles.wrist.includes(i)) wrist = true;
    else arm = true;
  }
  if (wrist && !axis1 && !arm) return "wrist flip";
  if (axis1 && !arm) return "shoulder";
  if (arm) return "elbow";
  return "jump";
}

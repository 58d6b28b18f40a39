/**
 * The record of one run (the line followed from one start solution): samples, branch changes and jumps, joint
 * range violations, the worst rate ratio and the smallest inverse condition with their neighbouring positions.
 */
import { copyPoint, createPoint, type Context, type Point } from "./context";

export interface Event {
  readonly fromS: number;
  toS: number;
  readonly fromCode: number;
  toCode: number;
  readonly continuous: boolean;
  readonly acrossGap: boolean;
  /** Joints before the change, and the change (after − before). */
  readonly fromQ: Float64Array;
  readonly dq: Float64Array;
}

export interface Violation {
  readonly joint: number;
  readonly upper: boolean;
  readonly fromS: number;
  toS: number;
  extreme: number;
}

export interface Run {
  readonly samplesOk: Uint8Array;
  readonly samplesRatesOk: Uint8Array;
  readonly sampleQ: Float64Array;
  readonly sampleRate: Float64Array;
  readonly sampleInv: Float64Array;
  readonly sampleSigma: Float64Array;
  readonly sampleKind: Int8Array;
  readonly sampleCode: Int16Array;
  readonly events: Event[];
  readonly gaps: { fromS: number; toS: number }[];
  readonly violations: Violation[];
  readonly open: (Violation | null)[];
  readonly startQ: Float64Array;
  startCode: number;
  /** Worst rate ratio and smallest inverse condition, with their neighbouring line positions. */
  readonly worst: Point;
  worstLo: number;
  worstHi: number;
  worstPending: boolean;
  readonly nearest: Point;
  nearestLo: number;
  nearestHi: number;
  nearestPending: boolean;
  anyPoint: boolean;
  evaluated: number;
  /** Current continuation step, m. */
  h: number;
  jumps: number;
}

export function createRun(ctx: Context): Run {
  const n = ctx.options.samples,
    m = ctx.m;
  return {
    samplesOk: new Uint8Array(n),
    samplesRatesOk: new Uint8Array(n),
    sampleQ: new Float64Array(n * m),
    sampleRate: new Float64Array(n * m),
    sampleInv: new Float64Array(n),
    sampleSigma: new Float64Array(n),
    sampleKind: new Int8Array(n),
    sampleCode: new Int16Array(n),
    events: [],
    gaps: [],
    violations: [],
    open: new Array<Violation | null>(m).fill(null),
    startQ: new Float64Array(m),
    startCode: 0,
    worst: createPoint(m),
    worstLo: 0,
    worstHi: 0,
    worstPending: false,
    nearest: createPoint(m),
    nearestLo: 0,
    nearestHi: 0,
    nearestPending: false,
    anyPoint: false,
    evaluated: 0,
    h: ctx.spacingM,
    jumps: 0,
  };
}

export function storeSample(ctx: Context, run: Run, k: number, p: Point): void {
  const m = ctx.m;
  run.samplesOk[k] = 1;
  run.samplesRatesOk[k] = p.ratesOk ? 1 : 0;
  run.sampleQ.set(p.q, k * m);
  run.sampleRate.set(p.rate, k * m);
  run.sampleInv[k] = p.inverseCondition;
  run.sampleSigma[k] = p.sigmaMin;
  run.sampleKind[k] = p.kind;
  run.sampleCode[k] = p.code;
}

/** Range bookkeeping of one accepted point (prev → p; prev null at a (re)start). */
function trackLimits(ctx: Context, run: Run, prev: Point | null, p: Point): void {
  const chain = ctx.chain;
  for (let i = 0; i < ctx.m; i++) {
    const lo = chain.lowerSi[i]!,
      hi = chain.upperSi[i]!,
      v = p.q[i]!;
    const upper = v > hi + 1e-9,
      lower = v < lo - 1e-9;
    const open = run.open[i]!;
    if (open) {
      if ((open.upper && upper) || (!open.upper && lower)) {
        open.toS = p.s;
        if (open.upper ? v > open.extreme : v < open.extreme) open.extreme = v;
        continue;
      }
      // Leaves the range violation: the crossing by linear interpolation between the two points.
      const bound = open.upper ? hi : lo;
      const pv = prev ? prev.q[i]! : v;
      open.toS = prev && pv !== v ? prev.s + ((bound - pv) / (v - pv)) * (p.s - prev.s) : p.s;
      run.open[i] = null;
    }
    if (upper || lower) {
      const bound = upper ? hi : lo;
      const pv = prev ? prev.q[i]! : v;
      const fromS = prev && pv !== v ? prev.s + ((bound - pv) / (v - pv)) * (p.s - prev.s) : p.s;
      const viol: Violation = { joint: i, upper, fromS, toS: p.s, extreme: v };
      run.violations.push(viol);
      run.open[i] = viol;
    }
  }
}

export function closeLimits(run: Run): void {
  run.open.fill(null);
}

/** Aggregates of one accepted point; prev is the previous accepted point (null at a start or after a gap). */
export function accept(ctx: Context, run: Run, prev: Point | null, p: Point, jump: boolean, acrossGap: boolean): void {
  run.evaluated++;
  if (run.worstPending) {
    run.worstHi = jump || acrossGap ? run.worst.s : p.s;
    run.worstPending = false;
  }
  if (run.nearestPending) {
    run.nearestHi = jump || acrossGap ? run.nearest.s : p.s;
    run.nearestPending = false;
  }
  if (!run.anyPoint || p.maxRatio > run.worst.maxRatio) {
    copyPoint(run.worst, p);
    run.worstLo = prev && !jump && !acrossGap ? prev.s : p.s;
    run.worstHi = p.s;
    run.worstPending = true;
  }
  if (!run.anyPoint || p.inverseCondition < run.nearest.inverseCondition) {
    copyPoint(run.nearest, p);
    run.nearestLo = prev && !jump && !acrossGap ? prev.s : p.s;
    run.nearestHi = p.s;
    run.nearestPending = true;
  }
  run.anyPoint = true;
  if (prev && (jump || prev.code !== p.code)) {
    const last = run.events[run.events.length - 1];
    if (
      jump &&
      last &&
      !last.continuous &&
      !last.acrossGap &&
      !acrossGap &&
      Math.abs(prev.s - last.toS) <= 16 * ctx.options.minStepM
    ) {
      // Jumps a few minimum steps apart are one flip (a joint turning by more than jumpRad in several steps).
      last.toS = p.s;
      last.toCode = p.code;
      for (let i = 0; i < ctx.m; i++) last.dq[i] = p.q[i]! - last.fromQ[i]!;
    } else {
      // An event is rare: allocating here is outside the per-step path.
      const dq = new Float64Array(ctx.m);
      for (let i = 0; i < ctx.m; i++) dq[i] = p.q[i]! - prev.q[i]!;
      run.events.push({
        fromS: prev.s,
        toS: p.s,
        fromCode: prev.code,
        toCode: p.code,
        continuous: !jump,
        acrossGap,
        fromQ: Float64Array.from(prev.q),
        dq,
      });
      if (jump) run.jumps++;
    }
  }
  trackLimits(ctx, run, acrossGap ? null : prev, p);
}

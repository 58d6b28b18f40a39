/**
 * Continuation along the line: the adaptive predictor–corrector walk between positions, the run of one start
 * solution over the whole line (re-entry after out-of-reach intervals), the golden-section refinement of the
 * bottleneck and the nearest singularity.
 * @see Allgower & Georg, Introduction to Numerical Continuation Methods, ch. 2 (predictor–corrector) [from memory];
 *   Kiefer, Proc. AMS 4(3), 1953 (golden-section search) [from memory]
 */
import {
  CONTINUATION_ITERATIONS,
  copyPoint,
  correct,
  createPoint,
  GOLDEN_ITERATIONS,
  type Context,
  type Point,
} from "./context";
import { evaluate, jointChange } from "./rates";
import { accept, closeLimits, createRun, storeSample, type Run } from "./record";
import { nearestSolution, solveAt } from "./solutions";

type WalkStatus = "done" | "lost";

/**
 * Continuation from `cur` (a converged, evaluated point; moved along in place) to line position sTo, forwards or
 * backwards. With `record`, every accepted point goes into the run's aggregates. "lost": the corrector failed at
 * the minimum step; `cur` is then the last reachable point.
 */
function walk(ctx: Context, run: Run, cur: Point, sTo: number, record: boolean): WalkStatus {
  const o = ctx.options,
    next = ctx.trial,
    m = ctx.m;
  const sign = sTo >= cur.s ? 1 : -1;
  let h = Math.min(run.h, ctx.spacingM);
  while (cur.s !== sTo) {
    const remaining = Math.abs(sTo - cur.s);
    const step = Math.min(h, remaining);
    const sNext = step >= remaining ? sTo : cur.s + sign * step;
    // Tangent predictor (skipped when it would move a joint by more than a few allowed steps).
    let predicted = 0;
    const ds = sNext - cur.s;
    if (cur.ratesOk) for (let i = 0; i < m; i++) predicted = Math.max(predicted, Math.abs(cur.rate[i]! * ds));
    const usePredictor = cur.ratesOk && predicted <= 4 * o.maxJointStepRad;
    for (let i = 0; i < m; i++) next.q[i] = cur.q[i]! + (usePredictor ? cur.rate[i]! * ds : 0);
    const ok = correct(ctx, next.q, sNext, CONTINUATION_ITERATIONS);
    let change = Infinity,
      conditionDrop = false;
    if (ok) {
      next.s = sNext;
      evaluate(ctx, next);
      change = jointChange(ctx, cur.q, next.q);
      conditionDrop = next.inverseCondition < 0.5 * cur.inverseCondition && step > ctx.spacingM / 64;
    }
    const atMin = step <= o.minStepM;
    if (!(ok && change <= o.maxJointStepRad && !conditionDrop) && !atMin) {
      h = Math.max(step / 2, o.minStepM);
      continue;
    }
    if (!ok) {
      // At the minimum step: from the last joints with more iterations, then from seeded starts (the nearest
      // solution to the last joints). Only when nothing is found is the point out of reach.
      const c = nearestSolution(ctx, sNext, cur.q);
      if (!c) {
        run.h = h;
        return "lost";
      }
      copyPoint(next, c);
      change = jointChange(ctx, cur.q, next.q);
    } else if (change > o.jumpRad) {
      // A jump at the minimum step: make sure no solution nearer the last joints exists.
      const c = nearestSolution(ctx, sNext, cur.q);
      if (c && jointChange(ctx, cur.q, c.q) < change) {
        copyPoint(next, c);
        change = jointChange(ctx, cur.q, next.q);
      }
    }
    const jump = change > o.jumpRad;
    if (record) accept(ctx, run, cur, next, jump, false);
    copyPoint(cur, next);
    if (change < o.maxJointStepRad / 2 && !conditionDrop) h = Math.min(2 * h, ctx.spacingM);
  }
  run.h = h;
  return "done";
}

/** Golden-section search of the objective over [lo, hi] near point p (refined in place when better). */
function refine(ctx: Context, p: Point, lo: number, hi: number, objective: (pt: Point) => number): void {
  if (!(hi > lo) || !Number.isFinite(objective(p))) return;
  const probe = ctx.probe,
    best = ctx.trial,
    base = p.s;
  copyPoint(best, p);
  let bestValue = objective(p);
  const at = (s: number): number => {
    for (let i = 0; i < ctx.m; i++) probe.q[i] = p.q[i]! + (p.ratesOk ? p.rate[i]! * (s - base) : 0);
    if (!solveAt(ctx, probe, s, CONTINUATION_ITERATIONS)) return -Infinity;
    if (jointChange(ctx, p.q, probe.q) > ctx.options.jumpRad || probe.code !== p.code) return -Infinity;
    const v = objective(probe);
    if (v > bestValue) {
      bestValue = v;
      copyPoint(best, probe);
    }
    return v;
  };
  const phi = (Math.sqrt(5) - 1) / 2;
  let a = lo,
    b = hi;
  let c = b - phi * (b - a),
    d = a + phi * (b - a);
  let fc = at(c),
    fd = at(d);
  for (let it = 0; it < GOLDEN_ITERATIONS; it++) {
    if (fc >= fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - phi * (b - a);
      fc = at(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + phi * (b - a);
      fd = at(d);
    }
  }
  if (bestValue > objective(p)) copyPoint(p, best);
}

/** Follows the whole line from a start solution found at sample k0 (earlier samples out of reach). */
export function runLine(ctx: Context, start: Point, k0: number): Run {
  const run = createRun(ctx),
    n = ctx.options.samples,
    L = ctx.lengthM;
  const sampleS = (k: number) => (k === n - 1 ? L : (k * L) / (n - 1));
  const cur = createPoint(ctx.m);
  copyPoint(cur, start);
  run.startQ.set(start.q);
  run.startCode = start.code;
  if (k0 > 0) {
    // Out of reach from the line's start: locate the boundary backwards from the first reachable sample.
    const status = walk(ctx, run, cur, 0, false);
    if (status === "lost") run.gaps.push({ fromS: 0, toS: cur.s });
  }
  accept(ctx, run, null, cur, false, false);
  let k = 0;
  while (k < n && sampleS(k) < cur.s) k++;
  if (k < n && sampleS(k) === cur.s) storeSample(ctx, run, k++, cur);
  const last = createPoint(ctx.m);
  let previousGapFrom = NaN;
  while (k < n) {
    const sk = sampleS(k);
    if (walk(ctx, run, cur, sk, true) === "done") {
      storeSample(ctx, run, k++, cur);
      continue;
    }
    // Lost at cur: search for a solution again at the following samples.
    const gapFrom = cur.s;
    copyPoint(last, cur);
    closeLimits(run);
    let found: Point | null = null;
    for (let k2 = k; k2 < n && !found; k2++) found = nearestSolution(ctx, sampleS(k2), last.q);
    if (!found) {
      run.gaps.push({ fromS: gapFrom, toS: L });
      break;
    }
    // Back from the solution found towards the point lost: the re-entry boundary, or no gap at all (the branch
    // folded back at a singular pose and another branch goes on: a jump). A second loss at the same place is
    // taken as a gap up to the solution found, so the loop always advances.
    const repeated = gapFrom === previousGapFrom;
    previousGapFrom = gapFrom;
    const back = repeated ? "lost" : walk(ctx, run, found, gapFrom, false);
    if (back === "lost") {
      run.gaps.push({ fromS: gapFrom, toS: found.s });
      accept(ctx, run, last, found, false, true);
    } else {
      accept(ctx, run, last, found, jointChange(ctx, last.q, found.q) > ctx.options.jumpRad, false);
    }
    copyPoint(cur, found);
    while (k < n && sampleS(k) < cur.s) k++;
    if (k < n && sampleS(k) === cur.s) storeSample(ctx, run, k++, cur);
  }
  // Refine the bottleneck (largest rate ratio) and the nearest singularity between their neighbouring points.
  if (run.anyPoint) {
    if (run.worstPending) run.worstHi = run.worst.s;
    if (run.nearestPending) run.nearestHi = run.nearest.s;
    refine(ctx, run.worst, Math.min(run.worstLo, run.worstHi), Math.max(run.worstLo, run.worstHi), (pt) => pt.maxRatio);
    refine(
      ctx,
      run.nearest,
      Math.min(run.nearestLo, run.nearestHi),
      Math.max(run.nearestLo, run.nearestHi),
      (pt) => -pt.inverseCondition,
    );
  }
  return run;
}

/**
 * Refinement stages of the payload-at-reach search (pure): continuation of each row's worst posture onto the
 * neighbouring rows, and golden-section search over the other searched joints with the row's reach re-solved.
 * @see Kiefer (1953), golden-section search; Press et al., Numerical Recipes, 3rd ed., §10.2 [from memory]
 */
import { mmToM } from "../../units";
import type { MountingSearch } from "./searchState";
import { crossing } from "./toolSolver";

/** Golden-section steps per joint in the refinement (the bracket shrinks to 0.618^6 ≈ 5.6 % of two grid steps). */
const REFINE_STEPS = 6;
const GOLDEN = (Math.sqrt(5) - 1) / 2;

/**
 * Continuation: the worst postures of neighbouring rows lie on one smooth family, so each row's worst posture is
 * moved onto the next row's reach (along the joint its crossing was found on, within ± two grid steps) and
 * evaluated there; one sweep up the rows, one down. A row the grid sampled poorly inherits its neighbours' find.
 */
export function continueAcrossRows(ms: MountingSearch): void {
  if (ms.D < 2) return;
  const m = ms.chain.drivenCount,
    nOff = ms.nOff;
  for (const dir of [1, -1]) {
    for (let k = 0; k < ms.nRows - 1; k++) {
      const from = dir > 0 ? k : ms.nRows - 1 - k,
        to = from + dir;
      for (let oi = 0; oi < nOff; oi++) {
        const src = from * nOff + oi;
        if (ms.bestLimit[src] === -2 || !Number.isFinite(ms.best[src]!)) continue;
        ms.qStar.set(ms.bestQ.subarray(src * m, src * m + m));
        project(ms, to, ms.bestDim[src]!, 2);
      }
    }
  }
}

/**
 * Moves qStar onto row `row`'s reach along searched joint dStar (within ± `steps` grid steps), solves the wrist,
 * evaluates and records. Returns the allowed payload of every offset in lastAllowed; false where no such posture.
 */
function project(ms: MountingSearch, row: number, dStar: number, steps: number): boolean {
  const plan = ms.plan,
    solver = ms.solver,
    qa = ms.qa,
    qb = ms.qb,
    qStar = ms.qStar;
  const target = (ms.kFirst + row) * ms.stepM;
  const jd = plan.searched[dStar]!,
    step = steps * ms.gridStep(dStar);
  qa.set(qStar);
  qb.set(qStar);
  qa[jd] = ms.clampTo(dStar, qStar[jd]! - step);
  qb[jd] = ms.clampTo(dStar, qStar[jd]! + step);
  solver.q.set(qa);
  const fa = solver.reach() - target;
  qa.set(solver.q);
  solver.q.set(qb);
  const fb = solver.reach() - target;
  qb.set(solver.q);
  if (!(fa * fb <= 0)) return false;
  if (!crossing(solver, qa, qb, fa, fb, target, mmToM(ms.ctx.o.reachToleranceMm), ms.nw, plan.orienting)) return false;
  if (plan.wcpFlangeDistanceM !== null) {
    for (let c = 0; c < ms.nw; c++) solver.q[plan.orienting[c]!] = qStar[plan.orienting[c]!]!;
    if (!solver.solveTool()) return false;
  }
  ms.evaluate();
  ms.record(row, dStar);
  return true;
}

/** Allowed payload (offset oi) at the posture on row `row`'s reach with searched joint e at x, the reach solved
 * along searched joint dStar within ± one grid step of the slot's best posture qStar; Infinity where none. */
function onLevel(ms: MountingSearch, row: number, oi: number, dStar: number, e: number, x: number): number {
  const saved = ms.qStar[ms.plan.searched[e]!]!;
  ms.qStar[ms.plan.searched[e]!] = x;
  const ok = project(ms, row, dStar, 1);
  ms.qStar[ms.plan.searched[e]!] = saved;
  return ok ? ms.lastAllowed[oi]! : Infinity;
}

/**
 * Local refinement of each row's worst posture: golden-section search over each other searched joint within ± one
 * grid step, the row's reach re-solved along the joint the crossing was found on (two passes when three or more
 * joints are searched).
 */
export function refineRows(ms: MountingSearch): void {
  const D = ms.D,
    m = ms.chain.drivenCount,
    passes = D >= 3 ? 2 : 1;
  if (D < 2) return;
  for (let slot = 0; slot < ms.nRows * ms.nOff; slot++) {
    if (ms.bestLimit[slot] === -2 || !Number.isFinite(ms.best[slot]!)) continue;
    const row = Math.floor(slot / ms.nOff),
      oi = slot % ms.nOff,
      dStar = ms.bestDim[slot]!;
    for (let pass = 0; pass < passes; pass++) {
      for (let e = 0; e < D; e++) {
        if (e === dStar) continue;
        ms.qStar.set(ms.bestQ.subarray(slot * m, slot * m + m));
        const center = ms.qStar[ms.plan.searched[e]!]!,
          step = ms.gridStep(e);
        let a = ms.clampTo(e, center - step),
          b = ms.clampTo(e, center + step);
        let x1 = b - GOLDEN * (b - a),
          x2 = a + GOLDEN * (b - a);
        let f1 = onLevel(ms, row, oi, dStar, e, x1),
          f2 = onLevel(ms, row, oi, dStar, e, x2);
        for (let it = 0; it < REFINE_STEPS; it++) {
          if (f1 < f2) {
            b = x2;
            x2 = x1;
            f2 = f1;
            x1 = b - GOLDEN * (b - a);
            f1 = onLevel(ms, row, oi, dStar, e, x1);
          } else {
            a = x1;
            x1 = x2;
            f1 = f2;
            x2 = a + GOLDEN * (b - a);
            f2 = onLevel(ms, row, oi, dStar, e, x2);
          }
        }
      }
    }
  }
}

/**
 * Targets and IK solutions on the line: the flange target of a line position, every distinct start solution (one
 * per branch name), the solution nearest given joints, joint wrapping and distances.
 * @see Siciliano et al., Robotics: Modelling, Planning and Control, §3.7 (inverse kinematics algorithms) [from memory]
 */
import { solveIkInto } from "../../kinematics/inverse";
import { mulberry32 } from "../../math/random";
import { mToMm } from "../../units";
import { correct, createPoint, DISCOVERY_IK, POLISH_ITERATIONS, type Context, type Point } from "./context";
import { evaluate } from "./rates";

/** Converges `p.q` at line position s and evaluates it; false when the corrector fails. */
export function solveAt(ctx: Context, p: Point, s: number, iterations: number): boolean {
  if (!correct(ctx, p.q, s, iterations)) return false;
  p.s = s;
  evaluate(ctx, p);
  return true;
}

/** Flange target (row-major 4×4) of line position s: rotation R, position p(s) − R·tool. */
function flangeTargetInto(ctx: Context, s: number): Float64Array {
  const t = ctx.target,
    r = ctx.rot,
    tool = ctx.tool;
  for (let row = 0; row < 3; row++) {
    t[row * 4] = r[row * 3]!;
    t[row * 4 + 1] = r[row * 3 + 1]!;
    t[row * 4 + 2] = r[row * 3 + 2]!;
    t[row * 4 + 3] =
      ctx.startM[row]! +
      s * ctx.dir[row]! -
      (r[row * 3]! * tool[0]! + r[row * 3 + 1]! * tool[1]! + r[row * 3 + 2]! * tool[2]!);
  }
  t[12] = 0;
  t[13] = 0;
  t[14] = 0;
  t[15] = 1;
  return t;
}

/** Brings revolute joints to the value 2π·k away nearest `reference`, inside the joint range when one exists. */
export function wrapJoints(ctx: Context, q: Float64Array, reference: ArrayLike<number> | null): void {
  const chain = ctx.chain;
  for (let i = 0; i < ctx.m; i++) {
    if (chain.isPrismatic[chain.drivenJoint[i]!]) continue;
    const ref = reference ? reference[i]! : 0;
    const lo = chain.lowerSi[i]!,
      hi = chain.upperSi[i]!;
    let v = q[i]! - 2 * Math.PI * Math.round((q[i]! - ref) / (2 * Math.PI));
    if (v > hi + 1e-9 && v - 2 * Math.PI >= lo - 1e-9) v -= 2 * Math.PI;
    else if (v < lo - 1e-9 && v + 2 * Math.PI <= hi + 1e-9) v += 2 * Math.PI;
    q[i] = v;
  }
}

export function insideRange(ctx: Context, q: Float64Array): boolean {
  for (let i = 0; i < ctx.m; i++)
    if (q[i]! < ctx.chain.lowerSi[i]! - 1e-9 || q[i]! > ctx.chain.upperSi[i]! + 1e-9) return false;
  return true;
}

export function distance2(ctx: Context, a: ArrayLike<number>, b: ArrayLike<number> | null): number {
  let d = 0;
  for (let i = 0; i < ctx.m; i++) {
    const k = ctx.chain.drivenJoint[i]!;
    const v = (a[i]! - (b ? b[i]! : 0)) / (ctx.chain.isPrismatic[k] ? ctx.lengthScaleM : 1);
    d += v * v;
  }
  return d;
}

/**
 * IK solutions at line position s from the zero pose, the extra seeds and seeded random starts (solveIkInto inside
 * the joint ranges, then polished by the corrector): one per branch code, preferring in-range solutions, then the
 * one nearest `reference` (the zero pose when null). Allocates (not a per-step path).
 */
export function discover(
  ctx: Context,
  s: number,
  extraSeeds: readonly ArrayLike<number>[],
  reference: ArrayLike<number> | null,
): Point[] {
  const chain = ctx.chain,
    m = ctx.m,
    o = ctx.options;
  const rnd = mulberry32(o.seed ^ Math.round(s * 1e6));
  const seeds: Float64Array[] = [
    new Float64Array(m),
    ...extraSeeds.map((q) => Float64Array.from({ length: m }, (_, i) => q[i]!)),
  ];
  for (let n = 0; n < o.discoverySeeds; n++) {
    const q = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      const k = chain.drivenJoint[i]!;
      const span = chain.isPrismatic[k] ? ctx.lengthScaleM : Math.PI;
      const lo = Math.max(chain.lowerSi[i]!, -span),
        hi = Math.min(chain.upperSi[i]!, span);
      q[i] = lo + (hi - lo) * rnd();
    }
    seeds.push(q);
  }
  const target = flangeTargetInto(ctx, s);
  const byCode = new Map<number, { p: Point; inside: boolean; d: number }>();
  const q = new Float64Array(m);
  for (const seed of seeds) {
    solveIkInto(q, chain, target, seed, ctx.ik, DISCOVERY_IK);
    const p = createPoint(m);
    p.q.set(q);
    if (!solveAt(ctx, p, s, POLISH_ITERATIONS)) continue;
    wrapJoints(ctx, p.q, reference);
    if (!solveAt(ctx, p, s, POLISH_ITERATIONS)) continue;
    const inside = insideRange(ctx, p.q),
      d = distance2(ctx, p.q, reference);
    const held = byCode.get(p.code);
    if (!held || (inside && !held.inside) || (inside === held.inside && d < held.d - 1e-12))
      byCode.set(p.code, { p, inside, d });
  }
  return [...byCode.values()].sort((a, b) => Number(b.inside) - Number(a.inside) || a.d - b.d).map((v) => v.p);
}

/** The IK solution at s nearest to q (from q itself, then from seeded starts), or null. Allocates (rare path). */
export function nearestSolution(ctx: Context, s: number, q: Float64Array): Point | null {
  const p = createPoint(ctx.m);
  p.q.set(q);
  if (solveAt(ctx, p, s, POLISH_ITERATIONS)) return p;
  let best: Point | null = null,
    bestD = Infinity;
  for (const c of discover(ctx, s, [q], q)) {
    const d = distance2(ctx, c.q, q);
    if (d < bestD) {
      bestD = d;
      best = c;
    }
  }
  return best;
}

/** Position on the line at s, mm. */
export function positionMm(ctx: Context, s: number): number[] {
  return [0, 1, 2].map((r) => mToMm(ctx.startM[r]! + s * ctx.dir[r]!));
}

/**
 * Joint rates along the line at a converged pose, and the figures of one continuation point (rate ratios, scaled
 * singular values, singularity kind, branch code).
 * @see Siciliano et al., Robotics: Modelling, Planning and Control, §3.5 (inverse differential kinematics) [from
 *   memory]; DOMAIN.md "Speed" (guaranteed straight-line speed) and "Singularities"
 */
import { wristCentreInto } from "../../kinematics/forward";
import { branchCode } from "../../measures/branches";
import { classifyNullVector, scaledSingularValues } from "../../measures/singularity";
import { lineRatesInto } from "../../measures/speed";
import { buildTask, KINDS, RATE_RESIDUAL, taskSolveInto, type Context, type Point } from "./context";

/** Joint rates per unit TCP speed along the line at the converged pose in ctx (J in ctx.j) into out. */
function ratesInto(ctx: Context, out: Float64Array): boolean {
  const m = ctx.m,
    d = ctx.dir;
  if (ctx.rows === 6 && m >= 6) {
    if (!lineRatesInto(ctx.j, m, ctx.speed)) return false;
    const b = ctx.speed.b;
    for (let i = 0; i < m; i++) out[i] = b[i * 3]! * d[0]! + b[i * 3 + 1]! * d[1]! + b[i * 3 + 2]! * d[2]!;
    return true;
  }
  // Fewer than six joints (or the tool-axis task): solve T q̇ = [u; 0] and check that it is solved exactly.
  buildTask(ctx);
  const y = ctx.y,
    k = ctx.rows,
    t = ctx.task;
  for (let r = 0; r < k; r++) y[r] = r < 3 ? d[r]! : 0;
  if (!taskSolveInto(ctx, out, 0)) return false;
  let res = 0;
  for (let r = 0; r < k; r++) {
    let v = -(r < 3 ? d[r]! : 0);
    for (let i = 0; i < m; i++) v += t[r * m + i]! * out[i]!;
    res += v * v;
  }
  return Math.sqrt(res) <= RATE_RESIDUAL;
}

/**
 * Fallback at a pose where J cannot be inverted (after scaledSingularValues): the minimum-norm rates
 * q̇ = Σ vᵢ (J_s vᵢ)ᵀ b / σᵢ² over the singular values above 1e-9 σ_max of the scaled Jacobian J_s, accepted only
 * when they produce the motion (relative residual ≤ 1e-6). A line that crosses a singular pose exactly, where the
 * motion is still possible (q5 passing through zero), keeps finite rates; a motion the pose cannot make stays
 * unbounded.
 */
function pseudoRatesInto(ctx: Context, out: Float64Array): boolean {
  if (ctx.rows !== 6) return false;
  const m = ctx.m,
    k = Math.min(6, m),
    sc = ctx.sing.scaled,
    sv = ctx.sing.sv,
    v = ctx.sing.v,
    d = ctx.dir,
    L = ctx.lengthScaleM;
  out.fill(0);
  const tol = 1e-9 * sv[0]!;
  for (let i = 0; i < k; i++) {
    const si = sv[i]!;
    if (!(si > tol)) continue;
    let g = 0;
    for (let r = 0; r < 3; r++) {
      let jv = 0;
      for (let c = 0; c < m; c++) jv += sc[r * m + c]! * v[c * m + i]!;
      g += (jv * d[r]!) / L;
    }
    const f = g / (si * si);
    for (let c = 0; c < m; c++) out[c] = out[c]! + v[c * m + i]! * f;
  }
  let res = 0;
  for (let r = 0; r < 6; r++) {
    let x = r < 3 ? -d[r]! / L : 0;
    for (let c = 0; c < m; c++) x += sc[r * m + c]! * out[c]!;
    res += x * x;
  }
  return Math.sqrt(res) <= 1e-6 / L;
}

/** Fills the figures of point p (rates, ratios, singular values, kind, branch) at the converged pose in ctx. */
export function evaluate(ctx: Context, p: Point): void {
  const chain = ctx.chain,
    m = ctx.m;
  p.inverseCondition = scaledSingularValues(ctx.j, m, ctx.lengthScaleM, ctx.sing);
  p.ratesOk = ratesInto(ctx, p.rate) || pseudoRatesInto(ctx, p.rate);
  let best = 0,
    arg = -1;
  if (p.ratesOk) {
    for (let i = 0; i < m; i++) {
      const w = chain.maxSpeedSi[i]!;
      if (!(w > 0)) continue;
      const r = Math.abs(p.rate[i]!) / w;
      if (r > best || arg < 0) {
        best = r;
        arg = i;
      }
    }
  } else {
    best = Infinity;
  }
  p.maxRatio = best;
  p.argJoint = arg;
  const col = Math.min(6, m) - 1;
  p.sigmaMin = ctx.sing.sv[col]!;
  p.kind = KINDS.indexOf(classifyNullVector(ctx.sing.v, m, col, ctx.roles));
  if (ctx.frame) {
    if (!wristCentreInto(ctx.c, chain, ctx.kin)) {
      ctx.c[0] = ctx.kin.flange[3]!;
      ctx.c[1] = ctx.kin.flange[7]!;
      ctx.c[2] = ctx.kin.flange[11]!;
    }
    p.code = branchCode(chain, ctx.kin, ctx.frame, ctx.c[0]!, ctx.c[1]!, ctx.c[2]!);
  } else {
    p.code = 0;
  }
}

/** Largest joint change from a to b, rad (prismatic joints in characteristic lengths). */
export function jointChange(ctx: Context, a: Float64Array, b: Float64Array): number {
  let best = 0;
  for (let i = 0; i < ctx.m; i++) {
    const k = ctx.chain.drivenJoint[i]!;
    const d = Math.abs(b[i]! - a[i]!) / (ctx.chain.isPrismatic[k] ? ctx.lengthScaleM : 1);
    if (d > best) best = d;
  }
  return best;
}

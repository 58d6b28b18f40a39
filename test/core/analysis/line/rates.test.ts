/**
 * Joint rates and point figures along a straight line (src/core/analysis/line/rates.ts: evaluate, jointChange),
 * against references outside the project:
 * - planar 3R: the closed-form inverse of the 2R Jacobian at constant tool angle (fixtures.ts rates3r, CHECKS C1)
 *   and the closed-form speed bound (bound3r, CHECKS C13);
 * - generic 6R: Spong's geometric Jacobian [zᵢ × (p − oᵢ); zᵢ] (Robot Modeling and Control, ch. 4) built from the
 *   independent mathjs DH product of testArms.ts, inverted or pseudo-inverted by ml-matrix;
 * - singular poses worked by hand (stretched 3R, the 6R wrist with q₅ = 0), branch codes as derived by hand in
 *   test/core/measures/branches.test.ts.
 */
import { describe, expect, it } from "vitest";
import { Matrix, pseudoInverse, solve } from "ml-matrix";
import { compileChain, forwardInto, jacobianInto, toolPointInto } from "../../../../src/core";
import { createContext, createPoint, KINDS, type Context } from "../../../../src/core/analysis/line/context";
import { evaluate, jointChange } from "../../../../src/core/analysis/line/rates";
import { DEFAULT_LINE_CHECK } from "../../../../src/core/analysis/line/types";
import { expectClose } from "../../../helpers/expectClose";
import { cylindricalPrismaticDh, dhFrameReference, GENERIC_6R_SI, Q_STAR } from "../../../helpers/testArms";
import { A1, A2, A3, bound3r, CHAIN_3R, CHAIN_6R, ik3r, rates3r, W3R } from "./fixtures";
import type { Chain } from "../../../../src/core/kinematics/chain";

const IDENTITY = [1, 0, 0, 0, 1, 0, 0, 0, 1];

function context(chain: Chain, dir: readonly number[]): Context {
  return createContext(
    chain,
    { startM: [0, 0, 0], endM: dir, baseFromToolRotation: IDENTITY, speedMPerS: 1 },
    DEFAULT_LINE_CHECK,
  );
}

/** Puts the pose q into ctx as the corrector leaves it (kinematics, TCP, Jacobian at the TCP) and evaluates it. */
function evaluateAt(ctx: Context, q: readonly number[]) {
  const p = createPoint(ctx.m);
  p.q.set(q);
  forwardInto(ctx.chain, p.q, ctx.kin);
  toolPointInto(ctx.tcp, ctx.kin, 0, 0, 0);
  jacobianInto(ctx.j, ctx.chain, ctx.kin, ctx.tcp[0]!, ctx.tcp[1]!, ctx.tcp[2]!);
  evaluate(ctx, p);
  return p;
}

/** Spong's geometric Jacobian of the generic 6R at the flange, from the mathjs DH product (6 × 6 nested). */
function reference6rJacobian(q: readonly number[]): number[][] {
  const tip = dhFrameReference(GENERIC_6R_SI.rows, q);
  const p = [tip[0]![3]!, tip[1]![3]!, tip[2]![3]!];
  const cols: number[][] = [];
  for (let i = 0; i < 6; i++) {
    const t = dhFrameReference(GENERIC_6R_SI.rows, q, i);
    const z = [t[0]![2]!, t[1]![2]!, t[2]![2]!],
      o = [t[0]![3]!, t[1]![3]!, t[2]![3]!];
    const r = [p[0]! - o[0]!, p[1]! - o[1]!, p[2]! - o[2]!];
    cols.push([z[1]! * r[2]! - z[2]! * r[1]!, z[2]! * r[0]! - z[0]! * r[2]!, z[0]! * r[1]! - z[1]! * r[0]!, ...z]);
  }
  return [0, 1, 2, 3, 4, 5].map((row) => cols.map((c) => c[row]!));
}

function unit(v: readonly number[]): number[] {
  const n = Math.hypot(...v);
  return v.map((x) => x / n);
}

describe("evaluate on a planar 3R (closed-form inverse Jacobian)", () => {
  const cases: { x: number; y: number; phi: number; elbow: 1 | -1; u: number[] }[] = [
    { x: 0.6, y: 0.3, phi: 0.4, elbow: 1, u: [1, 0] },
    { x: 0.6, y: 0.3, phi: 0.4, elbow: -1, u: [0, 1] },
    { x: -0.2, y: 0.55, phi: -1.0, elbow: 1, u: unit([0.6, -0.8]) },
    { x: 0.3, y: -0.4, phi: 2.5, elbow: -1, u: unit([-1, -1]) },
  ];
  for (const c of cases) {
    it(`TCP (${c.x}, ${c.y}), φ = ${c.phi}, elbow ${c.elbow}, u = (${c.u.map((v) => v.toFixed(2))})`, () => {
      const ctx = context(CHAIN_3R, [c.u[0]!, c.u[1]!, 0]);
      const q = ik3r(c.x, c.y, c.phi, c.elbow);
      const p = evaluateAt(ctx, q);
      expect(p.ratesOk).toBe(true);
      // closed form: [q̇₁, q̇₂] = J₂ᵣ⁻¹u (adjugate), q̇₃ = −(q̇₁ + q̇₂)
      expectClose(p.rate, rates3r(q, c.u[0]!, c.u[1]!), 1e-9, "3R rates");
      // closed form: the binding joint and 1 / (speed bound) = maxᵢ |q̇ᵢ| / q̇maxᵢ
      const b = bound3r(q, c.u[0]!, c.u[1]!);
      expectClose(p.maxRatio, 1 / b.speed, 1e-9, "max rate ratio");
      expect(p.argJoint).toBe(b.joint);
      expect(p.ratesOk && Number.isFinite(p.maxRatio)).toBe(true);
      // parallel first axes: elbow left/right only, from the sign of z·((o₂ − o₁) × (c − o₂)) with c the flange;
      // by hand o₂ − o₁ = A1·e(q₁), c − o₂ = A2·e(q₁ + q₂) + A3·e(q₁ + q₂ + q₃), so the sign is that of
      // A1A2 sin q₂ + A1A3 sin(q₂ + q₃); left = 0, right = 2
      const side = A1 * A2 * Math.sin(q[1]!) + A1 * A3 * Math.sin(q[1]! + q[2]!);
      expect(p.code).toBe(side > 0 ? 0 : 2);
    });
  }

  it("stretched arm (q₂ = 0): a radial line is impossible (unbounded rates), a tangential one has the minimum-norm rates", () => {
    // Hand: at q₂ = 0 the wrist point W is at distance A1 + A2 along the arm and moves only tangentially
    // (W velocity = (q̇₁(A1 + A2) + q̇₂A2)·t̂), so a radial TCP velocity at constant φ cannot be made.
    const q = [0.3, 0, -0.5];
    const radial = [Math.cos(0.3), Math.sin(0.3), 0];
    const pr = evaluateAt(context(CHAIN_3R, radial), q);
    expect(pr.ratesOk).toBe(false);
    expect(pr.maxRatio).toBe(Infinity);
    // Tangential: solutions satisfy (A1 + A2)q̇₁ + A2q̇₂ = 1 and q̇₁ + q̇₂ + q̇₃ = 0; the minimum-norm one lies in the
    // row space span{(A1 + A2, A2, 0), (1, 1, 1)}: ml-matrix pseudo-inverse of those two rows.
    const tangential = [-Math.sin(0.3), Math.cos(0.3), 0];
    const pt = evaluateAt(context(CHAIN_3R, tangential), q);
    expect(pt.ratesOk).toBe(true);
    const rows = new Matrix([
      [A1 + A2, A2, 0],
      [1, 1, 1],
    ]);
    const want = pseudoInverse(rows)
      .mmul(Matrix.columnVector([1, 0]))
      .to1DArray();
    expectClose(pt.rate, want, 1e-6, "minimum-norm rates at the stretched pose");
    // the pose is singular: σ_min of the scaled Jacobian is (close to) zero. Hand: the null motion keeps W and φ,
    // (A1 + A2)q̇₁ + A2q̇₂ = 0 and q̇₁ + q̇₂ + q̇₃ = 0, i.e. q̇ ∝ (A2, −(A1 + A2), A1) = (0.4, −0.9, 0.5): mostly joint 2,
    // the stretched-elbow singularity
    expect(pt.sigmaMin).toBeLessThan(1e-9);
    expect(KINDS[pt.kind]).toBe("elbow");
    // hand: the maximum ratio comes from these rates and the limits W3R
    const ratios = want.map((v, i) => Math.abs(v) / W3R[i]!);
    expectClose(pt.maxRatio, Math.max(...ratios), 1e-6, "max ratio at the stretched pose");
  });
});

describe("evaluate on the generic 6R (geometric Jacobian from mathjs, ml-matrix solves)", () => {
  for (const d of [[1, 0, 0], [0, 0, 1], unit([0.3, -0.5, 0.8])]) {
    it(`q* along (${d.map((v) => v.toFixed(2))}): rates = J⁻¹[u; 0]`, () => {
      const ctx = context(CHAIN_6R, d);
      const p = evaluateAt(ctx, Q_STAR);
      expect(p.ratesOk).toBe(true);
      const want = solve(new Matrix(reference6rJacobian(Q_STAR)), Matrix.columnVector([...d, 0, 0, 0])).to1DArray();
      expectClose(p.rate, want, 1e-9, "6R rates");
      const wDeg = [150, 150, 180, 300, 300, 400]; // testArms.ts speed limits, deg/s
      const ratios = want.map((v, i) => Math.abs(v) / ((wDeg[i]! * Math.PI) / 180));
      expectClose(p.maxRatio, Math.max(...ratios), 1e-9, "max ratio");
      expect(p.argJoint).toBe(ratios.indexOf(Math.max(...ratios)));
      expect(p.sigmaMin).toBeGreaterThan(1e-3);
    });
  }

  it("branch codes of hand-worked poses (see branches.test.ts): front/up/+ = 0, front/down/− = 6, back/up/+ = 1", () => {
    const ctx = context(CHAIN_6R, [1, 0, 0]);
    expect(evaluateAt(ctx, [0, -Math.PI / 2, 0, 0, -0.5, 0]).code).toBe(0);
    expect(evaluateAt(ctx, [0, Math.PI / 4, (-3 * Math.PI) / 4, 0, 0.5, 0]).code).toBe(2 | 4);
    expect(evaluateAt(ctx, [0, (-3 * Math.PI) / 4, (-3 * Math.PI) / 4, 0, -0.5, 0]).code).toBe(1);
  });

  describe("wrist singularity q₅ = 0 (axes 4 and 6 aligned)", () => {
    // Hand: at q = (0, −π/2, 0, 0, 0, 0) the arm lies in the x–z plane; the wrist axes span x and y only, so the
    // angular velocity (q̇₂ + q̇₃)·y of the arm can be cancelled by joint 5 (in-plane lines possible) but a line along
    // y needs q̇₁ (ω along z), which nothing cancels (impossible). Joints 4 and 6 (both along x) give a null motion.
    const q = [0, -Math.PI / 2, 0, 0, 0, 0];

    it("in-plane line: finite minimum-norm rates (ml-matrix pseudo-inverse), kind wrist", () => {
      const d = unit([0.6, 0, -0.8]);
      const p = evaluateAt(context(CHAIN_6R, d), q);
      expect(p.ratesOk).toBe(true);
      const want = pseudoInverse(new Matrix(reference6rJacobian(q)), 1e-9)
        .mmul(Matrix.columnVector([...d, 0, 0, 0]))
        .to1DArray();
      expectClose(p.rate, want, 1e-6, "minimum-norm rates at the wrist singularity");
      expectClose(p.rate[3]! + p.rate[5]!, 0, 1e-6, "no component along the null motion (1, −1) of joints 4, 6");
      expect(p.sigmaMin).toBeLessThan(1e-9);
      expect(KINDS[p.kind]).toBe("wrist");
    });

    it("out-of-plane line: rates unbounded", () => {
      const p = evaluateAt(context(CHAIN_6R, [0, 1, 0]), q);
      expect(p.ratesOk).toBe(false);
      expect(p.maxRatio).toBe(Infinity);
    });
  });
});

describe("jointChange", () => {
  it("is the largest absolute joint change; revolute in rad (hand-worked)", () => {
    const ctx = context(CHAIN_6R, [1, 0, 0]);
    const a = Float64Array.from([0, 0.1, -0.2, 0.3, 0, 1]),
      b = Float64Array.from([0.05, -0.1, -0.2, 0.35, 0.25, 0.9]);
    // hand: |Δ| = (0.05, 0.2, 0, 0.05, 0.25, 0.1) → 0.25
    expectClose(jointChange(ctx, a, b), 0.25, 1e-15, "largest change");
    expectClose(jointChange(ctx, b, a), 0.25, 1e-15, "symmetric");
    expect(jointChange(ctx, a, a)).toBe(0);
  });

  it("divides prismatic changes by the characteristic length", () => {
    const chain = compileChain(cylindricalPrismaticDh());
    const ctx = context(chain, [1, 0, 0]);
    const L = chain.characteristicLengthM;
    const m = chain.drivenCount;
    const prismatic = Array.from({ length: m }, (_, i) => chain.isPrismatic[chain.drivenJoint[i]!] === 1);
    expect(prismatic.filter(Boolean).length).toBeGreaterThan(0);
    const k = prismatic.indexOf(true);
    const a = new Float64Array(m),
      b = new Float64Array(m);
    b[k] = 0.3 * L; // a stroke of 0.3 characteristic lengths
    expectClose(jointChange(ctx, a, b), 0.3, 1e-15, "prismatic only");
    const r = prismatic.indexOf(false);
    b[r] = 0.5; // a revolute change of 0.5 rad now dominates
    expectClose(jointChange(ctx, a, b), 0.5, 1e-15, "revolute dominates");
  });
});

/**
 * Tests of src/core/kinematics/wristFlip.ts: which chains have the wrist flip as a symmetry, and what the twin keeps.
 * References, independent of src/core:
 * - the two wrist solutions of a spherical wrist, (ϑ₄, ϑ₅, ϑ₆) and (ϑ₄ + π, −ϑ₅, ϑ₆ + π) (Siciliano et al. 2009,
 *   §2.12.2 [from memory]), checked with the mathjs DH product of testArms.ts;
 * - Jacobians by central finite differences of that mathjs product (position rows; angular rows from the rotation
 *   difference Ṙ·Rᵀ), inverses and determinants by ml-matrix and mathjs.
 */
import { describe, expect, it } from "vitest";
import * as math from "mathjs";
import { Matrix, inverse } from "ml-matrix";
import { compileChain } from "../../../src/core";
import { wristFlipOf, wristTwinInto } from "../../../src/core/kinematics/wristFlip";
import { DEFAULT_SPEED_MAP, toolSpeedMap } from "../../../src/core/analysis/speedMap/speedMap";
import { expectClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI, type DhRowSi } from "../../helpers/testArms";
import type { ArmKinematicsInput } from "../../../src/core/kinematics/compile";

const DEG = Math.PI / 180;

/** The generic 6R with one DH row changed (mm, deg in the input; SI rows for the reference). */
function variant(
  row: number,
  change: { dMm?: number; alphaDeg?: number; thetaDeg?: number },
): { input: ArmKinematicsInput; rows: DhRowSi[] } {
  const base = generic6rDh();
  const joints = base.joints.map((j, i) => (i === row && j.dh ? { ...j, dh: { ...j.dh, ...change } } : j));
  const rows = GENERIC_6R_SI.rows.map((r, i) =>
    i === row
      ? {
          a: r.a,
          alpha: change.alphaDeg !== undefined ? change.alphaDeg * DEG : r.alpha,
          d: change.dMm !== undefined ? change.dMm / 1000 : r.d,
          theta: change.thetaDeg !== undefined ? change.thetaDeg * DEG : r.theta,
        }
      : r,
  );
  return { input: { ...base, joints }, rows };
}

/** Geometric Jacobian (6 × 6, rows vx vy vz ωx ωy ωz) of the mathjs DH product by central differences, h = 1e-6. */
function jacobianFd(rows: readonly DhRowSi[], q: readonly number[]): number[][] {
  const h = 1e-6;
  const J = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
  const t0 = dhFrameReference(rows, q);
  for (let c = 0; c < 6; c++) {
    const qp = [...q],
      qm = [...q];
    qp[c] = qp[c]! + h;
    qm[c] = qm[c]! - h;
    const tp = dhFrameReference(rows, qp),
      tm = dhFrameReference(rows, qm);
    for (let r = 0; r < 3; r++) J[r]![c] = (tp[r]![3]! - tm[r]![3]!) / (2 * h);
    // Ṙ·Rᵀ = [ω]×
    const rd = [0, 1, 2].map((i) => [0, 1, 2].map((k) => (tp[i]![k]! - tm[i]![k]!) / (2 * h)));
    const w = (i: number, k: number) => rd[i]![0]! * t0[k]![0]! + rd[i]![1]! * t0[k]![1]! + rd[i]![2]! * t0[k]![2]!;
    J[3]![c] = w(2, 1);
    J[4]![c] = w(0, 2);
    J[5]![c] = w(1, 0);
  }
  return J;
}

/** min_i w_i / ‖row i of the linear block of J⁻¹‖ with ml-matrix's inverse (issue 3's definition), m/s. */
function guaranteedReference(J: number[][], wRadPerS: readonly number[]): number {
  const inv = inverse(new Matrix(J));
  let best = Infinity;
  for (let i = 0; i < 6; i++)
    best = Math.min(best, wRadPerS[i]! / Math.hypot(inv.get(i, 0), inv.get(i, 1), inv.get(i, 2)));
  return best;
}

describe("wristFlipOf", () => {
  it("finds the flip of the generic 6R (spherical wrist, θ offsets 0) with reflection value 0", () => {
    const flip = wristFlipOf(compileChain(generic6rDh()));
    expect(flip).not.toBeNull();
    expect([flip!.a, flip!.b, flip!.c]).toEqual([3, 4, 5]);
    expectClose(flip!.centreRad, 0, 1e-9, "centre");
  });

  it("a θ offset of 30° on joint 5 moves the reflection value to −60° (ϑ₅ = q₅ + 30° mirrored: q₅' = −q₅ − 60°)", () => {
    const flip = wristFlipOf(compileChain(variant(4, { thetaDeg: 30 }).input));
    expect(flip).not.toBeNull();
    expectClose(flip!.centreRad, -60 * DEG, 1e-9, "centre");
  });

  it("finds none for an offset wrist (d₅ = 120 mm: axes 5 and 6 miss axis 4) or a wrist with axes at 60°", () => {
    expect(wristFlipOf(compileChain(variant(4, { dMm: 120 }).input))).toBeNull();
    expect(wristFlipOf(compileChain(variant(3, { alphaDeg: 60 }).input))).toBeNull();
  });

  it("finds none for arms with fewer than six joints", () => {
    const base = generic6rDh();
    const four: ArmKinematicsInput = { ...base, joints: base.joints.slice(0, 4) };
    expect(wristFlipOf(compileChain(four))).toBeNull();
  });
});

describe("wristTwinInto", () => {
  const cases = [
    { name: "generic 6R", ...variant(0, {}) },
    { name: "generic 6R, θ₅ offset 30°", ...variant(4, { thetaDeg: 30 }) },
  ];
  it.each(cases)(
    "$name: the twin puts the flange at the same pose (mathjs DH product, 1e-12 m and 1e-12)",
    ({ input, rows }) => {
      const chain = compileChain(input);
      const flip = wristFlipOf(chain)!;
      const rand = mulberry32(811);
      const twin = new Float64Array(6);
      let checked = 0;
      for (let n = 0; n < 200; n++) {
        const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
        if (!wristTwinInto(twin, q, flip, chain)) continue;
        checked++;
        for (let i = 0; i < 6; i++) expect(twin[i]!).toBeGreaterThanOrEqual(-Math.PI - 1e-12);
        for (let i = 0; i < 6; i++) expect(twin[i]!).toBeLessThanOrEqual(Math.PI + 1e-12);
        expectClose(
          flat4(dhFrameReference(rows, Array.from(twin))),
          flat4(dhFrameReference(rows, q)),
          1e-12,
          `q = ${q}`,
        );
      }
      // Within ±180° ranges the twin of joint 5 (reflected about 0 or −60°) is out of range only for part of q₅.
      expect(checked).toBeGreaterThan(100);
    },
  );

  it("is refused when the mirrored joint 5 falls outside its range", () => {
    const input = generic6rDh();
    const limited: ArmKinematicsInput = {
      ...input,
      joints: input.joints.map((j, i) => (i === 4 ? { ...j, rangeDeg: [-30, 120] } : j)),
    };
    const chain = compileChain(limited);
    const flip = wristFlipOf(chain)!;
    const out = new Float64Array(6);
    expect(wristTwinInto(out, [0.1, 0.2, 0.3, 0.4, 100 * DEG, 0.6], flip, chain)).toBe(false); // −100° < −30°
    expect(wristTwinInto(out, [0.1, 0.2, 0.3, 0.4, 20 * DEG, 0.6], flip, chain)).toBe(true);
    expectClose(out[4]!, -20 * DEG, 1e-15, "mirrored q5");
  });

  it("keeps the guaranteed line speed and negates det J (finite-difference J, ml-matrix inverse, mathjs det)", () => {
    const { input, rows } = variant(0, {});
    const chain = compileChain(input);
    const flip = wristFlipOf(chain)!;
    const w = Array.from(chain.maxSpeedSi);
    const rand = mulberry32(812);
    const twin = new Float64Array(6);
    let checked = 0;
    while (checked < 20) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      if (Math.abs(Math.sin(q[4]!)) < 0.2 || !wristTwinInto(twin, q, flip, chain)) continue;
      checked++;
      const J = jacobianFd(rows, q),
        Jt = jacobianFd(rows, Array.from(twin));
      const g = guaranteedReference(J, w),
        gt = guaranteedReference(Jt, w);
      // finite differences with h = 1e-6: about 1e-8 relative
      expectClose(gt, g, 1e-6 * g, `guaranteed speed, q = ${q}`);
      const d = math.det(J),
        dt = math.det(Jt);
      expectClose(dt, -d, 1e-6 * Math.max(1e-3, Math.abs(d)), `det J, q = ${q}`);
    }
  });
});

describe("toolSpeedMap with and without wrist-flip twins (generic 6R, 40 mm grid)", () => {
  it.each(["down", "outward"] as const)(
    "%s: the same reachable cells and, per cell, the same best guaranteed speed (1e-4 relative + 0.01 mm/s)",
    (orientation) => {
      // Without twins every solution is solved numerically; the kept figures are checked against a closed-form
      // inverse kinematics in speedMap.test.ts. Both must agree cell by cell, to what the IK tolerance (1e-6 m)
      // leaves of the figures (differences seen: up to 5e-6 relative, and up to 0.002 mm/s on axis 1, where the
      // shoulder singularity makes the speed 0 up to that noise).
      const chain = compileChain(generic6rDh());
      const options = { ...DEFAULT_SPEED_MAP, stepMm: 40, discoveryEveryCells: 5 };
      const on = toolSpeedMap(chain, orientation, options),
        off = toolSpeedMap(chain, orientation, { ...options, wristTwins: false });
      expect(on.reachableCells).toBe(off.reachableCells);
      expect(on.reachableCells).toBeGreaterThan(500);
      let differ = 0;
      for (let i = 0; i < on.guaranteedMmPerS.length; i++) {
        const a = on.guaranteedMmPerS[i]!,
          b = off.guaranteedMmPerS[i]!;
        expect(Number.isNaN(a)).toBe(Number.isNaN(b));
        if (!Number.isNaN(a) && Math.abs(a - b) > 1e-4 * b + 1e-2) {
          differ++;
          if (differ < 6)
            console.log(
              i % on.grid.nx,
              Math.floor(i / on.grid.nx),
              a,
              b,
              on.branchNames[on.branch[i]!],
              off.branchNames[off.branch[i]!],
            );
        }
      }
      expect(differ).toBe(0);
    },
  );
});

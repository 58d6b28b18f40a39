/**
 * Tests of src/core/analysis/speedMap/labels.ts: the kind of a singularity crossed between two poses is named by the
 * null motion of the driven-joint Jacobian at the singular pose (createCrossingNullMotion, crossingKind), and a demo
 * palletizer's locus on axis 1 is a shoulder singularity.
 *
 * Outside references: the singular poses are hand-derived closed forms (CHECKS C1 for the planar 2R, C5 for the
 * generic 6R of CHECKS §0: wrist q5 = 0, elbow q3 = −atan2(d4, a3), shoulder r_w = a1 + a2c2 + a3c23 − d4s23 = 0); the
 * reference null vector at each is the right singular vector of the smallest singular value by ml-matrix's
 * SingularValueDecomposition (named `referenceNullVector`), not by the project's own SVD.
 */
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { loadArmFile } from "../../../../src/catalog";
import type { Chain } from "../../../../src/core";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../../src/core";
import { createCrossingNullMotion, crossingKind } from "../../../../src/core/analysis/speedMap/labels";
import { DEFAULT_SPEED_MAP, toolSpeedMap } from "../../../../src/core/analysis/speedMap/speedMap";
import { classifyNullVector, jointRoles } from "../../../../src/core/measures/singularity";
import { expectClose } from "../../../helpers/expectClose";
import { generic6rDh, GENERIC_6R_SI, planar2r, Q_STAR } from "../../../helpers/testArms";

const { a1, a2, a3, d4 } = GENERIC_6R_SI;

/** Rows `rows` of the 6 × m flange Jacobian at q, linear rows divided by the chain's length scale (row-major). */
function scaledRows(chain: Chain, q: readonly number[], rows: readonly number[]): number[][] {
  const m = chain.drivenCount;
  const s = createScratch(chain);
  const t = forwardInto(chain, q, s);
  const j = jacobianInto(new Float64Array(6 * m), chain, s, t[3]!, t[7]!, t[11]!);
  return rows.map((r) =>
    Array.from({ length: m }, (_, c) => j[r * m + c]! / (r < 3 ? chain.characteristicLengthM : 1)),
  );
}

/** Reference: unit right singular vector of the smallest singular value of `a` by ml-matrix (independent SVD). */
function referenceNullVector(a: number[][]): { v: number[]; sigmaRatio: number } {
  const svd = new SingularValueDecomposition(new Matrix(a));
  const sv = svd.diagonal;
  const k = sv.length - 1;
  return { v: svd.rightSingularVectors.getColumn(k), sigmaRatio: sv[k]! / sv[0]! };
}

/** The null vector as column m − 1 of an m × m row-major matrix (the layout crossingKind reads). */
function asLastColumn(v: readonly number[]): Float64Array {
  const m = v.length;
  const out = new Float64Array(m * m);
  v.forEach((x, i) => (out[i * m + m - 1] = x));
  return out;
}

function lastColumn(v: Float64Array, m: number): number[] {
  return Array.from({ length: m }, (_, i) => v[i * m + m - 1]!);
}

function absDot(a: readonly number[], b: readonly number[]): number {
  return Math.abs(a.reduce((s, x, i) => s + x * b[i]!, 0));
}

describe("planar 2R stretched: elbow", () => {
  it("null motion (a2, −(a1 + a2)) by ml-matrix's SVD of the position rows; labelled elbow", () => {
    // CHECKS C1: det of the 2 × 2 position Jacobian = a1·a2·sin q2, zero stretched (q2 = 0). The tip is a1 + a2 from
    // axis 1 and a2 from axis 2 on one line: q̇1(a1 + a2) + q̇2·a2 = 0 → (q̇1, q̇2) ∝ (a2, −(a1 + a2)). Equal links:
    // shares 1/5 (axis 1) and 4/5 (joint 2, the elbow), so the elbow leads.
    const chain = compileChain(planar2r(0.4, 0.4));
    const ref = referenceNullVector(scaledRows(chain, [0.6, 0], [0, 1]));
    expect(ref.sigmaRatio, "premise: singular").toBeLessThan(1e-12);
    const len = Math.hypot(0.4, 0.8);
    expectClose(absDot(ref.v, [0.4 / len, -0.8 / len]), 1, 1e-9, "reference null vector ∥ (a2, −(a1 + a2))");
    expect(classifyNullVector(asLastColumn(ref.v), 2, 1, jointRoles(chain), 1e-12)).toBe("elbow");
    expect(crossingKind(asLastColumn(ref.v), 2, jointRoles(chain))).toBe("elbow");
  });
});

describe("generic 6R (CHECKS §0): kind at a det J crossing between two poses", () => {
  const chain = compileChain(generic6rDh());
  const roles = jointRoles(chain);
  const crossing = createCrossingNullMotion(chain)!;
  const v = new Float64Array(36);
  const all = [0, 1, 2, 3, 4, 5];

  /** Crossing between q with joint k at x − h and at x + h; checks it against the reference at x and returns the kind. */
  function kindAcross(q: readonly number[], k: number, h: number): string {
    const qa = [...q],
      qb = [...q];
    qa[k] = q[k]! - h;
    qb[k] = q[k]! + h;
    expect(crossing(qa, qb, v), "det J changes sign between the poses").toBe(true);
    const ref = referenceNullVector(scaledRows(chain, q, all));
    expect(ref.sigmaRatio, "premise: the closed-form pose is singular").toBeLessThan(1e-10);
    expectClose(absDot(lastColumn(v, 6), ref.v), 1, 1e-8, "null motion at the crossing = ml-matrix's at the pose");
    // The label of the reference null vector itself (ml-matrix) agrees.
    expect(crossingKind(asLastColumn(ref.v), 6, roles)).toBe(crossingKind(v, 6, roles));
    return crossingKind(v, 6, roles);
  }

  it("wrist: q5 from −0.1 to 0.1 crosses q5 = 0 (axes 4 and 6 in line): wrist", () => {
    // CHECKS C5: det J22 = −sin q5; null motion e4 − e6, the arm joints still.
    const q: number[] = [...Q_STAR];
    q[4] = 0;
    expect(kindAcross(q, 4, 0.1)).toBe("wrist");
  });

  it("shoulder: q2 across the closed-form root of r_w = 0 (wrist centre on axis 1): shoulder", () => {
    // CHECKS C5: r_w = a1 + a2c2 + a3c23 − d4s23 = a1 + A·c2 − B·s2 with A = a2 + a3c3 − d4s3, B = a3s3 + d4c3, so
    // R·cos(q2 + φ) = −a1 with R = hypot(A, B), φ = atan2(B, A). There the wrist centre is on axis 1: joint 1 spins
    // and the wrist turns it back (null motion on joint 1 and the wrist only).
    const q3 = 0.4;
    const A = a2 + a3 * Math.cos(q3) - d4 * Math.sin(q3),
      B = a3 * Math.sin(q3) + d4 * Math.cos(q3);
    const q2 = Math.acos(-a1 / Math.hypot(A, B)) - Math.atan2(B, A);
    expectClose(a1 + a2 * Math.cos(q2) + a3 * Math.cos(q2 + q3) - d4 * Math.sin(q2 + q3), 0, 1e-12, "r_w = 0");
    const q = [0.3, q2, q3, 1.1, 0.8, -0.2];
    expect(kindAcross(q, 1, 0.02)).toBe("shoulder");
  });

  it("elbow: q3 across −atan2(d4, a3) (arm stretched): elbow", () => {
    // CHECKS C5 elbow condition: the wrist centre on the line of axes 2 and 3; null motion (0, L, −(a2 + L), wrist).
    const q = [0.3, -0.7, -Math.atan2(d4, a3), 1.1, 0.8, -0.2];
    expect(kindAcross(q, 2, 0.02)).toBe("elbow");
  });
});

describe("yarrowfield-pl-180 (demo palletizer): the locus on axis 1", () => {
  it("the det J crossing at r 0, z 2,780–3,100 mm (tool down) is a shoulder singularity", async () => {
    // Hand derivation: with the flange on axis 1, axes 1 and 4 are one vertical line through it (the parallelogram
    // keeps axis 4 vertical), so turning J1 by +ε and J4 by −ε moves nothing: null motion (1, 0, 0, −1)/√2, axis 1
    // with the tool roll: shoulder.
    const loaded = await loadArmFile("arms/yarrowfield-pl-180.json");
    const chain = loaded.arm!.chain;
    const map = toolSpeedMap(chain, "down", {
      ...DEFAULT_SPEED_MAP,
      boundsMm: { rMax: 400, zMin: 2500, zMax: 3200 },
    });
    const onAxis = map.loci.flatMap((l) =>
      l.polylinesMm
        .flat()
        .filter(([r, z]) => Math.abs(r) < 15 && z >= 2780 && z <= 3100)
        .map(() => l.kind),
    );
    expect(onAxis.length, "locus points on axis 1").toBeGreaterThan(10);
    expect(new Set(onAxis)).toEqual(new Set(["shoulder"]));
    // The reference null motion at the map's own pose of the cell r = 0, z = 2,900 mm: ml-matrix's SVD of the
    // square task rows (vx, vy, vz scaled; ω·z_tool, here ωz with the tool down).
    const g = map.grid;
    const cell = Math.round((0 - g.rMinMm) / g.stepMm) + Math.round((2900 - g.zMinMm) / g.stepMm) * g.nx;
    const q = Array.from(map.joints.subarray(cell * 4, cell * 4 + 4));
    expect(q.every(Number.isFinite), "premise: the cell is reached").toBe(true);
    const [vx, vy, vz, , , wz] = scaledRows(chain, q, [0, 1, 2, 3, 4, 5]);
    const ref = referenceNullVector([vx!, vy!, vz!, wz!.map((x) => -x)]);
    expect(ref.sigmaRatio, "premise: singular on axis 1").toBeLessThan(1e-6);
    expectClose(Math.abs(ref.v[0]!), Math.SQRT1_2, 1e-6, "|J1 share| = 1/√2");
    expectClose(Math.abs(ref.v[3]!), Math.SQRT1_2, 1e-6, "|J4 share| = 1/√2");
    expect(crossingKind(asLastColumn(ref.v), 4, jointRoles(chain))).toBe("shoulder");
  });
});

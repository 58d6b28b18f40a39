/**
 * The per-pose kernel (FK + Jacobian + singular values + guaranteed line speed + maximum tool speed) written two
 * ways: ours on Float64Array scratch buffers, and the obvious way with ml-matrix objects (the baseline the
 * benchmark compares against in the same run).
 */
import { Matrix, SingularValueDecomposition, inverse } from "ml-matrix";
import type { Chain } from "../../src/core";
import { createScratch, forwardInto, jacobianInto } from "../../src/core";
import { createSpeedScratch, guaranteedLineSpeed, maxToolSpeed } from "../../src/core/measures/speed";
import { createSingularityScratch, scaledInverseCondition } from "../../src/core/measures/singularity";

export function fastKernel(chain: Chain) {
  const m = chain.drivenCount,
    s = createScratch(chain),
    j = new Float64Array(6 * m);
  const sp = createSpeedScratch(m),
    sg = createSingularityScratch(m);
  return (q: Float64Array): number => {
    const t = forwardInto(chain, q, s);
    jacobianInto(j, chain, s, t[3]!, t[7]!, t[11]!);
    const inv = scaledInverseCondition(j, m, chain.characteristicLengthM, sg);
    return inv + guaranteedLineSpeed(j, m, chain.maxSpeedSi, sp) + maxToolSpeed(j, m, chain.maxSpeedSi, sp);
  };
}

function rowMajor4(a: Float64Array, offset: number): Matrix {
  return new Matrix([0, 1, 2, 3].map((r) => [0, 1, 2, 3].map((c) => a[offset + r * 4 + c]!)));
}

/** The obvious version: one Matrix per transform, Matrix products, ml-matrix SVD and inverse. */
export function baselineKernel(chain: Chain) {
  const n = chain.jointCount,
    m = chain.drivenCount;
  const fixed = Array.from({ length: n + 1 }, (_, i) => rowMajor4(chain.fixed, 16 * i));
  const g = new Matrix(
    Array.from({ length: n }, (_, i) => Array.from({ length: m }, (_, k) => chain.couplingGain[i * m + k]!)),
  );
  return (q: Float64Array): number => {
    const qKin = g
      .mmul(Matrix.columnVector(Array.from(q)))
      .to1DArray()
      .map((v, i) => v + chain.couplingOffset[i]!);
    let t = fixed[0]!.clone();
    const origins: Matrix[] = [],
      axes: Matrix[] = [];
    for (let i = 0; i < n; i++) {
      const a = [chain.axisLocal[3 * i]!, chain.axisLocal[3 * i + 1]!, chain.axisLocal[3 * i + 2]!];
      const th = qKin[i]!;
      let motion: Matrix;
      if (chain.isPrismatic[i]) {
        motion = Matrix.eye(4);
        for (let r = 0; r < 3; r++) motion.set(r, 3, a[r]! * th);
      } else {
        const k = new Matrix([
          [0, -a[2]!, a[1]!],
          [a[2]!, 0, -a[0]!],
          [-a[1]!, a[0]!, 0],
        ]);
        const r3 = Matrix.eye(3)
          .add(k.clone().mul(Math.sin(th)))
          .add(k.mmul(k).mul(1 - Math.cos(th)));
        motion = Matrix.eye(4);
        motion.setSubMatrix(r3, 0, 0);
      }
      t = t.mmul(motion);
      origins.push(t.subMatrix(0, 2, 3, 3));
      axes.push(t.subMatrix(0, 2, 0, 2).mmul(Matrix.columnVector(a)));
      t = t.mmul(fixed[i + 1]!);
    }
    const p = t.subMatrix(0, 2, 3, 3);
    const jk = Matrix.zeros(6, n);
    for (let i = 0; i < n; i++) {
      const z = axes[i]!.to1DArray(),
        r = p.sub(origins[i]!).to1DArray();
      const lin = chain.isPrismatic[i]
        ? z
        : [z[1]! * r[2]! - z[2]! * r[1]!, z[2]! * r[0]! - z[0]! * r[2]!, z[0]! * r[1]! - z[1]! * r[0]!];
      const ang = chain.isPrismatic[i] ? [0, 0, 0] : z;
      for (let k = 0; k < 3; k++) {
        jk.set(k, i, lin[k]!);
        jk.set(k + 3, i, ang[k]!);
      }
    }
    const j = jk.mmul(g);
    const scaled = j.clone();
    for (let r = 0; r < 3; r++) for (let c = 0; c < m; c++) scaled.set(r, c, j.get(r, c) / chain.characteristicLengthM);
    const sv = new SingularValueDecomposition(scaled, { autoTranspose: true }).diagonal;
    const inv = sv[Math.min(6, m) - 1]! / sv[0]!;
    let guaranteed = 0;
    if (m === 6) {
      const b = inverse(j).subMatrix(0, 5, 0, 2);
      guaranteed = Infinity;
      for (let i = 0; i < 6; i++) guaranteed = Math.min(guaranteed, chain.maxSpeedSi[i]! / Math.hypot(...b.getRow(i)));
    }
    const jv = j.subMatrix(0, 2, 0, m - 1);
    let best = 0;
    for (let s = 0; s < 1 << m; s++) {
      const v = jv.mmul(
        Matrix.columnVector(Array.from({ length: m }, (_, i) => ((s >> i) & 1 ? -1 : 1) * chain.maxSpeedSi[i]!)),
      );
      best = Math.max(best, v.norm());
    }
    return inv + guaranteed + best;
  };
}

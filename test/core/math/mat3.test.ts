/**
 * Tests of src/core/math/mat3.ts (3-vectors and row-major 3×3 rotations of the closed-form inverse kinematics)
 * against mathjs as a live, independent general-purpose library, and against the Paden–Kahan subproblem 1 in its
 * defining form (Murray, Li & Sastry 1994, §3.2: Rot(ω, θ)·p = q) [from memory].
 */
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import {
  cross,
  dot,
  mul3,
  mul3At,
  mulRtv,
  mulRtvAt,
  mulRv,
  mulRvAt,
  norm,
  rotInto,
  subproblem1,
  transpose3,
} from "../../../src/core/math/mat3";
import { expectClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";

const rows = (a: ArrayLike<number>): number[][] => [0, 1, 2].map((r) => [0, 1, 2].map((c) => a[r * 3 + c]!));
/** Any mathjs result (array or Matrix) as a flat number array. */
const flat = (m: unknown): number[] => math.flatten(math.matrix(m as number[])).toArray() as number[];

function randomVec(rnd: () => number): [number, number, number] {
  return [uniform(rnd, -2, 2), uniform(rnd, -2, 2), uniform(rnd, -2, 2)];
}
function randomUnit(rnd: () => number): [number, number, number] {
  const v = randomVec(rnd);
  const n = Math.hypot(...v);
  return [v[0] / n, v[1] / n, v[2] / n];
}
function randomRotation(rnd: () => number): Float64Array {
  const out = new Float64Array(9);
  rotInto(out, 0, randomUnit(rnd), uniform(rnd, -Math.PI, Math.PI));
  return out;
}

describe("mat3", () => {
  it("dot, cross and norm equal mathjs dot, cross and norm on random vectors", () => {
    // mathjs is independent of the project; tolerance 1e-12 (a few roundings of numbers below 16).
    const rnd = mulberry32(301);
    for (let trial = 0; trial < 50; trial++) {
      const a = randomVec(rnd),
        b = randomVec(rnd);
      expectClose(dot(a, b), math.dot(a, b), 1e-12, `dot, trial ${trial}`);
      expectClose(cross(a, b), flat(math.cross(a, b)), 1e-12, `cross, trial ${trial}`);
      expectClose(norm(a), math.norm(a) as number, 1e-12, `norm, trial ${trial}`);
    }
  });

  it("rotInto(k, θ) equals mathjs rotationMatrix(θ, k) and expm(θ S(k)), written at an offset", () => {
    // mathjs rotationMatrix and expm (Padé) are independent implementations; tolerance 1e-12.
    const rnd = mulberry32(302);
    for (let trial = 0; trial < 30; trial++) {
      const k = randomUnit(rnd),
        theta = uniform(rnd, -Math.PI, Math.PI);
      const out = new Float64Array(14).fill(7);
      rotInto(out, 3, k, theta);
      expect(Array.from(out.subarray(0, 3))).toEqual([7, 7, 7]);
      expect(Array.from(out.subarray(12))).toEqual([7, 7]);
      const r = out.subarray(3, 12);
      expectClose(r, flat(math.rotationMatrix(theta, k)), 1e-12, `rotationMatrix, trial ${trial}`);
      const s = [
        [0, -k[2], k[1]],
        [k[2], 0, -k[0]],
        [-k[1], k[0], 0],
      ].map((row) => row.map((x) => x * theta));
      expectClose(r, flat(math.expm(math.matrix(s))), 1e-12, `expm, trial ${trial}`);
    }
  });

  it("products and transposes equal mathjs multiply and transpose, the At kernels at offsets", () => {
    // mathjs multiply/transpose; tolerance 1e-12.
    const rnd = mulberry32(303);
    for (let trial = 0; trial < 30; trial++) {
      const a = randomRotation(rnd),
        b = Float64Array.from({ length: 9 }, () => uniform(rnd, -2, 2)),
        x = randomVec(rnd);
      const ab = flat(math.multiply(rows(a), rows(b)));
      expectClose(mul3(a, b), ab, 1e-12, `mul3, trial ${trial}`);
      expectClose(transpose3(b), flat(math.transpose(rows(b))), 0, `transpose3, trial ${trial}`);
      expectClose(mulRv(b, x), flat(math.multiply(rows(b), x)), 1e-12, `mulRv, trial ${trial}`);
      expectClose(mulRtv(b, x), flat(math.multiply(math.transpose(rows(b)), x)), 1e-12, `mulRtv ${trial}`);
      // The same products read from and written to offsets inside larger buffers.
      const buf = new Float64Array(40).fill(5);
      buf.set(a, 2);
      buf.set(b, 13);
      buf.set(x, 23);
      mul3At(buf, 27, buf, 2, buf, 13);
      expectClose(buf.subarray(27, 36), ab, 1e-12, `mul3At, trial ${trial}`);
      mulRvAt(buf, 36, buf, 13, buf, 23);
      expectClose(buf.subarray(36, 39), flat(math.multiply(rows(b), x)), 1e-12, `mulRvAt, trial ${trial}`);
      mulRtvAt(buf, 36, buf, 13, buf, 23);
      const btx = flat(math.multiply(math.transpose(rows(b)), x));
      expectClose(buf.subarray(36, 39), btx, 1e-12, `mulRtvAt, trial ${trial}`);
      expect([buf[0], buf[1], buf[26], buf[39]]).toEqual([5, 5, 5, 5]);
    }
  });

  it("subproblem1 recovers θ from p and q = Rot(ω, θ)·p (mathjs rotationMatrix), NaN when p ∥ ω", () => {
    // q built with mathjs, not with rotInto; the angle compared modulo 2π, tolerance 1e-9.
    const rnd = mulberry32(304);
    for (let trial = 0; trial < 50; trial++) {
      const w = randomUnit(rnd),
        p = randomVec(rnd),
        theta = uniform(rnd, -3.1, 3.1);
      const q = flat(math.multiply(math.rotationMatrix(theta, w), p));
      const got = subproblem1(w, p[0], p[1], p[2], q[0]!, q[1]!, q[2]!, 1e-12);
      expectClose(got, theta, 1e-9, `trial ${trial}`);
    }
    expect(subproblem1([0, 0, 1], 0, 0, 2, 1, 0, 0, 1e-9)).toBeNaN();
    // A quarter turn about z takes x to y (textbook).
    expectClose(subproblem1([0, 0, 1], 1, 0, 0, 0, 1, 0, 1e-9), Math.PI / 2, 1e-15, "x to y");
  });
});

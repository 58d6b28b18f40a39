/**
 * Tests of src/core/math/mat4.ts against published worked examples (CHECKS C7, C8) and against mathjs as a live,
 * independent general-purpose library.
 */
import * as math from "mathjs";
import { describe, it } from "vitest";
import {
  fromXyzRpyInto,
  identity4Into,
  invertRigidInto,
  mat4,
  mul4Into,
  rotationAxisAngleInto,
  rpyOfInto,
  transformPointInto,
  translationInto,
} from "../../../src/core";
import { expectClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";

const DEG = Math.PI / 180;

/** 3×3 rotation block of a row-major 4×4 as nested rows. */
function rot3(t: ArrayLike<number>): number[][] {
  return [0, 1, 2].map((r) => [0, 1, 2].map((c) => t[r * 4 + c]!));
}

/** Nested 3×3 (mathjs Matrix or array) → flat row-major. */
function flat3(m: math.Matrix | number[][]): number[] {
  const a = Array.isArray(m) ? m : (m.toArray() as number[][]);
  return a.flat();
}

const skew = (w: readonly number[]): number[][] => [
  [0, -w[2]!, w[1]!],
  [w[2]!, 0, -w[0]!],
  [-w[1]!, w[0]!, 0],
];

/** Random unit vector from the deterministic PRNG (uniform in the cube, rejected outside the ball, then normalised). */
function randomUnit(rand: () => number): [number, number, number] {
  for (;;) {
    const v: [number, number, number] = [uniform(rand, -1, 1), uniform(rand, -1, 1), uniform(rand, -1, 1)];
    const n = Math.hypot(...v);
    if (n > 0.1 && n <= 1) return [v[0] / n, v[1] / n, v[2] / n];
  }
}

describe("rotationAxisAngleInto", () => {
  it("rotationAxisAngleInto(k, |w|) reproduces exp(S((1, 2, 3))) of the MatrixExp3 docstring", () => {
    // Lynch & Park, Modern Robotics companion library (core.py), MatrixExp3 docstring example; CHECKS C7 [pub✓].
    // Printed to 8 decimals, hence 5e-9.
    const w = [1, 2, 3];
    const theta = Math.hypot(1, 2, 3);
    const r = rotationAxisAngleInto(mat4(), w[0]! / theta, w[1]! / theta, w[2]! / theta, theta);
    const printed = [
      -0.69492056, 0.71352099, 0.08929286, -0.19200697, -0.30378504, 0.93319235, 0.69297817, 0.6313497, 0.34810748,
    ];
    expectClose(rot3(r).flat(), printed, 5e-9, "exp(S((1,2,3)))");
    expectClose([r[3]!, r[7]!, r[11]!, r[12]!, r[13]!, r[14]!, r[15]!], [0, 0, 0, 0, 0, 0, 1], 0, "homogeneous part");
  });

  it("rotationAxisAngleInto(k, θ) equals mathjs expm(θ S(k)) and mathjs rotationMatrix(θ, k) on random axes and angles", () => {
    // Rodrigues: exp(θ S(k)) = I + sin θ S(k) + (1 − cos θ) S(k)² (Murray, Li & Sastry 1994, ch. 2 [from memory]);
    // mathjs expm (Padé) and rotationMatrix are independent implementations; CHECKS C7 [lib✓]. Tolerance 1e-12.
    const rand = mulberry32(0xc7);
    for (let trial = 0; trial < 50; trial++) {
      const k = randomUnit(rand);
      const theta = uniform(rand, -2 * Math.PI, 2 * Math.PI);
      const r = rot3(rotationAxisAngleInto(mat4(), k[0], k[1], k[2], theta)).flat();
      const viaExpm = flat3(math.expm(math.matrix(skew(k.map((x) => x * theta)))));
      const viaRotationMatrix = flat3(math.rotationMatrix(theta, math.matrix(k)));
      expectClose(r, viaExpm, 1e-12, `expm, trial ${trial}`);
      expectClose(r, viaRotationMatrix, 1e-12, `rotationMatrix, trial ${trial}`);
    }
  });

  it("rotationAxisAngleInto gives R with R S(a) Rᵀ = S(Ra), R k = k and det R = 1", () => {
    // Identities of CHECKS C7 (Lynch & Park, Modern Robotics §3.2 [from memory]; Spong et al. §2.2 [from memory]).
    // Products and det by mathjs; tolerance 1e-12.
    const rand = mulberry32(7);
    for (let trial = 0; trial < 20; trial++) {
      const k = randomUnit(rand);
      const a = [uniform(rand, -2, 2), uniform(rand, -2, 2), uniform(rand, -2, 2)];
      const R = rot3(rotationAxisAngleInto(mat4(), k[0], k[1], k[2], uniform(rand, -Math.PI, Math.PI)));
      const lhs = math.multiply(math.multiply(R, skew(a)), math.transpose(R));
      const ra = math.multiply(R, a);
      expectClose(lhs.flat(), skew(ra).flat(), 1e-12, "R S(a) Rᵀ = S(Ra)");
      expectClose(math.multiply(R, k), k, 1e-12, "axis is fixed");
      expectClose(math.det(R), 1, 1e-12, "det R");
      expectClose(math.multiply(R, math.transpose(R)).flat(), [1, 0, 0, 0, 1, 0, 0, 0, 1], 1e-12, "R Rᵀ = I");
    }
  });
});

describe("fromXyzRpyInto", () => {
  it("fromXyzRpyInto(rpy) equals the mathjs product Rz(yaw)·Ry(pitch)·Rx(roll) (URDF rpy, fixed axes)", () => {
    // URDF joint/origin convention: R = Rz(yaw)·Ry(pitch)·Rx(roll) [from memory]; products by mathjs; tol 1e-12.
    const rand = mulberry32(0x2a);
    for (let trial = 0; trial < 50; trial++) {
      const roll = uniform(rand, -Math.PI, Math.PI),
        pitch = uniform(rand, -Math.PI, Math.PI),
        yaw = uniform(rand, -Math.PI, Math.PI);
      const xyz = [uniform(rand, -2, 2), uniform(rand, -2, 2), uniform(rand, -2, 2)];
      const t = fromXyzRpyInto(mat4(), xyz[0]!, xyz[1]!, xyz[2]!, roll, pitch, yaw);
      const expected = math.multiply(
        math.multiply(math.rotationMatrix(yaw, [0, 0, 1]), math.rotationMatrix(pitch, [0, 1, 0])),
        math.rotationMatrix(roll, [1, 0, 0]),
      ) as number[][];
      expectClose(rot3(t).flat(), expected.flat(), 1e-12, `rotation, trial ${trial}`);
      expectClose([t[3]!, t[7]!, t[11]!], xyz, 0, "translation column");
      expectClose([t[12]!, t[13]!, t[14]!, t[15]!], [0, 0, 0, 1], 0, "last row");
    }
  });
});

describe("rpyOfInto", () => {
  it("rpyOfInto(fromXyzRpyInto(rpy)) returns rpy for pitch inside (−90°, 90°)", () => {
    // Round trip; the inverse formulas are those of the ZYX Euler angles (Siciliano et al. 2009 §2.4 [from
    // memory]). Tolerance 1e-12 rad.
    const rand = mulberry32(99);
    for (let trial = 0; trial < 100; trial++) {
      const rpy = [uniform(rand, -Math.PI, Math.PI), uniform(rand, -1.5, 1.5), uniform(rand, -Math.PI, Math.PI)];
      const t = fromXyzRpyInto(mat4(), 0, 0, 0, rpy[0]!, rpy[1]!, rpy[2]!);
      expectClose(rpyOfInto([0, 0, 0], t), rpy, 1e-12, `trial ${trial}`);
    }
  });

  it("rpyOfInto at pitch = ±90° (gimbal lock) returns angles that rebuild the same rotation", () => {
    // At gimbal lock only yaw − roll (pitch +90°) or yaw + roll (pitch −90°) is defined; check the rotation,
    // not the angles. Tolerance 1e-12.
    for (const pitch of [Math.PI / 2, -Math.PI / 2]) {
      const t = fromXyzRpyInto(mat4(), 0, 0, 0, 0.4, pitch, -1.1);
      const rpy = rpyOfInto([0, 0, 0], t);
      expectClose(rpy[1]!, pitch, 1e-12, "pitch");
      const rebuilt = fromXyzRpyInto(mat4(), 0, 0, 0, rpy[0]!, rpy[1]!, rpy[2]!);
      expectClose(rot3(rebuilt).flat(), rot3(t).flat(), 1e-12, `rebuilt rotation, pitch ${pitch}`);
    }
  });
});

describe("mul4Into / transformPointInto: worked frame-transform examples (CHECKS C8)", () => {
  it("(a) fromXyzRpyInto(10, 5, 0, yaw 30°) maps ᴮP = (3, 7, 0) to ᴬP = (9.098, 12.562, 0)", () => {
    // Craig, Introduction to Robotics: Mechanics and Control, 3rd ed., Example 2.2 (statement [pub✓], printed
    // answer [pub·mem]); CHECKS C8(a). Printed to 3 decimals, hence 5e-4; plus the exact value 10 + 3c − 7s etc.
    const aFromB = fromXyzRpyInto(mat4(), 10, 5, 0, 0, 0, 30 * DEG);
    const p = transformPointInto(new Float64Array(3), 0, aFromB, 3, 7, 0);
    expectClose(p, [9.098, 12.562, 0], 5e-4, "printed answer");
    expectClose(p, [10 + 3 * Math.cos(30 * DEG) - 7 * 0.5, 5 + 3 * 0.5 + 7 * Math.cos(30 * DEG), 0], 1e-12, "exact");
  });

  it("(b) Trans(4, −3, 7)·Rot(y, 90°)·Rot(z, 90°) maps p = (7, 3, 1) to (5, 4, 10)", () => {
    // Niku, Introduction to Robotics, 2nd ed., ch. 2 worked example (statement [pub✓], example number [from
    // memory]): rotations and translation all about the reference frame, so each premultiplies; CHECKS C8(b). 1e-12.
    const rz = rotationAxisAngleInto(mat4(), 0, 0, 1, 90 * DEG);
    const ry = rotationAxisAngleInto(mat4(), 0, 1, 0, 90 * DEG);
    const tr = translationInto(mat4(), 4, -3, 7);
    const t = mul4Into(mat4(), tr, mul4Into(mat4(), ry, rz));
    expectClose(transformPointInto(new Float64Array(3), 0, t, 7, 3, 1), [5, 4, 10], 1e-12);
  });

  it("(c) Trans(4, −3, 7)·Rot(y, 90°)·Rot(z, 90°)·[7 3 2 1]ᵀ = [6 4 10 1]ᵀ", () => {
    // Paul, Robot Manipulators: Mathematics, Programming, and Control, 1981, ch. 1 [pub·mem]; CHECKS C8(c). 1e-12.
    const t = mul4Into(
      mat4(),
      mul4Into(mat4(), translationInto(mat4(), 4, -3, 7), rotationAxisAngleInto(mat4(), 0, 1, 0, 90 * DEG)),
      rotationAxisAngleInto(mat4(), 0, 0, 1, 90 * DEG),
    );
    const out = new Float64Array(4);
    transformPointInto(out, 0, t, 7, 3, 2);
    out[3] = t[12]! * 7 + t[13]! * 3 + t[14]! * 2 + t[15]!; // homogeneous coordinate stays 1
    expectClose(out, [6, 4, 10, 1], 1e-12);
  });

  it("(d) rotating r = (−3, 4, −11) by π/2 about X, then translating by (8, −4, 12) gives (5, 7, 16)", () => {
    // Pardos-Gotor, Screw Theory in Robotics, 2022, Exercise 2.2.2 (statement seen in the author's public exercise
    // code [pub✓]); CHECKS C8(d). 1e-12.
    const t = mul4Into(mat4(), translationInto(mat4(), 8, -4, 12), fromXyzRpyInto(mat4(), 0, 0, 0, Math.PI / 2, 0, 0));
    expectClose(transformPointInto(new Float64Array(3), 0, t, -3, 4, -11), [5, 7, 16], 1e-12);
  });
});

describe("invertRigidInto", () => {
  it("invertRigidInto(t) · t = I on random poses", () => {
    // Inverse of a rigid transform [Rᵀ, −Rᵀp] (Spong et al. §2.7 [from memory]); checked against mathjs inv. 1e-12.
    const rand = mulberry32(3);
    for (let trial = 0; trial < 20; trial++) {
      const t = fromXyzRpyInto(
        mat4(),
        uniform(rand, -3, 3),
        uniform(rand, -3, 3),
        uniform(rand, -3, 3),
        uniform(rand, -3, 3),
        uniform(rand, -1.5, 1.5),
        uniform(rand, -3, 3),
      );
      const inv = invertRigidInto(mat4(), t);
      expectClose(mul4Into(mat4(), inv, t), identity4Into(mat4()), 1e-12, "inv · t");
      const nested = [0, 1, 2, 3].map((r) => [0, 1, 2, 3].map((c) => t[r * 4 + c]!));
      expectClose(inv, (math.inv(nested) as number[][]).flat(), 1e-12, "mathjs inv");
    }
  });
});

/**
 * Tests of the dimension-drawing form (src/core/kinematics/dimensions.ts and its compile step in compile.ts).
 *
 * References, none of them our own code:
 * - the zero pose and signs as issue 14 §1 states them, worked by hand below;
 * - an independent product of elementary rotation and translation matrices by mathjs, written straight from the
 *   issue's geometry: T(θ) = Rz(θ1)·Tr(a1,0,c1)·Ry(θ2)·Tr(0,0,c2)·Ry(θ3)·Tr(c3,b,a2)·Rx(θ4)·Ry(θ5)·Rx(θ6)·
 *   Tr(c4,0,0)·Ry(90°), with θ = sign·q + zeroOffset;
 * - the same arm as a standard DH table (Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, ch. 3,
 *   Aᵢ = Rz(θ)·Tz(d)·Tx(a)·Rx(α)), derived by hand below and multiplied by mathjs (test/helpers/testArms.ts);
 * - the same arm as joint frames (origin and axis, as URDF), the signs folded into the axes and the zero offsets
 *   into the origins by hand;
 * - the demo arm Corvell Tern 7 (arms/corvell-tern-7.json, written as a DH table before this form existed),
 *   transcribed into the dimension form by reading its table.
 *
 * Hand derivation of the DH table of the drawing (all θ offsets and signs zero/+1). Row i: (θ offset, d, a, α).
 *  1: (0, c1, a1, −90°): frame 1 at (a1, 0, c1), x₁ = +x, z₁ = +y (axis 2), y₁ = −z.
 *  2: (−90°, b, c2, 0): d = b moves along z₁ = +y; θ = −90° turns x₂ onto +z, so the upper arm points up and
 *     frame 2 sits at (a1, b, c1 + c2) (axis 3, along z₂ = +y); y₂ = z₂ × x₂ = +x.
 *  3: (0, 0, a2, −90°): a2 along x₃ = +z gives (a1, b, c1 + c2 + a2); Rx(−90°) takes z₃ onto y₂ = +x (axis 4);
 *     y₃ = −z₂ = −y.
 *  4: (0, c3, 0, +90°): d = c3 along z₃ = +x gives the wrist centre (a1 + c3, b, c1 + c2 + a2); z₄ = −y₃ = +y
 *     (axis 5); y₄ = z₃ = +x; x₄ = +z.
 *  5: (0, 0, 0, −90°): z₅ = y₄ = +x (axis 6); x₅ = +z.
 *  6: (180°, c4, 0, 0): d = c4 along +x gives the flange centre; the half turn takes x₆ from +z to −z (flange x
 *     along −z, flange z along +x, as the issue states).
 * Every axis points the way the right-hand rules ask (z₁ = +y: positive θ2 tilts the upper arm to +x), so
 * the DH joint variables equal θ.
 */
import { fileURLToPath } from "node:url";
import { readFileSync } from "node:fs";
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import {
  compileChain,
  createScratch,
  dimensionsAsFrames,
  forwardInto,
  linkFrameInto,
  wristCentreInto,
  type ArmKinematicsInput,
} from "../../../src/core";
import { dimensionFrames, type DimensionsInput } from "../../../src/core/kinematics/dimensions";
import {
  MAX_CLOSED_FORM_SOLUTIONS,
  solveSphericalWristInto,
  sphericalWristIk,
} from "../../../src/core/kinematics/closedForm";
import { expectClose } from "../../helpers/expectClose";
import { dhFrameReference, dimensionsArmInput, flat4, type DhRowSi } from "../../helpers/testArms";
import { mulberry32, uniform } from "../../helpers/prng";

const DEG = Math.PI / 180;

/** Invented lengths (mm) with every offset non-zero, the lateral offset b included. */
const DIMS: DimensionsInput = { a1Mm: 150, a2Mm: 110, bMm: 35, c1Mm: 450, c2Mm: 600, c3Mm: 640, c4Mm: 100 };
const SIGN = [1, -1, 1, -1, 1, -1] as const;
const ZERO_OFFSET_DEG = [0, 10, 90, 0, -30, 180] as const;

function dimensionsArm(sign: readonly number[], zeroOffsetDeg: readonly number[]): ArmKinematicsInput {
  return dimensionsArmInput(DIMS, sign, zeroOffsetDeg);
}

/** θ = sign·q + zeroOffset (rad). */
function modelAngles(q: readonly number[]): number[] {
  return q.map((qi, i) => SIGN[i]! * qi + ZERO_OFFSET_DEG[i]! * DEG);
}

// ---- the independent mathjs product of the geometry (SI) ----
type M4 = number[][];
const c = Math.cos,
  s = Math.sin;
const rotZ = (t: number): M4 => [
  [c(t), -s(t), 0, 0],
  [s(t), c(t), 0, 0],
  [0, 0, 1, 0],
  [0, 0, 0, 1],
];
const rotY = (t: number): M4 => [
  [c(t), 0, s(t), 0],
  [0, 1, 0, 0],
  [-s(t), 0, c(t), 0],
  [0, 0, 0, 1],
];
const rotX = (t: number): M4 => [
  [1, 0, 0, 0],
  [0, c(t), -s(t), 0],
  [0, s(t), c(t), 0],
  [0, 0, 0, 1],
];
const tr = (x: number, y: number, z: number): M4 => [
  [1, 0, 0, x],
  [0, 1, 0, y],
  [0, 0, 1, z],
  [0, 0, 0, 1],
];
/** Exact Ry(90°): flange z along +x, flange x along −z (columns). */
const FLANGE_TURN: M4 = [
  [0, 0, 1, 0],
  [0, 1, 0, 0],
  [-1, 0, 0, 0],
  [0, 0, 0, 1],
];

function drawingReference(d: DimensionsInput, theta: readonly number[]): number[] {
  const m = (x: number) => x / 1000;
  const factors: M4[] = [
    rotZ(theta[0]!),
    tr(m(d.a1Mm), 0, m(d.c1Mm)),
    rotY(theta[1]!),
    tr(0, 0, m(d.c2Mm)),
    rotY(theta[2]!),
    tr(m(d.c3Mm), m(d.bMm), m(d.a2Mm)),
    rotX(theta[3]!),
    rotY(theta[4]!),
    rotX(theta[5]!),
    tr(m(d.c4Mm), 0, 0),
    FLANGE_TURN,
  ];
  return flat4(factors.reduce((acc, f) => math.multiply(acc, f) as M4));
}

/** The hand-derived DH table of the drawing (header comment), SI. */
function drawingDhRows(d: DimensionsInput): DhRowSi[] {
  const m = (x: number) => x / 1000;
  return [
    { theta: 0, d: m(d.c1Mm), a: m(d.a1Mm), alpha: -90 * DEG },
    { theta: -90 * DEG, d: m(d.bMm), a: m(d.c2Mm), alpha: 0 },
    { theta: 0, d: 0, a: m(d.a2Mm), alpha: -90 * DEG },
    { theta: 0, d: m(d.c3Mm), a: 0, alpha: 90 * DEG },
    { theta: 0, d: 0, a: 0, alpha: -90 * DEG },
    { theta: 180 * DEG, d: m(d.c4Mm), a: 0, alpha: 0 },
  ];
}

/** The same rows as an arm file's dh convention (mm, deg); the signs and offsets of SIGN/ZERO_OFFSET_DEG are
 * applied by the caller (the DH variable is θ). */
function drawingDhArm(d: DimensionsInput): ArmKinematicsInput {
  return {
    convention: "dh",
    joints: drawingDhRows(d).map((r, i) => ({
      name: `J${i + 1}`,
      kind: "revolute" as const,
      dh: { aMm: r.a * 1000, alphaDeg: r.alpha / DEG, dMm: r.d * 1000, thetaDeg: r.theta / DEG },
      rangeDeg: [-360, 360],
      maxSpeedDegPerS: 200,
    })),
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
}

/**
 * The same arm as joint frames, by hand: Rot(a, sign·q + off) = Rot(a, off)·Rot(sign·a, q), so each origin carries
 * the zero offset as a turn about the joint's own axis (rpy about x, y or z) and the axis is sign·a.
 */
function drawingFramesArm(d: DimensionsInput): ArmKinematicsInput {
  const rpyAbout = (axis: number, deg: number) => [axis === 0 ? deg : 0, axis === 1 ? deg : 0, axis === 2 ? deg : 0];
  const axisIndex = [2, 1, 1, 0, 1, 0];
  const xyz = [
    [0, 0, 0],
    [d.a1Mm, 0, d.c1Mm],
    [0, 0, d.c2Mm],
    [d.c3Mm, d.bMm, d.a2Mm],
    [0, 0, 0],
    [0, 0, 0],
  ];
  return {
    convention: "frames",
    joints: xyz.map((p, i) => {
      const axis = [0, 0, 0];
      axis[axisIndex[i]!] = SIGN[i]!;
      return {
        name: `J${i + 1}`,
        kind: "revolute" as const,
        origin: { xyzMm: p, rpyDeg: rpyAbout(axisIndex[i]!, ZERO_OFFSET_DEG[i]!) },
        axis,
        rangeDeg: [-360, 360],
        maxSpeedDegPerS: 200,
      };
    }),
    flange: { xyzMm: [d.c4Mm, 0, 0], rpyDeg: [0, 90, 0] },
  };
}

function position(t: ArrayLike<number>): number[] {
  return [t[3]!, t[7]!, t[11]!];
}
function column(t: ArrayLike<number>, k: number): number[] {
  return [t[k]!, t[4 + k]!, t[8 + k]!];
}

describe("dimensionFrames and compileChain(dimensions): the zero pose and signs worked by hand", () => {
  // Worked by hand from issue 14 §1 with a1 150, a2 110, b 35, c1 450, c2 600, c3 640, c4 100 mm (all signs +1,
  // no zero offsets):
  //   θ = 0: wrist centre (a1 + c3, b, c1 + c2 + a2) = (790, 35, 1160); flange (a1 + c3 + c4, b, …) = (890, 35, 1160),
  //     flange z = +x, flange x = −z.
  //   θ2 = 90°: the upper arm lies along +x, axis 3 at x = a1 + c2 = 750, z = c1 = 450; the forearm points down:
  //     Ry(90°)·(c3, b, a2) = (a2, b, −c3), wrist (150 + 600 + 110, 35, 450 − 640) = (860, 35, −190); flange
  //     c4 further down: (860, 35, −290); flange z = −z (down), flange x = Ry(90°)·(−z) = −x.
  //   θ3 = −90°: the forearm turns up: Ry(−90°)·(c3, b, a2) = (−a2, b, c3), wrist (40, 35, 1690), flange (40, 35, 1790).
  //   θ1 = 90°: Rz(90°) maps (x, y, z) to (−y, x, z): flange (−35, 890, 1160).
  //   θ5 = 90°: the flange turns down about the wrist centre: (790, 35, 1060).
  //   θ4 = 90°, θ5 = 90°: Rx(90°)·Ry(90°)·(c4, 0, 0) = Rx(90°)·(0, 0, −c4) = (0, c4, 0): flange (790, 135, 1160).
  const chain = compileChain(dimensionsArm([1, 1, 1, 1, 1, 1], [0, 0, 0, 0, 0, 0]));
  const k = createScratch(chain);
  const cases: [string, number[], number[], number[] | null, number[] | null][] = [
    ["θ = 0", [0, 0, 0, 0, 0, 0], [890, 35, 1160], [1, 0, 0], [0, 0, -1]],
    ["θ2 = 90°", [0, 90, 0, 0, 0, 0], [860, 35, -290], [0, 0, -1], [-1, 0, 0]],
    ["θ3 = −90°", [0, 0, -90, 0, 0, 0], [40, 35, 1790], [0, 0, 1], null],
    ["θ1 = 90°", [90, 0, 0, 0, 0, 0], [-35, 890, 1160], [0, 1, 0], null],
    ["θ5 = 90°", [0, 0, 0, 0, 90, 0], [790, 35, 1060], [0, 0, -1], null],
    ["θ4 = θ5 = 90°", [0, 0, 0, 90, 90, 0], [790, 135, 1160], [0, 1, 0], null],
  ];
  it.each(cases)("%s: flange position and axes as worked by hand (1e-12 m)", (_name, deg, pMm, z, x) => {
    const t = forwardInto(
      chain,
      deg.map((v) => v * DEG),
      k,
    );
    expectClose(
      position(t),
      pMm.map((v) => v / 1000),
      1e-12,
      "flange position, m",
    );
    if (z) expectClose(column(t, 2), z, 1e-12, "flange z");
    if (x) expectClose(column(t, 0), x, 1e-12, "flange x");
  });

  it("the wrist centre is found where axes 4, 5, 6 meet, at (a1 + c3, b, c1 + c2 + a2) = (790, 35, 1160) mm", () => {
    expect(chain.wrist?.basis).toBe("spherical");
    forwardInto(chain, [0, 0, 0, 0, 0, 0], k);
    const w = new Float64Array(3);
    expect(wristCentreInto(w, chain, k)).toBe(true);
    expectClose(w, [0.79, 0.035, 1.16], 1e-12, "wrist centre, m");
  });

  it("dimensionFrames gives the documented example (joint origins, flange)", () => {
    // dimensions.ts @example: a1 150, a2 110, b 0, c1 450, c2 600, c3 640, c4 100.
    const f = dimensionFrames({ a1Mm: 150, a2Mm: 110, bMm: 0, c1Mm: 450, c2Mm: 600, c3Mm: 640, c4Mm: 100 });
    expect(f.joints[1]!.origin.xyzMm).toEqual([150, 0, 450]);
    expect(f.joints[3]!.origin.xyzMm).toEqual([640, 0, 110]);
    expect(f.flange).toEqual({ xyzMm: [100, 0, 0], rpyDeg: [0, 90, 0] });
    const chain0 = compileChain({
      convention: "dimensions",
      dimensions: { a1Mm: 150, a2Mm: 110, bMm: 0, c1Mm: 450, c2Mm: 600, c3Mm: 640, c4Mm: 100 },
      joints: dimensionsArm([1, 1, 1, 1, 1, 1], [0, 0, 0, 0, 0, 0]).joints,
    });
    expectClose(position(forwardInto(chain0, [0, 0, 0, 0, 0, 0], createScratch(chain0))), [0.89, 0, 1.16], 1e-12, "");
  });
});

describe("compileChain(dimensions) against mathjs, DH and frames at random joint values", () => {
  it("dimensions, the mathjs product, the DH table and the frames arm give the same pose (1e-12)", () => {
    const dims = compileChain(dimensionsArm(SIGN, ZERO_OFFSET_DEG));
    const dh = compileChain(drawingDhArm(DIMS));
    const frames = compileChain(drawingFramesArm(DIMS));
    const [kd, kh, kf] = [createScratch(dims), createScratch(dh), createScratch(frames)];
    const rows = drawingDhRows(DIMS);
    const rand = mulberry32(0x14d);
    let worst = 0;
    for (let trial = 0; trial < 200; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -2 * Math.PI, 2 * Math.PI));
      const theta = modelAngles(q);
      const reference = drawingReference(DIMS, theta); // mathjs, issue 14 §1
      const poseDims = Array.from(forwardInto(dims, q, kd));
      expectClose(poseDims, reference, 1e-12, `dimensions vs mathjs, trial ${trial}`);
      expectClose(flat4(dhFrameReference(rows, theta)), reference, 1e-12, `mathjs DH vs mathjs drawing, ${trial}`);
      expectClose(forwardInto(dh, theta, kh), poseDims, 1e-12, `dh vs dimensions, trial ${trial}`);
      expectClose(forwardInto(frames, q, kf), poseDims, 1e-12, `frames vs dimensions, trial ${trial}`);
      for (let i = 0; i < 16; i++) worst = Math.max(worst, Math.abs(poseDims[i]! - reference[i]!));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it("dimensionsAsFrames folds sign and zero offset into axes and origins; G stays the identity", () => {
    // Rot(a, s·q + o) = Rot(a, o)·Rot(s·a, q); G = I and no offset (the closed-form inverse needs a unit diagonal).
    const frames = dimensionsAsFrames(dimensionsArm(SIGN, ZERO_OFFSET_DEG));
    const byHand = drawingFramesArm(DIMS);
    expect(frames.convention).toBe("frames");
    expect(frames.joints.map((j) => [j.origin, j.axis, j.sign, j.zeroOffsetDeg])).toEqual(
      byHand.joints.map((j) => [j.origin, j.axis, undefined, undefined]),
    );
    expect(frames.flange).toEqual(byHand.flange);
    const chain = compileChain(frames);
    for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) expect(chain.couplingGain[i * 6 + j]).toBe(i === j ? 1 : 0);
    expect(Array.from(chain.couplingOffset)).toEqual([0, 0, 0, 0, 0, 0]);
  });

  it("each link frame (links[].comMm) is the drawing's frame after the joint: parallel to the base at θ = 0", () => {
    // Link frame of joint k = the mathjs product up to and including Rot(θk) (dimensions.ts header); 1e-12.
    const chain = compileChain(dimensionsArm(SIGN, ZERO_OFFSET_DEG));
    const k = createScratch(chain);
    const m = (x: number) => x / 1000;
    const rand = mulberry32(0x11);
    const out = new Float64Array(16);
    for (let trial = 0; trial < 20; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const t = modelAngles(q);
      const factors: M4[][] = [
        [rotZ(t[0]!)],
        [tr(m(DIMS.a1Mm), 0, m(DIMS.c1Mm)), rotY(t[1]!)],
        [tr(0, 0, m(DIMS.c2Mm)), rotY(t[2]!)],
        [tr(m(DIMS.c3Mm), m(DIMS.bMm), m(DIMS.a2Mm)), rotX(t[3]!)],
        [rotY(t[4]!)],
        [rotX(t[5]!)],
      ];
      forwardInto(chain, q, k);
      let acc: M4 = tr(0, 0, 0);
      factors.forEach((fs, i) => {
        for (const f of fs) acc = math.multiply(acc, f) as M4;
        expectClose(linkFrameInto(out, chain, k, i), flat4(acc), 1e-12, `link frame ${i + 1}, trial ${trial}`);
      });
    }
  });
});

describe("the closed-form inverse applies to a dimensions arm", () => {
  it("sphericalWristIk finds the chain and FK(IK(x)) = x with x's own joints among the solutions", () => {
    // Pieper decoupling (closedForm.ts); reference FK is the mathjs product above.
    const chain = compileChain(dimensionsArm(SIGN, ZERO_OFFSET_DEG));
    const ik = sphericalWristIk(chain);
    expect(ik).not.toBeNull();
    const out = new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * 6);
    const rand = mulberry32(7);
    for (let p = 0; p < 30; p++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const target = drawingReference(DIMS, modelAngles(q));
      const n = solveSphericalWristInto(out, ik!, target);
      expect(n).toBeGreaterThanOrEqual(1);
      let own = Infinity;
      for (let k = 0; k < n; k++) {
        const sol = Array.from(out.subarray(6 * k, 6 * k + 6));
        expectClose(drawingReference(DIMS, modelAngles(sol)), target, 1e-6, `solution ${k} of pose ${p}`);
        own = Math.min(own, Math.max(...sol.map((v, i) => Math.abs(v - q[i]!))));
      }
      expect(own).toBeLessThan(1e-6);
    }
  });
});

describe("a demo arm's DH table transcribed into the dimension form", () => {
  it("arms/corvell-tern-7.json (dh) equals a1 75, a2 45, b 0, c1 340, c2 360, c3 400, c4 80, J6 zero offset 180°", () => {
    // Read off the file's DH rows by the derivation in this file's header: row 1 (a 75, d 340) → a1, c1; row 2
    // (a 360, θ −90°) → c2; row 3 (a 45) → a2; row 4 (d 400) → c3; row 6 (d 80, θ 0 instead of 180°) → c4 and
    // a half-turn zero offset on J6.
    const file = fileURLToPath(new URL("../../../arms/corvell-tern-7.json", import.meta.url));
    const spec = JSON.parse(readFileSync(file, "utf8")) as ArmKinematicsInput;
    const dhChain = compileChain(spec);
    const dimsChain = compileChain({
      convention: "dimensions",
      dimensions: { a1Mm: 75, a2Mm: 45, bMm: 0, c1Mm: 340, c2Mm: 360, c3Mm: 400, c4Mm: 80 },
      joints: spec.joints.map((j, i) => ({ ...j, dh: undefined, zeroOffsetDeg: i === 5 ? 180 : 0 })),
    });
    const [ka, kb] = [createScratch(dhChain), createScratch(dimsChain)];
    const rand = mulberry32(0x7e7);
    for (let trial = 0; trial < 100; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      expectClose(forwardInto(dimsChain, q, kb), forwardInto(dhChain, q, ka), 1e-12, `trial ${trial}`);
    }
  });
});

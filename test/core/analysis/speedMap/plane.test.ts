/**
 * Side-view plane and cell targets of the speed maps (src/core/analysis/speedMap/plane.ts), against hand-worked
 * geometry: the plane of the generic 6R (axis 1 = base z through the origin), of invented arms whose axis 1 is
 * flipped, tilted or horizontal, and of a gantry; target rotations checked orthonormal with det +1 by ml-matrix.
 */
import { describe, expect, it } from "vitest";
import { Matrix, determinant } from "ml-matrix";
import { compileChain } from "../../../../src/core";
import type { ArmKinematicsInput, JointInput } from "../../../../src/core/kinematics/compile";
import {
  mapGrid,
  sampledBounds,
  sidePlane,
  targetInto,
  targetPositionInto,
  type Plane,
} from "../../../../src/core/analysis/speedMap/plane";
import { expectClose } from "../../../helpers/expectClose";
import { cylindricalPrismaticDh, generic6rDh } from "../../../helpers/testArms";

const FLOOR = [0, 0, -1] as const;
const CEILING = [0, 0, 1] as const;
const S2 = Math.SQRT1_2;

/** An invented 2-joint arm whose axis 1 passes through (300, 100, 200) mm along `axis1`. */
function arm(axis1: number[], firstKind: "revolute" | "prismatic" = "revolute"): ArmKinematicsInput {
  const j = (name: string, kind: "revolute" | "prismatic", xyzMm: number[], axis: number[]): JointInput => ({
    name,
    kind,
    origin: { xyzMm, rpyDeg: [0, 0, 0] },
    axis,
    ...(kind === "revolute" ? { rangeDeg: [-170, 170], maxSpeedDegPerS: 100 } : { rangeMm: [0, 500] }),
    ...(kind === "prismatic" ? { maxSpeedMmPerS: 500 } : {}),
  });
  return {
    convention: "frames",
    joints: [j("j1", firstKind, [300, 100, 200], axis1), j("j2", "revolute", [0, 0, 400], [0, 1, 0])],
    flange: { xyzMm: [500, 0, 0], rpyDeg: [0, 0, 0] },
  };
}

function rotationOf(t: Float64Array): number[][] {
  return [0, 1, 2].map((r) => [t[4 * r]!, t[4 * r + 1]!, t[4 * r + 2]!]);
}

/** ml-matrix: RᵀR = I and det R = +1. */
function expectProperRotation(t: Float64Array, label: string): void {
  const r = new Matrix(rotationOf(t));
  expectClose(r.transpose().mmul(r).to1DArray(), Matrix.eye(3).to1DArray(), 1e-12, `${label}: RᵀR`);
  expectClose(determinant(r), 1, 1e-12, `${label}: det`);
  expectClose([t[12]!, t[13]!, t[14]!, t[15]!], [0, 0, 0, 1], 0, `${label}: bottom row`);
}

function expectPlane(p: Plane, want: Plane, label: string): void {
  expectClose(p.o, want.o, 1e-12, `${label}: origin`);
  expectClose(p.radial, want.radial, 1e-12, `${label}: radial`);
  expectClose(p.up, want.up, 1e-12, `${label}: up`);
}

describe("sidePlane", () => {
  it("generic 6R: axis 1 is base z through the origin, radial = base x (hand: DH row 1 has θ about base z)", () => {
    const chain = compileChain(generic6rDh());
    const want = { o: [0, 0, 0], radial: [1, 0, 0], up: [0, 0, 1] };
    expectPlane(sidePlane(chain, FLOOR), want, "floor");
    // documented: axis 1 is oriented along base +z whatever the mounting, so a ceiling arm has the same plane
    expectPlane(sidePlane(chain, CEILING), want, "ceiling");
  });

  it("axis 1 along −z through (0.3, 0.1, 0.2) m: flipped to +z, origin the axis point nearest the base origin", () => {
    // hand: nearest point of the line {(0.3, 0.1, t)} to the origin is (0.3, 0.1, 0)
    expectPlane(
      sidePlane(compileChain(arm([0, 0, -1])), FLOOR),
      { o: [0.3, 0.1, 0], radial: [1, 0, 0], up: [0, 0, 1] },
      "flipped",
    );
  });

  it("axis 1 tilted 45° in x–z: radial is base x made perpendicular, origin worked by hand", () => {
    // hand: z = (1, 0, 1)/√2; x − (x·z)z = (½, 0, −½) → (1, 0, −1)/√2; nearest point of (0.3, 0.1, 0.2) + t·z to
    // the origin: t = −(0.3 + 0.2)/√2, point (0.3 − 0.25, 0.1, 0.2 − 0.25) = (0.05, 0.1, −0.05)
    expectPlane(
      sidePlane(compileChain(arm([1, 0, 1])), FLOOR),
      { o: [0.05, 0.1, -0.05], radial: [S2, 0, -S2], up: [S2, 0, S2] },
      "tilted",
    );
  });

  it("horizontal axis 1: along ±x is oriented +x and radial falls back to base y; along y radial stays x", () => {
    // hand: z = ±x ⇒ sign from z_x; x made perpendicular to x vanishes ⇒ y; nearest point of the line
    // {(t, 0.1, 0.2)} to the origin is (0, 0.1, 0.2)
    const want = { o: [0, 0.1, 0.2], radial: [0, 1, 0], up: [1, 0, 0] };
    expectPlane(sidePlane(compileChain(arm([1, 0, 0])), FLOOR), want, "+x");
    expectPlane(sidePlane(compileChain(arm([-1, 0, 0])), FLOOR), want, "−x");
    expectPlane(
      sidePlane(compileChain(arm([0, 1, 0])), FLOOR),
      { o: [0.3, 0, 0.2], radial: [1, 0, 0], up: [0, 1, 0] },
      "+y",
    );
  });

  it("gantry (first axis prismatic): the base x–z plane", () => {
    expectPlane(
      sidePlane(compileChain(arm([0, 0, 1], "prismatic")), FLOOR),
      { o: [0, 0, 0], radial: [1, 0, 0], up: [0, 0, 1] },
      "gantry",
    );
  });

  it("the plane frame is orthonormal for every test arm (radial ⊥ up, both unit; origin ⊥ up)", () => {
    for (const input of [generic6rDh(), cylindricalPrismaticDh(), arm([1, 0, 1]), arm([0.3, -0.2, 0.9])]) {
      const p = sidePlane(compileChain(input), FLOOR);
      const dot = (a: readonly number[], b: readonly number[]) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
      expectClose([dot(p.radial, p.radial), dot(p.up, p.up), dot(p.radial, p.up), dot(p.o, p.up)], [1, 1, 0, 0], 1e-12);
    }
  });
});

describe("targetInto / targetPositionInto", () => {
  const plane6r: Plane = { o: [0, 0, 0], radial: [1, 0, 0], up: [0, 0, 1] };

  it('floor, "down": tool z along gravity, tool x outward — Rx(180°) = diag(1, −1, −1); position (r, 0, z)', () => {
    const t = targetInto(new Float64Array(16), plane6r, 1.2, 0.7, "down", FLOOR, 1);
    expectProperRotation(t, "floor down");
    // hand: z = (0, 0, −1), x = (1, 0, 0), y = z × x = (0, −1, 0)
    expectClose(rotationOf(t).flat(), [1, 0, 0, 0, -1, 0, 0, 0, -1], 1e-15, "floor down R");
    expectClose([t[3]!, t[7]!, t[11]!], [1.2, 0, 0.7], 1e-15, "floor down p");
  });

  it('ceiling, "down": tool z along gravity (base +z), x outward ⇒ R = I; with outwardSign −1 ⇒ diag(−1, −1, 1)', () => {
    const t = targetInto(new Float64Array(16), plane6r, 0.9, -0.4, "down", CEILING, 1);
    expectProperRotation(t, "ceiling down");
    expectClose(rotationOf(t).flat(), [1, 0, 0, 0, 1, 0, 0, 0, 1], 1e-15, "ceiling down R");
    expectClose([t[3]!, t[7]!, t[11]!], [0.9, 0, -0.4], 1e-15, "ceiling down p");
    // hand: x = (−1, 0, 0), y = z × x = (0, 0, 1) × (−1, 0, 0) = (0, −1, 0)
    const u = targetInto(new Float64Array(16), plane6r, -0.1, 0.3, "down", CEILING, -1);
    expectProperRotation(u, "ceiling down, inward");
    expectClose(rotationOf(u).flat(), [-1, 0, 0, 0, -1, 0, 0, 0, 1], 1e-15, "ceiling down inward R");
    expectClose([u[3]!, u[7]!, u[11]!], [-0.1, 0, 0.3], 1e-15, "behind axis 1: r < 0 along −radial");
  });

  it('floor, "outward": tool z along radial, tool x towards gravity', () => {
    const t = targetInto(new Float64Array(16), plane6r, 1, 1, "outward", FLOOR, 1);
    expectProperRotation(t, "floor outward");
    // hand: z = (1, 0, 0), x = (0, 0, −1), y = z × x = (0, 1, 0); R columns x y z
    expectClose(rotationOf(t).flat(), [0, 0, 1, 0, 1, 0, -1, 0, 0], 1e-15, "floor outward R");
  });

  it("tilted plane: hand-worked position, and the defining properties (p − o)·radial = r, p·up = z", () => {
    const p = sidePlane(compileChain(arm([1, 0, 1])), FLOOR);
    const out = targetPositionInto(new Float64Array(16), p, 1, 2);
    // hand: p₀ = o + 1·radial = (0.05 + √2/2, 0.1, −0.05 − √2/2), p₀·up = 0, p = p₀ + 2·up
    expectClose(
      [out[3]!, out[7]!, out[11]!],
      [0.05 + 1.5 * Math.SQRT2, 0.1, -0.05 + 0.5 * Math.SQRT2],
      1e-12,
      "tilted p",
    );
    for (const [r, z] of [
      [0, 0],
      [-0.3, 1.1],
      [2.2, -0.7],
    ] as const) {
      targetPositionInto(out, p, r, z);
      const d = [out[3]! - p.o[0]!, out[7]! - p.o[1]!, out[11]! - p.o[2]!];
      expectClose(d[0]! * p.radial[0]! + d[1]! * p.radial[1]! + d[2]! * p.radial[2]!, r, 1e-12, "radial coordinate");
      expectClose(out[3]! * p.up[0]! + out[7]! * p.up[1]! + out[11]! * p.up[2]!, z, 1e-12, "height along up");
      // and the point lies in the plane spanned by radial and up through o (component along radial × up is 0)
      const n = [
        p.radial[1]! * p.up[2]! - p.radial[2]! * p.up[1]!,
        p.radial[2]! * p.up[0]! - p.radial[0]! * p.up[2]!,
        p.radial[0]! * p.up[1]! - p.radial[1]! * p.up[0]!,
      ];
      expectClose(d[0]! * n[0]! + d[1]! * n[1]! + d[2]! * n[2]!, 0, 1e-12, "in the plane");
    }
  });

  it("targetPositionInto changes only the position column", () => {
    const t = targetInto(new Float64Array(16), plane6r, 1, 1, "down", FLOOR, 1);
    const before = Array.from(t);
    targetPositionInto(t, plane6r, 0.5, -0.2);
    for (const k of [0, 1, 2, 4, 5, 6, 8, 9, 10, 12, 13, 14, 15]) expect(t[k]).toBe(before[k]);
    expectClose([t[3]!, t[7]!, t[11]!], [0.5, 0, -0.2], 1e-15, "moved p");
  });
});

describe("mapGrid", () => {
  it("hand-worked grid: two columns behind axis 1, z floored to the step", () => {
    // hand: zMin = ⌊−250/100⌋·100 = −300; rMin = −200; nx = ⌈(1000 + 200)/100⌉ + 1 = 13;
    // ny = ⌈(1730 + 300)/100⌉ + 1 = 22
    expect(mapGrid({ rMax: 1000, zMin: -250, zMax: 1730 }, 100)).toEqual({
      nx: 13,
      ny: 22,
      rMinMm: -200,
      zMinMm: -300,
      stepMm: 100,
    });
  });

  it("rejects a non-positive step", () => {
    expect(() => mapGrid({ rMax: 1, zMin: 0, zMax: 1 }, 0)).toThrow(RangeError);
    expect(() => mapGrid({ rMax: 1, zMin: 0, zMax: 1 }, Number.NaN)).toThrow(RangeError);
  });
});

describe("sampledBounds", () => {
  // Hand reach of the generic 6R flange: distance from axis 1 ≤ a₁ + a₂ + √(a₃² + d₄²) + d₆ = 0.2 + 1 + √1.04 + 0.1,
  // reached with the arm stretched horizontally; height within 0.5 ± (1 + √1.04 + 0.1) (the shoulder is at 0.5 m).
  const reach = 1.3 + Math.sqrt(1.04);
  const arm2 = 1.1 + Math.sqrt(1.04);
  const chain = compileChain(generic6rDh());
  const plane = sidePlane(chain, FLOOR);
  const b = sampledBounds(chain, plane, 7);

  it("covers the true reach (the margin makes up for sampling) and stays within reach + the 6 % margin", () => {
    const span = 2 * arm2;
    const margin = 0.06 * Math.max(reach, span);
    expect(b.rMax).toBeGreaterThanOrEqual(reach * 1000);
    expect(b.rMax).toBeLessThanOrEqual((reach + margin) * 1000 + 1e-9);
    expect(b.zMax).toBeGreaterThanOrEqual((0.5 + arm2) * 1000);
    expect(b.zMin).toBeLessThanOrEqual((0.5 - arm2) * 1000);
    expect(b.zMax).toBeLessThanOrEqual((0.5 + arm2 + margin) * 1000 + 1e-9);
    expect(b.zMin).toBeGreaterThanOrEqual((0.5 - arm2 - margin) * 1000 - 1e-9);
  });

  it("is a function of the seed", () => {
    expect(sampledBounds(chain, plane, 7)).toEqual(b);
    expect(sampledBounds(chain, plane, 8)).not.toEqual(b);
  });
});

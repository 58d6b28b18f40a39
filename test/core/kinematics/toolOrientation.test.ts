/**
 * Tests of src/core/kinematics/toolOrientation.ts: rpyToolRotation against URDF roll-pitch-yaw written out by hand
 * with ml-matrix products; referenceToolRotation against closed-form tool axes of a floor and a ceiling arm.
 */
import { determinant, Matrix } from "ml-matrix";
import { describe, it } from "vitest";
import { compileChain } from "../../../src/core";
import {
  referenceAxesInto,
  referenceToolRotation,
  rpyToolRotation,
} from "../../../src/core/kinematics/toolOrientation";
import { mulberry32 } from "../../../src/core/math/random";
import { expectClose } from "../../helpers/expectClose";
import { generic6rDh } from "../../helpers/testArms";

const CHAIN_6R = compileChain(generic6rDh());

describe("orientation helpers", () => {
  it("rpyToolRotation = Rz(yaw)·Ry(pitch)·Rx(roll) (URDF fixed axes), products by ml-matrix", () => {
    const [roll, pitch, yaw] = [0.3, -0.7, 1.1];
    const rx = new Matrix([
      [1, 0, 0],
      [0, Math.cos(roll), -Math.sin(roll)],
      [0, Math.sin(roll), Math.cos(roll)],
    ]);
    const ry = new Matrix([
      [Math.cos(pitch), 0, Math.sin(pitch)],
      [0, 1, 0],
      [-Math.sin(pitch), 0, Math.cos(pitch)],
    ]);
    const rz = new Matrix([
      [Math.cos(yaw), -Math.sin(yaw), 0],
      [Math.sin(yaw), Math.cos(yaw), 0],
      [0, 0, 1],
    ]);
    expectClose(rpyToolRotation(roll, pitch, yaw), rz.mmul(ry).mmul(rx).to1DArray(), 1e-15, "rpy");
  });

  it("referenceToolRotation: 'down' and 'outward' for a floor arm with axis 1 along base z (closed form)", () => {
    // down at (1, 0, 0.5): z = gravity (0, 0, −1), x = outward (1, 0, 0), y = z × x = (0, −1, 0).
    expectClose(
      referenceToolRotation(CHAIN_6R, "down", [1, 0, 0.5], [0, 0, -1]),
      [1, 0, 0, 0, -1, 0, 0, 0, -1],
      1e-15,
      "down",
    );
    // outward at (0, 2, 0.5): z = (0, 1, 0), x = gravity (0, 0, −1), y = z × x = (−1, 0, 0).
    expectClose(
      referenceToolRotation(CHAIN_6R, "outward", [0, 2, 0.5], [0, 0, -1]),
      [0, -1, 0, 0, 0, 1, -1, 0, 0],
      1e-15,
      "outward",
    );
    // Ceiling mounting (gravity along base +z): down = tool z along +z.
    const ceiling = referenceToolRotation(CHAIN_6R, "down", [1, 0, 0.5], [0, 0, 1]);
    expectClose([ceiling[2]!, ceiling[5]!, ceiling[8]!], [0, 0, 1], 1e-15, "ceiling down");
  });
});

describe("referenceAxesInto: the one builder of the reference tool orientations", () => {
  // Closed form: for unit z and a lean direction t not parallel to z, x = (t − (t·z)z)/|…|, y = z × x; the result
  // is a rotation (RᵀR = I, det R = +1 checked with ml-matrix's determinant).
  const rotationOf = (out: Float64Array, stride: 3 | 4) =>
    new Matrix([0, 1, 2].map((i) => [0, 1, 2].map((j) => out[i * stride + j]!)));

  it("'down' on a wall: tool z along gravity (+x), tool x towards the outward direction made perpendicular", () => {
    const g = [1, 0, 0],
      outward = [0.6, 0.8, 0];
    const r = rotationOf(referenceAxesInto(new Float64Array(9), "down", outward, g, 3), 3);
    // x = (0.6, 0.8, 0) − 0.6·(1, 0, 0) = (0, 0.8, 0) → (0, 1, 0); y = z × x = (1,0,0) × (0,1,0) = (0, 0, 1)
    expectClose(r.getColumn(0), [0, 1, 0], 1e-15, "x");
    expectClose(r.getColumn(1), [0, 0, 1], 1e-15, "y");
    expectClose(r.getColumn(2), [1, 0, 0], 1e-15, "z");
  });

  it("'outward' leans tool x towards gravity, and writes the rotation block of a 4×4 without touching the rest", () => {
    const out = new Float64Array(16).fill(7);
    referenceAxesInto(out, "outward", [0, 1, 0], [0, 0, -1], 4);
    // z = (0, 1, 0); x = g − (g·z)z = (0, 0, −1); y = z × x = (0,1,0) × (0,0,−1) = (−1, 0, 0)
    expectClose(rotationOf(out, 4).to1DArray(), [0, -1, 0, 0, 0, 1, -1, 0, 0], 1e-15, "R");
    expectClose([out[3]!, out[7]!, out[11]!, out[12]!, out[15]!], [7, 7, 7, 7, 7], 0, "untouched");
  });

  it("falls back to the base axis least aligned with z when both directions are parallel; always a rotation", () => {
    const r = rotationOf(referenceAxesInto(new Float64Array(9), "down", [0, 0, 1], [0, 0, -1], 3), 3);
    // z = (0, 0, −1), least aligned base axis: x = (1, 0, 0); y = z × x = (0, −1, 0)
    expectClose(r.to1DArray(), [1, 0, 0, 0, -1, 0, 0, 0, -1], 1e-15, "R");
    const rnd = mulberry32(5);
    for (let k = 0; k < 50; k++) {
      const g = [rnd() - 0.5, rnd() - 0.5, rnd() - 0.5],
        o = [rnd() - 0.5, rnd() - 0.5, rnd() - 0.5];
      const gn = Math.hypot(g[0]!, g[1]!, g[2]!),
        on = Math.hypot(o[0]!, o[1]!, o[2]!);
      const name = k % 2 ? "down" : "outward";
      const m = rotationOf(
        referenceAxesInto(
          new Float64Array(9),
          name,
          o.map((v) => v / on),
          g.map((v) => v / gn),
          3,
        ),
        3,
      );
      expectClose(m.transpose().mmul(m).to1DArray(), Matrix.eye(3).to1DArray(), 1e-14, "RᵀR");
      expectClose([determinant(m)], [1], 1e-14, "det R");
    }
  });
});

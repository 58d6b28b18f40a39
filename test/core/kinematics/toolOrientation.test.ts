/**
 * Tests of src/core/kinematics/toolOrientation.ts: rpyToolRotation against URDF roll-pitch-yaw written out by hand
 * with ml-matrix products; referenceToolRotation against closed-form tool axes of a floor and a ceiling arm.
 */
import { Matrix } from "ml-matrix";
import { describe, it } from "vitest";
import { compileChain } from "../../../src/core";
import { referenceToolRotation, rpyToolRotation } from "../../../src/core/kinematics/toolOrientation";
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

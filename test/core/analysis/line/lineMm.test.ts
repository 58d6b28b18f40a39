/**
 * The line check set up in file units (src/core/analysis/line/lineMm.ts): the tool rotation a line holds (worked by
 * hand for a floor arm: "down" = tool z along −z; roll 180° = URDF Rz·Ry·Rx with roll π, i.e. diag(1, −1, −1)), the
 * length by the distance formula, and the options reaching the check.
 */
import { describe, expect, it } from "vitest";
import { checkLineMm, compileChain, lineToolRotation } from "../../../../src/core";
import { expectClose } from "../../../helpers/expectClose";
import { generic6rDh } from "../../../helpers/testArms";

const chain = compileChain(generic6rDh());
const g: [number, number, number] = [0, 0, -1];

describe("lineToolRotation", () => {
  it("'down' on a floor arm: tool z along −z (the third column), a proper rotation", () => {
    const r = lineToolRotation(chain, g, [600, -200, 400], "down");
    expectClose([r[2]!, r[5]!, r[8]!], [0, 0, -1], 1e-15, "tool z");
    // det of a row-major 3×3 by the rule of Sarrus
    const det =
      r[0]! * (r[4]! * r[8]! - r[5]! * r[7]!) -
      r[1]! * (r[3]! * r[8]! - r[5]! * r[6]!) +
      r[2]! * (r[3]! * r[7]! - r[4]! * r[6]!);
    expectClose([det], [1], 1e-14, "det");
  });

  it("roll 180° is diag(1, −1, −1) (URDF fixed axes)", () => {
    expectClose(
      Array.from(lineToolRotation(chain, g, [0, 0, 0], { rpyDeg: [180, 0, 0] })),
      [1, 0, 0, 0, -1, 0, 0, 0, -1],
      1e-15,
      "R",
    );
  });
});

describe("checkLineMm", () => {
  it("reports the line's length by the distance formula, and takes samples and start joints", () => {
    const from = [600, -150, 400],
      to = [600, 150, 500];
    const r = checkLineMm(chain, g, from, to, "down", 200, { samples: 11 });
    expect(r.lengthMm).toBeCloseTo(Math.hypot(0, 300, 100), 9);
    expect(r.samples.length).toBe(11);
    const seeded = checkLineMm(chain, g, from, to, "down", 200, { samples: 11, startJointsSi: [0, 0, 0, 0, 0.5, 0] });
    expect(seeded.startRule).toBe("nearest start joints");
  });
});

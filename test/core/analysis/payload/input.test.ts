/**
 * Tests of src/core/analysis/payload/input.ts (payloadInputOf, wristLeverOf). Outside reference: CHECKS §0 generic
 * 6R (spherical wrist, flange d6 = 0.1 m beyond the wrist centre); unit conversion mm → m by definition.
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { payloadInputOf, wristLeverOf } from "../../../../src/core/analysis/payload";
import { generic6rDh } from "../../../helpers/testArms";

describe("wristLeverOf and payloadInputOf", () => {
  it("wristLeverOf(generic 6R): axes 4 and 5 bend about the wrist centre d6 = 0.1 m behind the flange; axis 6 rolls", () => {
    // CHECKS §0 generic 6R: spherical wrist, flange d6 = 0.1 m beyond the wrist centre along the flange axis.
    const chain = compileChain(generic6rDh());
    for (const k of [3, 4]) {
      const lever = wristLeverOf(chain, k);
      expect(lever).toEqual({ kind: "bend", pivotBehindFlangeM: 0.1, pivotOffAxisM: 0, basis: "wrist-centre" });
    }
    expect(wristLeverOf(chain, 5)).toEqual({
      kind: "roll",
      pivotBehindFlangeM: 0,
      pivotOffAxisM: 0,
      basis: "flange-axis",
    });
  });

  it("payloadInputOf converts names to indices and mm to m, and rejects unknown joints", () => {
    const chain = compileChain(generic6rDh());
    const input = payloadInputOf(
      {
        ratedPayloadKg: 20,
        mountings: ["floor"],
        wrist: { momentNm: { j5: 40 }, inertiaKgM2: { j5: 1, j6: 0.5 } },
        links: [{ after: "j2", massKg: 30, comMm: [-500, 0, 100] }],
      },
      chain,
    );
    expect(input.wrist.map((w) => [w.joint, w.driven])).toEqual([
      ["j5", 4],
      ["j6", 5],
    ]);
    expect(input.wrist[1]!.momentNm).toBeNaN();
    expect(input.links).toEqual([{ joint: 1, massKg: 30, comInLinkM: [-0.5, 0, 0.1] }]);
    expect(() =>
      payloadInputOf(
        { ratedPayloadKg: 1, mountings: ["floor"], links: [{ after: "nope", massKg: 1, comMm: [0, 0, 0] }] },
        chain,
      ),
    ).toThrow(/invalid joint name: nope/);
  });
});

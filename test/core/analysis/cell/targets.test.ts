/**
 * Tests of src/core/analysis/cell/targets.ts (resolveTargets). Reference: vector addition by hand (an offset in the
 * cell frame adds to the base position; orientation is copied), written out beside each check.
 */
import { describe, expect, it } from "vitest";
import { resolveTargets } from "../../../../src/core/analysis/cell/targets";
import type { TargetSpec } from "../../../../src/core/analysis/cell/types";

describe("resolveTargets", () => {
  it("follows relativeTo chains in any file order: positions add, orientation is the root's", () => {
    // place-above = place + (0, 0, 150) = (−400, 900, 750); place-far = place-above + (100, −50, 0) = (−300, 850, 750).
    const targets: TargetSpec[] = [
      { name: "place-far", relativeTo: "place-above", offsetMm: [100, -50, 0] },
      { name: "place-above", relativeTo: "place", offsetMm: [0, 0, 150] },
      { name: "place", positionMm: [-400, 900, 600], rpyDeg: [180, 0, 90] },
    ];
    expect(resolveTargets(targets)).toEqual([
      {
        name: "place-far",
        positionMm: [-300, 850, 750],
        rpyDeg: [180, 0, 90],
        relativeTo: "place-above",
        root: "place",
      },
      { name: "place-above", positionMm: [-400, 900, 750], rpyDeg: [180, 0, 90], relativeTo: "place", root: "place" },
      { name: "place", positionMm: [-400, 900, 600], rpyDeg: [180, 0, 90], relativeTo: null, root: "place" },
    ]);
  });

  it("throws a RangeError naming the target for a loop, an unknown base and a duplicate name", () => {
    const loop: TargetSpec[] = [
      { name: "a", relativeTo: "b", offsetMm: [0, 0, 1] },
      { name: "b", relativeTo: "a", offsetMm: [0, 0, 1] },
    ];
    expect(() => resolveTargets(loop)).toThrow(new RangeError("target a: relativeTo loop a → b → a"));
    expect(() => resolveTargets([{ name: "s", relativeTo: "s", offsetMm: [0, 0, 1] }])).toThrow(
      "target s: relativeTo loop s → s",
    );
    expect(() => resolveTargets([{ name: "a", relativeTo: "nowhere", offsetMm: [0, 0, 1] }])).toThrow(
      "target a: unknown relativeTo target nowhere",
    );
    const p = { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] } as const;
    expect(() =>
      resolveTargets([
        { name: "a", ...p },
        { name: "a", ...p },
      ]),
    ).toThrow("duplicate target name: a");
  });
});

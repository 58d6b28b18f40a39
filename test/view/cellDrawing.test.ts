import { describe, expect, it } from "vitest";
import type { CellSpec } from "../../src/core";
import { cellDrawings, cellFromBaseMm, pathOf, verticalAxis1, type CellArmReach } from "../../src/view/cellDrawing";
import { expectClose } from "../helpers/expectClose";
import { CELL } from "./cellFixtures";

const UPRIGHT: CellArmReach = { flangeMaxMm: 1200, axis1: { pointMm: [0, 0, 0], direction: [0, 0, 1] } };

describe("cellFromBaseMm", () => {
  it("uses the arm's own placement, else the cell's; rpy as R = Rz(yaw)·Ry(pitch)·Rx(roll)", () => {
    const yawed = cellFromBaseMm({ placement: { positionMm: [100, 200, 300], rpyDeg: [0, 0, 90] } }, "x");
    // Rz(90°) maps the base x axis onto the cell's y axis: first column (0, 1, 0); translation (100, 200, 300).
    expectClose([yawed[0]!, yawed[4]!, yawed[8]!], [0, 1, 0], 1e-12, "base x in the cell frame");
    expect([yawed[3], yawed[7], yawed[11]]).toEqual([100, 200, 300]);
    const own = cellFromBaseMm(CELL, "arm-b");
    // roll 180°: Rx(π) turns z down (ceiling).
    expectClose([own[2]!, own[6]!, own[10]!], [0, 0, -1], 1e-12, "base z of the ceiling arm");
  });
});

describe("verticalAxis1", () => {
  it("gives axis 1 in the cell frame for floor and ceiling arms, null for a tilted one or no axis", () => {
    expect(verticalAxis1(cellFromBaseMm(CELL, "arm-a"), UPRIGHT)).toEqual([0, 0, 500]);
    const ceiling = verticalAxis1(cellFromBaseMm(CELL, "arm-b"), {
      ...UPRIGHT,
      axis1: { pointMm: [0, 0, 100], direction: [0, 0, 1] },
    });
    // A point 100 mm up axis 1 of a base turned upside down at (1000, 0, 2000) lies 100 mm below it.
    expectClose(ceiling!, [1000, 0, 1900], 1e-9, "axis 1 point, ceiling");
    const wall = cellFromBaseMm({ placement: { positionMm: [0, 0, 0], rpyDeg: [90, 0, 0] } }, "x");
    expect(verticalAxis1(wall, UPRIGHT)).toBeNull();
    expect(verticalAxis1(cellFromBaseMm(CELL, "arm-a"), { flangeMaxMm: 900, axis1: null })).toBeNull();
  });
});

describe("pathOf", () => {
  it("starts the loop at the last step's target and resolves relative targets", () => {
    const path = pathOf(CELL);
    // Steps: place → above pick (joint), above pick → pick (linear), pick → place (joint). above pick = pick + 100 z.
    expect(path.map((s) => [s.step, s.motion, s.from, s.to])).toEqual([
      [1, "joint", [600, 400, 500], [600, -200, 400]],
      [2, "linear", [600, -200, 400], [600, -200, 300]],
      [3, "joint", [600, -200, 300], [600, 400, 500]],
    ]);
  });
});

describe("cellDrawings", () => {
  const arms = [
    { id: "arm-a", name: "Maker A One", shortName: "One", reach: UPRIGHT },
    { id: "arm-b", name: "Maker B Two", reach: null },
  ];
  const { top, side } = cellDrawings(CELL, arms, "cell");

  it("projects targets and bases on x–y (top) and x–z (side)", () => {
    expect(top.targets.map((t) => t.p)).toEqual([
      [600, -200],
      [600, -200],
      [600, 400],
    ]);
    expect(side.targets.map((t) => t.p)).toEqual([
      [600, 300],
      [600, 400],
      [600, 500],
    ]);
    expect(top.bases.map((b) => [b.key, b.p, b.shortLabel])).toEqual([
      ["arm-a", [0, 0], "One"],
      ["arm-b", [1000, 0], "Maker B Two"],
    ]);
    expect(side.bases[1]!.p).toEqual([1000, 2000]);
    expect(side.floor).toBe(true);
  });

  it("outlines the reach as a circle about axis 1 (top) and a span at the base's height (side)", () => {
    expect(top.bases[0]!.outline).toEqual({ kind: "circle", c: [0, 0], rMm: 1200 });
    expect(side.bases[0]!.outline).toEqual({ kind: "span", x: [-1200, 1200], y: 500 });
    expect(top.bases[1]!.outline).toBeNull();
    expect(top.caption).toMatch(/No outline for Maker B Two/);
    // The tool offset (0, 30, 40) mm is 50 mm long (3-4-5 triangle), said in the caption.
    expect(top.caption).toMatch(/up to 50\u00a0mm \(the tool offset\)/);
  });

  it("draws the joint moves dashed and the linear moves solid, by step", () => {
    expect(top.segments.map((s) => `${s.step}:${s.motion}`)).toEqual(["1:joint", "2:linear", "3:joint"]);
  });

  it("draws at most six arms and says so", () => {
    const many = Array.from({ length: 8 }, (_, i) => ({ id: `a${i}`, name: `A${i}`, reach: null }));
    const cell: CellSpec = { ...CELL, candidates: many.map((a) => a.id), placements: undefined };
    const d = cellDrawings(cell, many, "x");
    expect(d.top.bases).toHaveLength(6);
    expect(d.top.caption).toMatch(/Only the first 6 arms are drawn/);
  });
});

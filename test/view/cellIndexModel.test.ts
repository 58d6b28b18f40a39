import { describe, expect, it } from "vitest";
import { cellIndexTable, cellsUsingArms } from "../../src/view/cellIndexModel";
import { STUDY } from "./cellFixtures";

describe("cellIndexTable", () => {
  it("lists each study with its candidates, how many pass, the fastest passing arm and its cycle time", () => {
    const names = new Map([
      ["arm-a", "Maker A One"],
      ["arm-b", "Maker B Two"],
    ]);
    const t = cellIndexTable(
      [{ id: "test-cell", title: "Test cell", candidates: ["arm-a", "arm-b"], study: STUDY }],
      names,
      "/",
    );
    expect(t.rows[0]!.cells.map((c) => c.text)).toEqual(["Test cell", "2", "1 of 2", "Maker A One", "3.5"]);
    expect(t.rows[0]!.cells[0]!.href).toBe("/cells/test-cell/");
    expect(t.rows[0]!.cells[3]!.href).toBe("/arms/arm-a/");
    const none = cellIndexTable(
      [{ id: "c", title: "C", candidates: ["arm-b"], study: { cell: "c", arms: [STUDY.arms[1]!] } }],
      names,
      "/",
    );
    expect(none.rows[0]!.cells.map((c) => c.text).slice(2)).toEqual(["0 of 1", "none passes", "—"]);
  });
});

describe("cellsUsingArms", () => {
  const cells = [
    { id: "x", title: "Xylo", href: "/cells/x/", candidates: ["a", "b", "c"] },
    { id: "y", title: "Alpha", href: "/cells/y/", candidates: ["b"] },
    { id: "z", title: "Beta", href: "/cells/z/", candidates: ["d"] },
    { id: "w", title: "Gamma", href: "/cells/w/", candidates: ["c", "e"] },
  ];

  it("keeps the studies that share an arm, the most shared first, then by title", () => {
    const found = cellsUsingArms(cells, ["b", "c"]);
    expect(found.map((c) => [c.id, c.shared])).toEqual([
      ["x", ["b", "c"]],
      ["y", ["b"]],
      ["w", ["c"]],
    ]);
    expect(cellsUsingArms(cells, ["q"])).toEqual([]);
  });
});

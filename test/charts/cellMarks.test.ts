import { describe, expect, it } from "vitest";
import { groupPoints, placeLabels } from "../../src/charts/cellMarks";
import { textWidthPx } from "../../src/charts/legend";

describe("groupPoints", () => {
  it("merges points closer than 1 mm, keeping the first position and the names in order", () => {
    expect(
      groupPoints([
        { name: "a", p: [0, 0] },
        { name: "b", p: [0, 0.5] },
        { name: "c", p: [9, 0] },
        { name: "a", p: [0, 0] },
      ]),
    ).toEqual([
      { names: ["a", "b"], p: [0, 0] },
      { names: ["c"], p: [9, 0] },
    ]);
  });
});

describe("placeLabels", () => {
  it("gives labels of nearby marks boxes that do not overlap each other, inside the bounds", () => {
    const marks = [
      { text: "first target", x: 200, y: 200 },
      { text: "second", x: 205, y: 203 },
      { text: "third one", x: 198, y: 210 },
      { text: "fourth", x: 210, y: 196 },
    ];
    const bounds = { x0: 0, y0: 0, x1: 500, y1: 400 };
    const placed = placeLabels(marks, bounds);
    // Boxes as the placement estimates them: text width at 11 px + 2, height 13, baseline 3 px above the bottom.
    const boxes = placed.map((l) => {
      const w = textWidthPx(l.text, 11) + 2;
      const x0 = l.anchor === "start" ? l.x : l.anchor === "end" ? l.x - w : l.x - w / 2;
      return { x0, x1: x0 + w, y0: l.y - 10, y1: l.y + 3 };
    });
    for (let i = 0; i < boxes.length; i++) {
      const a = boxes[i]!;
      expect(a.x0).toBeGreaterThanOrEqual(bounds.x0);
      expect(a.x1).toBeLessThanOrEqual(bounds.x1);
      for (let j = i + 1; j < boxes.length; j++) {
        const b = boxes[j]!;
        const overlap = a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;
        expect(overlap, `${placed[i]!.text} / ${placed[j]!.text}`).toBe(false);
      }
    }
  });
});

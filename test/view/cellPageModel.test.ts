import { describe, expect, it } from "vitest";
import {
  cellArmParts,
  cellAssumptions,
  cellPageModel,
  placementLine,
  requirementsText,
} from "../../src/view/cellPageModel";
import { cellArmInfo } from "../../src/view/cellPageModel";
import { ARM_HASHES, CELL, PLACEMENT_A, STUDY } from "./cellFixtures";

const input = {
  cell: { id: CELL.id, spec: CELL },
  study: STUDY,
  placements: [PLACEMENT_A],
  armSpecHashes: ARM_HASHES,
  arms: [
    {
      id: "arm-a",
      name: "Maker A One",
      shortName: "One",
      reach: { flangeMaxMm: 900, axis1: { pointMm: [0, 0, 0], direction: [0, 0, 1] } },
    },
    { id: "arm-b", name: "Maker B Two", reach: null },
  ],
};

describe("requirementsText", () => {
  it("states what passing needs, with the cell's requirements in numbers", () => {
    expect(requirementsText(CELL)).toBe(
      "Every target reached, every move feasible, the tool load within the rated payload and wrist ratings, and a cycle of at most 4\u00a0s and every joint at least 5° from a range end at every target.",
    );
    expect(requirementsText({})).toMatch(/; no cycle time or margin is required\.$/);
  });
});

describe("cellAssumptions", () => {
  it("names the arms whose accelerations are assumed and says the figures are lower bounds", () => {
    const info = cellArmInfo(input.arms, ARM_HASHES, "/");
    const a = cellAssumptions(STUDY, info);
    expect(a[0]).toMatch(/no payload dynamics.*no blending.*lower bounds/);
    expect(a).toContain(
      "Accelerations assumed (full speed in 0.25 s) where the arm file gives none: Maker A One (J1–J4, J6). Their cycle times rest on that assumption.",
    );
  });
});

describe("placementLine", () => {
  it("gives the feasible area, the fastest position with its yaw and cycle, and today's cycle", () => {
    expect(placementLine(PLACEMENT_A, 3.5)).toBe(
      "Feasible area 0.01\u00a0m² (50 mm grid at z = 500 mm); fastest placement found: x 50 mm, y 50 mm, yaw 0°, cycle 3.25\u00a0s (today 3.5\u00a0s); 7 positions evaluated.",
    );
    expect(placementLine({ ...PLACEMENT_A, best: null }, null)).toMatch(/; no position with a feasible cycle found\.$/);
    expect(placementLine({ ...PLACEMENT_A, feasible: [[0, 0, 0]], feasibleAreaM2: 0, best: null }, null)).toBe(
      "No base position on the plane z = 500 mm reaches every target (50 mm grid).",
    );
  });
});

describe("cellArmParts", () => {
  it("heads a passing arm with its rank and a failing one without, with the verdict in words", () => {
    const info = cellArmInfo(input.arms, ARM_HASHES, "/tools/armdex/");
    const a = cellArmParts(STUDY.arms[0]!, CELL, info, "cell");
    expect(a.heading).toBe("1. Maker A One");
    expect(a.summary).toBe("Passes, cycle 3.5 s, the fastest.");
    expect(a.placementText).toBe("Base at (0, 0, 500) mm, roll-pitch-yaw (0, 0, 0)°, floor mounting.");
    expect(a.sheetHref).toBe("/tools/armdex/arms/arm-a/");
    const b = cellArmParts(STUDY.arms[1]!, CELL, info, "cell");
    expect(b.heading).toBe("Maker B Two");
    expect(b.summary).toBe("Fails (4 reasons), no cycle time.");
    expect(b.targets.id).toBe("cell-arm-b-targets");
  });
});

describe("cellPageModel", () => {
  const model = cellPageModel(input, { baseUrl: "/tools/armdex/", site: "https://tools.example.internal" });

  it("has a section per arm between the drawings and the downloads, each with an anchor", () => {
    expect(model.sections.map((s) => s.id)).toEqual([
      "ranking",
      "assumptions",
      "layout",
      "arm-arm-a",
      "arm-arm-b",
      "downloads",
      "cautions",
    ]);
    expect(model.armSections.map((s) => s.anchor)).toEqual(["arm-arm-a", "arm-arm-b"]);
  });

  it("links the downloads, the editor and the list under the base path", () => {
    expect(model.downloads.map((d) => d.href)).toEqual([
      "/tools/armdex/data/cells/test-cell.json",
      "/tools/armdex/data/cells/test-cell/placements.json",
      "/tools/armdex/data/cells/test-cell/moves.csv",
      "/tools/armdex/data/cells/test-cell/targets.csv",
      "/tools/armdex/data/cells/test-cell/cell.json",
    ]);
    expect(model.editHref).toBe("/tools/armdex/cells/edit/?cell=test-cell");
    expect(model.indexHref).toBe("/tools/armdex/cells/");
    expect(model.canonicalUrl).toBe("https://tools.example.internal/tools/armdex/cells/test-cell/");
  });

  it("gives the fastest passing arm and the requirement as key figures", () => {
    const best = model.keyFigures.find((f) => f.key === "best")!;
    expect([best.value, best.note, best.href]).toEqual(["3.5 s", "Maker A One", "#arm-arm-a"]);
    expect(model.keyFigures.find((f) => f.key === "candidates")!.note).toBe("1 pass, 1 fail");
  });

  it("draws the cell twice, a time bar per arm and one for all, and a placement map where there is one", () => {
    expect(model.drawings.map((d) => d.id)).toEqual(["cell-top", "cell-side"]);
    expect(model.timeChart.svg).toContain('data-arm="arm-b"');
    expect(model.armSections[0]!.placement!.line).toMatch(/^Feasible area 0.01/);
    expect(model.armSections[0]!.placement!.chart.id).toBe("cell-arm-a-placement");
    expect(model.armSections[1]!.placement).toBeNull();
    expect(model.printRef).toContain("cell test-cell");
  });
});

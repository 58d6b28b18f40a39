/**
 * The standard lines as the sheet shows them (src/view/standardLines.ts): words from the placement numbers the
 * analysis chose (on the synthetic band of test/core/analysis/standardLines/choose.test.ts), the chart, the form
 * link and the command.
 */
import { describe, expect, it } from "vitest";
import type { ArmAnalysis, LineCheckResult, StandardLines } from "../../src/core";
import { chooseStandardLines } from "../../src/core";
import { standardLineNoteText, standardLineQueries, standardLinesModel } from "../../src/view/standardLines";
import type { LineQuery } from "../../src/view/lineCheckModel";
import { bandSource } from "../helpers/standardLineSource";

const length = (q: LineQuery) => Math.hypot(q.toMm[0] - q.fromMm[0], q.toMm[1] - q.fromMm[1], q.toMm[2] - q.fromMm[2]);

function analysisWith(
  check: (q: LineQuery) => LineCheckResult,
  layout?: "prismatic-base",
  redundancy: string | null = null,
): ArmAnalysis {
  const chosen = layout
    ? chooseStandardLines(bandSource(0, 1900, 500, 1500, layout))
    : chooseStandardLines(bandSource(100, 800, 0, 600));
  const standardLines: StandardLines = {
    speedMmPerS: 500,
    lines: chosen.lines.map((l) => ({
      ...l,
      speedMmPerS: 500,
      result: check({ fromMm: l.fromMm, toMm: l.toMm, orientation: { kind: "down" }, speedMmPerS: 500 }),
    })),
    notes: chosen.notes,
  };
  return { standardLines, speed: { redundancy } } as unknown as ArmAnalysis;
}

const seen: LineQuery[] = [];
const fake = (q: LineQuery): LineCheckResult => {
  seen.push(q);
  const n = 3;
  return {
    lengthMm: length(q),
    speedMmPerS: q.speedMmPerS,
    direction: [1, 0, 0],
    orientationHeld: "full",
    jointNames: ["J1"],
    jointUnits: ["deg"],
    startRule: "best run",
    startBranch: null,
    startBranches: [],
    followed: true,
    feasibleConstantSpeedMmPerS: 1000,
    commandedSpeedFeasible: true,
    passesAxis1: false,
    bottleneck: {
      joint: "J1",
      jointIndex: 0,
      positionMm: [...q.fromMm],
      fraction: 0,
      rateRatio: 0.5,
      reason: "joint rate",
    },
    nearestSingularity: null,
    branchChanges: [],
    outOfReach: [],
    jointLimitViolations: [],
    jointsWithoutSpeedLimit: [],
    speedProfile: [],
    samples: Array.from({ length: n }, (_, k) => ({
      fraction: k / (n - 1),
      positionMm: [0, 0, 0],
      reachable: true,
      branch: "front",
      jointsDeg: [0],
      jointRatesDegPerS: [1],
      rateRatios: [0.5],
      localSpeedMmPerS: 1000,
      sigmaMinScaled: 1,
      inverseCondition: 1,
      singularityKind: "other" as const,
    })),
    evaluatedPoints: n,
  };
};

describe("standardLineQueries", () => {
  it("words each line from its numbers, above or below the base by the mounting's gravity", () => {
    const a = analysisWith(fake);
    const { lines, notes } = standardLineQueries(a, "floor");
    expect(notes).toEqual([]);
    expect(lines.map((l) => l.title)).toEqual(["Across the front", "Close to axis 1", "Out to the edge of the reach"]);
    expect(lines[0]!.summary).toContain("300\u00a0mm above the base");
    expect(lines[0]!.summary).toContain(`${Math.round(length(lines[0]!.query))}\u00a0mm long`);
    expect(lines[1]!.summary).toContain("passing 120\u00a0mm from axis 1 (the closest the arm reaches");
    expect(lines[2]!.summary).toContain("to 790\u00a0mm from it, about 10\u00a0mm inside the edge");
    expect(standardLineQueries(a, "ceiling").lines[0]!.summary).toContain("300\u00a0mm below the base");
    for (const l of lines) expect(l.query.orientation).toEqual({ kind: "down" });
  });

  it("words the notes", () => {
    const g = standardLineQueries(analysisWith(fake, "prismatic-base"), "floor");
    expect(g.lines.map((l) => l.title)).toEqual(["Across the working area", "Out to the edge of the reach"]);
    expect(g.notes.join(" ")).toContain("no axis 1");
    expect(standardLineNoteText({ code: "too-short", key: "edge", placement: "to-edge" })).toBe(
      'The "Out to the edge of the reach" line would be shorter than 10 mm, so it is left out.',
    );
  });
});

describe("standardLinesModel", () => {
  it("shows each line's check and links it to the form", () => {
    seen.length = 0;
    const arm = {
      id: "band",
      file: "arms/band.json",
      spec: { model: "Band", mountings: ["floor" as const] },
    };
    const model = standardLinesModel(arm, analysisWith(fake));
    expect(seen).toHaveLength(3);
    expect(model.lines.map((l) => l.chart.id)).toEqual(["line-rates-front", "line-rates-axis1", "line-rates-edge"]);
    expect(model.lines[0]!.formHref).toMatch(/^\?from=.*&to=.*&orientation=down&speed=500#line-check$/);
    expect(model.lines[0]!.command).toContain("npx armdex line arms/band.json --from ");
    expect(model.lines[0]!.figures.feasibleText).toBe("1,000\u00a0mm/s");
  });

  it("names the posture rule for a redundant arm, and only there", () => {
    const arm = { id: "band", file: "arms/band.json", spec: { model: "Band", mountings: ["floor" as const] } };
    expect(standardLinesModel(arm, analysisWith(fake)).notes.join(" ")).not.toContain("Posture rule");
    const seven = standardLinesModel(arm, analysisWith(fake, undefined, "minimum-norm joint rates (redundant arm)"));
    expect(seven.notes.join(" ")).toContain("Posture rule for this redundant arm");
  });
});

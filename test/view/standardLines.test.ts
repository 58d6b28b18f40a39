/**
 * Choice of the standard lines (src/view/standardLines.ts) on synthetic "tool down" maps whose reachable region is
 * known exactly, so every chosen point can be checked against it: an annulus band 100 ≤ r ≤ 800 mm, 0 ≤ z ≤ 600 mm
 * about a vertical axis 1 through the base origin (revolute base), and a box for a linear first joint (gantry).
 */
import { describe, expect, it } from "vitest";
import type { ArmAnalysis } from "../../src/core/analysis/analyseArm";
import { standardLineQueries, standardLinesModel } from "../../src/view/standardLines";
import type { LineCheckResult } from "../../src/core/analysis/line";
import type { LineQuery } from "../../src/view/lineCheckModel";

const STEP = 10;

function bandAnalysis(
  rInMm: number,
  rOutMm: number,
  zLoMm: number,
  zHiMm: number,
  layout: "revolute-base" | "prismatic-base" = "revolute-base",
): ArmAnalysis {
  const rMinMm = -20,
    zMinMm = zLoMm - 50;
  const nx = Math.ceil((rOutMm + 100 - rMinMm) / STEP) + 1,
    ny = Math.ceil((zHiMm + 50 - zMinMm) / STEP) + 1;
  const guaranteed: (number | null)[] = [];
  for (let iy = 0; iy < ny; iy++) {
    for (let ix = 0; ix < nx; ix++) {
      const r = rMinMm + ix * STEP,
        z = zMinMm + iy * STEP;
      guaranteed.push(Math.abs(r) >= rInMm && Math.abs(r) <= rOutMm && z >= zLoMm && z <= zHiMm ? 1000 : null);
    }
  }
  const analysis = {
    reach: { flangeMaxMm: rOutMm },
    envelope: {
      layout,
      axis1:
        layout === "revolute-base"
          ? { pointMm: [0, 0, 0], direction: [0, 0, 1], forward: [1, 0, 0], sweepRad: [-Math.PI, Math.PI] }
          : null,
      flange: {
        top: [
          {
            outer: [
              [0, 0],
              [2000, 0],
              [2000, 1000],
              [0, 1000],
              [0, 0],
            ],
            holes: [],
          },
        ],
      },
    },
    speed: {
      maps: [
        {
          orientation: "down",
          grid: { nx, ny, rMinMm, zMinMm, stepMm: STEP },
          reachableCells: guaranteed.filter((v) => v !== null).length,
          guaranteedMmPerS: guaranteed,
        },
      ],
    },
  };
  return analysis as unknown as ArmAnalysis;
}

const radius = (p: readonly number[]) => Math.hypot(p[0]!, p[1]!);
const length = (q: LineQuery) => Math.hypot(q.toMm[0] - q.fromMm[0], q.toMm[1] - q.fromMm[1], q.toMm[2] - q.fromMm[2]);

describe("standardLineQueries", () => {
  const { lines, notes } = standardLineQueries(bandAnalysis(100, 800, 0, 600), "floor");
  const byKey = Object.fromEntries(lines.map((l) => [l.key, l]));

  it("chooses the three lines, every one level, tool down, in whole millimetres", () => {
    expect(lines.map((l) => l.key)).toEqual(["front", "axis1", "edge"]);
    expect(notes).toEqual([]);
    for (const l of lines) {
      expect(l.query.orientation).toEqual({ kind: "down" });
      expect(l.query.fromMm[2]).toBe(l.query.toMm[2]);
      for (const v of [...l.query.fromMm, ...l.query.toMm]) expect(Number.isInteger(v)).toBe(true);
    }
  });

  it("front: across the front at mid height, its ends inside the band", () => {
    const q = byKey.front!.query;
    expect(q.fromMm[2]).toBe(300);
    expect(q.fromMm[0]).toBe(q.toMm[0]);
    expect(q.fromMm[1]).toBe(-q.toMm[1]);
    expect(radius(q.fromMm)).toBeLessThanOrEqual(800 - 16); // margin max(step, 2 % of reach)
    expect(q.fromMm[0]).toBeGreaterThanOrEqual(100);
  });

  it("axis1: passes as close to axis 1 as the band allows, above the base", () => {
    const l = byKey.axis1!;
    // The band starts at 100 mm: the line passes at 100 + margin (16 mm), rounded up to 5 mm.
    expect(l.query.fromMm[0]).toBe(120);
    expect(l.summary).toContain("the closest the arm reaches");
    expect(l.query.fromMm[2]).toBeGreaterThanOrEqual(0.25 * 800);
    expect(radius(l.query.toMm)).toBeLessThanOrEqual(800 - 16);
  });

  it("axis1: passes at 4 % of the reach when the arm reaches axis 1", () => {
    const q = standardLineQueries(bandAnalysis(0, 800, 0, 600), "floor").lines.find((l) => l.key === "axis1")!.query;
    expect(q.fromMm[0]).toBe(35); // ceil(max(2 steps, 0.04 · 800) = 32 to 5 mm)
  });

  it("edge: straight out, ending one grid step inside the outer edge", () => {
    const q = byKey.edge!.query;
    expect(q.fromMm[1]).toBe(0);
    expect(q.toMm[1]).toBe(0);
    expect(q.toMm[0]).toBe(790);
    expect(q.toMm[0]).toBeGreaterThan(q.fromMm[0]);
    expect(length(q)).toBeLessThanOrEqual(0.3 * 800 + 5);
  });

  it("says above or below the base by the mounting's gravity", () => {
    expect(byKey.front!.summary).toContain("300\u00a0mm above the base");
    const ceiling = standardLineQueries(bandAnalysis(100, 800, 0, 600), "ceiling").lines[0]!;
    expect(ceiling.summary).toContain("300\u00a0mm below the base");
  });

  it("gantry: no axis 1; lines from the top view", () => {
    const g = standardLineQueries(bandAnalysis(0, 1900, 500, 1500, "prismatic-base"), "floor");
    expect(g.lines.map((l) => l.key)).toEqual(["front", "edge"]);
    expect(g.notes.join(" ")).toContain("no axis 1");
    const front = g.lines[0]!.query;
    expect(front.fromMm[0]).toBe(1000);
    expect(front.fromMm[1]).toBeGreaterThan(0);
    expect(front.toMm[1]).toBeLessThan(1000);
    expect(g.lines[1]!.query.toMm[0]).toBeLessThan(2000);
  });

  it("no tool-down region: no line, and a note", () => {
    const empty = bandAnalysis(100, 800, 0, 600);
    (empty.speed.maps[0] as { reachableCells: number }).reachableCells = 0;
    expect(standardLineQueries(empty, "floor")).toEqual({
      lines: [],
      notes: [expect.stringContaining("No flange position")],
    });
  });
});

describe("standardLinesModel", () => {
  it("checks each line once and links it to the form", () => {
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
    const arm = {
      id: "band",
      file: "arms/band.json",
      chain: {} as never,
      spec: { model: "Band", mountings: ["floor" as const] },
    };
    const model = standardLinesModel(arm, bandAnalysis(100, 800, 0, 600), fake);
    expect(seen).toHaveLength(3);
    expect(model.lines.map((l) => l.chart.id)).toEqual(["line-rates-front", "line-rates-axis1", "line-rates-edge"]);
    expect(model.lines[0]!.formHref).toMatch(/^\?from=.*&to=.*&orientation=down&speed=500#line-check$/);
    expect(model.lines[0]!.command).toContain("npx armdex line arms/band.json --from ");
    expect(model.lines[0]!.figures.feasibleText).toBe("1,000\u00a0mm/s");
  });
});

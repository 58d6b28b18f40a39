/**
 * Choice of the standard lines (src/core/analysis/standardLines/choose.ts) on synthetic "tool down" maps whose
 * reachable region is known exactly, so every chosen point can be checked against it: an annulus band
 * 100 ≤ r ≤ 800 mm, 0 ≤ z ≤ 600 mm about a vertical axis 1 through the base origin (revolute base), and a box for a
 * linear first joint (gantry). The expected ends are worked by hand from the rules in the module comment.
 */
import { describe, expect, it } from "vitest";
import { chooseStandardLines, type StandardLineSpec } from "../../../../src/core";
import { bandSource } from "../../../helpers/standardLineSource";

const radius = (p: readonly number[]) => Math.hypot(p[0]!, p[1]!);
const length = (q: StandardLineSpec) =>
  Math.hypot(q.toMm[0] - q.fromMm[0], q.toMm[1] - q.fromMm[1], q.toMm[2] - q.fromMm[2]);

describe("chooseStandardLines", () => {
  const { lines, notes } = chooseStandardLines(bandSource(100, 800, 0, 600));
  const byKey = Object.fromEntries(lines.map((l) => [l.key, l]));

  it("chooses the three lines, every one level, in whole millimetres", () => {
    expect(lines.map((l) => l.key)).toEqual(["front", "axis1", "edge"]);
    expect(notes).toEqual([]);
    for (const l of lines) {
      expect(l.fromMm[2]).toBe(l.toMm[2]);
      for (const v of [...l.fromMm, ...l.toMm]) expect(Number.isInteger(v)).toBe(true);
    }
  });

  it("front: across the front at mid height, its ends inside the band", () => {
    const q = byKey.front!;
    expect(q.placement).toMatchObject({ kind: "across", zMm: 300 });
    expect(q.fromMm[2]).toBe(300);
    expect(q.fromMm[0]).toBe(q.toMm[0]);
    expect(q.fromMm[1]).toBe(-q.toMm[1]);
    expect(radius(q.fromMm)).toBeLessThanOrEqual(800 - 16); // margin max(step, 2 % of reach)
    expect(q.fromMm[0]).toBeGreaterThanOrEqual(100);
  });

  it("axis1: passes as close to axis 1 as the band allows, above the base", () => {
    const l = byKey.axis1!;
    // The band starts at 100 mm: the line passes at 100 + margin (16 mm), rounded up to 5 mm.
    expect(l.fromMm[0]).toBe(120);
    expect(l.placement).toMatchObject({ kind: "near-axis1", dMm: 120, closest: true });
    expect(l.fromMm[2]).toBeGreaterThanOrEqual(0.25 * 800);
    expect(radius(l.toMm)).toBeLessThanOrEqual(800 - 16);
  });

  it("axis1: passes at 4 % of the reach when the arm reaches axis 1", () => {
    const q = chooseStandardLines(bandSource(0, 800, 0, 600)).lines.find((l) => l.key === "axis1")!;
    expect(q.fromMm[0]).toBe(35); // ceil(max(2 steps, 0.04 · 800) = 32 to 5 mm)
    expect(q.placement).toMatchObject({ kind: "near-axis1", closest: false });
  });

  it("edge: straight out, ending one grid step inside the outer edge", () => {
    const q = byKey.edge!;
    expect(q.fromMm[1]).toBe(0);
    expect(q.toMm[1]).toBe(0);
    expect(q.toMm[0]).toBe(790);
    expect(q.placement).toMatchObject({ kind: "to-edge", endMm: 790, insideEdgeMm: 10 });
    expect(q.toMm[0]).toBeGreaterThan(q.fromMm[0]);
    expect(length(q)).toBeLessThanOrEqual(0.3 * 800 + 5);
  });

  it("gantry: no axis 1; lines from the top view", () => {
    const g = chooseStandardLines(bandSource(0, 1900, 500, 1500, "prismatic-base"));
    expect(g.lines.map((l) => l.key)).toEqual(["front", "edge"]);
    expect(g.notes).toEqual([{ code: "no-axis1" }]);
    const front = g.lines[0]!;
    expect(front.fromMm[0]).toBe(1000);
    expect(front.fromMm[1]).toBeGreaterThan(0);
    expect(front.toMm[1]).toBeLessThan(1000);
    expect(g.lines[1]!.toMm[0]).toBeLessThan(2000);
  });

  it("no tool-down region: no line, and a note", () => {
    const empty = bandSource(100, 800, 0, 600);
    expect(chooseStandardLines({ ...empty, downMap: { ...empty.downMap!, reachableCells: 0 } })).toEqual({
      lines: [],
      notes: [{ code: "no-tool-down-region" }],
    });
  });
});

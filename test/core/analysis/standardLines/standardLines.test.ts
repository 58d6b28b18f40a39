/**
 * The standard lines inside the analysis of a demo six-axis arm: each checked line is the straight line between its
 * chosen ends (length by the distance formula), its ends lie in cells the published tool-down map reaches, and the
 * analysis reports the same check as the browser form and `armdex line` run for those ends (agreement of front ends,
 * labelled as such: the figures themselves are checked against closed forms in test/core/analysis/line/).
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { Arm } from "../../../../src/catalog";
import type { ArmAnalysis } from "../../../../src/core";
import { runLineQuery } from "../../../../src/view/lineCheckModel";
import { demoArmWithAnalysis } from "../../../helpers/demoAnalysis";

let arm: Arm;
let analysis: ArmAnalysis;
beforeAll(async () => {
  ({ arm, analysis } = await demoArmWithAnalysis("arms/corvell-tern-7.json"));
}, 60_000);

describe("standard lines of an analysis", () => {
  it("holds the three lines, each checked over its own ends", () => {
    const lines = analysis.standardLines.lines;
    expect(lines.map((l) => l.key)).toEqual(["front", "axis1", "edge"]);
    for (const l of lines) {
      const d = Math.hypot(l.toMm[0] - l.fromMm[0], l.toMm[1] - l.fromMm[1], l.toMm[2] - l.fromMm[2]);
      expect(l.result.lengthMm).toBeCloseTo(d, 6);
      expect(l.result.speedMmPerS).toBe(analysis.standardLines.speedMmPerS);
    }
  });

  it("starts and ends each revolute-base line where the tool-down map reaches", () => {
    const map = analysis.speed.maps.find((m) => m.orientation === "down")!;
    const g = map.grid;
    for (const l of analysis.standardLines.lines) {
      for (const p of [l.fromMm, l.toMm]) {
        // Floor arm with axis 1 along base z through the origin: r = √(x² + y²), z = z.
        const ix = Math.round((Math.hypot(p[0], p[1]) - g.rMinMm) / g.stepMm),
          iy = Math.round((p[2] - g.zMinMm) / g.stepMm);
        const near = [-1, 0, 1].flatMap((dx) =>
          [-1, 0, 1].map((dy) => map.guaranteedMmPerS[ix + dx + (iy + dy) * g.nx] ?? null),
        );
        expect(
          near.some((v) => v !== null),
          `${l.key} end ${p.join(",")}`,
        ).toBe(true);
      }
    }
  });

  it("reports what the form and the command line report for the same line (front ends agree)", () => {
    for (const l of analysis.standardLines.lines) {
      const fresh = runLineQuery(arm.chain, arm.spec.mountings, {
        fromMm: l.fromMm,
        toMm: l.toMm,
        orientation: { kind: "down" },
        speedMmPerS: l.speedMmPerS,
      });
      expect(l.result).toEqual(JSON.parse(JSON.stringify(fresh)));
    }
  });
});

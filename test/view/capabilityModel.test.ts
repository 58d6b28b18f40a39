/**
 * The "Tool directions" section, its key figure, the catalog column and the side-by-side row, from real analyses of two
 * demo arms: a six-axis arm with a spherical wrist (a map, solved in closed form) and the SCARA (no map). The headline
 * and mean shares shown are recomputed here by brute force over the published per-cell shares.
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { Arm } from "../../src/catalog";
import type { ArmAnalysis } from "../../src/core";
import { armAnalysisModel } from "../../src/view/armAnalysisModel";
import {
  CAPABILITY_HEADLINE_LABEL,
  CAPABILITY_REASON_TEXT,
  capabilityHeadlineCell,
  capabilitySection,
  capabilitySummaryFigure,
} from "../../src/view/capabilityModel";
import { catalogPageModel } from "../../src/view/catalogPageModel";
import { compareSummary } from "../../src/view/compareData";
import { speedRows } from "../../src/view/compareModel";
import { demoArmWithAnalysis } from "../helpers/demoAnalysis";

let six: { arm: Arm; analysis: ArmAnalysis };
let scara: { arm: Arm; analysis: ArmAnalysis };

beforeAll(async () => {
  six = await demoArmWithAnalysis("arms/corvell-tern-7.json");
  scara = await demoArmWithAnalysis("arms/yarrowfield-sable-600.json");
}, 120_000);

/** Headline and mean share by brute force over the published shares. */
function bruteForce(share: readonly (number | null)[]): { half: number; mean: number } {
  const inside = share.filter((v): v is number => v !== null);
  return {
    half: inside.filter((v) => v >= 0.5).length / inside.length,
    mean: inside.reduce((a, b) => a + b, 0) / inside.length,
  };
}

describe("capabilitySection", () => {
  it("six-axis spherical wrist: the chart, the headline and mean shares as published, closed form, roll free", () => {
    const c = six.analysis.capability!;
    expect(c.method).toBe("closed-form");
    // The published per-cell shares are rounded to 1e-4: the brute-force mean agrees to that.
    const { half, mean } = bruteForce(c.share);
    expect(c.areaShareAtLeastHalf).toBeCloseTo(half, 4);
    expect(Math.abs(c.meanShare! - mean)).toBeLessThanOrEqual(1e-4);
    const section = capabilitySection(six.analysis, six.arm.spec.model, six.arm.chain.drivenCount);
    expect(section.chart?.id).toBe("capability");
    expect(section.absentText).toBeNull();
    const pct = (v: number) => `${(Math.round(v * 1000) / 10).toLocaleString("en")}\u00a0%`;
    expect(section.notes[0]).toBe(
      `${CAPABILITY_HEADLINE_LABEL}: ${pct(c.areaShareAtLeastHalf!)} of the 50\u00a0mm cells inside the flange envelope; mean share over those cells ${pct(c.meanShare!)}.`,
    );
    expect(section.notes.join(" ")).toMatch(/closed form/);
    expect(section.notes.join(" ")).toMatch(/last joint turns the flange about its own axis/);
    // The directions are 4π/n steradians each: neighbours about √(4π/n) rad apart.
    expect(section.notes[1]).toContain(
      `${Math.round(Math.sqrt((4 * Math.PI) / c.directions) * (180 / Math.PI))}\u00b0`,
    );
  });

  it("SCARA: no chart, the reason as a sentence, 'no map' among the key figures", () => {
    expect(scara.analysis.capability).toBeNull();
    const section = capabilitySection(scara.analysis, scara.arm.spec.model, scara.arm.chain.drivenCount);
    expect(section.chart).toBeNull();
    expect(section.absentText).toBe(CAPABILITY_REASON_TEXT["tool-axis-cannot-turn"]);
    const figure = capabilitySummaryFigure(scara.analysis);
    expect(figure).toMatchObject({ key: "capability-half", value: "no map", href: "#directions" });
  });

  it("the sheet's model carries the section and the key figure", () => {
    const model = armAnalysisModel(six.arm, six.analysis, { baseUrl: "/" });
    const figure = model.summary.find((f) => f.key === "capability-half")!;
    expect(figure.label).toBe(CAPABILITY_HEADLINE_LABEL);
    expect(figure.value).toBe(
      `${(Math.round(six.analysis.capability!.areaShareAtLeastHalf! * 1000) / 10).toLocaleString("en")}\u00a0%`,
    );
    expect(model.capability.chart?.title).toBe(`${six.arm.spec.model}: share of tool directions reached`);
  });
});

describe("the headline share in the catalog and on the side-by-side page", () => {
  it("capabilityHeadlineCell: a percentage with one decimal, 'no map' without a map", () => {
    expect(capabilityHeadlineCell({ areaShareAtLeastHalf: 0.8626 })).toEqual({ text: "86.3", sortValue: 86.26 });
    expect(capabilityHeadlineCell(null)).toEqual({ text: "no map" });
  });

  it("catalog: a column after the line-speed share, 'no map' for the SCARA", () => {
    const arms = [six.arm, scara.arm];
    const model = catalogPageModel(
      arms,
      { baseUrl: "/" },
      new Map(arms.map((a, i) => [a.id, [six, scara][i]!.analysis])),
    );
    const keys = model.table.columns.map((c) => c.key);
    expect(keys.indexOf("directions-half")).toBe(keys.indexOf("share-1") + 1);
    const col = keys.indexOf("directions-half");
    expect(model.table.rows[0]!.cells[col]!.sortValue).toBeCloseTo(
      six.analysis.capability!.areaShareAtLeastHalf! * 100,
      9,
    );
    expect(model.table.rows[1]!.cells[col]!.text).toBe("no map");
    expect(model.table.footnote).toMatch(/half of all tool directions/);
  });

  it("side by side: a row before the cycle; with one arm mapped nothing is marked best", () => {
    const arms = [compareSummary(six.arm, six.analysis), compareSummary(scara.arm, scara.analysis)];
    const rows = speedRows(arms);
    const keys = rows.map((r) => r.key);
    expect(keys.indexOf("directions-half")).toBe(keys.indexOf("cycle") - 1);
    const row = rows.find((r) => r.key === "directions-half")!;
    expect(row.cells.map((c) => c.value)).toEqual([six.analysis.capability!.areaShareAtLeastHalf, null]);
    expect(row.cells[1]!.text).toBe("no map");
    expect(row.cells.every((c) => !c.best)).toBe(true);
    // Two mapped arms: the larger share is marked.
    const twice = speedRows([
      arms[0]!,
      { ...arms[0]!, id: "copy", capability: { ...arms[0]!.capability!, areaShareAtLeastHalf: 0.1 } },
    ]);
    expect(twice.find((r) => r.key === "directions-half")!.cells.map((c) => c.best)).toEqual([true, false]);
  });
});

/**
 * The catalog table's columns, row figures and filter choices with a real analysis: the SCARA of the demo catalog
 * (the quickest to analyse) and a copy of the same arm without commercial data and with another class, to see the
 * choices and the price column follow the files. No Astro, no cache. The line-speed figure is checked by brute force
 * over the published "down" map's cells; the row's raw figures against the analysis fields they stand for.
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { Arm } from "../../src/catalog";
import type { ArmAnalysis } from "../../src/core/analysis/analyseArm";
import { bestGuaranteedLineSpeedDownMPerS, catalogPageModel } from "../../src/view/catalogPageModel";
import { catalogSummaryRow } from "../../src/view/catalogData";
import { demoArmWithAnalysis } from "../helpers/demoAnalysis";

let arm: Arm;
let analysis: ArmAnalysis;

beforeAll(async () => {
  ({ arm, analysis } = await demoArmWithAnalysis());
});

describe("bestGuaranteedLineSpeedDownMPerS", () => {
  it("is the largest guaranteed speed over the cells of the tool-down map, in m/s (brute force over the grid)", () => {
    const down = analysis.speed.maps.find((m) => m.orientation === "down")!;
    let max = 0;
    for (const v of down.guaranteedMmPerS) if (v !== null && v > max) max = v;
    const figure = bestGuaranteedLineSpeedDownMPerS(analysis)!;
    // The published cells are rounded to 1 mm/s, the maximum to 0.1 mm/s; when the output grid keeps every computed
    // cell the two agree to that rounding, otherwise the kept cells cannot exceed the maximum.
    if (down.grid.stepMm === down.computedGrid.stepMm)
      expect(Math.abs(figure * 1000 - max)).toBeLessThanOrEqual(0.5 + 1e-9);
    else expect(figure * 1000).toBeGreaterThanOrEqual(max - 0.5);
    expect(figure).toBeGreaterThan(0);
  });

  it("is null without a tool-down map", () => {
    const none = { ...analysis, speed: { ...analysis.speed, maps: [] } } as ArmAnalysis;
    expect(bestGuaranteedLineSpeedDownMPerS(none)).toBeNull();
  });
});

describe("catalogPageModel for the interactive catalog", () => {
  it("shows the line-speed column and writes each row's raw figures for the filters", () => {
    const model = catalogPageModel([arm], { baseUrl: "/" }, new Map([[arm.id, analysis]]));
    const keys = model.table.columns.map((c) => c.key);
    expect(keys.indexOf("line-speed")).toBe(keys.indexOf("max-tool-speed") + 1);
    expect(model.table.columns.find((c) => c.key === "line-speed")).toMatchObject({ unit: "m/s", numeric: true });
    const row = model.table.rows[0]!;
    const line = row.cells[keys.indexOf("line-speed")]!;
    expect(line.sortValue).toBe(analysis.speed.maps[0]!.maxGuaranteedMmPerS! / 1000);
    expect(row.label).toBe(`${arm.spec.maker} ${arm.spec.model}`);
    expect(row.data).toEqual({
      class: arm.spec.class,
      mountings: arm.spec.mountings.join(" "),
      "payload-kg": String(arm.spec.ratedPayloadKg),
      // A SCARA has no wrist centre point: its computed reach is the flange's.
      "computed-reach-mm": String(analysis.reach.flangeMaxMm),
      "min-height-mm": String(analysis.reach.minHeightMm),
      "max-height-mm": String(analysis.reach.maxHeightMm),
      "line-speed-m-per-s": String(analysis.speed.maps[0]!.maxGuaranteedMmPerS! / 1000),
      protection: arm.spec.protection,
      "repeatability-mm": String(arm.spec.repeatabilityMm),
      // The SCARA demo declares no footprint: no footprint attributes, and the filter on it fails.
    });
    expect(analysis.reach.wcpMaxMm).toBeNull();
    // List prices sort within their currency.
    const price = row.cells[keys.indexOf("price")]!;
    expect(price).toMatchObject({
      sortValue: arm.spec.commercial!.listPrice,
      sortGroup: arm.spec.commercial!.currency,
    });
    expect(model.table.footnote).toMatch(/not converted between currencies/);
  });

  it("offers only the classes and mountings that occur, in the format's order", () => {
    const other: Arm = {
      ...arm,
      id: "copy",
      spec: { ...arm.spec, id: "copy", class: "articulated", mountings: ["wall", "floor"], commercial: undefined },
    };
    const model = catalogPageModel([arm, other], { baseUrl: "/" });
    expect(model.filterChoices.classes.map((o) => o.value)).toEqual(["articulated", "scara"]);
    expect(model.filterChoices.mountings.map((o) => o.value)).toEqual(["floor", "wall"]);
    expect(model.table.rows[1]!.cells.at(-1)!.text).toBe("not stated");
  });

  it("puts the tool-down figure into data/catalog.json: the largest cell of the published map (brute force)", () => {
    const figure = catalogSummaryRow(arm, analysis).bestGuaranteedLineSpeedToolDownMPerS!;
    expect(figure).toBeGreaterThan(0);
    // Against the map's own cells, not against bestGuaranteedLineSpeedDownMPerS (which the row is made with):
    // published cells are rounded to 1 mm/s and the figure to 0.1 mm/s, as in the first test.
    const down = analysis.speed.maps.find((m) => m.orientation === "down")!;
    let max = 0;
    for (const v of down.guaranteedMmPerS) if (v !== null && v > max) max = v;
    if (down.grid.stepMm === down.computedGrid.stepMm)
      expect(Math.abs(figure * 1000 - max)).toBeLessThanOrEqual(0.5 + 1e-9);
    else expect(figure * 1000).toBeGreaterThanOrEqual(max - 0.5);
    // m/s, as the key says (a figure left in mm/s would be a thousand times larger than any arm's speed).
    expect(figure).toBeLessThan(20);
  });
});

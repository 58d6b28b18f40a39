/**
 * The arm sheet's view model with a real analysis: the SCARA of the demo catalog (the quickest to analyse), plus a
 * copy with the stated reach changed to check the mismatch flag. No Astro, no cache.
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { Arm } from "../../src/catalog";
import type { ArmAnalysis } from "../../src/core/analysis/analyseArm";
import { ANALYSIS_SECTIONS, armPageModel } from "../../src/view/armPageModel";
import { reachCheck } from "../../src/view/armAnalysisModel";
import { jointsCsv, payloadCsv, PAYLOAD_CSV_HEADER } from "../../src/view/armCsv";
import { catalogPageModel } from "../../src/view/catalogPageModel";
import { demoArmWithAnalysis } from "../helpers/demoAnalysis";

let arm: Arm;
let analysis: ArmAnalysis;

beforeAll(async () => {
  ({ arm, analysis } = await demoArmWithAnalysis());
});

describe("armPageModel with an analysis", () => {
  it("keeps the declared sections and adds the computed ones with their anchors, in page order", () => {
    const model = armPageModel(arm, { baseUrl: "/tools/armdex/" }, analysis);
    const ids = model.sections.map((s) => s.id);
    expect(ids.slice(0, 2)).toEqual(["summary", "specs"]);
    expect(ids).toEqual(
      expect.arrayContaining([...ANALYSIS_SECTIONS.map((s) => s.id), "joints", "source", "downloads", "cautions"]),
    );
    expect(ids.indexOf("envelope")).toBeLessThan(ids.indexOf("cycle"));
    expect(ids.indexOf("joints")).toBeLessThan(ids.indexOf("source"));
  });

  it("without an analysis the sheet is the declared part alone, as before", () => {
    const model = armPageModel(arm, { baseUrl: "/" });
    expect(model.analysis).toBeNull();
    expect(model.sections.map((s) => s.id)).toEqual([
      "specs",
      "datasheet",
      "parameters",
      "joints",
      "source",
      "cautions",
    ]);
  });

  it("gives every chart a unique id, a title, a caption and an accessible SVG", () => {
    const a = armPageModel(arm, { baseUrl: "/" }, analysis).analysis!;
    const charts = [
      ...a.envelope.charts,
      ...a.speed.charts,
      ...a.singularities.charts,
      ...a.payload.charts,
      ...(a.payload.loadDiagram ? [a.payload.loadDiagram] : []),
      ...(a.cycle.chart ? [a.cycle.chart] : []),
    ];
    expect(charts.length).toBeGreaterThanOrEqual(6);
    expect(new Set(charts.map((c) => c.id)).size).toBe(charts.length);
    for (const c of charts) {
      expect(c.svg).toMatch(/^<svg[^>]* role="img"[^>]* aria-label="[^"]+"/);
      expect(c.caption.length).toBeGreaterThan(40);
      expect(c.svg).not.toMatch(/\sstyle=/);
    }
    // One speed map and one singularity chart per reference orientation: a SCARA has only "tool down".
    expect(a.speed.charts.map((c) => c.id)).toEqual(["speed-down"]);
  });

  it("summarises reach against the stated value, speed, line-speed share and cycle", () => {
    const a = armPageModel(arm, { baseUrl: "/" }, analysis).analysis!;
    expect(a.summary.map((f) => f.key).slice(0, 4)).toEqual(["reach", "max-tool-speed", "share-1", "cycle"]);
    const reach = a.summary[0]!;
    expect(reach.label).toBe("Computed reach, flange centre"); // a SCARA has no wrist centre point
    expect(reach.flag).toBe(false);
    expect(a.summary[1]!.value).toMatch(/^\d+(\.\d+)?\u00a0m\/s$/);
    expect(a.summary[2]!.value).toMatch(/^\d+(\.\d)?\u00a0%$/);
    expect(a.downloads.map((d) => d.href)).toEqual([
      "/data/arms/yarrowfield-sable-600.json",
      "/data/arms/yarrowfield-sable-600/payload.csv",
      "/data/arms/yarrowfield-sable-600/joints.csv",
      "/data/arms/yarrowfield-sable-600/arm.urdf",
    ]);
  });

  it("flags a stated reach more than 2 % from the computed one", () => {
    const computed = reachCheck(analysis).computedMm;
    const wrong = { ...analysis, reach: { ...analysis.reach, statedMm: computed * 1.05 } };
    const check = reachCheck(wrong);
    expect(check.deviation).toBeCloseTo(0.05, 9);
    expect(check.mismatch).toBe(true);
    const a = armPageModel(arm, { baseUrl: "/" }, wrong).analysis!;
    expect(a.summary[0]!.flag).toBe(true);
    expect(a.summary[0]!.note).toMatch(/\+5\u00a0%, more than 2\u00a0% apart/);
    expect(reachCheck({ ...analysis, reach: { ...analysis.reach, statedMm: computed * 1.019 } }).mismatch).toBe(false);
  });
});

describe("CSV downloads", () => {
  /** The file's records as header → cell maps (the demo arm's cells hold no commas or quotes). */
  const records = (csv: string) => {
    expect(csv.endsWith("\r\n")).toBe(true);
    const [head, ...lines] = csv.trimEnd().split("\r\n");
    const names = head!.split(",");
    return lines.map((l) => {
      const cells = l.split(",");
      expect(cells).toHaveLength(names.length);
      return Object.fromEntries(names.map((n, i) => [n, cells[i]!]));
    });
  };

  it("payload.csv has one row per analysis row under a unit-named header, each holding that row's figures", () => {
    const csv = payloadCsv(analysis);
    expect(csv.split("\r\n")[0]).toBe(PAYLOAD_CSV_HEADER.join(","));
    const rows = records(csv);
    expect(rows).toHaveLength(analysis.payload.atReach.length);
    expect(rows.length).toBeGreaterThan(0);
    // Each cell against the analysis field its header names, in the header's unit, to the rounding the file uses
    // (0.1 mm, 0.001 kg: half a unit of the last digit).
    analysis.payload.atReach.forEach((r, i) => {
      const row = rows[i]!;
      expect(row.mounting).toBe(r.mounting);
      expect(Math.abs(Number(row.reach_mm) - r.reachMm)).toBeLessThanOrEqual(0.05 + 1e-9);
      expect(Math.abs(Number(row.cg_offset_mm) - r.offsetMm)).toBeLessThanOrEqual(0.05 + 1e-9);
      expect(Math.abs(Number(row.payload_kg) - r.payloadKg)).toBeLessThanOrEqual(0.0005 + 1e-12);
      expect(row.limited_by).toBe(r.limitedBy);
      expect(row.limiting_joint).toBe(r.limitingJoint ?? "");
      expect(row.basis).toBe(analysis.payload.basis);
    });
  });

  it("joints.csv has one row per joint with the file's ranges and speeds in the units it names", () => {
    const rows = records(jointsCsv(arm));
    expect(rows.map((r) => r.joint)).toEqual(arm.spec.joints.map((j) => j.name));
    arm.spec.joints.forEach((j, i) => {
      const row = rows[i]!;
      expect(row.type).toBe(j.kind);
      const prismatic = j.kind === "prismatic";
      const range = prismatic ? j.rangeMm : j.rangeDeg;
      if (!range) expectPassiveRow(row);
      else {
        expect(row.drive).toBe("driven");
        expect([Number(row.range_min), Number(row.range_max)]).toEqual([range[0], range[1]]);
        expect(row.range_unit).toBe(prismatic ? "mm" : "deg");
        expect(Number(row.max_speed)).toBe(prismatic ? j.maxSpeedMmPerS : j.maxSpeedDegPerS);
        expect(row.speed_unit).toBe(prismatic ? "mm/s" : "deg/s");
      }
    });
    // The SCARA's third joint is its vertical stroke, in millimetres.
    expect(rows.some((r) => r.type === "prismatic" && r.range_unit === "mm")).toBe(true);
  });
});

/** A joint without a range of its own (passive) has empty limit cells. */
function expectPassiveRow(row: Record<string, string>): void {
  expect(row.drive).toBe("passive");
  expect([row.range_min, row.range_max, row.max_speed]).toEqual(["", "", ""]);
}

describe("catalogPageModel with analyses", () => {
  it("adds the computed columns and keeps the declared ones", () => {
    const model = catalogPageModel([arm], { baseUrl: "/" }, new Map([[arm.id, analysis]]));
    const keys = model.table.columns.map((c) => c.key);
    expect(keys).toEqual(
      expect.arrayContaining([
        "reach",
        "computed-reach",
        "max-tool-speed",
        "share-1",
        "cycle",
        "repeatability",
        "mass",
      ]),
    );
    expect(keys.indexOf("computed-reach")).toBe(keys.indexOf("reach") - 1);
    const row = model.table.rows[0]!;
    const cellOf = (key: string) => row.cells[keys.indexOf(key)]!;
    expect(cellOf("computed-reach").note).toBe("flange");
    expect(Number(cellOf("max-tool-speed").sortValue)).toBeCloseTo(analysis.speed.maxToolSpeedMmPerS! / 1000, 9);
    expect(model.table.footnote).toMatch(/2\u00a0%/);
  });
  it("without analyses the table is the declared one", () => {
    const model = catalogPageModel([arm], { baseUrl: "/" });
    expect(model.table.columns.map((c) => c.key)).not.toContain("computed-reach");
  });
});

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
    expect(model.sections.map((s) => s.id)).toEqual(["specs", "parameters", "joints", "source", "cautions"]);
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
  it("payload.csv has one row per analysis row under a unit-named header", () => {
    const lines = payloadCsv(analysis).trimEnd().split("\r\n");
    expect(lines[0]).toBe(PAYLOAD_CSV_HEADER.join(","));
    expect(lines).toHaveLength(analysis.payload.atReach.length + 1);
    expect(lines[1]).toMatch(/^floor,\d/);
  });
  it("joints.csv has one row per joint with numeric ranges", () => {
    const lines = jointsCsv(arm).trimEnd().split("\r\n");
    expect(lines).toHaveLength(arm.spec.joints.length + 1);
    expect(lines[1]).toMatch(/^J1,revolute,driven,,,-?\d/);
  });
});

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

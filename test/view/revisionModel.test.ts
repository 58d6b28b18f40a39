/**
 * The revision words and models (src/view/revisionModel.ts) on hand-made revision data, and the key figures of a
 * revision (src/catalog/revisionFigures.ts) against the arm sheet's own key figures for the same analysis (the two
 * must agree: the "what moved" list compares what the sheet shows). Expected texts are written out from the inputs.
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { Arm } from "../../src/catalog";
import type { ArmRevision, ArmRevisionData } from "../../src/catalog/revisions";
import { revisionFigures, type RevisionFigures } from "../../src/catalog/revisionFigures";
import type { ArmAnalysis } from "../../src/core";
import { armAnalysisModel } from "../../src/view/armAnalysisModel";
import {
  changeText,
  citeModel,
  figureChanges,
  formatChangeValue,
  pinnedBannerModel,
  pinnedRevisions,
  revisionPath,
  revisionsJson,
  revisionsSectionModel,
} from "../../src/view/revisionModel";
import { demoArmWithAnalysis } from "../helpers/demoAnalysis";

const figures = (over: Partial<RevisionFigures> = {}): RevisionFigures => ({
  computedReachMm: 1285.04,
  reachBasis: "wcp",
  maxToolSpeedMmPerS: 5210,
  shareAtLeast1MPerSDown: 0.5,
  standardCycleS: 0.456,
  payloadFullReach: { payloadKg: 9.5, reachMm: 1300, mounting: "floor" },
  ...over,
});

function revision(fingerprint: string, over: Partial<ArmRevision> = {}): ArmRevision {
  return {
    fingerprint,
    specHash: `${fingerprint}${"0".repeat(52)}`,
    commit: `${fingerprint}${"f".repeat(28)}`,
    date: "2026-03-02T23:30:00-05:00",
    source: { document: "Sheet", revision: "B", date: "2026-01-01" },
    valid: true,
    issues: [],
    changed: [],
    data: {},
    figures: figures(),
    ...over,
  };
}

function data(revisions: ArmRevision[], history: ArmRevisionData["history"] = "available"): ArmRevisionData {
  return {
    format: 1,
    id: "demo-arm",
    file: "arms/demo-arm.json",
    currentSpecHash: revisions[0]!.specHash,
    history,
    revisions,
  };
}

describe("change and figure words", () => {
  it("writes JSON values compactly and absent fields as (absent)", () => {
    expect(formatChangeValue(190)).toBe("190");
    expect(formatChangeValue("IP54")).toBe('"IP54"');
    expect(formatChangeValue([-170, 170])).toBe("[-170,170]");
    expect(formatChangeValue(null)).toBe("(absent)");
    expect(formatChangeValue("x".repeat(200))).toHaveLength(120);
    expect(changeText({ path: "joints[1].maxSpeedDegPerS", from: 190, to: 180 })).toBe(
      "joints[1].maxSpeedDegPerS: 190 \u2192 180",
    );
  });

  it("lists a key figure as moved only when its displayed value changes", () => {
    // 5,210 → 5,214 mm/s shows 5.21 m/s both times; 0.456 → 0.47 s shows 0.46 s → 0.47 s.
    const moved = figureChanges(
      figures(),
      figures({ maxToolSpeedMmPerS: 5214, standardCycleS: 0.47, payloadFullReach: null }),
    );
    expect(moved).toEqual([
      { key: "cycle", label: "Standard cycle estimate", from: "0.46\u00a0s", to: "0.47\u00a0s" },
      {
        key: "payload-full-reach",
        label: "Payload at full reach",
        from: "9.5\u00a0kg at 1,300\u00a0mm",
        to: "not computed",
      },
    ]);
    expect(figureChanges(null, figures())).toEqual([]);
  });
});

describe("revisionsSectionModel", () => {
  it("lists revisions newest first with dates, commits, changes and the figures that moved from the one below", () => {
    const list = [
      revision("aaaaaaaaaaaa", {
        commit: null,
        date: null,
        changed: [{ path: "joints[1].maxSpeedDegPerS", from: 180, to: 175 }],
        figures: figures({ maxToolSpeedMmPerS: 5100 }),
      }),
      revision("bbbbbbbbbbbb", { changed: [{ path: "noiseDbA", from: null, to: 70 }] }),
      revision("cccccccccccc", { valid: false, figures: null, issues: ["error: x"] }),
    ];
    const m = revisionsSectionModel(data(list), "/tools/armdex/");
    expect(m.available).toBe(true);
    expect(m.unavailableText).toBeNull();
    expect(m.rows.map((r) => [r.fingerprint, r.href, r.current, r.dateText, r.commitText, r.valid, r.oldest])).toEqual([
      [
        "aaaaaaaaaaaa",
        "/tools/armdex/arms/demo-arm/rev/aaaaaaaaaaaa/",
        true,
        "not committed",
        "not committed",
        true,
        false,
      ],
      [
        "bbbbbbbbbbbb",
        "/tools/armdex/arms/demo-arm/rev/bbbbbbbbbbbb/",
        false,
        "2026-03-02",
        "bbbbbbbbbbbb",
        true,
        false,
      ],
      [
        "cccccccccccc",
        "/tools/armdex/arms/demo-arm/rev/cccccccccccc/",
        false,
        "2026-03-02",
        "cccccccccccc",
        false,
        true,
      ],
    ]);
    expect(m.rows[0]!.changes).toEqual(["joints[1].maxSpeedDegPerS: 180 \u2192 175"]);
    expect(m.rows[0]!.figureChanges.map((f) => [f.key, f.from, f.to])).toEqual([
      ["max-tool-speed", "5.21\u00a0m/s", "5.1\u00a0m/s"],
    ]);
    // The revision below an invalid one has no figures to compare with.
    expect(m.rows[1]!.figureChanges).toEqual([]);
    expect(m.rows[1]!.sourceText).toBe("revision B of 2026-01-01");
  });

  it("says why revisions are unavailable", () => {
    const m = revisionsSectionModel(data([revision("aaaaaaaaaaaa")], "shallow-clone"), "/");
    expect(m.available).toBe(false);
    expect(m.unavailableText).toMatch(/^Revisions are unavailable: .*shallow clone/);
    expect(revisionsSectionModel(data([revision("a")], "never-committed"), "/").unavailableText).toMatch(
      /not been committed/,
    );
  });
});

describe("citation, banner, revisions.json", () => {
  const arm = { id: "demo-arm", spec: { maker: "Maker", model: "M 1" } } as unknown as Arm;

  it("cites the pinned address, fingerprint, date and source", () => {
    const c = citeModel(arm, revision("bbbbbbbbbbbb"), { baseUrl: "/tools/armdex/", site: "https://h.test" });
    expect(c.href).toBe("/tools/armdex/arms/demo-arm/rev/bbbbbbbbbbbb/");
    expect(c.url).toBe("https://h.test/tools/armdex/arms/demo-arm/rev/bbbbbbbbbbbb/");
    expect(c.citation).toBe(
      "Maker M 1, Armdex arm sheet, spec fingerprint bbbbbbbbbbbb (2026-03-02), from Sheet, revision B, 2026-01-01. https://h.test/tools/armdex/arms/demo-arm/rev/bbbbbbbbbbbb/",
    );
    expect(citeModel(arm, revision("b"), { baseUrl: "/" }).url).toBeNull();
    expect(revisionPath("demo-arm", "b")).toBe("arms/demo-arm/rev/b/");
  });

  it("says on a pinned page whether a newer revision exists, and when it no longer validates", () => {
    const old = pinnedBannerModel("demo-arm", revision("bbbbbbbbbbbb"), true, "/");
    expect(old.superseded).toBe(true);
    expect(old.currentHref).toBe("/arms/demo-arm/");
    expect(old.lines.join(" ")).toMatch(/committed on 2026-03-02 \(commit bbbbbbbbbbbb\).*A newer revision/);
    const bad = pinnedBannerModel("demo-arm", revision("c", { valid: false }), true, "/");
    expect(bad.lines.join(" ")).toMatch(/no longer validates/);
    expect(pinnedBannerModel("demo-arm", revision("a"), false, "/").lines.join(" ")).toMatch(/current revision/);
  });

  it("writes revisions.json newest first in the issue's shape, and pins each fingerprint once", () => {
    const list = [
      revision("aaaaaaaaaaaa", { commit: null, date: null, changed: [{ path: "x", from: 1, to: 2 }] }),
      revision("bbbbbbbbbbbb", { date: "2026-02-01T00:00:00Z" }),
      revision("aaaaaaaaaaaa", { date: "2026-01-01T00:00:00Z" }),
    ];
    expect(revisionsJson(data(list))[0]).toEqual({
      fingerprint: "aaaaaaaaaaaa",
      commit: null,
      date: null,
      sourceRevision: "B",
      changed: [{ path: "x", from: 1, to: 2 }],
    });
    // A file that went back to earlier content: one page, named by its oldest occurrence.
    expect(pinnedRevisions(data(list)).map((r) => [r.fingerprint, r.date])).toEqual([
      ["bbbbbbbbbbbb", "2026-02-01T00:00:00Z"],
      ["aaaaaaaaaaaa", "2026-01-01T00:00:00Z"],
    ]);
  });
});

describe("revisionFigures", () => {
  let arm: Arm;
  let analysis: ArmAnalysis;
  beforeAll(async () => {
    ({ arm, analysis } = await demoArmWithAnalysis());
  });

  it("reads the same figures the arm sheet's key figures show", () => {
    const f = revisionFigures(analysis, arm.spec.mountings);
    const sheet = armAnalysisModel(arm, analysis, { baseUrl: "/" }).summary;
    const byKey = Object.fromEntries(sheet.map((s) => [s.key, s.value]));
    const fc = (g: RevisionFigures) =>
      figureChanges(g, {
        ...g,
        computedReachMm: -1,
        maxToolSpeedMmPerS: -1,
        shareAtLeast1MPerSDown: -1,
        standardCycleS: -1,
        payloadFullReach: null,
      });
    const shown = Object.fromEntries(fc(f).map((c) => [c.key, c.from]));
    expect(shown["max-tool-speed"]).toBe(byKey["max-tool-speed"]);
    expect(shown["share-1"]).toBe(byKey["share-1"]);
    expect(shown.cycle).toBe(byKey.cycle);
    expect(shown.reach!.startsWith(byKey.reach!)).toBe(true);
    if (byKey["payload-full-reach"])
      expect(shown["payload-full-reach"]!.startsWith(byKey["payload-full-reach"])).toBe(true);
  });
});

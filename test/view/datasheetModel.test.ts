/**
 * The datasheet section's view model and the words for declared facts (src/view/datasheetModel.ts,
 * datasheetFormat.ts, protection.ts), the catalog row's datasheet attributes and the side-by-side rows. Pure
 * functions over invented arm specs; expected texts are written out by hand from the inputs.
 */
import { describe, expect, it } from "vitest";
import { validateArm, type ArmSpec } from "../../src/catalog";
import { datasheetModel, declaredPoseRepeatability, NOT_DECLARED } from "../../src/view/datasheetModel";
import { protectionMeets, parseIpCode } from "../../src/view/protection";
import { specRows } from "../../src/view/compareModel";
import type { CompareArmSummary } from "../../src/view/compareData";

function spec(extra: Record<string, unknown> = {}): ArmSpec {
  const joint = (name: string, aMm: number, alphaDeg: number, dMm: number) => ({
    name,
    kind: "revolute",
    dh: { aMm, alphaDeg, dMm, thetaDeg: 0 },
    rangeDeg: [-170, 170],
    maxSpeedDegPerS: 200,
  });
  const r = validateArm(
    {
      id: "sheet-arm",
      maker: "Test Maker",
      model: "S-1",
      class: "articulated",
      mountings: ["floor"],
      massKg: 50,
      ratedPayloadKg: 5,
      repeatabilityMm: 0.03,
      protection: "IP54",
      convention: "dh",
      joints: [joint("J1", 100, -90, 400), joint("J2", 500, 0, 0), joint("J3", 0, 0, 80)],
      flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
      source: { document: "Test sheet", revision: "A", date: "2026-01-01" },
      ...extra,
    },
    "arms/sheet-arm.json",
    "sheet-arm",
  );
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.spec;
}

const stop = (joint: string, stopCategory: number, speedPercent: number, distanceDeg: number, timeS: number) => ({
  joint,
  stopCategory,
  speedPercent,
  extensionPercent: 100,
  payloadPercent: 100,
  distanceDeg,
  timeS,
});
const perf = (characteristic: string, value: Record<string, number>, loadPercent: number, speedPercent: number) => ({
  characteristic,
  ...value,
  loadPercent,
  speedPercent,
  standard: "ISO 9283",
});

const cellTexts = (rows: readonly { cells: readonly { text: string }[] }[]) =>
  rows.map((r) => r.cells.map((c) => c.text));

describe("datasheetModel", () => {
  it("says 'not declared' for every field a file leaves out, and counts none", () => {
    const m = datasheetModel(spec());
    expect(m.declaredCount).toBe(0);
    expect(m.table.rows.every((r) => r.cells[1]!.text === NOT_DECLARED)).toBe(true);
    expect(m.performance).toBeNull();
    expect(m.stopping).toEqual([]);
  });

  it("shows each declared fact with its unit", () => {
    const m = datasheetModel(
      spec({
        footprintMm: [320, 1250],
        mountingFace: "4 × M12",
        flangeInterface: "ISO 9409-1-50-4-M6",
        ambientC: [-10, 45],
        controller: { model: "Box 1", massKg: 30.5 },
        noiseDbA: 68,
      }),
    );
    expect(m.declaredCount).toBe(6);
    const byKey = Object.fromEntries(m.table.rows.map((r) => [r.key, r.cells[1]!.text]));
    expect(byKey).toEqual({
      footprint: "320 \u00d7 1,250\u00a0mm",
      "mounting-face": "4 × M12",
      flange: "ISO 9409-1-50-4-M6",
      ambient: "\u221210 to 45\u00a0\u00b0C",
      noise: "68\u00a0dB(A)",
      controller: "Box 1",
      "controller-mass": "30.5\u00a0kg",
      "controller-supply": NOT_DECLARED,
    });
  });

  it("lists declared performance with its test conditions, each value in its characteristic's unit", () => {
    const m = datasheetModel(
      spec({
        declaredPerformance: [
          perf("pose repeatability", { valueMm: 0.03 }, 100, 100),
          perf("positioning time", { valueS: 0.45 }, 100, 50),
        ],
      }),
    );
    expect(cellTexts(m.performance!.rows)).toEqual([
      ["pose repeatability", "0.03\u00a0mm", "100", "100", "ISO 9283"],
      ["positioning time", "0.45\u00a0s", "100", "50", "ISO 9283"],
    ]);
  });

  it("gives stopping data a table and a chart per joint, in joint order, rows by category then speed", () => {
    const m = datasheetModel(
      spec({
        stoppingData: [
          stop("J2", 1, 100, 30, 0.5),
          stop("J1", 1, 66, 12, 0.4),
          stop("J1", 0, 100, 25, 0.3),
          stop("J1", 1, 33, 4, 0.3),
        ],
      }),
    );
    expect(m.stopping.map((j) => j.joint)).toEqual(["J1", "J2"]);
    expect(cellTexts(m.stopping[0]!.table.rows)).toEqual([
      ["0", "100", "100", "100", "25", "0.3"],
      ["1", "33", "100", "100", "4", "0.3"],
      ["1", "66", "100", "100", "12", "0.4"],
    ]);
    const ids = m.stopping.map((j) => j.chart.id);
    expect(new Set(ids).size).toBe(2);
    for (const id of ids) expect(id).toMatch(/^[A-Za-z][-A-Za-z0-9_]*$/);
    expect(m.stopping[0]!.table.columns.map((c) => c.unit)).toEqual([
      undefined,
      "% of max.",
      "%",
      "% of rated",
      "deg",
      "s",
    ]);
  });

  it("sums all stopping data up in one table for print: a row per joint and condition, a column per speed", () => {
    const t = datasheetModel(
      spec({
        stoppingData: [
          stop("J2", 1, 100, 30, 0.5),
          stop("J1", 1, 66, 12, 0.4),
          stop("J1", 0, 100, 25, 0.3),
          stop("J1", 1, 33, 4, 0.3),
        ],
      }),
    ).stoppingSummary!;
    expect(t.columns.map((c) => c.label)).toEqual([
      "Joint",
      "Stop category",
      "Extension",
      "Payload",
      "At 33 % speed",
      "At 66 % speed",
      "At 100 % speed",
    ]);
    expect(cellTexts(t.rows)).toEqual([
      ["J1", "0", "100", "100", "\u2014", "\u2014", "25, 0.3"],
      ["J1", "1", "100", "100", "4, 0.3", "12, 0.4", "\u2014"],
      ["J2", "1", "100", "100", "\u2014", "\u2014", "30, 0.5"],
    ]);
    expect(datasheetModel(spec()).stoppingSummary).toBeNull();
  });

  it("takes the pose repeatability at the highest load, then the highest speed", () => {
    const s = spec({
      declaredPerformance: [
        perf("pose repeatability", { valueMm: 0.02 }, 10, 100),
        perf("pose repeatability", { valueMm: 0.04 }, 100, 50),
        perf("pose repeatability", { valueMm: 0.03 }, 100, 100),
        perf("pose accuracy", { valueMm: 0.3 }, 100, 100),
      ],
    });
    expect(declaredPoseRepeatability(s)).toEqual({ valueMm: 0.03, loadPercent: 100, speedPercent: 100 });
    expect(declaredPoseRepeatability(spec())).toBeNull();
  });
});

describe("IEC 60529 codes for the protection filter", () => {
  it("reads the two numerals", () => {
    expect(parseIpCode("IP54")).toEqual({ solids: 5, water: 4 });
    expect(parseIpCode("IPX7")).toEqual({ solids: null, water: 7 });
    expect(parseIpCode("IP6K9")).toBeNull();
    expect(parseIpCode("IP79")).toBeNull();
  });

  // Each case worked by hand from the rule: every numeral asked for is met; water 1–6 and 7–8 are separate ladders
  // (an enclosure marked 7 or 8 alone need not pass the jets of 5 and 6) [from memory: IEC 60529].
  it.each([
    ["IP65", "IP54", true],
    ["IP54", "IP65", false],
    ["IP66", "IP65", true],
    ["IP67", "IP65", false],
    ["IP67", "IPX7", true],
    ["IP68", "IPX7", true],
    ["IPX7", "IP54", false],
    ["IP65", "IP5X", true],
    ["IP20", "IP20", true],
    ["IP54", "IP00", true],
  ])("%s meets at least %s: %s", (arm, min, want) => {
    expect(protectionMeets(arm, min)).toBe(want);
  });
});

describe("side-by-side rows of declared datasheet facts", () => {
  const summary = (id: string, footprintMm: [number, number] | null, rp: boolean): CompareArmSummary =>
    ({
      id,
      maker: "M",
      model: id,
      name: id,
      class: "articulated",
      drivenAxes: 6,
      declared: {
        ratedPayloadKg: 5,
        reachMm: null,
        repeatabilityMm: 0.03,
        massKg: 50,
        protection: "IP54",
        mountings: ["floor"],
        listPrice: null,
        currency: null,
        source: "s",
        footprintMm,
        poseRepeatability: rp ? { valueMm: 0.03, loadPercent: 100, speedPercent: 50 } : null,
      },
      reach: { basis: "wrist centre point", computedMm: null, flangeMaxMm: null, maxHeightMm: null, minHeightMm: null },
      cycle: { standardCycleS: null, limitingJoint: null, reason: null },
    }) as unknown as CompareArmSummary;

  it("marks the smallest footprint by area and shows the repeatability's test conditions", () => {
    const rows = specRows([summary("a", [400, 400], true), summary("b", [300, 500], false), summary("c", null, false)]);
    const fp = rows.find((r) => r.key === "footprint")!;
    expect(fp.cells.map((c) => c.text)).toEqual(["400 \u00d7 400\u00a0mm", "300 \u00d7 500\u00a0mm", NOT_DECLARED]);
    // 300 × 500 = 150 000 mm² < 400 × 400 = 160 000 mm².
    expect(fp.cells.map((c) => c.best)).toEqual([false, true, false]);
    const rep = rows.find((r) => r.key === "repeatability")!;
    expect(rep.cells[0]!.text).toBe("\u00b10.03\u00a0mm (at 100\u00a0% load, 50\u00a0% speed)");
    expect(rep.cells[1]!.text).toBe("\u00b10.03\u00a0mm");
  });
});

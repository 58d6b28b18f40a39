import { describe, expect, it } from "vitest";
import {
  accelerationNote,
  jointList,
  movesTable,
  rankingTable,
  shortReasons,
  stepSpeedText,
  targetsTable,
  tightestMargin,
  toolLoadStatus,
  toolLoadTable,
  type CellArmInfo,
} from "../../src/view/cellTables";
import { ARM_HASHES, CELL, STUDY } from "./cellFixtures";

const info = new Map<string, CellArmInfo>([
  ["arm-a", { id: "arm-a", name: "Maker A One", sheetHref: "/arms/arm-a/", specHash: ARM_HASHES["arm-a"] }],
  ["arm-b", { id: "arm-b", name: "Maker B Two", sheetHref: "/arms/arm-b/", specHash: null }],
]);
const [A, B] = STUDY.arms as [(typeof STUDY.arms)[0], (typeof STUDY.arms)[0]];
const texts = (row: { cells: readonly { text: string }[] }) => row.cells.map((c) => c.text);

describe("jointList", () => {
  it("joins runs of three or more consecutive joints with an en dash, shorter runs with commas", () => {
    expect(jointList(["J1", "J2", "J3", "J4", "J5", "J6"])).toBe("J1–J6");
    expect(jointList(["J1", "J2", "J3", "J5", "J6"])).toBe("J1–J3, J5, J6");
    expect(jointList(["J2", "J4"])).toBe("J2, J4");
    expect(jointList([])).toBe("");
  });
});

describe("accelerationNote", () => {
  it("names the joints and the assumed 0.25 s to full speed, or says nothing", () => {
    expect(accelerationNote(A)).toBe("J1–J4, J6: no acceleration in the arm file; assumed full speed in 0.25 s.");
    expect(accelerationNote(B)).toBe("");
  });
});

describe("tightestMargin and toolLoadStatus", () => {
  it("takes the smallest margin over the targets with its joint", () => {
    // arm-a margins 12.5 (J3), 8.25 (J5), 20 (J1): the smallest is 8.25 at J5, shown with one decimal.
    expect(tightestMargin(A)).toEqual({ text: "8.3° (J5)", valueDeg: 8.25 });
  });

  it("reports the most used rating as a share (used / allowed)", () => {
    // arm-a: masses 2 and 5 kg of 10 kg rated (20 %, 50 %); J5 moment 12 of 40 N·m (30 %), inertia 0.2 of 1 (20 %):
    // the most used is the mass with the box, 50 %.
    expect(toolLoadStatus(A)).toEqual({
      text: "within ratings",
      note: "most used: mass, tool with box, 50 %",
      ok: true,
    });
    // arm-b: J5 moment 12 > 10 N·m in both loads, and 12 kg > 10 kg with the box: three checks over. Shares in the
    // order checked: 2/10 = 20 %, moment 12/10 = 120 %, inertia 20 %, then the box's 12/10 = 120 % and 120 %, which
    // do not exceed the first 120 %: the J5 moment with the tool alone is reported.
    const b = toolLoadStatus(B);
    expect(b.ok).toBe(false);
    expect(b.text).toBe("3 checks over");
    expect(b.note).toBe("most used: J5 moment, tool alone, 120 %");
  });
});

describe("rankingTable", () => {
  const table = rankingTable(STUDY, info, { id: "rank" });

  it("keeps the study's order and links each arm to its sheet", () => {
    expect(table.rows.map((r) => r.key)).toEqual(["arm-a", "arm-b"]);
    expect(table.rows[0]!.cells[1]).toMatchObject({ text: "Maker A One", href: "/arms/arm-a/" });
    expect(table.rows[0]!.data).toEqual({ verdict: "pass", "cycle-s": "3.5" });
    expect(table.rows[1]!.data).toEqual({ verdict: "fail" });
  });

  it("shows rank, verdict, cycle, margin, tool load, the first 12 hex of the spec hash and the reasons", () => {
    expect(texts(table.rows[0]!)).toEqual([
      "1",
      "Maker A One",
      "pass",
      "3.5",
      "8.3° (J5)",
      "within ratings",
      "0123456789ab",
      "—",
    ]);
    const b = texts(table.rows[1]!);
    expect(b.slice(0, 4)).toEqual(["—", "Maker B Two", "fail", "—"]);
    expect(b[6]).toBe("—");
    // Four reasons: three shown, then how many more.
    expect(b[7]).toBe(
      "J5 moment 12 N·m > 10 N·m (tool with box); place: out of reach; a; and 1 more (see the arm's section)",
    );
    expect(table.rows[0]!.cells[3]!.note).toBe("acceleration assumed (J1–J4, J6)");
    expect(table.rows[1]!.cells[3]!.note).toBe("a move cannot be done");
  });

  it("links the fingerprint to the arm's pinned sheet of that revision when the site has one", () => {
    const pinned = new Map(info);
    pinned.set("arm-a", { ...info.get("arm-a")!, revisionHref: "/arms/arm-a/rev/0123456789ab/" });
    const t = rankingTable(STUDY, pinned, { id: "rank" });
    expect(t.rows[0]!.cells[6]).toMatchObject({ text: "0123456789ab", href: "/arms/arm-a/rev/0123456789ab/" });
    expect(t.rows[1]!.cells[6]!.href).toBeUndefined();
  });

  it("says a list without reasons is a dash", () => {
    expect(shortReasons([])).toBe("—");
    expect(shortReasons(["x", "y"], 3)).toBe("x; y");
  });
});

describe("targetsTable", () => {
  const t = targetsTable(A, "t", "Maker A One");

  it("lists each target with its solutions, joints, margin, inverse condition and largest holding share", () => {
    expect(t.rows.map((r) => r.key)).toEqual(["pick", "above pick", "place"]);
    expect(texts(t.rows[0]!)).toEqual([
      "pick",
      "yes, 4 solutions",
      "10, −20.3, 30, 0, 45, −170",
      "12.5° (J3)",
      "0.235",
      // J2 90 of 300 N·m is 30 %; J3 60 of 120 N·m is 50 %: J3 is shown.
      "J3 60 of 120\u00a0N·m",
    ]);
    expect(t.rows[0]!.cells[5]!.note).toBe("50 % of rated");
  });

  it("gives a linear axis's holding figure as a force in N", () => {
    expect(targetsTable(A, "t", "A", ["J3"]).rows[0]!.cells[5]!.text).toBe("J3 60 of 120\u00a0N");
  });

  it("gives the reason where a target is out of reach", () => {
    const row = targetsTable(B, "t", "B").rows[2]!;
    expect(texts(row).slice(0, 3)).toEqual(["place", "no", "—"]);
    expect(row.cells[1]!.note).toBe("out of reach");
  });
});

describe("movesTable", () => {
  it("shows each move with the cell step's speed, time, dwell, limit and problem", () => {
    const m = movesTable(A, CELL, "m", "A");
    expect(texts(m.rows[0]!)).toEqual(["1", "place → above pick", "joint, 80 %", "—", "1", "0", "J1 speed", "—"]);
    expect(texts(m.rows[1]!)).toEqual([
      "2",
      "above pick → pick",
      "linear, 250\u00a0mm/s",
      "—",
      "1.5",
      "0.5",
      "tool speed 250 mm/s",
      "—",
    ]);
    expect(texts(m.rows[2]!)[3]).toBe("box");
    const bad = movesTable(B, CELL, "m", "B").rows[2]!;
    expect(texts(bad)[4]).toBe("—");
    expect(bad.cells[7]).toMatchObject({ text: "singularity (J5)", note: "at (610, −12, 700) mm" });
  });

  it("says the default speeds when a step gives none", () => {
    expect(stepSpeedText({ to: "x", motion: "joint" })).toBe("100 %");
    expect(stepSpeedText({ to: "x", motion: "linear" })).toBe("joint limits");
  });
});

describe("toolLoadTable", () => {
  it("has one row per load and wrist rating, used of allowed, with the mass against the rated payload", () => {
    const t = toolLoadTable(B, "l", "B");
    expect(t.rows).toHaveLength(2);
    expect(texts(t.rows[1]!)).toEqual([
      "tool with box",
      "12",
      "(0, 0, 80)",
      "J5 (bending)",
      "12 of 10",
      "0.2 of 1",
      "over",
    ]);
    expect(t.rows[1]!.cells[1]!.note).toBe("rated 10\u00a0kg: over");
    expect(t.rows[1]!.cells[4]!.note).toBe("over");
    expect(t.rows[1]!.cells[5]!.note).toBeUndefined();
  });

  it("says a rating the arm file leaves out is not rated", () => {
    const load = B.toolLoad[0]!;
    const unrated = {
      ...B,
      toolLoad: [
        { ...load, ratings: [{ ...load.ratings[0]!, allowedMomentNm: null, allowedInertiaKgM2: null, ok: true }] },
      ],
    };
    expect(texts(toolLoadTable(unrated, "l", "B").rows[0]!).slice(4, 6)).toEqual(["12 (not rated)", "0.2 (not rated)"]);
  });
});

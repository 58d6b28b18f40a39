import { describe, expect, it } from "vitest";
import { MOVES_CSV_HEADER, movesCsv, targetsCsv } from "../../src/view/cellCsv";
import { STUDY } from "./cellFixtures";

/** RFC 4180 reader for the tests (quoted fields, doubled quotes, CRLF records): independent of the writer. */
function readCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [],
    field = "",
    quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") {
      row.push(field);
      field = "";
    } else if (c === "\r" && text[i + 1] === "\n") {
      row.push(field);
      rows.push(row);
      row = [];
      field = "";
      i++;
    } else field += c;
  }
  return rows;
}

describe("movesCsv", () => {
  it("has one row per move of every arm, numbers as numbers and empty cells where a move cannot be done", () => {
    const rows = readCsv(movesCsv(STUDY));
    expect(rows[0]).toEqual([...MOVES_CSV_HEADER]);
    expect(rows).toHaveLength(1 + 3 + 3);
    expect(rows[2]).toEqual([
      "arm-a",
      "1",
      "pass",
      "2",
      "above pick",
      "pick",
      "linear",
      "",
      "1.5",
      "0.5",
      "tool speed 250 mm/s",
      "yes",
      "",
      "",
      "",
      "",
      "",
    ]);
    expect(rows[6]).toEqual([
      "arm-b",
      "",
      "fail",
      "3",
      "pick",
      "place",
      "joint",
      "box",
      "",
      "0",
      "",
      "no",
      "singularity",
      "J5",
      "610.4",
      "-12",
      "700",
    ]);
  });
});

describe("targetsCsv", () => {
  it("puts the joints in columns j1…jN with the arm's joint units, and the largest holding share", () => {
    const rows = readCsv(targetsCsv(STUDY, new Map([["arm-a", ["deg", "deg", "mm", "deg", "deg", "deg"]]])));
    const header = rows[0]!;
    expect(header.slice(5, 12)).toEqual(["j1", "j2", "j3", "j4", "j5", "j6", "joint_units"]);
    const pick = rows[1]!;
    expect(pick.slice(0, 12)).toEqual([
      "arm-a",
      "pick",
      "yes",
      "4",
      "",
      "10",
      "-20.25",
      "30",
      "0",
      "45",
      "-170",
      "deg deg mm deg deg deg",
    ]);
    // Holding: J3 60 of 120 N·m (50 %) is a larger share than J2 90 of 300 (30 %).
    expect(pick.slice(-4)).toEqual(["J3", "60", "120", "yes"]);
    const unreached = rows[6]!;
    expect(unreached.slice(0, 6)).toEqual(["arm-b", "place", "no", "0", "out of reach", ""]);
    expect(unreached.slice(-4)).toEqual(["", "", "", ""]);
  });
});

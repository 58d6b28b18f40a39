/**
 * The parameter table of an arm sheet (src/view/jointTables.ts) for the dimension-drawing form: the axes at θ = 0
 * and the flange centre as issue 14 §1 places them, worked by hand for the demo arm Corvell Tern 12
 * (a1 120, a2 95, b 0, c1 420, c2 560, c3 600, c4 90 mm): axis 2 through (120, 0, 420), axis 3 through
 * (120, 0, 980), the wrist centre at (a1 + c3, b, c1 + c2 + a2) = (720, 0, 1075), the flange centre 90 further
 * along +x at (810, 0, 1075).
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { validateArm } from "../../src/catalog";
import { parameterTable } from "../../src/view/jointTables";

describe("parameterTable(dimensions arm)", () => {
  it("lists each joint's axis at θ = 0, its sign and zero offset, and the flange centre", () => {
    const data = JSON.parse(readFileSync("arms/corvell-tern-12.json", "utf8")) as unknown;
    const r = validateArm(data, "arms/corvell-tern-12.json", "corvell-tern-12");
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const table = parameterTable(r.spec);
    const cells = table.rows.map((row) => row.cells.map((c) => c.text));
    expect(cells.map((c) => c[1])).toEqual([
      "+z through (0, 0, 0) mm",
      "+y through (120, 0, 420) mm",
      "+y through (120, 0, 980) mm",
      "+x through the wrist centre (720, 0, 1,075) mm",
      "+y through the wrist centre",
      "+x through the wrist centre",
    ]);
    expect(cells.map((c) => c[2])).toEqual(["+1", "+1", "\u22121", "+1", "+1", "+1"]);
    expect(table.footnote).toContain("Flange centre at \u03b8 = 0: (810, 0, 1,075) mm");
  });
});

/**
 * diffJson (src/catalog/jsonDiff.ts): JSON paths with old and new values, checked on hand-made pairs whose changes
 * are written out by hand, and a property: applying the reported changes to the old value gives the new one.
 */
import { describe, expect, it } from "vitest";
import { diffJson, type JsonChange } from "../../src/catalog/jsonDiff";
import { mulberry32 } from "../helpers/prng";

describe("diffJson", () => {
  it("names a changed joint speed by its path, with old and new values", () => {
    const a = {
      joints: [
        { name: "J1", maxSpeedDegPerS: 200 },
        { name: "J2", maxSpeedDegPerS: 190 },
      ],
    };
    const b = {
      joints: [
        { name: "J1", maxSpeedDegPerS: 200 },
        { name: "J2", maxSpeedDegPerS: 175 },
      ],
    };
    expect(diffJson(a, b)).toEqual([{ path: "joints[1].maxSpeedDegPerS", from: 190, to: 175 }]);
  });

  it("treats a tuple of plain values as one value, and absent fields as null", () => {
    const a = { rangeDeg: [-170, 170], mountings: ["floor"], source: { revision: "A" } };
    const b = { rangeDeg: [-165, 165], mountings: ["floor", "ceiling"], source: { revision: "B", notes: "x" } };
    expect(diffJson(a, b)).toEqual([
      { path: "mountings", from: ["floor"], to: ["floor", "ceiling"] },
      { path: "rangeDeg", from: [-170, 170], to: [-165, 165] },
      { path: "source.notes", from: null, to: "x" },
      { path: "source.revision", from: "A", to: "B" },
    ]);
  });

  it("reports added and removed array elements by index, and keys that are not identifiers in brackets", () => {
    const a = { links: [{ after: "J1", massKg: 3 }], wrist: { momentNm: { "J 4": 10 } } };
    const b = {
      links: [
        { after: "J1", massKg: 3 },
        { after: "J2", massKg: 2 },
      ],
      wrist: { momentNm: {} },
    };
    expect(diffJson(a, b)).toEqual([
      { path: "links[1]", from: null, to: { after: "J2", massKg: 2 } },
      { path: 'wrist.momentNm["J 4"]', from: 10, to: null },
    ]);
    expect(diffJson(b, b)).toEqual([]);
  });

  it("lists exactly what turns the old value into the new one (random objects)", () => {
    const rand = mulberry32(15);
    const leaf = () => (rand() < 0.5 ? Math.round(rand() * 10) : ["a", "b", "c"][Math.floor(rand() * 3)]!);
    const make = (depth: number): Record<string, unknown> => {
      const o: Record<string, unknown> = {};
      for (const k of ["p", "q", "r"]) {
        if (rand() < 0.2) continue;
        o[k] =
          depth > 0 && rand() < 0.4
            ? rand() < 0.5
              ? make(depth - 1)
              : [make(depth - 1), make(depth - 1)].slice(0, 1 + Math.floor(rand() * 2))
            : leaf();
      }
      return o;
    };
    /** Sets `path` (as diffJson writes it) in `root` to `value`, deleting the key for null. */
    const apply = (root: unknown, c: JsonChange) => {
      const keys = [...c.path.matchAll(/\.?([A-Za-z_$][\w$]*)|\[(\d+)\]/g)].map(
        (m) => (m[1] ?? Number(m[2])) as string | number,
      );
      let at = root as Record<string | number, unknown>;
      for (const k of keys.slice(0, -1)) at = at[k] as Record<string | number, unknown>;
      const last = keys.at(-1)!;
      if (c.to === null) {
        if (Array.isArray(at)) at.length = Math.min(at.length, Number(last));
        else delete at[last];
      } else at[last] = structuredClone(c.to);
    };
    for (let n = 0; n < 200; n++) {
      const a = make(3),
        b = make(3);
      const copy = structuredClone(a);
      const changes = diffJson(a, b);
      // Removals from the end of an array first, so indices stay valid.
      for (const c of [...changes].reverse()) apply(copy, c);
      expect(copy).toEqual(b);
    }
  });
});

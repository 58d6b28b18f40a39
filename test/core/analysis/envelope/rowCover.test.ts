/**
 * RowCover.coversMirrored against a brute-force reading of the rows: [a, b] and [−b, −a] each inside one interval
 * of every row in range (interval membership checked directly on the intervals added, merged by hand).
 */
import { describe, expect, it } from "vitest";
import { RowCover } from "../../../../src/core/analysis/envelope/rowCover";
import { mulberry32, uniform } from "../../../helpers/prng";

/** Union of intervals, merged by sorting (the textbook sweep), as [start, end] pairs. */
function merged(intervals: [number, number][]): [number, number][] {
  const out: [number, number][] = [];
  for (const [s, e] of [...intervals].sort((p, q) => p[0] - q[0])) {
    const last = out[out.length - 1];
    if (last && s <= last[1]) last[1] = Math.max(last[1], e);
    else out.push([s, e]);
  }
  return out;
}
const within = (rows: [number, number][], a: number, b: number) => rows.some(([s, e]) => s <= a && e >= b);

describe("RowCover.coversMirrored", () => {
  it("agrees with the intervals added, row by row, on random covers and boxes", () => {
    const rand = mulberry32(11);
    for (let trial = 0; trial < 200; trial++) {
      const cover = new RowCover(0, 1);
      const added = new Map<number, [number, number][]>();
      for (let k = 0; k < 12; k++) {
        const j = Math.floor(uniform(rand, 0, 6)),
          s = uniform(rand, -100, 100),
          e = s + uniform(rand, 0, 120);
        cover.add(j, s, e);
        (added.get(j) ?? added.set(j, []).get(j)!).push([s, e]);
      }
      const a = uniform(rand, 0, 40),
        b = a + uniform(rand, 0, 40);
      const jLo = Math.floor(uniform(rand, -1, 6)),
        jHi = jLo + Math.floor(uniform(rand, 0, 3));
      let expected = true;
      for (let j = jLo; j <= jHi; j++) {
        const rows = merged(added.get(j) ?? []);
        if (!within(rows, a, b) || !within(rows, -b, -a)) expected = false;
      }
      expect(cover.coversMirrored(jLo, jHi, a, b), `trial ${trial}`).toBe(expected);
    }
  });

  it("answers as the rows stand when queries and additions alternate (per-row cache of the symmetric radius)", () => {
    // intervals around 0 (the cached symmetric radius applies) and off it, queried again after every addition
    const rand = mulberry32(23);
    for (let trial = 0; trial < 50; trial++) {
      const cover = new RowCover(0, 1);
      const added = new Map<number, [number, number][]>();
      for (let k = 0; k < 30; k++) {
        const j = Math.floor(uniform(rand, 0, 5)),
          s = uniform(rand, -60, 20),
          e = s + uniform(rand, 0, 80);
        cover.add(j, s, e);
        (added.get(j) ?? added.set(j, []).get(j)!).push([s, e]);
        for (let q = 0; q < 4; q++) {
          const a = uniform(rand, 0, 30),
            b = a + uniform(rand, 0, 30);
          const jLo = Math.floor(uniform(rand, 0, 5)),
            jHi = jLo + Math.floor(uniform(rand, 0, 2));
          let expected = true;
          for (let j = jLo; j <= jHi; j++) {
            const rows = merged(added.get(j) ?? []);
            if (!within(rows, a, b) || !within(rows, -b, -a)) expected = false;
          }
          expect(cover.coversMirrored(jLo, jHi, a, b), `trial ${trial}, addition ${k}`).toBe(expected);
        }
      }
    }
  });
});

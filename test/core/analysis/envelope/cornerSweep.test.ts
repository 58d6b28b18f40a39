/**
 * CornerSweep on hand-made slices: a 4 × 5 primary grid (c0 = 10·ia, c1 = 10·ib) translated per slice by a linear
 * function of the secondary indices. Checks: triangle counts worked by hand from the module doc (per pair of slices
 * adjacent along one secondary joint, 4 corners × 2 limits × depth grid edges, one quad = 2 triangles each; per 2-D
 * cell of the secondary grid, one quad per corner), and coverage: for a translation the path of a boundary edge is a
 * parallelogram, so every point (1 − u)·P + u·Q of a strip edge moved by t ∈ [0, 1] of the step between neighbours
 * must lie in the union of the triangles (point-in-triangle by barycentric signs, independent of the code).
 */
import { describe, expect, it } from "vitest";
import { CornerSweep } from "../../../../src/core/analysis/envelope/cornerSweep";
import type { SamplingPlan } from "../../../../src/core/analysis/envelope/jointSampling";
import type { SliceBuffers } from "../../../../src/core/analysis/envelope/sliceGrid";
import { mulberry32, uniform } from "../../../helpers/prng";

const NA = 4,
  NB = 5,
  STEP = 10;

function planOf(secondaryCounts: number[]): SamplingPlan {
  const grid = (n: number) => ({ driven: 0, values: new Float64Array(n), periodic: false });
  return { a: grid(NA), b: grid(NB), secondaries: secondaryCounts.map(grid) } as unknown as SamplingPlan;
}

/** Translation of slice (s1, s2): along s1 by (3, 7), along s2 by (1, −2) (not parallel to the grid edges). */
const shift = (s1: number, s2: number): [number, number] => [3 * s1 + s2, 7 * s1 - 2 * s2];

function slice(s1: number, s2: number): SliceBuffers {
  const [tx, ty] = shift(s1, s2);
  const c0 = new Float64Array(NA * NB),
    c1 = new Float64Array(NA * NB),
    c2 = new Float64Array(NA * NB);
  for (let ia = 0; ia < NA; ia++)
    for (let ib = 0; ib < NB; ib++) {
      c0[ia * NB + ib] = STEP * ia + tx;
      c1[ia * NB + ib] = STEP * ib + ty;
    }
  return { c0, c1, c2, q: new Float64Array(3) };
}

type Tri = [number, number, number, number, number, number];

function trianglesOf(sweep: CornerSweep): Tri[] {
  const out: Tri[] = [];
  for (let k = 0; k < sweep.count; k++) {
    const t = sweep.tris.subarray(9 * k, 9 * k + 9);
    out.push([t[0]!, t[1]!, t[3]!, t[4]!, t[6]!, t[7]!]);
  }
  return out;
}

/** Point in a closed triangle (barycentric sign test with a small tolerance). */
function inTriangle(x: number, y: number, t: Tri, eps = 1e-9): boolean {
  const d = (ax: number, ay: number, bx: number, by: number) => (bx - ax) * (y - ay) - (by - ay) * (x - ax);
  const d1 = d(t[0], t[1], t[2], t[3]),
    d2 = d(t[2], t[3], t[4], t[5]),
    d3 = d(t[4], t[5], t[0], t[1]);
  return (d1 >= -eps && d2 >= -eps && d3 >= -eps) || (d1 <= eps && d2 <= eps && d3 <= eps);
}

/** The boundary edges of the primary box within `depth` steps of a corner, as grid index pairs (hand-listed). */
function stripEdges(depth: number): [[number, number], [number, number]][] {
  const edges: [[number, number], [number, number]][] = [];
  const corners: [number, number, number, number][] = [
    [0, 0, 1, 1],
    [NA - 1, 0, -1, 1],
    [NA - 1, NB - 1, -1, -1],
    [0, NB - 1, 1, -1],
  ];
  for (const [ia, ib, da, db] of corners)
    for (let s = 0; s < depth; s++) {
      edges.push([
        [ia + da * s, ib],
        [ia + da * (s + 1), ib],
      ]);
      edges.push([
        [ia, ib + db * s],
        [ia, ib + db * (s + 1)],
      ]);
    }
  return edges;
}

describe("CornerSweep", () => {
  it("emits nothing without secondary joints, nor for the first slice", () => {
    const none = new CornerSweep(planOf([]), 2);
    none.visit(slice(0, 0), 0);
    // no secondaries: no neighbouring slices
    expect(none.count).toBe(0);
    const one = new CornerSweep(planOf([3]), 2);
    one.visit(slice(0, 0), 0);
    expect(one.count).toBe(0);
  });

  it("one secondary joint: 8 strips × depth quads per neighbour pair; the strips' paths are covered", () => {
    const rand = mulberry32(3);
    for (const depth of [1, 2]) {
      const sweep = new CornerSweep(planOf([3]), depth);
      for (let s1 = 0; s1 < 3; s1++) {
        sweep.visit(slice(s1, 0), s1);
        if (s1 === 0) continue;
        // hand count: 4 corners × 2 limits × depth edges, 2 triangles each
        expect(sweep.count).toBe(8 * depth * 2);
        const tris = trianglesOf(sweep);
        const [ax, ay] = shift(s1 - 1, 0),
          [bx, by] = shift(s1, 0);
        for (const [[pa, pb], [qa, qb]] of stripEdges(depth))
          for (let k = 0; k < 20; k++) {
            const u = uniform(rand, 0, 1),
              t = uniform(rand, 0, 1);
            const x = STEP * ((1 - u) * pa + u * qa) + (1 - t) * ax + t * bx,
              y = STEP * ((1 - u) * pb + u * qb) + (1 - t) * ay + t * by;
            expect(
              tris.some((tri) => inTriangle(x, y, tri)),
              `depth ${depth} slice ${s1} point (${x}, ${y})`,
            ).toBe(true);
          }
      }
    }
  });

  it("two secondary joints: counts per slice and the corner's path over each 2-D cell covered", () => {
    const rand = mulberry32(9);
    const depth = 2,
      n1 = 3,
      n2 = 3;
    const sweep = new CornerSweep(planOf([n1, n2]), depth);
    const corners: [number, number][] = [
      [0, 0],
      [NA - 1, 0],
      [NA - 1, NB - 1],
      [0, NB - 1],
    ];
    // slice index = s1 + n1·s2 (first secondary fastest: strides 1, n1)
    for (let s2 = 0; s2 < n2; s2++)
      for (let s1 = 0; s1 < n1; s1++) {
        sweep.visit(slice(s1, s2), s1 + n1 * s2);
        // hand count: 32 triangles per neighbour along each joint with a nonzero digit, 8 per 2-D cell
        const expected = (s1 > 0 ? 32 : 0) + (s2 > 0 ? 32 : 0) + (s1 > 0 && s2 > 0 ? 8 : 0);
        expect(sweep.count, `slice (${s1}, ${s2})`).toBe(expected);
        if (!(s1 > 0 && s2 > 0)) continue;
        const tris = trianglesOf(sweep);
        for (const [ia, ib] of corners)
          for (let k = 0; k < 20; k++) {
            // corner moved bilinearly over the cell [s1 − 1, s1] × [s2 − 1, s2]: a parallelogram for a translation
            const t1 = uniform(rand, 0, 1),
              t2 = uniform(rand, 0, 1);
            const [tx, ty] = shift(s1 - 1 + t1, s2 - 1 + t2);
            const x = STEP * ia + tx,
              y = STEP * ib + ty;
            expect(
              tris.some((tri) => inTriangle(x, y, tri)),
              `cell (${s1}, ${s2}) corner (${ia}, ${ib})`,
            ).toBe(true);
          }
      }
  });
});

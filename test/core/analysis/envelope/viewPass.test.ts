/**
 * viewPass.ts helpers on hand-made inputs: the vector helpers and view matrices against mathjs, the tolerance rules
 * and the stated error bound worked by hand from their documented formulas, and polygonsOf's pocket rule on
 * rectangles whose areas and widths (2 · area / perimeter) are worked by hand.
 */
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import { DEFAULT_ENVELOPE_OPTIONS } from "../../../../src/core/analysis/envelope/envelopeTypes";
import type { SamplingPlan } from "../../../../src/core/analysis/envelope/jointSampling";
import type { PocketProbe } from "../../../../src/core/analysis/envelope/pocketProbe";
import { compileChain } from "../../../../src/core";
import { chainPoint, planSampling } from "../../../../src/core/analysis/envelope/jointSampling";
import { RowCover } from "../../../../src/core/analysis/envelope/rowCover";
import { SliceScratch } from "../../../../src/core/analysis/envelope/sliceScratch";
import {
  accumulate,
  cross,
  dot,
  MM3_PER_M3,
  norm,
  polygonsOf,
  statedTolerance,
  toleranceFn,
  unit,
  viewMatrix,
  type Vec3,
} from "../../../../src/core/analysis/envelope/viewPass";
import { expectClose } from "../../../helpers/expectClose";
import { mulberry32, uniform } from "../../../helpers/prng";
import { planar2r } from "../../../helpers/testArms";

describe("vector helpers and view matrices against mathjs", () => {
  it("dot, cross, norm and unit agree with mathjs on random vectors", () => {
    const rand = mulberry32(5);
    for (let k = 0; k < 50; k++) {
      const a: Vec3 = [uniform(rand, -3, 3), uniform(rand, -3, 3), uniform(rand, -3, 3)];
      const b: Vec3 = [uniform(rand, -3, 3), uniform(rand, -3, 3), uniform(rand, -3, 3)];
      // mathjs dot / cross / norm as the independent reference
      expectClose(dot(a, b), math.dot(a, b), 1e-12, "dot");
      expectClose(cross(a, b), math.cross(a, b) as number[], 1e-12, "cross");
      expectClose(norm(a), math.norm(a) as number, 1e-12, "norm");
      expectClose(unit(a), math.divide(a, math.norm(a)) as number[], 1e-12, "unit");
    }
  });

  it("viewMatrix maps base metres to rows · (p − origin) in mm, untranslated rows to rows · p", () => {
    const c = Math.cos(0.4),
      s = Math.sin(0.4);
    const rows: Vec3[] = [
      [c, s, 0],
      [-s, c, 0],
      [0, 0, 1],
    ];
    const origin: Vec3 = [0.3, -0.2, 0.5];
    const v = viewMatrix(rows, origin, [true, true, false]);
    const p: Vec3 = [1.1, 0.7, -0.4];
    const got = [0, 1, 2].map((r) => v[4 * r]! * p[0] + v[4 * r + 1]! * p[1] + v[4 * r + 2]! * p[2] + v[4 * r + 3]!);
    // mathjs: 1000 · R · (p − o) on the translated rows, 1000 · R · p on the last one
    const rel = math.multiply(1000, math.multiply(rows, math.subtract(p, origin))) as number[];
    const abs = math.multiply(1000, math.multiply(rows, p)) as number[];
    expectClose(got, [rel[0]!, rel[1]!, abs[2]!], 1e-9, "view of p");
  });

  it("MM3_PER_M3 is 10⁹ (1 m³ = (1000 mm)³)", () => {
    // unit definition: 1 m = 1000 mm
    expect(MM3_PER_M3).toBe(1e9);
  });
});

describe("tolerance rules (hand-worked)", () => {
  const o = { ...DEFAULT_ENVELOPE_OPTIONS, minToleranceMm: 2, toleranceOfReach: 0.002 };

  it("toleranceFn: max(2 mm, 0.2 % of the reach)", () => {
    const tol = toleranceFn(o);
    // 0.002 × 500 = 1 < 2 → 2; 0.002 × 1000 = 2; 0.002 × 2500 = 5
    expectClose([tol(500), tol(1000), tol(2500)], [2, 2, 5], 1e-12, "tolerance");
  });

  it("statedTolerance: sampling σ + half a row + simplification + half the gap closing, at least the target", () => {
    const opts = { ...o, simplifyShare: 0.1 };
    const plan = (sigma: number) => ({ samplingSigmaMm: sigma }) as unknown as SamplingPlan;
    // target 10, row 7: σ = 3 → 3 + 3.5 + 0.1·10 + 0.15·10 = 9 < 10 → 10
    expectClose(statedTolerance(plan(3), 7, opts, 10), 10, 1e-12, "floored at the target");
    // σ = 5 → 5 + 3.5 + 1 + 1.5 = 11
    expectClose(statedTolerance(plan(5), 7, opts, 10), 11, 1e-12, "budget exceeded");
  });
});

/** Open flat ring of an axis-aligned rectangle: counter-clockwise (outer) or clockwise (hole). */
function rect(x0: number, y0: number, x1: number, y1: number, hole: boolean): Float64Array {
  return hole ? Float64Array.of(x0, y0, x0, y1, x1, y1, x1, y0) : Float64Array.of(x0, y0, x1, y0, x1, y1, x0, y1);
}

/** |shoelace area| of a closed ring of points. */
function ringArea(ring: readonly (readonly [number, number])[]): number {
  let s = 0;
  for (let k = 1; k < ring.length; k++) s += ring[k - 1]![0] * ring[k]![1] - ring[k]![0] * ring[k - 1]![1];
  return Math.abs(s) / 2;
}

describe("polygonsOf pocket rule", () => {
  // tolerance 10 mm: simplification 1 mm (rectangles unchanged), smallest ring (0.3 · 10)² = 9 mm²; stated tolerance
  // 10 mm, so holes up to 20 mm wide are slivers; secondary step 50 mm: holes narrower than that are pockets
  const o = { ...DEFAULT_ENVELOPE_OPTIONS, simplifyShare: 0.1 };
  const plan = { secondaryStepMm: 50 } as unknown as SamplingPlan;
  const rings = [
    rect(0, 0, 1000, 1000, false),
    rect(100, 100, 500, 500, true), // width 2·160000/1600 = 200 mm ≥ 50: a real hole
    rect(600, 100, 615, 300, true), // 15 × 200: width 2·3000/430 ≈ 14 mm ≤ 20: a sliver, filled
    rect(700, 100, 730, 300, true), // 30 × 200: width 2·6000/460 ≈ 26 mm: the probe decides
    rect(800, 800, 802, 802, true), // 2 × 2: 4 mm² < 9 mm², dropped
  ];
  const holeAreas = (polys: ReturnType<typeof polygonsOf>) =>
    polys.flatMap((p) => p.holes.map(ringArea)).sort((a, b) => a - b);

  it("without a probe keeps the real hole and the undecided pocket, fills the sliver and the speck", () => {
    const filled = { areaMm2: 0 };
    const polys = polygonsOf(rings, 10, o, plan, 10, null, filled);
    expect(polys).toHaveLength(1);
    // hand-worked areas: outer 10⁶, holes 6000 and 160000; filled 3000 + 4
    expectClose(ringArea(polys[0]!.outer), 1e6, 1e-9, "outer");
    expectClose(holeAreas(polys), [6000, 160000], 1e-9, "holes kept");
    expectClose(filled.areaMm2, 3004, 1e-9, "filled");
  });

  it("with a probe that reaches the pocket's deepest point fills it; one that does not keeps it", () => {
    const asked: [number, number, number][] = [];
    const probe = (answer: boolean) =>
      ({
        reaches: (u: number, v: number, tol: number) => {
          asked.push([u, v, tol]);
          return answer;
        },
      }) as unknown as PocketProbe;
    const filled = { areaMm2: 0 };
    const reached = polygonsOf(rings, 10, o, plan, 10, probe(true), filled);
    // the 30 × 200 pocket is filled too: 3000 + 4 + 6000
    expectClose(holeAreas(reached), [160000], 1e-9, "only the real hole");
    expectClose(filled.areaMm2, 9004, 1e-9, "filled");
    // asked once, about the deepest point of that pocket (its mid-line x = 715 within the 32-cell grid), at 10 mm
    expect(asked).toHaveLength(1);
    const [u, v, tol] = asked[0]!;
    expect(Math.abs(u - 715)).toBeLessThanOrEqual(30 / 32);
    expect(v > 100 && v < 300).toBe(true);
    expect(tol).toBe(10);
    const kept = polygonsOf(rings, 10, o, plan, 10, probe(false), { areaMm2: 0 });
    expectClose(holeAreas(kept), [6000, 160000], 1e-9, "pocket kept");
  });
});

describe("accumulate on a planar 2R (a1 = 1.0 m, a2 = 0.6 m, full joint ranges)", () => {
  it("covers the annulus |a1 − a2| ≤ r ≤ a1 + a2: area within perimeter × stated tolerance, extent ± (a1 + a2)", () => {
    const a1 = 1000,
      a2 = 600;
    const chain = compileChain(planar2r(a1 / 1000, a2 / 1000));
    const o = DEFAULT_ENVELOPE_OPTIONS;
    const target = 5;
    const plan = planSampling({
      chain,
      point: chainPoint(chain, "flange")!,
      view: viewMatrix(
        [
          [1, 0, 0],
          [0, 1, 0],
          [0, 0, 1],
        ],
        [0, 0, 0],
        [false, false, false],
      ),
      fixed: new Map(),
      relevantRows: 2,
      scoring: "plane",
      toleranceMm: () => target,
      samplingShare: o.samplingShare,
      rowShare: o.rowShare,
      maxWork: o.workBudget,
    });
    const row = o.rowShare * target;
    const cover = new RowCover(0, row);
    let slices = 0;
    accumulate(plan, cover, false, row, new SliceScratch(), () => slices++);
    const tol = statedTolerance(plan, row, o, target);
    // closed form: annulus area π((a1 + a2)² − (a1 − a2)²) = 4π a1 a2; boundary length 2π((a1 + a2) + (a1 − a2))
    const area = Math.PI * ((a1 + a2) ** 2 - (a1 - a2) ** 2),
      perimeter = 2 * Math.PI * (a1 + a2 + (a1 - a2));
    expect(Math.abs(cover.area() - area)).toBeLessThanOrEqual(perimeter * tol);
    // outer circle: x from −(a1 + a2) to a1 + a2
    expectClose(cover.xExtent(), [-(a1 + a2), a1 + a2], tol, "x extent");
    // the hole r < a1 − a2: the row through the centre (y = 0, row 0) has a gap containing [−(a1 − a2) + tol, a1 − a2 − tol]
    const v = cover.valuesOf(0),
      n = cover.lengthOf(0);
    for (let k = 0; k < n; k += 2) expect(v[k + 1]! <= -(a1 - a2) + tol || v[k]! >= a1 - a2 - tol).toBe(true);
    expect(slices).toBeGreaterThan(0);
  });
});

/**
 * The capability grid and its target poses (nodes.ts).
 * - Nodes: whole multiples of the grid; a node is inside when the flange side view holds (r, z) or its mirror
 *   (−r, z) over axis 1 (reached over the back); positions on the plane through axis 1 along base x, worked by hand
 *   for an axis 1 along base z through the origin: node (r, z) → (r, 0, z).
 * - directionPoseInto: a rotation (orthonormal, det +1, checked with mathjs det and RᵀR) whose z column is the
 *   direction; a roll ψ turns x about z by ψ (x(ψ)·x(0) = cos ψ, x(0) × x(ψ) = sin ψ · z).
 */
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import { capabilityNodes, directionPoseInto } from "../../../../src/core/analysis/capability/nodes";
import { fibonacciSphere } from "../../../../src/core/analysis/capability/fibonacci";
import { expectClose } from "../../../helpers/expectClose";

const PLANE = { o: [0, 0, 0], radial: [1, 0, 0], up: [0, 0, 1] };

describe("capabilityNodes", () => {
  it("keeps nodes whose (r, z) or (−r, z) lies in the side view; (r, z) → (r, 0, z) m", () => {
    // A square behind axis 1 only: r in [−520, −80] mm, z in [−20, 220] mm.
    const square = [
      [-520, -20],
      [-80, -20],
      [-80, 220],
      [-520, 220],
      [-520, -20],
    ] as [number, number][];
    const nodes = capabilityNodes(
      PLANE,
      { side: [{ outer: square, holes: [] }], maxReachMm: 520, minHeightMm: -20, maxHeightMm: 220 },
      100,
    );
    expect(nodes.rMm).toEqual([0, 100, 200, 300, 400, 500, 600]);
    expect(nodes.zMm).toEqual([-100, 0, 100, 200, 300]);
    const inside: string[] = [];
    nodes.inside.forEach((v, i) => {
      if (v) inside.push(`${nodes.rMm[i % 7]},${nodes.zMm[Math.floor(i / 7)]}`);
    });
    // r = 100 … 500 (mirrors of −100 … −500), z = 0 … 200.
    const expected = [0, 100, 200].flatMap((z) => [100, 200, 300, 400, 500].map((r) => `${r},${z}`));
    expect(inside).toEqual(expected);
    const node = 3 + 2 * 7; // r = 300, z = 100
    expect(Array.from(nodes.positionsM.subarray(3 * node, 3 * node + 3))).toEqual([0.3, 0, 0.1]);
    expect(Number.isNaN(nodes.positionsM[0]!)).toBe(true);
  });

  it("leaves out nodes in a hole: a 600 mm square with a 200 mm square hole about (300, 300)", () => {
    const ring = (x0: number, x1: number, y0: number, y1: number) =>
      [
        [x0, y0],
        [x1, y0],
        [x1, y1],
        [x0, y1],
        [x0, y0],
      ] as [number, number][];
    // Outer 10 … 590 mm both ways, hole 190 … 410 mm: nodes at 100-mm multiples; (200..400, 200..400) lie in the hole.
    const nodes = capabilityNodes(
      PLANE,
      {
        side: [{ outer: ring(10, 590, 10, 590), holes: [ring(190, 410, 190, 410)] }],
        maxReachMm: 590,
        minHeightMm: 10,
        maxHeightMm: 590,
      },
      100,
    );
    expect(nodes.zMm).toEqual([0, 100, 200, 300, 400, 500, 600]);
    const at = (r: number, z: number) => nodes.inside[r / 100 + (z / 100) * nodes.rMm.length];
    let count = 0;
    for (const z of [100, 200, 300, 400, 500])
      for (const r of [100, 200, 300, 400, 500]) {
        const hole = r >= 200 && r <= 400 && z >= 200 && z <= 400;
        expect(at(r, z), `(${r}, ${z})`).toBe(hole ? 0 : 1);
        count += hole ? 0 : 1;
      }
    expect(nodes.inside.reduce((a, b) => a + b, 0)).toBe(count);
  });

  it("rejects a grid spacing that is not positive", () => {
    expect(() => capabilityNodes(PLANE, { side: [], maxReachMm: 1, minHeightMm: 0, maxHeightMm: 1 }, 0)).toThrow(
      /invalid gridMm/,
    );
  });
});

describe("directionPoseInto", () => {
  it("writes a rotation with z along the direction, rolled about it, and the position", () => {
    const dirs = fibonacciSphere(40);
    const t0 = new Float64Array(16),
      t = new Float64Array(16);
    for (let k = 0; k < 40; k++) {
      directionPoseInto(t0, dirs, k, 0, 0.1, -0.2, 0.3);
      for (const psi of [0.4, -2.1, Math.PI]) {
        directionPoseInto(t, dirs, k, psi, 0.1, -0.2, 0.3);
        const r = [0, 1, 2].map((i) => [0, 1, 2].map((j) => t[4 * i + j]!));
        expectClose(math.det(r), 1, 1e-14, "det R");
        expectClose(
          (math.multiply(math.transpose(r), r) as number[][]).flat(),
          [1, 0, 0, 0, 1, 0, 0, 0, 1],
          1e-14,
          "RᵀR",
        );
        expectClose([t[2]!, t[6]!, t[10]!], Array.from(dirs.subarray(3 * k, 3 * k + 3)), 1e-15, "z");
        const x0 = [t0[0]!, t0[4]!, t0[8]!],
          x = [t[0]!, t[4]!, t[8]!];
        expectClose(math.dot(x0, x), Math.cos(psi), 1e-14, "x(0)·x(ψ)");
        expectClose(
          math.cross(x0, x) as number[],
          [t[2]!, t[6]!, t[10]!].map((v) => v * Math.sin(psi)),
          1e-14,
          "x(0)×x(ψ)",
        );
        expect([t[3], t[7], t[11], t[12], t[13], t[14], t[15]]).toEqual([0.1, -0.2, 0.3, 0, 0, 0, 1]);
      }
    }
  });
});

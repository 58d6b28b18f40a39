/**
 * Tests of src/core/analysis/placement (placement maps).
 *
 * Outside references: for a SCARA with its tool pointing down and a full turn of axis 1, the reach set at a target
 * height inside the quill stroke is an annulus r_in ≤ |p − base| ≤ a1 + a2 (r_in = |a1 + a2·e^{iθ}| at the elbow's
 * range end, by the law of cosines); the base positions that reach a target are the same annulus centred on the
 * target (the reach set mirrored about it), and for several targets the intersection of those annuli. Its area
 * follows from the circle–circle intersection (lens) area by inclusion–exclusion: Weisstein, "Circle-Circle
 * Intersection", MathWorld [from memory]:
 *   L(r₁, r₂, d) = r₁²·acos((d² + r₁² − r₂²)/(2dr₁)) + r₂²·acos((d² + r₂² − r₁²)/(2dr₂))
 *                  − ½·√((−d + r₁ + r₂)(d + r₁ − r₂)(d − r₁ + r₂)(d + r₁ + r₂)),
 *   |A₁ ∩ A₂| = L(R, R) − L(R, r) − L(r, R) + L(r, r).
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import type { CellSpec } from "../../../../src/core/analysis/cell/types";
import { placementMap, reachBoundM } from "../../../../src/core/analysis/placement/placement";
import { identity4Into, mat4 } from "../../../../src/core/math/mat4";
import { scaraRrprDh } from "../../../helpers/testArms";

const A1 = 0.4,
  A2 = 0.3,
  ELBOW_LIMIT_DEG = 150;
const R_OUT = A1 + A2;
// Elbow at its range end: |a1 + a2·e^{i·150°}|² = a1² + a2² + 2·a1·a2·cos 150°.
const R_IN = Math.sqrt(A1 * A1 + A2 * A2 + 2 * A1 * A2 * Math.cos((ELBOW_LIMIT_DEG * Math.PI) / 180));

/** The test SCARA with a full turn of axis 1 (the reach set becomes a whole annulus). */
function scaraArm() {
  const input = scaraRrprDh();
  const chain = compileChain({
    ...input,
    joints: input.joints.map((j, i) => (i === 0 ? { ...j, rangeDeg: [-180, 180] as [number, number] } : j)),
  });
  return { id: "test-scara", chain, facts: { ratedPayloadKg: 5, mountings: ["floor" as const] } };
}

function lens(r1: number, r2: number, d: number): number {
  if (d >= r1 + r2) return 0;
  if (d <= Math.abs(r1 - r2)) return Math.PI * Math.min(r1, r2) ** 2;
  return (
    r1 * r1 * Math.acos((d * d + r1 * r1 - r2 * r2) / (2 * d * r1)) +
    r2 * r2 * Math.acos((d * d + r2 * r2 - r1 * r1) / (2 * d * r2)) -
    0.5 * Math.sqrt((-d + r1 + r2) * (d + r1 - r2) * (d - r1 + r2) * (d + r1 + r2))
  );
}

/** A cell with tool-down targets at the given xy (m), 0.3 m above the base plane, visited by joint moves. */
function cellWith(points: [number, number][]): CellSpec {
  return {
    id: "test-cell",
    title: "test",
    candidates: ["test-scara"],
    placement: { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
    tool: { tcp: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] }, bodies: [{ name: "g", massKg: 1, cogMm: [0, 0, 20] }] },
    parts: [],
    targets: points.map(([x, y], k) => ({
      name: `t${k}`,
      positionMm: [x * 1000, y * 1000, 300],
      rpyDeg: [180, 0, 25 * k],
    })),
    cycle: points.map((_, k) => ({ to: `t${k}`, motion: "joint" as const })),
  };
}

describe("placementMap on a SCARA with the tool down", () => {
  it("two targets: feasible positions are the intersection of the annuli around them (node by node; area by lens formula)", () => {
    const targets: [number, number][] = [
      [0, 0],
      [0.5, 0.1],
    ];
    const map = placementMap(cellWith(targets), scaraArm(), { gridMm: 10 });
    let checked = 0;
    map.yMm.forEach((y, r) =>
      map.xMm.forEach((x, c) => {
        const d = targets.map(([tx, ty]) => Math.hypot(x / 1000 - tx, y / 1000 - ty));
        // Nodes within 1 mm of a boundary circle are left out (the solver's tolerance decides them either way).
        if (d.some((v) => Math.abs(v - R_OUT) < 1e-3 || Math.abs(v - R_IN) < 1e-3)) return;
        const inside = d.every((v) => v > R_IN && v < R_OUT);
        expect(map.feasible[r]![c], `node (${x}, ${y})`).toBe(inside ? 1 : 0);
        checked++;
      }),
    );
    expect(checked).toBeGreaterThan(10000);
    const dist = Math.hypot(0.5, 0.1);
    const exact = lens(R_OUT, R_OUT, dist) - 2 * lens(R_OUT, R_IN, dist) + lens(R_IN, R_IN, dist);
    // Grid counting at 10 mm: the error is about the boundary length times a fraction of the spacing; 2 % here.
    expect(Math.abs(map.feasibleAreaM2 - exact) / exact).toBeLessThan(0.02);
    expect(map.best).not.toBeNull();
    expect(map.feasible[map.yMm.indexOf(map.best!.positionMm[1])]![map.xMm.indexOf(map.best!.positionMm[0])]).toBe(1);
  });

  it("one target: the feasible region is the arm's reach set mirrored about the target, the annulus π(R² − r²)", () => {
    const map = placementMap(cellWith([[0.2, -0.1]]), scaraArm(), { gridMm: 20 });
    const exact = Math.PI * (R_OUT * R_OUT - R_IN * R_IN);
    // Grid counting at 20 mm: 3 % (twice the spacing of the test above, about twice the relative error).
    expect(Math.abs(map.feasibleAreaM2 - exact) / exact).toBeLessThan(0.03);
    // Mirror symmetry about the target: (x, y) feasible ⇔ (2·tx − x, 2·ty − y) feasible, away from the boundary.
    map.yMm.forEach((y, r) =>
      map.xMm.forEach((x, c) => {
        const mx = 400 - x,
          my = -200 - y;
        const rr = map.yMm.indexOf(my),
          cc = map.xMm.indexOf(mx);
        const d = Math.hypot(x / 1000 - 0.2, y / 1000 + 0.1);
        if (rr < 0 || cc < 0 || Math.abs(d - R_OUT) < 1e-3 || Math.abs(d - R_IN) < 1e-3) return;
        expect(map.feasible[rr]![cc]).toBe(map.feasible[r]![c]);
      }),
    );
  });

  it("the grid covers every position within the reach bound of every target, and the bound holds (triangle inequality)", () => {
    const arm = scaraArm();
    const bound = reachBoundM(arm.chain, identity4Into(mat4()));
    // By hand: |F₀..F₄| translations a1 = 0.4 and d1 = 0.5 (one frame), a2 = 0.3, d4 = 0.05, the 0.3 m quill stroke.
    expect(bound).toBeGreaterThanOrEqual(R_OUT);
    const map = placementMap(cellWith([[0, 0]]), arm, { gridMm: 50 });
    expect(map.xMm[0]!).toBeLessThanOrEqual(-R_OUT * 1000);
    expect(map.xMm[map.xMm.length - 1]!).toBeGreaterThanOrEqual(R_OUT * 1000);
    expect(map.feasible.length).toBe(map.yMm.length);
    expect(map.feasible.every((row) => row.length === map.xMm.length)).toBe(true);
  });
});

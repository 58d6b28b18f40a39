/**
 * Tests of src/core/analysis/cell/reach.ts (every solution of a cell target, or why there is none).
 *
 * Outside references: the forward kinematics of each solution recomputed with mathjs matrix products of the standard
 * DH link transforms (test/helpers/testArms.ts; Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, ch. 3);
 * the count of solutions of a spherical-wrist 6R (at most 8: 4 for the wrist centre × 2 for the wrist, Pieper 1968
 * [from memory]); the whole-turn variants counted by hand from the ranges; the tilt of a SCARA target computed by
 * hand (the angle between the tool axis and the base's −z axis).
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { createReachContext, solveTarget } from "../../../../src/core/analysis/cell/reach";
import { fromXyzRpyInto, mat4 } from "../../../../src/core/math/mat4";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI, Q_STAR, scaraRrprDh } from "../../../helpers/testArms";

const rows = GENERIC_6R_SI.rows;

function maxPoseError(a: readonly number[], b: ArrayLike<number>): number {
  let e = 0;
  for (let i = 0; i < 12; i++) e = Math.max(e, Math.abs(a[i]! - b[i]!));
  return e;
}

describe("solveTarget on the generic spherical-wrist 6R", () => {
  it("finds q* among ≤ 8 solutions, each putting the flange on the target (mathjs forward kinematics, 1e-9 m)", () => {
    const chain = compileChain(generic6rDh());
    const target = Float64Array.from(flat4(dhFrameReference(rows, Q_STAR)));
    const r = solveTarget(createReachContext(chain), target);
    expect(r.reason).toBeNull();
    expect(r.solutions.length).toBeGreaterThanOrEqual(2);
    expect(r.solutions.length).toBeLessThanOrEqual(8);
    for (const q of r.solutions) expect(maxPoseError(flat4(dhFrameReference(rows, q)), target)).toBeLessThan(1e-9);
    expect(r.solutions.some((q) => q.every((v, i) => Math.abs(v - Q_STAR[i]!) < 1e-9))).toBe(true);
  });

  it("with joint 6 allowed ±360°, every solution comes twice, one turn apart (variants counted by hand)", () => {
    const base = compileChain(generic6rDh());
    const input = generic6rDh();
    const wide = compileChain({
      ...input,
      joints: input.joints.map((j, i) => (i === 5 ? { ...j, rangeDeg: [-360, 360] as [number, number] } : j)),
    });
    const target = Float64Array.from(flat4(dhFrameReference(rows, Q_STAR)));
    const one = solveTarget(createReachContext(base), target).solutions;
    const two = solveTarget(createReachContext(wide), target).solutions;
    // Each q6 in (−180°, 180°] has exactly one other value q6 ± 360° inside [−360°, 360°].
    expect(two.length).toBe(2 * one.length);
    for (const q of one) {
      const twins = two.filter((p) => p.slice(0, 5).every((v, i) => Math.abs(v - q[i]!) < 1e-9));
      expect(twins.length).toBe(2);
      expect(Math.abs(Math.abs(twins[0]![5]! - twins[1]![5]!) - 2 * Math.PI)).toBeLessThan(1e-9);
    }
  });

  it("a target beyond reach (5 m from the base) is out of reach; one needing joint 1 at ±90° is outside a ±10° range", () => {
    const chain = compileChain(generic6rDh());
    const far = fromXyzRpyInto(mat4(), 5, 0, 0.5, 0, Math.PI / 2, 0);
    expect(solveTarget(createReachContext(chain), far).reason).toEqual({ kind: "out-of-reach" });
    const input = generic6rDh();
    const narrow = compileChain({
      ...input,
      joints: input.joints.map((j, i) => (i === 0 ? { ...j, rangeDeg: [-10, 10] as [number, number] } : j)),
    });
    // q1 = 90°: every solution has q1 = 90° or q1 = 90° − 180° (the two shoulder branches), both outside ±10°.
    const target = Float64Array.from(flat4(dhFrameReference(rows, [Math.PI / 2, -0.7, 0.4, 1.1, 0.8, -0.2])));
    const r = solveTarget(createReachContext(narrow), target);
    expect(r.solutions).toEqual([]);
    expect(r.reason?.kind).toBe("joint-limits");
    if (r.reason?.kind === "joint-limits") {
      expect(r.reason.joint).toBe(0);
      expect(Math.abs(Math.abs(r.reason.valueDeg) - 90)).toBeLessThan(1e-4);
    }
  });
});

describe("solveTarget on a four-axis SCARA (tool axis fixed)", () => {
  it("reaches a tool-down target with any turn about the vertical, and names the tilt of a tilted one (30°)", () => {
    const chain = compileChain(scaraRrprDh());
    const ctx = createReachContext(chain);
    // Tool down (flange z along −z of the base: roll 180°), turned 40° about the vertical, inside the annulus.
    const down = fromXyzRpyInto(mat4(), 0.5, 0.2, 0.3, Math.PI, 0, (40 * Math.PI) / 180);
    const r = solveTarget(ctx, down);
    expect(r.reason).toBeNull();
    // Elbow left and right; joint 4 (±360°) adds one whole-turn twin each: 4 solutions (counted by hand).
    expect(r.solutions.length).toBe(4);
    // Tilted 30° about x from tool-down: roll 150°; angle between (0, 0, −1) and the tool axis is 30°.
    const tilted = fromXyzRpyInto(mat4(), 0.5, 0.2, 0.3, (150 * Math.PI) / 180, 0, 0);
    const t = solveTarget(ctx, tilted);
    expect(t.solutions).toEqual([]);
    expect(t.reason?.kind).toBe("orientation");
    if (t.reason?.kind === "orientation") {
      expect(t.reason.tiltDeg).toBeCloseTo(30, 9);
      expect(t.reason.requiredAxis[2]).toBeCloseTo(-1, 12);
    }
  });
});

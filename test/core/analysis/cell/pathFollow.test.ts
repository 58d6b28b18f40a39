/**
 * Tests of src/core/analysis/cell/pathFollow.ts (following a linear move by continuation).
 *
 * Outside references: the flange pose of every followed stage recomputed with mathjs matrix products of the standard
 * DH transforms (test/helpers/testArms.ts; Spong et al., ch. 3) against the straight line and the uniformly turning
 * orientation (slerp: the rotation R(f) = exp(f·[ω])·R₀ with ω the rotation vector of R₁·R₀ᵀ, so the angle to R₀
 * grows linearly in f; Shoemake 1985 [from memory]); the wrist singularity of a spherical wrist at q5 = 0 (axes 4
 * and 6 aligned; Spong et al., ch. 4); the edge of reach of a planar 3R with its tool angle held, by hand: the wrist
 * point p − a3·(cos φ, sin φ) must stay within a1 + a2 of the base.
 */
import { describe, expect, it } from "vitest";
import * as math from "mathjs";
import { compileChain, type ArmKinematicsInput } from "../../../../src/core";
import { createFollowContext, firstRangeViolation, followLinear } from "../../../../src/core/analysis/cell/pathFollow";
import { fromXyzRpyInto, identity4Into, mat4 } from "../../../../src/core/math/mat4";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI } from "../../../helpers/testArms";

const rows = GENERIC_6R_SI.rows;
const tool = () => identity4Into(mat4());

/** Rotation angle between the rotation blocks of two row-major 4×4 poses (mathjs), rad. */
function angleBetween(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const ra = math.matrix([0, 1, 2].map((r) => [0, 1, 2].map((c) => a[4 * r + c]!)));
  const rb = math.matrix([0, 1, 2].map((r) => [0, 1, 2].map((c) => b[4 * r + c]!)));
  const rel = math.multiply(rb, math.transpose(ra)) as math.Matrix;
  const tr = (math.trace(rel) as number) - 1;
  return Math.acos(Math.min(1, Math.max(-1, tr / 2)));
}

describe("followLinear on the generic 6R", () => {
  it("every stage lies on the line with the orientation turned in proportion (mathjs forward kinematics, 1e-7)", () => {
    const chain = compileChain(generic6rDh());
    const q0 = [0.3, -0.7, 0.4, 1.1, 0.8, -0.2];
    const from = Float64Array.from(flat4(dhFrameReference(rows, q0)));
    // The end: 300 mm along (1, 1, −1)/√3 and turned 0.4 rad about x.
    const to = Float64Array.from(from);
    const d = 0.3 / Math.sqrt(3);
    to[3]! += d;
    to[7]! += d;
    to[11]! -= d;
    const turn = fromXyzRpyInto(mat4(), 0, 0, 0, 0.4, 0, 0);
    for (let r = 0; r < 3; r++)
      for (let c = 0; c < 3; c++)
        to[4 * r + c] = [0, 1, 2].reduce((s, k) => s + turn[4 * r + k]! * from[4 * k + c]!, 0);
    const r = followLinear(createFollowContext(chain), { fromTcp: from, toTcp: to, tcpInFlange: tool() }, q0);
    expect(r.problem).toBeNull();
    expect(r.completed).toBe(r.stages);
    expect(r.s[r.stages - 1]).toBeCloseTo(0.3, 12);
    for (let k = 0; k < r.stages; k++) {
      const f = r.s[k]! / r.s[r.stages - 1]!;
      const pose = flat4(dhFrameReference(rows, r.q.subarray(6 * k, 6 * k + 6)));
      for (const i of [3, 7, 11]) expect(Math.abs(pose[i]! - (from[i]! + f * (to[i]! - from[i]!)))).toBeLessThan(1e-7);
      expect(Math.abs(angleBetween(from, pose) - f * 0.4)).toBeLessThan(1e-6);
    }
    expect(firstRangeViolation(chain, r, new Float64Array(6))).toBeNull();
    // One turn added to joint 6 leaves its ±180° range: the check sees it at the first stage.
    expect(firstRangeViolation(chain, r, Float64Array.of(0, 0, 0, 0, 0, 2 * Math.PI))).toEqual({ stage: 0, joint: 5 });
  });

  it("a move whose wrist must pass q5 = 0 stops there as a singularity", () => {
    const chain = compileChain(generic6rDh());
    const qa = [0.3, -0.7, 0.4, 1.1, 0.3, -0.2],
      qb = [0.3, -0.7, 0.4, 1.1, -0.3, -0.2];
    const from = Float64Array.from(flat4(dhFrameReference(rows, qa)));
    const to = Float64Array.from(flat4(dhFrameReference(rows, qb)));
    const r = followLinear(createFollowContext(chain), { fromTcp: from, toTcp: to, tcpInFlange: tool() }, qa);
    expect(r.problem?.kind).toBe("singularity");
    // Up to the stop, q5 keeps its sign and shrinks towards 0.
    const last = r.q[6 * (r.completed - 1) + 4]!;
    expect(last).toBeGreaterThan(0);
    expect(last).toBeLessThan(0.3);
  });
});

/** Planar 3R in the x–y plane (a = 0.5, 0.4, 0.1 m), as a DH chain. */
function planar3r(): ArmKinematicsInput {
  const joint = (i: number, aMm: number) => ({
    name: `j${i}`,
    kind: "revolute" as const,
    dh: { aMm, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
    rangeDeg: [-170, 170] as [number, number],
    maxSpeedDegPerS: 100,
  });
  return {
    convention: "dh",
    joints: [joint(1, 500), joint(2, 400), joint(3, 100)],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
}

describe("followLinear on a planar 3R", () => {
  it("a line out to x = 1.5 m at tool angle 0 stops at the edge of reach, x = a1 + a2 + a3 = 1.0 m (fraction 0.5)", () => {
    const chain = compileChain(planar3r());
    const from = fromXyzRpyInto(mat4(), 0.5, 0, 0, 0, 0, 0),
      to = fromXyzRpyInto(mat4(), 1.5, 0, 0, 0, 0, 0);
    // Elbow-up start at x = 0.5 (wrist point (0.4, 0)): cos q2 = (0.4² − 0.5² − 0.4²)/(2·0.5·0.4) = −0.625.
    const q2 = Math.acos(-0.625);
    const q1 = Math.atan2(0, 0.4) - Math.atan2(0.4 * Math.sin(q2), 0.5 + 0.4 * Math.cos(q2));
    const r = followLinear(createFollowContext(chain), { fromTcp: from, toTcp: to, tcpInFlange: tool() }, [
      q1,
      q2,
      -q1 - q2,
    ]);
    expect(["singularity", "out-of-reach"]).toContain(r.problem?.kind);
    expect(r.problem!.fraction).toBeGreaterThan(0.45);
    expect(r.problem!.fraction).toBeLessThanOrEqual(0.5 + 1e-9);
  });
});

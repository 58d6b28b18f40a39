/**
 * Degenerate chains (parallel or coincident axes, zero-length links, no positional freedom, strokes along one axis):
 * each is analysed with every property of properties.ts holding, or refused with a "not supported because" error.
 * Below them, the minimal counterexamples the random arms found, as regression tests.
 */
import { describe, expect, it } from "vitest";
import { validateArm } from "../../src/catalog/validate";
import { workspaceEnvelope } from "../../src/core/analysis/envelope/envelope";
import { DEGENERATE_ARMS } from "./degenerateArms";
import redundantNearRankDrop from "./redundantNearRankDrop.json" with { type: "json" };
import { checkArm, DEFAULT_CHECK, distanceToBoundary, insidePolygons, UNSUPPORTED_MARK } from "./properties";

function chainOf(arm: Record<string, unknown>) {
  const v = validateArm(arm, `${arm.id as string}.json`, arm.id as string);
  if (!v.ok) throw new Error(v.issues.map((i) => `${i.path}: ${i.message}`).join("; "));
  return v.chain;
}

describe("degenerate chains", () => {
  it.each(DEGENERATE_ARMS.map((d) => [d.name, d.arm] as const))(
    "%s: analysed with every property, or refused clearly",
    (_name, arm) => {
      const result = checkArm(arm, DEFAULT_CHECK);
      if (result.outcome === "unsupported") expect(result.message).toContain(UNSUPPORTED_MARK);
      else expect(result.outcome).toBe("analysed");
      expect(result.violations).toEqual([]);
    },
  );
});

describe("counterexamples found by the random arms (regressions)", () => {
  it("workspaceEnvelope: a flange on a circle about axis 1 (two coincident axes) keeps its side view at (±300, 300) mm", () => {
    // Found as an empty side view: the image of each slice is a curve that crosses axis 1, its clipped triangles
    // have no area, and the thin-image path (sliceCover.ts) was skipped for clipped slices.
    // Closed form: J2 turns about J1's axis with a = 300 mm, d1 + d2 = 300 mm, so in the side view (joint 1 at 0)
    // the flange is at r = ±300 mm (front and back of axis 1), z = 300 mm (elementary geometry, CHECKS C6 style).
    const arm = DEGENERATE_ARMS.find((d) => d.name === "coincident axes, flange off the axis")!.arm;
    const env = workspaceEnvelope(chainOf(arm)).flange!;
    expect(env.side.length).toBeGreaterThan(0);
    for (const r of [300, -300]) {
      const inside = insidePolygons(r, 300, env.side) || distanceToBoundary(r, 300, env.side) <= env.toleranceMm;
      expect(inside, `(${r}, 300) in the side view`).toBe(true);
    }
    // and nothing near the axis, which the flange never reaches (its distance from axis 1 is always 300 mm)
    expect(insidePolygons(0, 300, env.side)).toBe(false);
  });

  it("workspaceEnvelope: a flange whose top-view projection has no area gets a finite minimum reach", () => {
    // Found as minReachMm = Infinity (the distance to an empty top view). Shrunk by hand from the random arm: a 2 mm
    // stroke, then a turn; the flange moves on a circle in a vertical plane at y = −241 mm … so its distance from the
    // base z axis is at least that plane's distance: checked against forward kinematics by brute force below.
    const arm = {
      id: "stroke-then-turn",
      maker: "Fuzzwerk",
      model: "Counterexample",
      class: "other",
      mountings: ["wall"],
      massKg: 50,
      ratedPayloadKg: 5,
      repeatabilityMm: 0.05,
      protection: "IP54",
      convention: "mdh",
      joints: [
        {
          name: "J1",
          kind: "prismatic",
          mdh: { aMm: 0, alphaDeg: 90, dMm: 0, thetaDeg: -176 },
          rangeMm: [1397, 1399],
          maxSpeedMmPerS: 591,
        },
        {
          name: "J2",
          kind: "revolute",
          mdh: { aMm: 0, alphaDeg: 0, dMm: 0, thetaDeg: 180 },
          rangeDeg: [-6, 485],
          maxSpeedDegPerS: 245,
        },
      ],
      flange: { xyzMm: [-1, 241, -8], rpyDeg: [-4, -90, -90] },
      source: { document: "Generated chain", revision: "1", date: "2026-01-01" },
    };
    const result = checkArm(arm, DEFAULT_CHECK);
    expect(result.violations).toEqual([]);
    const reach = result.analysis!.reach;
    expect(Number.isFinite(reach.flangeMinMm)).toBe(true);
    expect(reach.flangeMinMm!).toBeLessThanOrEqual(reach.flangeMaxMm!);
  });

  it("guaranteedLineSpeed (7 driven joints): the joint rates behind it move the tool as stated at every sampled pose", () => {
    // Found as J·q̇ giving a tool velocity 20–45 % off the one the guaranteed speed was computed for: with more than
    // six joints B = Jᵀ(JJᵀ)⁻¹E, and JJᵀ squares the condition number, so near a rank drop the solve passed its pivot
    // test with a wrong answer. The arm as drawn by the random run (7 driven joints); checkArm multiplies J·q̇ out.
    const result = checkArm(redundantNearRankDrop, DEFAULT_CHECK);
    expect(result.outcome).toBe("analysed");
    expect(result.violations).toEqual([]);
  });
});

/**
 * Extremes (reach and height figures refined by a compass search) on an invented planar 2R (links a1 = 1.0 m,
 * a2 = 0.6 m, test/helpers/testArms.ts) sampled on a deliberately coarse joint grid, against closed-form maxima of
 * x = a1 cos q1 + a2 cos(q1 + q2), y = a1 sin q1 + a2 sin(q1 + q2) (planar 2R forward kinematics, e.g. Spong,
 * Hutchinson & Vidyasagar, Robot Modeling and Control, ch. 3) and ρ² = a1² + a2² + 2 a1 a2 cos q2 (law of cosines).
 */
import { describe, expect, it } from "vitest";
import { compileChain, type ArmKinematicsInput } from "../../../../src/core";
import { Extremes } from "../../../../src/core/analysis/envelope/extremes";
import { chainPoint, planSampling, type SamplingPlan } from "../../../../src/core/analysis/envelope/jointSampling";
import { forEachSlice } from "../../../../src/core/analysis/envelope/sliceGrid";
import { viewMatrix } from "../../../../src/core/analysis/envelope/viewPass";
import { expectClose } from "../../../helpers/expectClose";
import { planar2r } from "../../../helpers/testArms";

const A1_MM = 1000,
  A2_MM = 600;
const DEG = Math.PI / 180;

/** The planar 2R with joint ranges replaced (deg). */
function arm(range1: [number, number], range2: [number, number]): ArmKinematicsInput {
  const base = planar2r(A1_MM / 1000, A2_MM / 1000);
  const [j1, j2] = base.joints;
  return {
    ...base,
    joints: [
      { ...j1!, rangeDeg: range1 },
      { ...j2!, rangeDeg: range2 },
    ],
  };
}

/** A coarse plan (tolerance 40 mm) of the flange in base coordinates (view rows x, y, z, mm). */
function planOf(input: ArmKinematicsInput, rows: 2 | 3): SamplingPlan {
  const chain = compileChain(input);
  const point = chainPoint(chain, "flange")!;
  const view = viewMatrix(
    [
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
    ],
    [0, 0, 0],
    [false, false, false],
  );
  return planSampling({
    chain,
    point,
    view,
    fixed: new Map(),
    relevantRows: rows,
    scoring: rows === 3 ? "radial" : "plane",
    toleranceMm: () => 40,
    samplingShare: 0.35,
    rowShare: 0.7,
    maxWork: 1_000_000,
  });
}

function visited(plan: SamplingPlan, heightRow: 1 | 2): Extremes {
  const ext = new Extremes(plan, heightRow);
  forEachSlice(plan, (buf) => ext.visit(buf));
  return ext;
}

describe("Extremes on a planar 2R, radius in the view plane (height row 2)", () => {
  it("full ranges: ρ from |a1 − a2| to a1 + a2", () => {
    const ext = visited(planOf(arm([-180, 180], [-180, 180]), 3), 2);
    // closed form: ρ = √(a1² + a2² + 2 a1 a2 cos q2) ∈ [|a1 − a2|, a1 + a2]
    expectClose(ext.refined(0), A1_MM + A2_MM, 1e-6, "max ρ = a1 + a2");
    expectClose(ext.refined(1), Math.abs(A1_MM - A2_MM), 1e-6, "min ρ = |a1 − a2|");
    // the arm moves in z = 0: height is identically 0
    expectClose([ext.refined(2), ext.refined(3)], [0, 0], 1e-9, "height");
  });

  it("elbow limited to [0°, 90°]: the smallest radius sits at the limit, √(a1² + a2²)", () => {
    const ext = visited(planOf(arm([-180, 180], [0, 90]), 3), 2);
    // law of cosines at q2 = 0 and q2 = 90° (ρ decreases monotonically in q2 on [0, π])
    expectClose(ext.refined(0), A1_MM + A2_MM, 1e-6, "max ρ at q2 = 0");
    expectClose(ext.refined(1), Math.hypot(A1_MM, A2_MM), 1e-6, "min ρ at q2 = 90°");
  });

  it("elbow limited to [40°, 120°]: both figures at the limits", () => {
    const ext = visited(planOf(arm([-180, 180], [40, 120]), 3), 2);
    const rho = (q2: number) => Math.sqrt(A1_MM ** 2 + A2_MM ** 2 + 2 * A1_MM * A2_MM * Math.cos(q2 * DEG));
    // law of cosines at q2 = 40° (largest) and q2 = 120° (smallest)
    expectClose(ext.refined(0), rho(40), 1e-6, "max ρ at q2 = 40°");
    expectClose(ext.refined(1), rho(120), 1e-6, "min ρ at q2 = 120°");
  });
  it("elbow in [−37°, 71°]: the largest radius is interior (q2 = 0, off the grid), the smallest at q2 = 71°", () => {
    const plan = planOf(arm([-180, 180], [-37, 71]), 3);
    const ext = visited(plan, 2);
    const rho = (q2: number) => Math.sqrt(A1_MM ** 2 + A2_MM ** 2 + 2 * A1_MM * A2_MM * Math.cos(q2 * DEG));
    // law of cosines: cos q2 peaks at q2 = 0 and is smallest at the limit farther from 0 (71° > 37°)
    expectClose(ext.refined(0), A1_MM + A2_MM, 1e-6, "max ρ at q2 = 0");
    expectClose(ext.refined(1), rho(71), 1e-6, "min ρ at q2 = 71°");
  });
});

describe("Extremes on a planar 2R, base-plane projection (height row 1: ρ = |x|, height = y)", () => {
  it("q1 ∈ [0°, 30°], q2 ∈ [0°, 90°]: hand-worked maxima of x and y", () => {
    const ext = visited(planOf(arm([0, 30], [0, 90]), 2), 1);
    // ∂x/∂q1, ∂x/∂q2 ≤ 0 on the box: max x at (0, 0) = a1 + a2; min x at (30°, 90°) = a1 cos 30° + a2 cos 120°
    expectClose(ext.refined(0), A1_MM + A2_MM, 1e-6, "max |x|");
    expectClose(ext.refined(1), A1_MM * Math.cos(30 * DEG) + A2_MM * Math.cos(120 * DEG), 1e-6, "min |x|");
    // ∂y/∂q1 ≥ 0 on the box, so q1 = 30°, then sin(30° + q2) peaks at q2 = 60°: max y = a1/2 + a2; min y at (0, 0) = 0
    expectClose(ext.refined(2), A1_MM / 2 + A2_MM, 1e-6, "max y");
    expectClose(ext.refined(3), 0, 1e-6, "min y");
  });
});

describe("Extremes before any sample", () => {
  it("reports the empty-set conventions: sup ∅ = −∞ (a radius clamped to 0), inf ∅ = +∞", () => {
    const ext = new Extremes(planOf(arm([-180, 180], [-180, 180]), 3), 2);
    // nothing visited: largest radius sup ∅ = −∞, clamped to a length ≥ 0; smallest radius and height inf ∅ = +∞
    expect(ext.refined(0)).toBe(0);
    expect(ext.refined(1)).toBe(Infinity);
    expect(ext.refined(2)).toBe(-Infinity);
    expect(ext.refined(3)).toBe(Infinity);
  });
});

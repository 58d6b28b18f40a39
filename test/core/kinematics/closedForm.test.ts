/**
 * Closed-form inverse kinematics of spherical-wrist 6R arms (src/core/kinematics/closedForm.ts), checked against
 * things outside it:
 * - round trips through forward kinematics: for random DH chains, the independent mathjs reference FK of
 *   test/helpers/testArms.ts (no code from src/core); for the demo arms, forwardInto (itself checked against
 *   Orocos KDL in kdlReference.test.ts);
 * - the numeric damped-least-squares solver (inverse.ts) started from many seeded random joint values: every
 *   solution it converges to must be among the closed-form ones (brute-force sampling of the solution set);
 * - the joint ranges of each chain.
 */
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../src/catalog/index";
import { compileChain, createScratch, forwardInto, type ArmKinematicsInput, type Chain } from "../../../src/core";
import { createIkScratch, solveIkInto } from "../../../src/core/kinematics/inverse";
import {
  DEGENERATE,
  MAX_CLOSED_FORM_SOLUTIONS,
  solveSphericalWristInto,
  sphericalWristIk,
} from "../../../src/core/kinematics/closedForm";
import { DEFAULT_SPEED_MAP, toolSpeedMap } from "../../../src/core/analysis/speedMap/speedMap";
import { dhFrameReference, flat4, type DhRowSi } from "../../helpers/testArms";
import { mulberry32, uniform } from "../../helpers/prng";

const ARMS_DIR = process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../arms", import.meta.url));
const { arms } = await loadArms([ARMS_DIR]);
const DEG = Math.PI / 180;

/** Largest difference of two joint vectors, revolute joints compared modulo whole turns. */
function turnDistance(a: ArrayLike<number>, ao: number, b: ArrayLike<number>, bo: number): number {
  let d = 0;
  for (let i = 0; i < 6; i++) {
    const x = Math.abs(a[ao + i]! - b[bo + i]!);
    d = Math.max(d, Math.abs(x - 2 * Math.PI * Math.round(x / (2 * Math.PI))));
  }
  return d;
}

function randomPose(chain: Chain, rnd: () => number): Float64Array {
  return Float64Array.from({ length: 6 }, (_, i) =>
    uniform(rnd, Math.max(chain.lowerSi[i]!, -Math.PI), Math.min(chain.upperSi[i]!, Math.PI)),
  );
}

/** Pose error of flange pose f against target t: position (m) and largest rotation-matrix entry difference. */
function poseError(f: ArrayLike<number>, t: ArrayLike<number>): { positionM: number; rotation: number } {
  let rotation = 0;
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++) rotation = Math.max(rotation, Math.abs(f[r * 4 + c]! - t[r * 4 + c]!));
  return { positionM: Math.hypot(f[3]! - t[3]!, f[7]! - t[7]!, f[11]! - t[11]!), rotation };
}

/** A random standard-DH 6R with a spherical wrist (rows 4–6: a = 0, d₅ = 0, α₄ = −α₅ = ±90°), SI rows and file input. */
function randomSphericalDh(rnd: () => number, general: boolean): { rows: DhRowSi[]; input: ArmKinematicsInput } {
  const pick = (xs: number[]) => xs[Math.floor(rnd() * xs.length)]!;
  const alpha1 = general ? uniform(rnd, -120, 120) : pick([-90, 90]);
  const alpha2 = general ? uniform(rnd, -60, 60) : 0;
  const alpha3 = general ? uniform(rnd, -120, 120) : pick([-90, 90]);
  const w = pick([-90, 90]);
  const mm = [
    { aMm: uniform(rnd, 0, 300), alphaDeg: alpha1, dMm: uniform(rnd, 200, 700), thetaDeg: uniform(rnd, -30, 30) },
    {
      aMm: uniform(rnd, 400, 1200),
      alphaDeg: alpha2,
      dMm: general ? uniform(rnd, -200, 200) : 0,
      thetaDeg: uniform(rnd, -30, 30),
    },
    { aMm: uniform(rnd, 0, 250), alphaDeg: alpha3, dMm: uniform(rnd, -150, 150), thetaDeg: uniform(rnd, -30, 30) },
    { aMm: 0, alphaDeg: w, dMm: uniform(rnd, 300, 1200), thetaDeg: 0 },
    { aMm: 0, alphaDeg: -w, dMm: 0, thetaDeg: 0 },
    { aMm: 0, alphaDeg: 0, dMm: uniform(rnd, 50, 200), thetaDeg: 0 },
  ];
  const rows = mm.map((r) => ({ a: r.aMm / 1000, alpha: r.alphaDeg * DEG, d: r.dMm / 1000, theta: r.thetaDeg * DEG }));
  const input: ArmKinematicsInput = {
    convention: "dh",
    joints: mm.map((dh, i) => ({
      name: `j${i + 1}`,
      kind: "revolute" as const,
      dh,
      rangeDeg: [-180, 180],
      maxSpeedDegPerS: 200,
    })),
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
  return { rows, input };
}

describe("solveSphericalWristInto on random spherical-wrist DH chains", () => {
  it("general axes (2 not parallel to 3): not handled in closed form yet, so sphericalWristIk returns null (numeric fallback)", () => {
    const rnd = mulberry32(91);
    for (let a = 0; a < 12; a++) expect(sphericalWristIk(compileChain(randomSphericalDh(rnd, true).input))).toBeNull();
  });
  for (const general of [false]) {
    it(`FK(IK(x)) = x against the mathjs reference FK, and x's own joints are among the solutions (${general ? "general axes: scanned reduction" : "axes 2 ∥ 3"})`, () => {
      const rnd = mulberry32(general ? 91 : 17);
      let chains = 0;
      for (let a = 0; a < 12; a++) {
        const { rows, input } = randomSphericalDh(rnd, general);
        const chain = compileChain(input);
        const ik = sphericalWristIk(chain);
        expect(ik, "closed form applies to every spherical-wrist 6R").not.toBeNull();
        if (!ik) continue;
        chains++;
        const out = new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * 6);
        for (let p = 0; p < 20; p++) {
          const q = randomPose(chain, rnd);
          const target = flat4(dhFrameReference(rows, q));
          const n = solveSphericalWristInto(out, ik, target);
          expect(n).not.toBe(DEGENERATE);
          expect(n).toBeGreaterThanOrEqual(1);
          let own = Infinity;
          for (let k = 0; k < n; k++) {
            const back = flat4(dhFrameReference(rows, out.subarray(6 * k, 6 * k + 6)));
            const e = poseError(back, target);
            // Tolerances of the numeric solver's continuation (1 µm, 1e-5): the closed form must do as well.
            expect(e.positionM).toBeLessThan(1e-6);
            expect(e.rotation).toBeLessThan(1e-5);
            own = Math.min(own, turnDistance(out, 6 * k, q, 0));
          }
          expect(own, "the pose the target came from is one of the solutions").toBeLessThan(1e-6);
        }
      }
      expect(chains).toBe(12);
    });
  }
});

describe("solveSphericalWristInto with firstOnly (the capability maps' reachability test)", () => {
  it("returns a solution exactly when the full solve has one, each among the full solutions and on target (mathjs FK)", () => {
    const rnd = mulberry32(23);
    let withSolution = 0,
      without = 0;
    for (let a = 0; a < 8; a++) {
      const { rows, input } = randomSphericalDh(rnd, false);
      // Narrow ranges so that many targets keep some, but not all, of their eight solutions.
      const narrowed = {
        ...input,
        joints: input.joints.map((j, i) => ({
          ...j,
          rangeDeg: i === 1 || i === 2 || i === 4 ? [-70, 70] : [-180, 180],
        })),
      };
      const chain = compileChain(narrowed);
      const ik = sphericalWristIk(chain)!;
      const all = new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * 6),
        first = new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * 6);
      const wide = compileChain(input);
      for (let p = 0; p < 40; p++) {
        // Targets from poses over the unnarrowed ranges: some lie outside the narrowed ones.
        const target = flat4(dhFrameReference(rows, randomPose(wide, rnd)));
        const n = solveSphericalWristInto(all, ik, target);
        const f = solveSphericalWristInto(first, ik, target, 0, undefined, true);
        if (n === DEGENERATE) continue;
        expect(f > 0, `chain ${a}, pose ${p}`).toBe(n > 0);
        if (n > 0) withSolution++;
        else without++;
        for (let k = 0; k < f; k++) {
          let nearest = Infinity;
          for (let j = 0; j < n; j++) nearest = Math.min(nearest, turnDistance(first, 6 * k, all, 6 * j));
          expect(nearest).toBeLessThan(1e-12);
          const e = poseError(flat4(dhFrameReference(rows, first.subarray(6 * k, 6 * k + 6))), target);
          expect(e.positionM).toBeLessThan(1e-6);
          expect(e.rotation).toBeLessThan(1e-5);
        }
      }
    }
    expect(withSolution).toBeGreaterThan(20);
    expect(without).toBeGreaterThan(20);
  });
});

describe("solveSphericalWristInto: a solution just beyond a joint limit", () => {
  // One random axes-2-∥-3 chain and pose; J2's upper limit is then put δ below the pose's own q2. References: the
  // mathjs DH product of test/helpers/testArms.ts (pose error) and the numeric solver of inverse.ts (the repair).
  const rnd = mulberry32(2412);
  const { rows, input } = randomSphericalDh(rnd, false);
  const free = compileChain(input);
  const q = randomPose(free, rnd);
  const target = flat4(dhFrameReference(rows, q));
  const limited = (deltaRad: number) =>
    compileChain({
      ...input,
      joints: input.joints.map((j, i) => (i === 1 ? { ...j, rangeDeg: [-180, (q[1]! - deltaRad) / DEG] } : j)),
    } as ArmKinematicsInput);
  /** The kept solution nearest to q (by whole turns), its distance and its pose error; null when none is kept. */
  const nearestTo = (chain: Chain, repair?: (v: Float64Array) => boolean) => {
    const out = new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * 6);
    const n = solveSphericalWristInto(out, sphericalWristIk(chain)!, target, 0, repair);
    let best: { k: number; d: number } | null = null;
    for (let k = 0; k < n; k++) {
      const d = turnDistance(out, 6 * k, q, 0);
      if (!best || d < best.d) best = { k, d };
    }
    if (!best || best.d > 1e-2) return null;
    const sol = out.slice(6 * best.k, 6 * best.k + 6);
    return { sol, d: best.d, error: poseError(flat4(dhFrameReference(rows, sol)), target) };
  };

  it("δ = 1e-9 rad: put onto the limit and kept without a repair (the pose is met to 1 µm)", () => {
    const chain = limited(1e-9);
    const got = nearestTo(chain);
    expect(got).not.toBeNull();
    expect(got!.sol[1]).toBe(chain.upperSi[1]);
    expect(got!.error.positionM).toBeLessThan(1e-6);
    expect(got!.error.rotation).toBeLessThan(1e-5);
  });

  it("δ = 3e-4 rad: the clamped values miss the pose, so only a repair keeps it (here the numeric solver at 1 mm)", () => {
    const chain = limited(3e-4);
    expect(nearestTo(chain), "without a repair").toBeNull();
    let calls = 0;
    const ik = createIkScratch(chain);
    const loose = { maxIterations: 30, toleranceM: 1e-3, toleranceRad: 1e-2 };
    const got = nearestTo(chain, (v) => {
      calls++;
      return solveIkInto(v, chain, target, v, ik, loose);
    });
    expect(calls).toBeGreaterThan(0);
    expect(got, "with the repair").not.toBeNull();
    expect(got!.sol[1]).toBeLessThanOrEqual(chain.upperSi[1]!);
    expect(got!.error.positionM).toBeLessThan(1e-3);
  });

  it("δ = 1e-2 rad (beyond the margin): dropped, and the repair is not asked", () => {
    let calls = 0;
    expect(
      nearestTo(limited(1e-2), () => {
        calls++;
        return true;
      }),
    ).toBeNull();
    expect(calls).toBe(0);
  });
});

describe("solveSphericalWristInto on every spherical-wrist demo arm", () => {
  const sixAxis = arms.filter((arm) => sphericalWristIk(arm.chain) !== null);
  it("applies to the spherical-wrist 6R arms and to none other", () => {
    // Spherical wrist: the compiler found the wrist centre where the last three axes meet (compile.ts).
    for (const arm of arms) {
      const expected =
        arm.chain.drivenCount === 6 && arm.chain.jointCount === 6 && arm.chain.wrist?.basis === "spherical";
      expect(sphericalWristIk(arm.chain) !== null, arm.id).toBe(expected);
    }
    expect(sixAxis.length).toBeGreaterThanOrEqual(1);
  });

  it.each(sixAxis.map((arm) => [arm.id, arm.chain] as const))(
    "%s: round trips, joint ranges, and every branch the numeric solver finds",
    (_id, chain) => {
      let converged = 0;
      const ik = sphericalWristIk(chain)!;
      const rnd = mulberry32(5);
      const kin = createScratch(chain),
        ikScratch = createIkScratch(chain);
      const out = new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * 6),
        qNum = new Float64Array(6);
      for (let p = 0; p < 8; p++) {
        const q = randomPose(chain, rnd);
        const target = Float64Array.from(forwardInto(chain, q, kin));
        const n = solveSphericalWristInto(out, ik, target);
        expect(n).toBeGreaterThanOrEqual(1);
        let own = Infinity;
        for (let k = 0; k < n; k++) {
          const sol = out.subarray(6 * k, 6 * k + 6);
          for (let i = 0; i < 6; i++) {
            expect(sol[i]!).toBeGreaterThanOrEqual(chain.lowerSi[i]!);
            expect(sol[i]!).toBeLessThanOrEqual(chain.upperSi[i]!);
          }
          const e = poseError(forwardInto(chain, sol, kin), target);
          expect(e.positionM).toBeLessThan(1e-6);
          expect(e.rotation).toBeLessThan(1e-5);
          own = Math.min(own, turnDistance(out, 6 * k, q, 0));
        }
        expect(own).toBeLessThan(1e-6);
        // Brute force: the numeric solver from 150 seeded random starts; each converged solution must be a closed-form one.
        for (let s = 0; s < 150; s++) {
          const seed = randomPose(chain, rnd);
          if (
            !solveIkInto(qNum, chain, target, seed, ikScratch, {
              maxIterations: 80,
              toleranceM: 1e-9,
              toleranceRad: 1e-8,
            })
          )
            continue;
          converged++;
          let nearest = Infinity;
          for (let k = 0; k < n; k++) nearest = Math.min(nearest, turnDistance(out, 6 * k, qNum, 0));
          expect(
            nearest,
            `numeric solution ${Array.from(qNum, (x) => (x / DEG).toFixed(2)).join(", ")} deg not found in closed form`,
          ).toBeLessThan(1e-5);
        }
      }
      // The numeric solver stalls from many starts (joint limits); some must converge for the comparison to mean anything.
      // About 2 % of the 1200 starts converge on the ortho-parallel demo arms (Tern 7: 23, Tern 12: 20 with this
      // seed), so the floor is 10, not a count one arm's ranges happen to clear.
      expect(converged).toBeGreaterThanOrEqual(10);
    },
  );
});

describe("toolSpeedMap with closed-form inverse kinematics", () => {
  // The numeric path (damped least squares, continuation from discovery cells) is the reference. Stated tolerance:
  // headline figures within 0.5 % and shares of the map within 0.02 (the closed form also finds solutions next to
  // singular poses and joint limits where the numeric continuation gives up, so the cell sets differ slightly).
  const arm = sixAxisSmallest();
  it.each(["down", "outward"] as const)(
    `${arm?.id ?? "none"} (%s): maximum speeds and shares agree with the numeric path`,
    (orientation) => {
      expect(arm).toBeDefined();
      if (!arm) return;
      const options = { ...DEFAULT_SPEED_MAP, stepMm: 20 };
      const numeric = toolSpeedMap(arm.chain, orientation, { ...options, closedForm: false });
      for (const closedForm of [true, "discovery"] as const) {
        const closed = toolSpeedMap(arm.chain, orientation, { ...options, closedForm });
        const max = (xs: Float64Array) => xs.reduce((a, b) => (b > a ? b : a), 0);
        expect(Math.abs(max(closed.maxMmPerS) / max(numeric.maxMmPerS) - 1)).toBeLessThan(0.005);
        expect(Math.abs(max(closed.guaranteedMmPerS) / max(numeric.guaranteedMmPerS) - 1)).toBeLessThan(0.005);
        expect(Math.abs(closed.reachableCells / numeric.reachableCells - 1)).toBeLessThan(0.02);
        for (const limit of [500, 1000, 2000]) {
          const share = (m: typeof numeric) => m.guaranteedMmPerS.filter((g) => g >= limit).length / m.reachableCells;
          expect(Math.abs(share(closed) - share(numeric))).toBeLessThan(0.02);
        }
      }
    },
  );
});

function sixAxisSmallest() {
  return arms
    .filter((a) => sphericalWristIk(a.chain) !== null)
    .sort((a, b) => a.chain.characteristicLengthM - b.chain.characteristicLengthM)[0];
}

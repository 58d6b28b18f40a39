/**
 * Tests of src/core/analysis/cycle.ts: trapezoidTimeS and standardCycle.
 *
 * Outside references: CHECKS C17 (rest-to-rest time T = D/V + V/A when D ≥ V²/A, else 2·sqrt(D/A); V = 2 m/s,
 * A = 20 m/s²: 0.25 s for 0.3 m, 0.0707107 s for 0.025 m; the standard cycle 2·(2·0.0707107 + 0.25) = 0.7828427 s;
 * Biagiotti & Melchiorri 2008 §3.2 [from memory]); the cycle geometry (25 mm up, 300 mm across, 25 mm down and
 * back) is common practice, no source (CHECKS §4). The hand computation for the cycle uses an invented Cartesian
 * gantry whose every cycle move is a single-joint move, so the expected time is a sum of single trapezoids.
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import {
  DEFAULT_TIME_TO_TOP_SPEED_S,
  STANDARD_CYCLE_MOVES,
  standardCycle,
  trapezoidTimeS,
} from "../../../../src/core/analysis/cycle/cycle";
import { expectClose } from "../../../helpers/expectClose";
import { mulberry32, uniform } from "../../../helpers/prng";
import { cartesianGantry as gantry } from "../../../helpers/testArms";

describe("STANDARD_CYCLE_MOVES", () => {
  it("STANDARD_CYCLE_MOVES is the trade's test cycle: up 25 mm, across 300 mm (CHECKS §4, common practice)", () => {
    // CHECKS §4 states the cycle geometry; the numbers here are typed from it, not from our output.
    expect(STANDARD_CYCLE_MOVES).toEqual({ upMm: 25, acrossMm: 300 });
  });
});

describe("trapezoidTimeS (CHECKS C17)", () => {
  it("trapezoidTimeS(0.3 m, 2 m/s, 20 m/s²) = 0.25 s (trapezoid: D ≥ V²/A = 0.2 m)", () => {
    // CHECKS C17: 0.3/2 + 2/20 = 0.25 s. Tolerance 1e-12.
    expectClose(trapezoidTimeS(0.3, 2, 20), 0.25, 1e-12);
  });

  it("trapezoidTimeS(0.025 m, 2 m/s, 20 m/s²) = 0.0707107 s (triangle: 2·sqrt(D/A))", () => {
    // CHECKS C17, printed to 7 decimals; the closed form 2·sqrt(0.025/20) to 1e-12.
    expectClose(trapezoidTimeS(0.025, 2, 20), 0.0707107, 1e-7);
    expectClose(trapezoidTimeS(0.025, 2, 20), 2 * Math.sqrt(0.025 / 20), 1e-12);
  });

  it("the standard cycle from these moves by hand: 2·(2·0.0707107 + 0.25) = 0.7828427 s", () => {
    // CHECKS C17: up, across, down and back, no blending, no dwell.
    const up = trapezoidTimeS(0.025, 2, 20),
      across = trapezoidTimeS(0.3, 2, 20);
    expectClose(2 * (2 * up + across), 0.7828427, 1e-7);
  });

  it("both branches agree at D = V²/A (2V/A), the time is even in D, and 0 for no move", () => {
    // C17 formulas: at D = V²/A, D/V + V/A = 2V/A = 2·sqrt(D/A).
    const rand = mulberry32(3101);
    for (let k = 0; k < 50; k++) {
      const v = uniform(rand, 0.1, 5),
        a = uniform(rand, 0.5, 50),
        d = (v * v) / a;
      expectClose(trapezoidTimeS(d, v, a), (2 * v) / a, 1e-12, "boundary");
      expectClose(trapezoidTimeS(d * (1 + 1e-9), v, a), (2 * v) / a, 1e-8, "just above");
      expectClose(trapezoidTimeS(-0.7 * d, v, a), trapezoidTimeS(0.7 * d, v, a), 0, "even");
    }
    expect(trapezoidTimeS(0, 2, 20)).toBe(0);
  });

  it("the profile with that time covers exactly D (area under the speed curve) and never beats D/V", () => {
    // Kinematics of the profile: peak speed vp = min(V, sqrt(D·A)); ramps of vp/A each; area = vp·(T − vp/A).
    const rand = mulberry32(3102);
    for (let k = 0; k < 200; k++) {
      const d = uniform(rand, 1e-4, 3),
        v = uniform(rand, 0.1, 5),
        a = uniform(rand, 0.5, 50);
      const t = trapezoidTimeS(d, v, a);
      const vp = Math.min(v, Math.sqrt(d * a));
      expectClose(vp * (t - vp / a), d, 1e-12 * Math.max(1, d), "area = D");
      expect(t).toBeGreaterThanOrEqual(d / v);
    }
  });

  it("throws RangeError for non-positive limits when there is a move", () => {
    // STYLE C9: programmer errors throw RangeError with the value.
    expect(() => trapezoidTimeS(0.1, 0, 20)).toThrow(RangeError);
    expect(() => trapezoidTimeS(0.1, 2, -1)).toThrow(RangeError);
    expect(() => trapezoidTimeS(0.1, Number.NaN, 20)).toThrow(RangeError);
  });
});

/** Target flange pose for the gantry: r along base x, lateral along base y, height z + up; tool down (Rx(180°)). */
function gantryTarget(lateralMm: number, rMm: number, zMm: number, upMm: number, out: Float64Array): Float64Array {
  out.set([1, 0, 0, rMm / 1000, 0, -1, 0, lateralMm / 1000, 0, 0, -1, (zMm + upMm) / 1000, 0, 0, 0, 1]);
  return out;
}

describe("standardCycle on a Cartesian gantry (every move is a single-joint move)", () => {
  const names = ["X", "Y", "Z", "R"];

  it("with V = 2 m/s and A = 20 m/s² the cycle is 0.7828427 s (CHECKS C17), limited by the across joint Y", () => {
    // By hand: A → A up moves Z by 25 mm (triangle, 0.0707107 s), A up → B up moves Y by 300 mm (trapezoid, 0.25 s),
    // B up → B moves Z by 25 mm, then the same back: 2·(2·0.0707107 + 0.25) = 0.7828427 s. The other joints stay
    // put up to the solver tolerance (1e-7 m), so the total matches to about 1e-6 s.
    const chain = compileChain(gantry(true));
    const r = standardCycle(chain, { rMm: 1000, zMm: 200 }, [1, 0, 0.2, 0], gantryTarget, {
      upMm: 25,
      acrossMm: 300,
      jointNames: names,
    });
    expect(r.failure).toBeUndefined();
    expectClose(r.standardCycleS ?? Number.NaN, 0.7828427, 1e-6, "cycle time");
    expectClose(
      r.standardCycleS ?? Number.NaN,
      2 * (2 * 2 * Math.sqrt(0.025 / 20) + (0.3 / 2 + 2 / 20)),
      1e-6,
      "by hand",
    );
    expect(r.limitingJoint).toBe("Y");
    expect(r.moves.map((m) => m.limitingJoint)).toEqual(["Z", "Y", "Z", "Z", "Y", "Z"]);
    expectClose(
      r.moves.map((m) => m.timeS),
      [0.0707107, 0.25, 0.0707107, 0.0707107, 0.25, 0.0707107],
      1e-6,
      "per move",
    );
  });

  it("without accelerations in the file, the stated default (top speed in DEFAULT_TIME_TO_TOP_SPEED_S) is used", () => {
    // A = V / 0.4 s = 5 m/s² (the default, stated in the assumptions). By hand (C17 formulas): 0.025 m → triangle
    // 2·sqrt(0.025/5) = 0.1414214 s; 0.3 m < V²/A = 0.8 m → triangle 2·sqrt(0.3/5) = 0.4898979 s.
    expect(DEFAULT_TIME_TO_TOP_SPEED_S).toBe(0.4);
    const chain = compileChain(gantry(false));
    const r = standardCycle(chain, { rMm: 800, zMm: 0 }, [0.8, 0, 0, 0], gantryTarget, {
      upMm: 25,
      acrossMm: 300,
      jointNames: names,
    });
    const a = 2 / DEFAULT_TIME_TO_TOP_SPEED_S;
    expectClose(
      r.standardCycleS ?? Number.NaN,
      2 * (2 * 2 * Math.sqrt(0.025 / a) + 2 * Math.sqrt(0.3 / a)),
      1e-6,
      "cycle time",
    );
    expectClose(r.standardCycleS ?? Number.NaN, 2 * (2 * 0.1414214 + 0.4898979), 1e-6, "printed values");
    expect(r.assumptions.some((s) => s.includes(`${DEFAULT_TIME_TO_TOP_SPEED_S} s`))).toBe(true);
  });

  it("a location out of reach gives no cycle time and a reason", () => {
    // X travels 0–2000 mm, so r = 5000 mm cannot be reached.
    const chain = compileChain(gantry(true));
    const r = standardCycle(chain, { rMm: 5000, zMm: 0 }, [1, 0, 0, 0], gantryTarget, {
      upMm: 25,
      acrossMm: 300,
      jointNames: names,
    });
    expect(r.standardCycleS).toBeNull();
    expect(r.limitingJoint).toBeNull();
    expect(r.failure?.reason).toMatch(/^(start|point)-unreachable$/);
  });
});

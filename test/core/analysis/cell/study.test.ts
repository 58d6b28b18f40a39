/**
 * Tests of src/core/analysis/cell/study.ts (the whole study for one cell), on an invented Cartesian gantry whose
 * every move is a single-axis move, so each time has a closed form:
 * - joint move: one joint's rest-to-rest trapezoid T = D/V + V/A when D ≥ V²/A (CHECKS C17; Biagiotti & Melchiorri
 *   2008, ch. 3 [from memory]); a speed override scales V only;
 * - linear move along one prismatic axis (q = s): the time-optimal timing equals that trapezoid, with V the smaller
 *   of the joint speed and the tool-speed cap (Bobrow et al. 1985: with one joint the optimal profile is bang-bang);
 * - holding force of the vertical axis: the carried mass times g (statics, τ = Jᵀ·F; Craig ch. 5 [from memory]);
 * - the tool load: masses add, the centre of gravity is the mass-weighted mean (Meriam & Kraige, ch. 7).
 * And on the generic spherical-wrist 6R: each target's chosen joints put the tool point on the target, checked by
 * mathjs forward kinematics (test/helpers/testArms.ts).
 */
import { describe, expect, it } from "vitest";
import { compileChain, type ArmKinematicsInput, type CellSpec } from "../../../../src/core";
import { cellStudy } from "../../../../src/core/analysis/cell/study";
import { trapezoidTimeS } from "../../../../src/core/analysis/cycle/cycle";
import { cartesianGantry, dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI } from "../../../helpers/testArms";

const G = 9.80665;

/** The gantry with a rated force on the vertical axis Z (invented: 100 N). */
function gantryArm(): {
  id: string;
  chain: ReturnType<typeof compileChain>;
  facts: { ratedPayloadKg: number; mountings: ("floor" | "ceiling")[] };
} {
  const input = cartesianGantry(true);
  const withForce: ArmKinematicsInput = {
    ...input,
    joints: input.joints.map((j) => (j.name === "Z" ? { ...j, ratedForceN: 100 } : j)),
  };
  return { id: "test-gantry", chain: compileChain(withForce), facts: { ratedPayloadKg: 10, mountings: ["floor"] } };
}

/** Pick at A, place nothing; A and A-up, B-up; the tool point 100 mm below the flange. */
function gantryCell(overrides: Partial<CellSpec> = {}): CellSpec {
  return {
    id: "test-cell",
    title: "gantry test cell",
    candidates: ["test-gantry"],
    placement: { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
    tool: {
      tcp: { xyzMm: [0, 0, 100], rpyDeg: [0, 0, 0] },
      bodies: [{ name: "gripper", massKg: 2, cogMm: [0, 0, 50] }],
    },
    parts: [{ name: "box", massKg: 3, cogMm: [0, 0, 150] }],
    targets: [
      { name: "A", positionMm: [500, 0, 200], rpyDeg: [180, 0, 0] },
      { name: "A-up", relativeTo: "A", offsetMm: [0, 0, 300] },
      { name: "B-up", positionMm: [1500, 0, 500], rpyDeg: [180, 0, 0] },
    ],
    cycle: [
      { to: "A", motion: "linear", dwellS: 0.5, grip: "box" },
      { to: "A-up", motion: "linear", speedMmPerS: 500 },
      { to: "B-up", motion: "joint", speedPercent: 50, release: true },
      { to: "A-up", motion: "joint" },
    ],
    requirements: { maxCycleS: 5, minJointMarginDeg: 5 },
    ...overrides,
  };
}

describe("cellStudy on a Cartesian gantry (closed-form move times)", () => {
  const study = cellStudy(gantryCell(), [gantryArm()]);
  const arm = study.arms[0]!;

  it("each move takes its single-axis trapezoid: 0.25 s, 0.625 s (cap 0.5 m/s), 1.05 s (50 %), 0.6 s", () => {
    // V = 2 m/s, A = 20 m/s² on every linear axis (the test gantry).
    const expected = [
      trapezoidTimeS(0.3, 2, 20), // Z down 300 mm: 0.3/2 + 2/20 = 0.25 s
      trapezoidTimeS(0.3, 0.5, 20), // Z up 300 mm, tool capped at 0.5 m/s: 0.6 + 0.025 = 0.625 s
      trapezoidTimeS(1, 1, 20), // X 1 m at 50 % speed: 1 + 0.05 = 1.05 s
      trapezoidTimeS(1, 2, 20), // X 1 m back: 0.5 + 0.1 = 0.6 s
    ];
    expect([0.25, 0.625, 1.05, 0.6].every((t, i) => Math.abs(t - expected[i]!) < 1e-12)).toBe(true);
    // The time-optimal timing of a sampled path converges as O(Δs) (timeOptimal.ts): 0.5 % on 30 mm stages here;
    // the joint moves are closed forms (rounded to 1 ms in the JSON).
    arm.moves.forEach((m, i) => {
      expect(m.feasible).toBe(true);
      const tol = m.motion === "linear" ? 0.005 * expected[i]! : 6e-4;
      expect(Math.abs(m.timeS! - expected[i]!), `move ${i + 1}`).toBeLessThan(tol);
    });
    // What holds longest: Z cruises 0.05 s against 0.2 s of speeding up and slowing down; the capped move cruises
    // 0.575 s against 0.05 s; X cruises 0.95 s (50 %) and 0.4 s against 0.1 s and 0.2 s.
    expect(arm.moves.map((m) => m.limitedBy)).toEqual(["Z acceleration", "tool speed 500 mm/s", "X speed", "X speed"]);
    expect(arm.cycleTimeS!).toBeCloseTo(0.25 + 0.625 + 1.05 + 0.6 + 0.5, 2);
    expect(arm.verdict).toBe("pass");
    expect(arm.rank).toBe(1);
  });

  it("the tool load adds the box (5 kg, CG at (2·50 + 3·150)/5 = 110 mm); the holding force of Z is m·g", () => {
    expect(arm.toolLoad.map((t) => [t.carrying, t.massKg, t.cogMm[2]])).toEqual([
      [null, 2, 50],
      ["box", 5, 110],
    ]);
    expect(arm.toolLoad.every((t) => t.withinRatedPayload)).toBe(true);
    // At A the box is gripped on arrival: the larger load (5 kg) counts. Rated 100 N (invented).
    const atA = arm.targets.find((t) => t.name === "A")!;
    const z = atA.holding.find((h) => h.joint === "Z")!;
    expect(z.torqueNm).toBeCloseTo(5 * G, 1);
    expect(z.ok).toBe(true);
    // A-up is visited carrying the box (after the grip) and empty (after B-up's release): the box counts there too.
    expect(arm.targets.find((t) => t.name === "B-up")!.holding.find((h) => h.joint === "Z")!.torqueNm).toBeCloseTo(
      5 * G,
      1,
    );
  });

  it("fails with reasons in numbers: a slower cycle than required, a mounting the arm does not list, a target off its axes", () => {
    const slow = cellStudy(gantryCell({ requirements: { maxCycleS: 2 } }), [gantryArm()]).arms[0]!;
    expect(slow.verdict).toBe("fail");
    expect(slow.reasons).toEqual([`cycle ${slow.cycleTimeS!.toFixed(2)} s > 2 s`]);
    const ceiling = cellStudy(gantryCell({ placement: { positionMm: [0, 0, 2000], rpyDeg: [180, 0, 0] } }), [
      gantryArm(),
    ]).arms[0]!;
    expect(ceiling.placement.mounting).toBe("ceiling");
    expect(ceiling.reasons[0]).toBe("placement implies ceiling mounting; the arm file lists floor");
    const far = gantryCell();
    const farCell = {
      ...far,
      targets: [...far.targets.slice(0, 2), { name: "B-up", positionMm: [3000, 0, 500], rpyDeg: [180, 0, 0] } as const],
    };
    const out = cellStudy(farCell, [gantryArm()]).arms[0]!;
    // X would need 3000 mm, its range ends at 2000 mm.
    expect(out.reasons).toContain("B-up: only outside the joint ranges (X would need 3000 ° )".replace(" ° ", " mm"));
    expect(out.cycleTimeS).toBeNull();
    expect(out.moves[2]!.problem).toEqual({ kind: "out-of-reach", positionMm: [3000, 0, 500] });
  });
});

describe("cellStudy on the generic 6R", () => {
  it("the chosen joints of every target put the tool point on it (mathjs forward kinematics, 1e-6 m)", () => {
    const chain = compileChain(generic6rDh());
    const cell: CellSpec = {
      id: "six",
      title: "six",
      candidates: ["six"],
      placement: { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
      tool: { tcp: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] }, bodies: [] },
      parts: [],
      targets: [
        { name: "p", positionMm: [1200, 300, 300], rpyDeg: [180, 0, 0] },
        { name: "q", positionMm: [1000, -400, 500], rpyDeg: [180, 0, 30] },
      ],
      cycle: [
        { to: "p", motion: "joint" },
        { to: "q", motion: "linear" },
      ],
    };
    const arm = cellStudy(cell, [{ id: "six", chain, facts: { ratedPayloadKg: 10, mountings: ["floor"] } }]).arms[0]!;
    for (const t of arm.targets) {
      expect(t.reachable).toBe(true);
      const pose = flat4(
        dhFrameReference(
          GENERIC_6R_SI.rows,
          t.jointsDeg!.map((d) => (d * Math.PI) / 180),
        ),
      );
      const target = cell.targets.find((x) => x.name === t.name)! as { readonly positionMm: readonly number[] };
      // Joints are printed to 0.01°: a 2 m arm moves its tool by at most ~0.35 mm per 0.01°.
      for (let i = 0; i < 3; i++) expect(Math.abs(pose[4 * i + 3]! * 1000 - target.positionMm[i]!)).toBeLessThan(1);
    }
    expect(arm.moves.every((m) => m.feasible)).toBe(true);
  });
});

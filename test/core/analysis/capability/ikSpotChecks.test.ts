/**
 * Check (b): the joint solutions behind the capability shares, put through an independent forward kinematics — the
 * DH link products written with mathjs matrices (test/helpers/testArms.ts dhFrameReference, no code of src/core) —
 * land on the node with flange z along the direction, and lie within the joint ranges of the arm file (degrees
 * converted here). The arms (invented, round numbers; shellArm.ts dhArm):
 * - the shell arm (closed form, roll left to joint 6),
 * - a seven-axis arm with alternating ±90° twists and limited joints (numeric continuation, redundant),
 * - an offset-wrist six-axis arm (axes 2, 3 and 4 parallel, the wrist axes sharing no point; numeric),
 * - the shell arm with joint 5 limited to ±60° and joint 2 to [−30°, 120°] (closed form; limits honoured).
 * Tolerances: the solvers stop at 1 µm and 1e-5 rad (closed form: checked to 1 µm and 1e-5 per rotation entry).
 */
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { capabilityMap, DEFAULT_CAPABILITY } from "../../../../src/core/analysis/capability/capability";
import { dhFrameReference } from "../../../helpers/testArms";
import { dhArm, discEnvelope, shellArm, type DhArm } from "./shellArm";

const DEG = Math.PI / 180;

function spotCheck(arm: DhArm, envelopeMm: number, options: Partial<typeof DEFAULT_CAPABILITY>, every: number) {
  const chain = compileChain(arm.input);
  const result = capabilityMap(chain, "revolute-base", discEnvelope(envelopeMm), {
    ...DEFAULT_CAPABILITY,
    keepSolutions: true,
    ...options,
  });
  if (!result.ok) throw new Error(result.reason);
  const map = result.map;
  const m = arm.rows.length,
    N = map.directions;
  let checked = 0,
    reached = 0;
  for (let node = 0; node < map.share.length; node++) {
    if (Number.isNaN(map.share[node]!)) continue;
    let hits = 0;
    for (let k = 0; k < N; k++) {
      const o = (node * N + k) * m;
      if (Number.isNaN(map.solutions![o]!)) continue;
      hits++;
      reached++;
      if (reached % every !== 0) continue;
      const q = Array.from(map.solutions!.subarray(o, o + m));
      const t = dhFrameReference(arm.rows, q);
      const pArr = [0, 1, 2].map((r) => t[r]![3]!),
        zArr = [0, 1, 2].map((r) => t[r]![2]!);
      const dp = math.norm(math.subtract(pArr, Array.from(map.nodePositionsM.subarray(3 * node, 3 * node + 3)))),
        dz = math.norm(math.subtract(zArr, Array.from(map.directionVectors.subarray(3 * k, 3 * k + 3))));
      expect(dp as number, `node ${node}, direction ${k}: position`).toBeLessThan(2e-6);
      expect(dz as number, `node ${node}, direction ${k}: tool axis`).toBeLessThan(2e-5);
      q.forEach((v, i) => {
        const [lo, hi] = arm.rangesDeg[i]!;
        expect(v, `joint ${i + 1}`).toBeGreaterThanOrEqual(lo * DEG - 1e-9);
        expect(v, `joint ${i + 1}`).toBeLessThanOrEqual(hi * DEG + 1e-9);
      });
      checked++;
    }
    // The share counts exactly the directions with a kept solution.
    expect(Math.round(map.share[node]! * N)).toBe(hits);
  }
  return { map, checked, reached };
}

describe("capability solutions under mathjs forward kinematics (check b)", () => {
  it("shell arm, closed form: every 7th solution lands on its node and direction, joints within range", () => {
    const { map, checked } = spotCheck(shellArm(), 1000, { gridMm: 100, directions: 64 }, 7);
    expect(map.method).toBe("closed-form");
    expect(checked).toBeGreaterThan(500);
  });

  it("shell arm with joint 2 in [−30°, 120°] and joint 5 within ±60°: solutions honour the limits", () => {
    const base = shellArm();
    const ranges = base.rangesDeg.map((r, i) => (i === 1 ? ([-30, 120] as const) : i === 4 ? ([-60, 60] as const) : r));
    const rows = base.rows.map((r) => [r.a * 1000, r.alpha / DEG, r.d * 1000] as const);
    const { map, checked } = spotCheck(dhArm(rows, ranges), 1000, { gridMm: 100, directions: 64 }, 3);
    expect(map.method).toBe("closed-form");
    expect(checked).toBeGreaterThan(300);
  });

  it("seven-axis arm, numeric continuation: solutions land on node and direction within the ranges", () => {
    const arm = dhArm(
      [
        [0, -90, 300],
        [0, 90, 0],
        [0, 90, 450],
        [0, -90, 0],
        [0, -90, 350],
        [0, 90, 0],
        [0, 0, 100],
      ],
      [
        [-165, 165],
        [-115, 115],
        [-165, 165],
        [-115, 115],
        [-165, 165],
        [-115, 115],
        [-170, 170],
      ],
    );
    const { map, checked } = spotCheck(arm, 1200, { gridMm: 150, directions: 48, numericSamples: 1500 }, 5);
    expect(map.method).toBe("numeric");
    expect(map.rollBasis).toBe("last-joint");
    expect(checked).toBeGreaterThan(200);
  });

  it("offset-wrist six-axis arm, numeric continuation: solutions land on node and direction within the ranges", () => {
    const arm = dhArm(
      [
        [0, 90, 150],
        [-500, 0, 0],
        [-400, 0, 0],
        [0, 90, 120],
        [0, -90, 100],
        [0, 0, 90],
      ],
      [
        [-360, 360],
        [-360, 360],
        [-170, 170],
        [-360, 360],
        [-360, 360],
        [-360, 360],
      ],
    );
    const { map, checked } = spotCheck(arm, 1150, { gridMm: 150, directions: 48, numericSamples: 1500 }, 5);
    expect(map.method).toBe("numeric");
    expect(checked).toBeGreaterThan(200);
  });
});

/**
 * Tests of src/core/analysis/speedMap/edgeRetry.ts: the shoulder flip (q₁ + π, −q₂, q₃ + π) is found on a chain
 * whose first three axes intersect and only there. Checked against an independent forward kinematics written here
 * from the arm files with mathjs matrix products (standard DH, Spong et al., Robot Modeling and Control, ch. 3:
 * Aᵢ = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ)), at seeded joint values. The map cell the retry fills is checked in
 * sweep.test.ts (brandmoor-lyra-r7 outward (600, 1010)).
 */
import { readFileSync } from "node:fs";
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { hasShoulderFlip } from "../../../../src/core/analysis/speedMap/edgeRetry";
import { mulberry32 } from "../../../helpers/prng";

type M4 = number[][];
const DEG = Math.PI / 180;

interface DhArm {
  joints: { rangeDeg: [number, number]; dh: { aMm: number; alphaDeg: number; dMm: number; thetaDeg: number } }[];
}

function armFile(id: string): DhArm & Record<string, unknown> {
  return JSON.parse(readFileSync(`arms/${id}.json`, "utf8"));
}

/** Flange pose by standard DH with mathjs products (both test arms: DH, zero flange offset checked below). */
function dhFlange(arm: DhArm, q: readonly number[]): M4 {
  let t: M4 = math.identity(4).valueOf() as M4;
  arm.joints.forEach((j, i) => {
    const th = j.dh.thetaDeg * DEG + q[i]!,
      al = j.dh.alphaDeg * DEG;
    const a: M4 = [
      [Math.cos(th), -Math.sin(th) * Math.cos(al), Math.sin(th) * Math.sin(al), (j.dh.aMm / 1000) * Math.cos(th)],
      [Math.sin(th), Math.cos(th) * Math.cos(al), -Math.cos(th) * Math.sin(al), (j.dh.aMm / 1000) * Math.sin(th)],
      [0, Math.sin(al), Math.cos(al), j.dh.dMm / 1000],
      [0, 0, 0, 1],
    ];
    t = math.multiply(t, a) as M4;
  });
  return t;
}

/** Largest entry difference between the flange poses at q and at q shoulder-flipped, over seeded q. */
function flipMismatch(arm: DhArm): number {
  const rnd = mulberry32(0x5a11);
  let worst = 0;
  for (let n = 0; n < 20; n++) {
    const q = arm.joints.map(() => -Math.PI + 2 * Math.PI * rnd());
    const flipped = [q[0]! + Math.PI, -q[1]!, q[2]! + Math.PI, ...q.slice(3)];
    const a = dhFlange(arm, q),
      b = dhFlange(arm, flipped);
    for (let r = 0; r < 3; r++) for (let c = 0; c < 4; c++) worst = Math.max(worst, Math.abs(a[r]![c]! - b[r]![c]!));
  }
  return worst;
}

describe("hasShoulderFlip", () => {
  it("holds for brandmoor-lyra-r7 (axes 1–3 intersect), as the independent DH forward kinematics confirms", () => {
    const arm = armFile("brandmoor-lyra-r7");
    expect(arm.flange).toEqual({ xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] });
    // Rz(a)·R_u(b)·Rz(c) = Rz(a + π)·R_u(−b)·Rz(c + π) for u ⟂ z: the pose is unchanged to rounding.
    expect(flipMismatch(arm)).toBeLessThan(1e-12);
    expect(hasShoulderFlip(compileChain(arm as never), 20261202)).toBe(true);
  });

  it("fails for corvell-heron-210l (shoulder offset a₁ = 350 mm), as the independent forward kinematics confirms", () => {
    const arm = armFile("corvell-heron-210l");
    expect(flipMismatch(arm)).toBeGreaterThan(0.1);
    expect(hasShoulderFlip(compileChain(arm as never), 20261202)).toBe(false);
  });
});

/**
 * capabilityMap against closed forms.
 *
 * Check (a), spherical-wrist arm with an unlimited wrist (shellArm.ts): direction n is reached at p exactly when the
 * wrist centre c = p − d·n lies in the wrist-centre reach set, here the shell 0.1 m ≤ |c| ≤ 0.9 m. Worked by hand:
 *   |p − d·n|² = ρ² + d² − 2dρ·t,  ρ = |p|, t = p̂·n,
 * so the reached directions are those with t_lo ≤ t ≤ t_hi,
 *   t_lo = (ρ² + d² − 0.9²) / (2dρ),  t_hi = (ρ² + d² − 0.1²) / (2dρ),
 * a spherical zone about p̂. By Archimedes' hat-box theorem a zone between the planes t = a and t = b (−1 ≤ a ≤ b ≤ 1)
 * has area 2π(b − a), so the share of all directions is
 *   s(p) = max(0, min(1, t_hi) − max(−1, t_lo)) / 2.
 * E.g. ρ = 0.5 m: t_lo = (0.25 + 0.01 − 0.81)/0.1 = −5.5 → −1, t_hi = (0.25 + 0.01 − 0.01)/0.1 = 2.5 → 1: s = 1;
 * ρ = 0.95 m: t_lo = (0.9025 + 0.01 − 0.81)/0.19 = 0.5395, t_hi > 1: s = (1 − 0.5395)/2 = 0.2303.
 * Compared two ways: (1) per direction, the lattice counted with the same rule (exact agreement); (2) against the
 * zone area: on axis 1 (p̂ = ±z, the lattice's own axis, whose heights are equally spaced) to within 2/N (one point per
 * zone edge); elsewhere to within 2·N^(−3/4): a zone is the difference of two caps, and the spherical cap discrepancy
 * of Fibonacci points measured by Aistleitner, Brauchart & Dick (Discrete Comput. Geom. 48, 2012) [from memory] is of
 * order N^(−3/4).
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import {
  areaShareAtLeast,
  capabilityMap,
  DEFAULT_CAPABILITY,
  type CapabilityMap,
} from "../../../../src/core/analysis/capability/capability";
import { scaraRrprDh } from "../../../helpers/testArms";
import { discEnvelope, SHELL, shellArm } from "./shellArm";

const N = 256;

function mapOf(flange?: Parameters<typeof shellArm>[0], extra: Partial<typeof DEFAULT_CAPABILITY> = {}): CapabilityMap {
  const chain = compileChain(shellArm(flange).input);
  const result = capabilityMap(chain, "revolute-base", discEnvelope(1000), {
    ...DEFAULT_CAPABILITY,
    gridMm: 100,
    directions: N,
    ...extra,
  });
  if (!result.ok) throw new Error(result.reason);
  return result.map;
}

/** The zone share s(p) of the module doc. */
function zoneShare(rho: number): number {
  const d = SHELL.dM,
    rMin = SHELL.l1M - SHELL.l2M,
    rMax = SHELL.l1M + SHELL.l2M;
  const tLo = (rho * rho + d * d - rMax * rMax) / (2 * d * rho),
    tHi = (rho * rho + d * d - rMin * rMin) / (2 * d * rho);
  return Math.max(0, Math.min(1, tHi) - Math.max(-1, tLo)) / 2;
}

describe("capabilityMap, spherical wrist with unlimited wrist joints (check a)", () => {
  const map = mapOf();

  it("solves in closed form with the roll left to joint 6 (its axis is the flange axis)", () => {
    expect(map.method).toBe("closed-form");
    expect(map.rollBasis).toBe("last-joint");
    expect(map.directions).toBe(N);
    // Nodes at whole multiples of the grid: r = 0 … 1000 mm, z = −1000 … 1000 mm.
    expect(map.rMm).toEqual(Array.from({ length: 11 }, (_, i) => 100 * i));
    expect(map.zMm[0]).toBe(-1000);
    expect(map.zMm.at(-1)).toBe(1000);
  });

  it("reaches direction n at p exactly when 0.1 m ≤ |p − 0.1·n| ≤ 0.9 m (lattice counted per direction)", () => {
    let compared = 0;
    for (let node = 0; node < map.share.length; node++) {
      if (Number.isNaN(map.share[node]!)) continue;
      const p = map.nodePositionsM.subarray(3 * node, 3 * node + 3);
      let count = 0,
        onEdge = false;
      for (let k = 0; k < N; k++) {
        const c = Math.hypot(
          p[0]! - SHELL.dM * map.directionVectors[3 * k]!,
          p[1]! - SHELL.dM * map.directionVectors[3 * k + 1]!,
          p[2]! - SHELL.dM * map.directionVectors[3 * k + 2]!,
        );
        // A wrist centre on the shell's surface (within 1 µm) may go either way (elbow straight or folded).
        if (Math.abs(c - 0.1) < 1e-6 || Math.abs(c - 0.9) < 1e-6) onEdge = true;
        if (c >= 0.1 && c <= 0.9) count++;
      }
      if (onEdge) continue;
      compared++;
      expect(Math.round(map.share[node]! * N), `node ${node} at (${p.join(", ")}) m`).toBe(count);
    }
    expect(compared).toBeGreaterThan(150);
  });

  it("matches the spherical-zone share s(p) cell by cell (2/N on axis 1, 2·N^(−3/4) elsewhere)", () => {
    let onAxis = 0;
    for (let node = 0; node < map.share.length; node++) {
      if (Number.isNaN(map.share[node]!)) continue;
      const [x, y, z] = map.nodePositionsM.subarray(3 * node, 3 * node + 3);
      const rho = Math.hypot(x!, y!, z!);
      if (rho < 1e-9) continue; // the origin: every wrist centre on the inner surface (elbow folded flat)
      const axis = Math.hypot(x!, y!) < 1e-12;
      if (axis) onAxis++;
      const tol = axis ? 2 / N : 2 * N ** -0.75;
      expect(Math.abs(map.share[node]! - zoneShare(rho)), `node ${node}, ρ = ${rho} m`).toBeLessThanOrEqual(tol);
    }
    expect(onAxis).toBeGreaterThan(10);
    // The worked values of the module doc.
    expect(zoneShare(0.5)).toBe(1);
    expect(zoneShare(0.95)).toBeCloseTo((1 - 0.1025 / 0.19) / 2, 12);
  });

  it("puts the nodes on the plane through axis 1 (base z) along base x: node (r, z) at (r, 0, z)", () => {
    const nx = map.rMm.length;
    for (const [ix, iy] of [
      [0, 0],
      [3, 12],
      [7, 9],
    ] as const) {
      const node = ix + iy * nx;
      expect(Array.from(map.nodePositionsM.subarray(3 * node, 3 * node + 3)).map((v) => v * 1000)).toEqual([
        map.rMm[ix],
        0,
        map.zMm[iy],
      ]);
    }
  });
});

describe("capabilityMap, numeric continuation (lower bound)", () => {
  it("on the shell arm: reaches no pair the closed form does not, and misses under 1 % of those it does", () => {
    const closed = mapOf(undefined, { directions: 64, keepSolutions: true });
    const numeric = mapOf(undefined, { directions: 64, keepSolutions: true, method: "numeric" });
    expect(numeric.method).toBe("numeric");
    let both = 0,
      missed = 0;
    const m = 6;
    for (let p = 0; p < closed.share.length * 64; p++) {
      const c = !Number.isNaN(closed.solutions![p * m]!),
        n = !Number.isNaN(numeric.solutions![p * m]!);
      expect(n && !c, `pair ${p}: numeric reaches a pair the closed form does not`).toBe(false);
      if (c) both++;
      if (c && !n) missed++;
    }
    expect(both).toBeGreaterThan(5000);
    expect(missed / both).toBeLessThan(0.01);
  });
});

describe("capabilityMap, rolls sampled when the last joint is not the flange's own turn", () => {
  it("flange turned 90° about x: reaches a subset of the exact roll circle, within the 45° roll spacing", () => {
    // Flange = DH frame 6 turned by 90° about its x axis at the wrist-centre distance: flange z is perpendicular to
    // axis 6 and the wrist centre lies d = 0.1 m from the flange centre along axis 6 (the flange's −y... any
    // direction across n). With the roll free, the wrist centre runs over the circle c = p − d·u, u ⊥ n, |u| = 1:
    // |c|² = ρ² + d² − 2d(p·u) with p·u over [−|p⊥|, |p⊥|] (p⊥ = p minus its part along n), so n is reached for some
    // roll exactly when [ρ² + d² − 2d|p⊥|, ρ² + d² + 2d|p⊥|] meets [0.1², 0.9²].
    const map = mapOf({ xyzMm: [0, 0, 0], rpyDeg: [90, 0, 0] }, { directions: 64, rolls: 8 });
    expect(map.rollBasis).toBe("sampled");
    expect(map.rollsTried).toBe(8);
    let exact = 0,
      sampled = 0;
    for (let node = 0; node < map.share.length; node++) {
      if (Number.isNaN(map.share[node]!)) continue;
      const p = map.nodePositionsM.subarray(3 * node, 3 * node + 3);
      const rho2 = p[0]! ** 2 + p[1]! ** 2 + p[2]! ** 2;
      let count = 0;
      for (let k = 0; k < 64; k++) {
        const n = map.directionVectors.subarray(3 * k, 3 * k + 3);
        const along = p[0]! * n[0]! + p[1]! * n[1]! + p[2]! * n[2]!;
        const perp = Math.sqrt(Math.max(0, rho2 - along * along));
        const lo = rho2 + 0.01 - 0.2 * perp,
          hi = rho2 + 0.01 + 0.2 * perp;
        if (hi >= 0.01 && lo <= 0.81) count++;
      }
      const got = Math.round(map.share[node]! * 64);
      expect(got, `node ${node}`).toBeLessThanOrEqual(count);
      exact += count;
      sampled += got;
    }
    // A roll arc narrower than the 45° spacing can be missed; here that costs under 3 % of the reached pairs.
    expect(sampled / exact).toBeGreaterThan(0.97);
  });
});

describe("capabilityMap, arms without a map", () => {
  it("a SCARA (every revolute axis vertical: the tool axis never tilts) has none: tool-axis-cannot-turn", () => {
    const chain = compileChain(scaraRrprDh());
    expect(capabilityMap(chain, "revolute-base", discEnvelope(700))).toEqual({
      ok: false,
      reason: "tool-axis-cannot-turn",
    });
  });

  it("an arm whose side view has no axis 1 (prismatic base) has none: no-axis-1", () => {
    const chain = compileChain(shellArm().input);
    expect(capabilityMap(chain, "prismatic-base", discEnvelope(1000))).toEqual({ ok: false, reason: "no-axis-1" });
  });
});

describe("areaShareAtLeast", () => {
  it("areaShareAtLeast([0.2, 0.6, NaN, 0.5], 0.5) = 2/3: two of three inside nodes reach half or more", () => {
    expect(areaShareAtLeast([0.2, 0.6, Number.NaN, 0.5], 0.5)).toBeCloseTo(2 / 3, 15);
    expect(areaShareAtLeast([Number.NaN], 0.5)).toBeNull();
  });
});

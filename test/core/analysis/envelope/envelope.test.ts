/**
 * workspaceEnvelope against closed forms (invented round-number chains) and, on every demo arm, against forward
 * kinematics at seeded random poses.
 *
 * Accuracy target of the analysis: boundary error ≤ max(2 mm, 0.2 % of the reach). "Boundary error" of a vertex is
 * checked as the distance of the polygon vertex from the closed-form boundary curve; areas and volumes are checked
 * with the error a boundary within that tolerance allows (perimeter × tolerance, surface × tolerance; CHECKS C3
 * gives |A_tool − A| ≤ perimeter × cell size for rasterised envelopes).
 */
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../../src/catalog/index";
import {
  compileChain,
  createScratch,
  forwardInto,
  wristCentreInto,
  type ArmKinematicsInput,
  type Chain,
  type JointInput,
} from "../../../../src/core";
import {
  DEFAULT_ENVELOPE_OPTIONS,
  workspaceEnvelope,
  type PointEnvelope,
  type PolygonMm,
  type WorkspaceEnvelope,
} from "../../../../src/core/analysis/envelope/envelope";
import { mulberry32, uniform } from "../../../helpers/prng";
import { generic6rDh, GENERIC_6R_SI } from "../../../helpers/testArms";

// ---------------------------------------------------------------------------------------------------------------
// Independent geometry helpers (no code from src/core/analysis)

type Ring = readonly (readonly [number, number])[];

function pointInRing(x: number, y: number, ring: Ring): boolean {
  let inside = false;
  for (let k = 1; k < ring.length; k++) {
    const [x0, y0] = ring[k - 1]!,
      [x1, y1] = ring[k]!;
    if (y0 > y !== y1 > y && x < x0 + ((y - y0) * (x1 - x0)) / (y1 - y0)) inside = !inside;
  }
  return inside;
}

function inside(x: number, y: number, polygons: readonly PolygonMm[]): boolean {
  return polygons.some((p) => pointInRing(x, y, p.outer) && !p.holes.some((h) => pointInRing(x, y, h)));
}

function distanceToBoundary(x: number, y: number, polygons: readonly PolygonMm[]): number {
  let best = Infinity;
  for (const p of polygons) {
    for (const ring of [p.outer, ...p.holes]) {
      for (let k = 1; k < ring.length; k++) {
        const [ax, ay] = ring[k - 1]!,
          [bx, by] = ring[k]!;
        const dx = bx - ax,
          dy = by - ay,
          l2 = dx * dx + dy * dy;
        const t = l2 > 0 ? Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / l2)) : 0;
        best = Math.min(best, Math.hypot(x - ax - t * dx, y - ay - t * dy));
      }
    }
  }
  return best;
}

/** Largest |distance of a vertex from (cx, cy) − radius| over the given rings. */
function radiusError(rings: readonly Ring[], cx: number, cy: number, radius: number): number {
  let worst = 0;
  for (const ring of rings)
    for (const [x, y] of ring) worst = Math.max(worst, Math.abs(Math.hypot(x - cx, y - cy) - radius));
  return worst;
}

const outers = (ps: readonly PolygonMm[]) => ps.map((p) => p.outer);
const holes = (ps: readonly PolygonMm[]) => ps.flatMap((p) => p.holes);

/** Target boundary tolerance of the analysis for a point of the given reach (issue 3 §1). */
const target = (reachMm: number) => Math.max(2, 0.002 * reachMm);

// ---------------------------------------------------------------------------------------------------------------
// Invented chains (frames convention, mm and deg)

const O = { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] } as const;
const joint = (
  name: string,
  xyzMm: number[],
  axis: number[],
  range: [number, number],
  extra: Partial<JointInput> = {},
  rpyDeg = [0, 0, 0],
): JointInput => ({
  name,
  kind: "revolute",
  origin: { xyzMm, rpyDeg },
  axis,
  rangeDeg: range,
  ...extra,
});

/**
 * Vertical axis 1 through the base origin, a shoulder on it at height 400 mm (horizontal axis y), an upper arm a1
 * and a forearm a2 (elbow axis y). The flange moves in the plane that turns with axis 1, so the side view is the
 * planar two-link reachable set about the shoulder (0, 400).
 */
function shoulderElbow(
  a1Mm: number,
  a2Mm: number,
  elbowDeg: [number, number] = [-180, 180],
  j1Deg: [number, number] = [-180, 180],
  shoulderOffsetMm = 0,
  baseRpyDeg = [0, 0, 0],
): Chain {
  const input: ArmKinematicsInput = {
    convention: "frames",
    joints: [
      joint("j1", [0, 0, 0], [0, 0, 1], j1Deg, {}, baseRpyDeg),
      joint("j2", [shoulderOffsetMm, 0, 400], [0, 1, 0], [-180, 180]),
      joint("j3", [a1Mm, 0, 0], [0, 1, 0], elbowDeg),
    ],
    flange: { xyzMm: [a2Mm, 0, 0], rpyDeg: [0, 0, 0] },
  };
  return compileChain(input);
}

const FLANGE_ONLY = { ...DEFAULT_ENVELOPE_OPTIONS, flange: true };

function flangeOf(env: WorkspaceEnvelope): PointEnvelope {
  expect(env.flange).not.toBeNull();
  return env.flange!;
}

describe("workspaceEnvelope(two-link shoulder–elbow chain)", () => {
  it("full ranges: the side view is the annulus |a1 − a2| ≤ ρ ≤ a1 + a2 about the shoulder (CHECKS C3)", () => {
    const env = workspaceEnvelope(shoulderElbow(500, 300), FLANGE_ONLY);
    expect(env.layout).toBe("revolute-base");
    expect(env.sideAxes).toEqual(["rMm", "zMm"]);
    const f = flangeOf(env);
    // CHECKS C3: annulus 200 mm ≤ ρ ≤ 800 mm; target tolerance max(2, 0.2 % × 800) = 2 mm
    expect(f.toleranceMm).toBeLessThanOrEqual(target(800));
    expect(f.side).toHaveLength(1);
    expect(f.side[0]!.holes).toHaveLength(1);
    expect(radiusError(outers(f.side), 0, 400, 800)).toBeLessThanOrEqual(target(800));
    expect(radiusError(holes(f.side), 0, 400, 200)).toBeLessThanOrEqual(target(800));
    // CHECKS C3: A = 4π a1 a2 = 0.6π m²; allowed error perimeter × tolerance = 2π(0.8 + 0.2) m × 2 mm
    expect(Math.abs(f.sideAreaM2 - 4 * Math.PI * 0.5 * 0.3)).toBeLessThanOrEqual(2 * Math.PI * 1.0 * 0.002);
    // elementary geometry: reach a1 + a2 = 800 mm from axis 1; heights 400 ± 800 mm; the annulus crosses axis 1
    expect(Math.abs(f.maxReachMm - 800)).toBeLessThanOrEqual(0.01);
    expect(f.minReachMm).toBe(0);
    expect(Math.abs(f.maxHeightMm - 1200)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(f.minHeightMm + 400)).toBeLessThanOrEqual(0.01);
    // no wrist: the WCP envelope is absent
    expect(env.wcp).toBeNull();
  });

  it("full ranges: swept 360° about axis 1 the annulus gives the spherical shell 4/3·π·(R³ − r³) (Pappus / elementary geometry)", () => {
    const f = flangeOf(workspaceEnvelope(shoulderElbow(500, 300), FLANGE_ONLY));
    const shell = (4 / 3) * Math.PI * (0.8 ** 3 - 0.2 ** 3);
    // a boundary within 2 mm moves the volume by at most surface × 2 mm = 4π(R² + r²) × 0.002 m
    expect(f.volumeM3).not.toBeNull();
    expect(Math.abs(f.volumeM3! - shell)).toBeLessThanOrEqual(4 * Math.PI * (0.8 ** 2 + 0.2 ** 2) * 0.002);
  });

  it("full ranges: the top view is the disc of radius a1 + a2 (plan of a sphere; elementary geometry)", () => {
    const env = workspaceEnvelope(shoulderElbow(500, 300), FLANGE_ONLY);
    const f = flangeOf(env);
    expect(env.topAxes).toEqual(["xMm", "yMm"]);
    expect(f.top).toHaveLength(1);
    expect(f.top[0]!.holes).toHaveLength(0);
    expect(radiusError(outers(f.top), 0, 0, 800)).toBeLessThanOrEqual(target(800));
    expect(Math.abs(f.topAreaM2 - Math.PI * 0.8 ** 2)).toBeLessThanOrEqual(2 * Math.PI * 0.8 * 0.002);
  });

  it("a1 = a2: the annulus closes into the disc ρ ≤ 2a (CHECKS C3)", () => {
    const f = flangeOf(workspaceEnvelope(shoulderElbow(400, 400), FLANGE_ONLY));
    expect(f.side).toHaveLength(1);
    expect(f.side[0]!.holes).toHaveLength(0);
    expect(radiusError(outers(f.side), 0, 400, 800)).toBeLessThanOrEqual(target(800));
    // CHECKS C3: A = 4π a1 a2 = π (2a)² for a = 0.4 m
    expect(Math.abs(f.sideAreaM2 - 4 * Math.PI * 0.4 * 0.4)).toBeLessThanOrEqual(2 * Math.PI * 0.8 * 0.002);
  });

  it("elbow limited to [0°, 120°]: annulus ρ(120°) ≤ ρ ≤ ρ(0°), A = 2π a1 a2 (cos α − cos β) = 0.45π m² (CHECKS C3)", () => {
    const f = flangeOf(workspaceEnvelope(shoulderElbow(500, 300, [0, 120]), FLANGE_ONLY));
    // law of cosines: ρ(q)² = a1² + a2² + 2 a1 a2 cos q
    const rhoIn = Math.sqrt(500 ** 2 + 300 ** 2 + 2 * 500 * 300 * Math.cos((120 * Math.PI) / 180));
    expect(radiusError(outers(f.side), 0, 400, 800)).toBeLessThanOrEqual(target(800));
    expect(radiusError(holes(f.side), 0, 400, rhoIn)).toBeLessThanOrEqual(target(800));
    expect(Math.abs(f.sideAreaM2 - 0.45 * Math.PI)).toBeLessThanOrEqual(2 * Math.PI * (0.8 + rhoIn / 1000) * 0.002);
  });

  it("elbow [−120°, 120°] reaches the same set as [0°, 120°] (CHECKS C3 invariance: elbow up and down)", () => {
    const one = flangeOf(workspaceEnvelope(shoulderElbow(500, 300, [0, 120]), FLANGE_ONLY));
    const both = flangeOf(workspaceEnvelope(shoulderElbow(500, 300, [-120, 120]), FLANGE_ONLY));
    const rhoIn = Math.sqrt(500 ** 2 + 300 ** 2 + 2 * 500 * 300 * Math.cos((120 * Math.PI) / 180));
    expect(Math.abs(both.sideAreaM2 - one.sideAreaM2)).toBeLessThanOrEqual(
      2 * 2 * Math.PI * (0.8 + rhoIn / 1000) * 0.002,
    );
    expect(Math.abs(both.sideAreaM2 - 0.45 * Math.PI)).toBeLessThanOrEqual(2 * Math.PI * (0.8 + rhoIn / 1000) * 0.002);
  });

  it("joint 1 over ±90°: front and back halves together still sweep the whole shell (Pappus, both sides)", () => {
    // each point at +ρ covers azimuths [−90°, 90°], its mirror at −ρ covers [90°, 270°]: a full turn
    const f = flangeOf(workspaceEnvelope(shoulderElbow(500, 300, [-180, 180], [-90, 90]), FLANGE_ONLY));
    const shell = (4 / 3) * Math.PI * (0.8 ** 3 - 0.2 ** 3);
    expect(Math.abs(f.volumeM3! - shell)).toBeLessThanOrEqual(4 * Math.PI * (0.8 ** 2 + 0.2 ** 2) * 0.002);
  });

  it("joint 1 over ±45°: half the shell, and a top view of two opposite 90° sectors (Pappus; sector area θR²/2)", () => {
    const f = flangeOf(workspaceEnvelope(shoulderElbow(500, 300, [-180, 180], [-45, 45]), FLANGE_ONLY));
    const shell = (4 / 3) * Math.PI * (0.8 ** 3 - 0.2 ** 3);
    // front sweeps 90°, back sweeps the opposite 90°: 180° of 360°
    expect(Math.abs(f.volumeM3! - shell / 2)).toBeLessThanOrEqual(0.5 * 4 * Math.PI * (0.8 ** 2 + 0.2 ** 2) * 0.002);
    // two sectors of angle π/2 and radius 0.8 m: 2 · (π/2) · 0.8² / 2; boundary = 2 arcs + 4 radii
    const perimeter = 2 * (Math.PI / 2) * 0.8 + 4 * 0.8;
    expect(Math.abs(f.topAreaM2 - (Math.PI / 2) * 0.8 ** 2)).toBeLessThanOrEqual(perimeter * 0.002);
    // every top-view vertex lies within the two sectors |θ| ≤ 45° or |θ − 180°| ≤ 45° (plus the tolerance)
    for (const [x, y] of f.top.flatMap((p) => p.outer)) {
      const rho = Math.hypot(x, y),
        th = Math.abs(Math.atan2(y, x));
      const angular = Math.min(Math.abs(th), Math.abs(Math.PI - th));
      expect(rho * Math.max(0, Math.sin(Math.min(Math.PI / 2, angular - Math.PI / 4)))).toBeLessThanOrEqual(
        target(800),
      );
      expect(rho).toBeLessThanOrEqual(800 + target(800));
    }
  });

  it("shoulder 1000 mm in front of axis 1, joint 1 over 180°: V = angle × centroid distance × area (Pappus's second theorem)", () => {
    // the annulus lies entirely at r > 0 (1000 − 800 > 0): one side only, swept by π
    const f = flangeOf(workspaceEnvelope(shoulderElbow(500, 300, [-180, 180], [-90, 90], 1000), FLANGE_ONLY));
    const area = 4 * Math.PI * 0.5 * 0.3;
    expect(f.minReachMm).toBeGreaterThan(190);
    expect(Math.abs(f.minReachMm - 200)).toBeLessThanOrEqual(target(1800));
    expect(Math.abs(f.maxReachMm - 1800)).toBeLessThanOrEqual(0.01);
    // volume error ≤ π × tolerance × Σ (circumference × centroid distance) of the two boundary circles
    expect(Math.abs(f.volumeM3! - Math.PI * 1.0 * area)).toBeLessThanOrEqual(
      ((Math.PI * target(1800)) / 1000) * 2 * Math.PI * (0.8 + 0.2) * 1.0,
    );
  });

  it("axis 1 along base x: the side view is the same annulus, heights measured along axis 1 (elementary geometry)", () => {
    // the base frame of joint 1 turned by 90° about y: axis 1 = base +x
    const env = workspaceEnvelope(shoulderElbow(500, 300, [-180, 180], [-180, 180], 0, [0, 90, 0]), FLANGE_ONLY);
    const f = flangeOf(env);
    expect(env.axis1!.direction[0]).toBeCloseTo(1, 12);
    expect(radiusError(outers(f.side), 0, 400, 800)).toBeLessThanOrEqual(target(800));
    expect(radiusError(holes(f.side), 0, 400, 200)).toBeLessThanOrEqual(target(800));
    expect(Math.abs(f.sideAreaM2 - 4 * Math.PI * 0.5 * 0.3)).toBeLessThanOrEqual(2 * Math.PI * 1.0 * 0.002);
  });

  it("rejects invalid options with a RangeError naming the value", () => {
    expect(() =>
      workspaceEnvelope(shoulderElbow(500, 300), { ...DEFAULT_ENVELOPE_OPTIONS, minToleranceMm: 0 }),
    ).toThrow(/invalid minToleranceMm: 0/);
    expect(() => workspaceEnvelope(shoulderElbow(500, 300), { ...DEFAULT_ENVELOPE_OPTIONS, workBudget: -1 })).toThrow(
      RangeError,
    );
  });
});

// ---------------------------------------------------------------------------------------------------------------

/** Spherical-wrist 6R in the standard-DH layout of CHECKS C5/C6 (α = −90°, 0, −90°, 90°, −90°, 0), joints ±180°. */
function sphericalWrist6r(a1: number, a2: number, a3: number, d1: number, d4: number, d6: number): Chain {
  const rows = [
    [a1, -90, d1],
    [a2, 0, 0],
    [a3, -90, 0],
    [0, 90, d4],
    [0, -90, 0],
    [0, 0, d6],
  ] as const;
  return compileChain({
    convention: "dh",
    joints: rows.map(([a, alpha, d], i) => ({
      name: `j${i + 1}`,
      kind: "revolute",
      dh: { aMm: a, alphaDeg: alpha, dMm: d, thetaDeg: 0 },
      rangeDeg: [-180, 180],
    })),
    flange: O,
  });
}

/** a1 = 0, a2 = 800, a3 = 300, d1 = 500, d4 = 400, d6 = 100 mm (computed once for the two tests that use it). */
let sixRCache: WorkspaceEnvelope | undefined;
const sixR = () => (sixRCache ??= workspaceEnvelope(sphericalWrist6r(0, 800, 300, 500, 400, 100)));

describe("workspaceEnvelope(spherical-wrist 6R)", () => {
  it("a1 = 0: WCP section is the annulus ρ_min ≤ ρ ≤ ρ_max about the shoulder, area 4π a2 √(a3² + d4²) (CHECKS C6)", () => {
    // a2 = 800, a3 = 300, d4 = 400: √(a3² + d4²) = 500, ρ ∈ [300, 1300] mm about (0, d1 = 500)
    const w = sixR().wcp!;
    expect(w).not.toBeNull();
    expect(w.toleranceMm).toBeLessThanOrEqual(target(1300));
    expect(radiusError(outers(w.side), 0, 500, 1300)).toBeLessThanOrEqual(target(1300));
    expect(radiusError(holes(w.side), 0, 500, 300)).toBeLessThanOrEqual(target(1300));
    expect(Math.abs(w.sideAreaM2 - 4 * Math.PI * 0.8 * 0.5)).toBeLessThanOrEqual(
      (2 * Math.PI * (1.3 + 0.3) * target(1300)) / 1000,
    );
    // CHECKS C6: WCP max reach a1 + ρ_max = 1300 mm
    expect(Math.abs(w.maxReachMm - 1300)).toBeLessThanOrEqual(0.01);
  });

  it("a1 = 0: the flange set is the WCP set grown by d6, radii [ρ_min − d6, ρ_max + d6] (CHECKS C6)", () => {
    const f = sixR().flange!;
    // measured boundary error against the closed form stays within the target max(2, 0.2 % × 1400) = 2.8 mm, even
    // where the stated bound (toleranceMm) is larger because the work budget coarsened the wrist sampling
    expect(radiusError(outers(f.side), 0, 500, 1400)).toBeLessThanOrEqual(target(1400));
    expect(radiusError(holes(f.side), 0, 500, 200)).toBeLessThanOrEqual(target(1400));
    expect(Math.abs(f.sideAreaM2 - Math.PI * (1.4 ** 2 - 0.2 ** 2))).toBeLessThanOrEqual(
      (2 * Math.PI * (1.4 + 0.2) * target(1400)) / 1000,
    );
    // CHECKS C6: flange max reach a1 + ρ_max + d6
    expect(Math.abs(f.maxReachMm - 1400)).toBeLessThanOrEqual(0.01);
    expect(f.toleranceMm).toBeGreaterThanOrEqual(f.targetToleranceMm);
  });

  it("generic 6R of CHECKS §0: WCP reach a1 + a2 + √(a3² + d4²), flange + d6 (CHECKS C6)", () => {
    const { a1, a2, a3, d4, d6 } = GENERIC_6R_SI;
    const env = workspaceEnvelope(compileChain(generic6rDh()));
    const rhoMax = a2 + Math.hypot(a3, d4);
    expect(Math.abs(env.wcp!.maxReachMm - 1000 * (a1 + rhoMax))).toBeLessThanOrEqual(0.01);
    expect(Math.abs(env.flange!.maxReachMm - 1000 * (a1 + rhoMax + d6))).toBeLessThanOrEqual(0.01);
  });
});

// ---------------------------------------------------------------------------------------------------------------

/**
 * SCARA-like RRPR: vertical axis 1; axis 2 vertical at a1 = 400 mm; the tip a2 = 300 mm further; a prismatic stroke
 * of 200 mm straight down from 500 mm; a last vertical axis through the flange.
 */
function scara(j1Deg: [number, number]): Chain {
  return compileChain({
    convention: "frames",
    joints: [
      joint("j1", [0, 0, 0], [0, 0, 1], j1Deg),
      joint("j2", [400, 0, 500], [0, 0, 1], [-150, 150]),
      {
        name: "j3",
        kind: "prismatic",
        origin: { xyzMm: [300, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, 0, -1],
        rangeMm: [0, 200],
      },
      joint("j4", [0, 0, 0], [0, 0, 1], [-360, 360]),
    ],
    flange: O,
  });
}

/** ψ(ρ): angle at the base between link 1 and the tip at distance ρ (law of cosines). */
const scaraPsi = (rho: number) => Math.acos((400 ** 2 + rho ** 2 - 300 ** 2) / (2 * 400 * rho));
const RHO_MIN = Math.sqrt(400 ** 2 + 300 ** 2 + 2 * 400 * 300 * Math.cos((150 * Math.PI) / 180));

/** Simpson's rule on [a, b] with n (even) intervals. */
function simpson(f: (x: number) => number, a: number, b: number, n = 2000): number {
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

describe("workspaceEnvelope(SCARA-like RRPR)", () => {
  it("side view = radial band [ρ(±150°), a1 + a2] × stroke; full turn of joint 1: volume = annulus × stroke (DOMAIN, law of cosines)", () => {
    const f = flangeOf(workspaceEnvelope(scara([-180, 180])));
    const tol = target(700);
    expect(f.side).toHaveLength(1);
    for (const [r, z] of f.side[0]!.outer) {
      // each vertex lies on the rectangle's outline: |r| ∈ {ρ_min, 700} or z ∈ {300, 500}, within the tolerance
      const d = Math.min(
        Math.abs(Math.abs(r) - RHO_MIN),
        Math.abs(Math.abs(r) - 700),
        Math.abs(z - 300),
        Math.abs(z - 500),
      );
      expect(d).toBeLessThanOrEqual(tol);
      expect(Math.abs(r)).toBeLessThanOrEqual(700 + tol);
    }
    expect(Math.abs(f.sideAreaM2 - ((700 - RHO_MIN) / 1000) * 0.2)).toBeLessThanOrEqual(
      (2 * ((700 - RHO_MIN) / 1000 + 0.2) * tol) / 1000,
    );
    const annulus = Math.PI * (0.7 ** 2 - (RHO_MIN / 1000) ** 2);
    expect(Math.abs(f.volumeM3! - annulus * 0.2)).toBeLessThanOrEqual(
      ((2 * annulus + 2 * Math.PI * (0.7 + RHO_MIN / 1000) * 0.2) * tol) / 1000,
    );
    expect(Math.abs(f.maxReachMm - 700)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(f.minReachMm - RHO_MIN)).toBeLessThanOrEqual(tol);
  });

  it("joint 1 over ±90°: top view and volume include the forearm's angular spread, ∫ ρ (Δ + 2ψ(ρ)) dρ (law of cosines, quadrature)", () => {
    const f = flangeOf(workspaceEnvelope(scara([-90, 90])));
    // plan: at distance ρ the tip sits at azimuths ±ψ(ρ) from link 1; joint 1 sweeps Δ = π: arc length Δ + 2ψ(ρ)
    const planMm2 = simpson((rho) => rho * (Math.PI + 2 * scaraPsi(rho)), RHO_MIN, 700);
    const tol = target(700);
    const perimeterMm = Math.PI * (700 + RHO_MIN) + 2 * (700 - RHO_MIN) + 4 * 300; // generous outline length
    expect(Math.abs(f.topAreaM2 * 1e6 - planMm2)).toBeLessThanOrEqual(perimeterMm * tol);
    expect(Math.abs(f.volumeM3! * 1e9 - planMm2 * 200)).toBeLessThanOrEqual((2 * planMm2 + perimeterMm * 200) * tol);
  });
});

// ---------------------------------------------------------------------------------------------------------------

describe("workspaceEnvelope(gantry)", () => {
  const gantry = compileChain({
    convention: "frames",
    joints: [
      { name: "x", kind: "prismatic", origin: O, axis: [1, 0, 0], rangeMm: [0, 1000] },
      { name: "y", kind: "prismatic", origin: O, axis: [0, 1, 0], rangeMm: [0, 600] },
      {
        name: "z",
        kind: "prismatic",
        origin: { xyzMm: [0, 0, 1500], rpyDeg: [0, 0, 0] },
        axis: [0, 0, -1],
        rangeMm: [0, 400],
      },
      joint("c", [0, 0, 0], [0, 0, 1], [-180, 180]),
    ],
    flange: { xyzMm: [0, 0, -100], rpyDeg: [180, 0, 0] },
  });

  it("box envelope: volume = product of the strokes, side (x, z) and top (x, y) rectangles (elementary geometry)", () => {
    const env = workspaceEnvelope(gantry);
    expect(env.layout).toBe("prismatic-base");
    expect(env.sideAxes).toEqual(["xMm", "zMm"]);
    const f = flangeOf(env);
    const tol = target(Math.hypot(1000, 600, 1400));
    // x stroke × (y, z) cross-section; the cross-section's boundary within the tolerance: 1.0 m × perimeter × tol
    expect(Math.abs(f.volumeM3! - 1.0 * 0.6 * 0.4)).toBeLessThanOrEqual((1.0 * 2 * (0.6 + 0.4) * tol) / 1000);
    expect(Math.abs(f.sideAreaM2 - 1.0 * 0.4)).toBeLessThanOrEqual((2 * (1.0 + 0.4) * tol) / 1000);
    expect(Math.abs(f.topAreaM2 - 1.0 * 0.6)).toBeLessThanOrEqual((2 * (1.0 + 0.6) * tol) / 1000);
    for (const [x, z] of f.side[0]!.outer) {
      expect(x).toBeGreaterThanOrEqual(-tol);
      expect(x).toBeLessThanOrEqual(1000 + tol);
      expect(z).toBeGreaterThanOrEqual(1000 - tol);
      expect(z).toBeLessThanOrEqual(1400 + tol);
    }
    expect(Math.abs(f.maxHeightMm - 1400)).toBeLessThanOrEqual(1e-6);
    expect(Math.abs(f.minHeightMm - 1000)).toBeLessThanOrEqual(1e-6);
    expect(Math.abs(f.maxReachMm - Math.hypot(1000, 600))).toBeLessThanOrEqual(1e-6);
  });
});

// ---------------------------------------------------------------------------------------------------------------

const ARMS_DIR = process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../../arms", import.meta.url));
const { arms } = await loadArms([ARMS_DIR]);

describe("workspaceEnvelope on every demo arm", () => {
  it.each(arms.map((a) => [a.id, a] as const))(
    "%s: 2000 random poses within the limits lie inside the side and top views or within toleranceMm of their boundary; reach and height figures bound them",
    (id, arm) => {
      // Forward kinematics (tested on its own in test/core/kinematics) places the WCP and the flange; the polygons
      // must contain them. Seeded PRNG (mulberry32) from the arm id, so failures reproduce.
      const chain = arm.chain;
      const env = workspaceEnvelope(chain);
      const m = chain.drivenCount;
      let seed = 0;
      for (const ch of id) seed = (Math.imul(seed, 31) + ch.charCodeAt(0)) >>> 0;
      const rand = mulberry32(seed);
      const s = createScratch(chain),
        q = new Float64Array(m),
        w = new Float64Array(3);
      const ax = env.axis1;
      const failures: string[] = [];
      for (let trial = 0; trial < 2000; trial++) {
        for (let j = 0; j < m; j++) {
          const prismatic = chain.isPrismatic[chain.drivenJoint[j]!] === 1;
          const lo = Number.isFinite(chain.lowerSi[j]!) ? chain.lowerSi[j]! : prismatic ? -1 : -Math.PI;
          const hi = Number.isFinite(chain.upperSi[j]!) ? chain.upperSi[j]! : prismatic ? 1 : Math.PI;
          q[j] = uniform(rand, lo, hi);
        }
        for (const pe of [env.wcp, env.flange]) {
          if (!pe) continue;
          const at = (qq: Float64Array): [number, number, number] => {
            forwardInto(chain, qq, s);
            if (pe.point === "wcp") {
              wristCentreInto(w, chain, s);
              return [w[0]! * 1000, w[1]! * 1000, w[2]! * 1000];
            }
            return [s.flange[3]! * 1000, s.flange[7]! * 1000, s.flange[11]! * 1000];
          };
          const check = (label: string, x: number, y: number, polygons: readonly PolygonMm[]) => {
            if (inside(x, y, polygons)) return;
            const d = distanceToBoundary(x, y, polygons);
            if (d > pe.toleranceMm + 1e-6)
              failures.push(
                `${pe.point} ${label} (${x.toFixed(1)}, ${y.toFixed(1)}) is ${d.toFixed(2)} mm outside (tolerance ${pe.toleranceMm.toFixed(2)} mm), q = ${Array.from(q, (v) => v.toFixed(4))}`,
              );
          };
          const [px, py, pz] = at(q);
          if (ax) {
            // top view: base plan of the pose as it is
            check("top", px, py, pe.top);
            // side view: the same pose with joint 1 at kinematic angle 0 (the side view turns with joint 1)
            const q0 = Float64Array.from(q);
            q0[0] = -chain.couplingOffset[0]! / chain.couplingGain[0]!;
            const [x, y, z] = at(q0);
            const d = [x - ax.pointMm[0], y - ax.pointMm[1], z - ax.pointMm[2]];
            const along = d[0]! * ax.direction[0] + d[1]! * ax.direction[1] + d[2]! * ax.direction[2];
            const radial = [
              d[0]! - along * ax.direction[0],
              d[1]! - along * ax.direction[1],
              d[2]! - along * ax.direction[2],
            ];
            const rho = Math.hypot(radial[0]!, radial[1]!, radial[2]!);
            const forward = radial[0]! * ax.forward[0] + radial[1]! * ax.forward[1] + radial[2]! * ax.forward[2];
            const height = x * ax.direction[0] + y * ax.direction[1] + z * ax.direction[2];
            check("side", forward >= 0 ? rho : -rho, height, pe.side);
            if (rho > pe.maxReachMm + 1e-6) failures.push(`${pe.point} reach ${rho} > maxReachMm ${pe.maxReachMm}`);
            if (rho < pe.minReachMm - 1e-6) failures.push(`${pe.point} reach ${rho} < minReachMm ${pe.minReachMm}`);
            if (height > pe.maxHeightMm + 1e-6 || height < pe.minHeightMm - 1e-6)
              failures.push(`${pe.point} height ${height} outside [${pe.minHeightMm}, ${pe.maxHeightMm}]`);
          } else {
            check("side", px, pz, pe.side);
            check("top", px, py, pe.top);
            const rho = Math.hypot(px, py);
            if (rho > pe.maxReachMm + 1e-6) failures.push(`${pe.point} reach ${rho} > maxReachMm ${pe.maxReachMm}`);
            if (pz > pe.maxHeightMm + 1e-6 || pz < pe.minHeightMm - 1e-6)
              failures.push(`${pe.point} height ${pz} outside [${pe.minHeightMm}, ${pe.maxHeightMm}]`);
          }
        }
      }
      expect(failures.slice(0, 5)).toEqual([]);
    },
    180_000,
  );
});

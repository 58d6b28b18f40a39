/**
 * Side-view containment on the arms the random run found with side views that missed reachable points (stored as
 * drawn in envelopeRegressions.json), checked independently of the envelope code: joint vectors drawn with a seeded
 * PRNG within the limits (brute-force sampling of joint space), the point by forward kinematics, its side-view
 * coordinates from the definition in the envelope's module doc, and a winding-number point-in-polygon written in
 * properties.ts (not src/core/geometry/polygon.ts). Every sampled point must lie inside the side view or within its
 * stated boundary tolerance (+ 0.1 mm of rounding).
 */
import { describe, expect, it } from "vitest";
import { validateArm } from "../../src/catalog/validate";
import { DEFAULT_ENVELOPE_OPTIONS, workspaceEnvelope } from "../../src/core/analysis/envelope/envelope";
import { createScratch, forwardInto, wristCentreInto } from "../../src/core/kinematics/forward";
import { mulberry32 } from "../helpers/prng";
import regressions from "./envelopeRegressions.json" with { type: "json" };
import { distanceToBoundary, FUZZ_ANALYSIS, insidePolygons } from "./properties";

/** What each arm exposed (layout; stage; miss before the fix at the property run's resolution). */
const FOUND: Record<string, string> = {
  "envelope-gap-1":
    "prismatic base; a thin part of the region narrower than the outline's node spacing vanished from the outline (38 mm)",
  "envelope-gap-2": "base frame; a thin slanted strip between two row lines was outlined as separate specks (26 mm)",
  "envelope-gap-3":
    "revolute base; a secondary prismatic joint with a 1.2 m stroke sampled at its two ends only (400 mm)",
  "envelope-gap-4": "base frame; the tip of a thin parallelogram between two rows cut off (38 mm)",
  "envelope-gap-5":
    "base frame; a secondary prismatic joint sampled too coarsely for the curved boundary it translates (120 mm)",
  "envelope-gap-6": "revolute base, WCP; thin strips dropped by the outline and by the small-ring filter (47 mm)",
  "envelope-gap-7":
    "revolute base; a corner of the region poking between rows (73 mm at a coarsened tolerance of 63 mm)",
  "envelope-gap-8": "prismatic base; a region of slivers (area 0.001 m²) dropped by the outline (15 mm)",
  "envelope-gap-9":
    "revolute base, WCP fixed purely lateral to axis 1: a single point, its tiny ring dropped (empty side view)",
  "envelope-gap-10": "base frame; a nearly flat projection whose image is a thin band (80 mm)",
  "envelope-gap-11":
    "revolute base; a primary prismatic joint sampled at its ends although ρ bends along its line (114 mm)",
  "envelope-gap-12": "revolute base; a prismatic joint with two samples moving the point across the arm plane (97 mm)",
};

const POSES = 1500;
const OPTIONS = { ...DEFAULT_ENVELOPE_OPTIONS, ...FUZZ_ANALYSIS.envelope };

describe("workspaceEnvelope side view on the stored counterexamples (regressions)", () => {
  it.each((regressions as { id: string }[]).map((arm) => [arm.id, FOUND[arm.id] ?? "", arm] as const))(
    "%s (%s): every sampled pose's point lies in the side view",
    (id, _found, arm) => {
      const v = validateArm(arm, `${id}.json`, id);
      if (!v.ok) throw new Error(v.issues.map((i) => `${i.path}: ${i.message}`).join("; "));
      const chain = v.chain;
      const env = workspaceEnvelope(chain, OPTIONS);
      const point = env.wcp ?? env.flange!;
      expect(point.side.length).toBeGreaterThan(0);
      const tol = point.toleranceMm + 0.1;
      const s = createScratch(chain),
        m = chain.drivenCount,
        q = new Float64Array(m),
        p = new Float64Array(3);
      const rnd = mulberry32(20260401);
      const axis = env.axis1;
      let worst = 0,
        where = "";
      for (let n = 0; n < POSES; n++) {
        for (let i = 0; i < m; i++) {
          const lo = chain.lowerSi[i]!,
            hi = chain.upperSi[i]!,
            u = rnd();
          // limits drawn on purpose: boundaries are often reached there
          q[i] = u < 0.05 ? lo : u > 0.95 ? hi : lo + (hi - lo) * rnd();
        }
        // revolute base: the side view is the set with joint 1 at kinematic angle 0 (module doc of envelope.ts)
        if (axis) q[0] = -chain.couplingOffset[0]! / chain.couplingGain[0]!;
        forwardInto(chain, q, s);
        if (env.wcp) wristCentreInto(p, chain, s);
        else p.set([s.flange[3]!, s.flange[7]!, s.flange[11]!]);
        const pMm = [p[0]! * 1000, p[1]! * 1000, p[2]! * 1000];
        const candidates: [number, number][] = [];
        if (axis) {
          // (±√(x_f² + y_l²), z): forward e_f, lateral e_l = axis × e_f, height along the axis direction
          const f = axis.forward,
            d = axis.direction,
            o = axis.pointMm;
          const lat = [d[1] * f[2] - d[2] * f[1], d[2] * f[0] - d[0] * f[2], d[0] * f[1] - d[1] * f[0]];
          const rel = [pMm[0]! - o[0], pMm[1]! - o[1], pMm[2]! - o[2]];
          const xf = rel[0]! * f[0] + rel[1]! * f[1] + rel[2]! * f[2];
          const yl = rel[0]! * lat[0]! + rel[1]! * lat[1]! + rel[2]! * lat[2]!;
          const r = Math.hypot(xf, yl),
            z = pMm[0]! * d[0] + pMm[1]! * d[1] + pMm[2]! * d[2];
          candidates.push([xf < 0 ? -r : r, z]);
          // a point on the plane x_f = 0 (within the tolerance) has no sign: either side counts
          if (Math.abs(xf) < tol) candidates.push([xf < 0 ? r : -r, z]);
        } else {
          // prismatic-base and base-frame layouts: projection on the base x–z plane
          candidates.push([pMm[0]!, pMm[2]!]);
        }
        let miss = Infinity;
        for (const [x, y] of candidates)
          miss = Math.min(miss, insidePolygons(x, y, point.side) ? 0 : distanceToBoundary(x, y, point.side));
        if (miss > worst) {
          worst = miss;
          where = `q = [${Array.from(q, (x) => x.toFixed(4)).join(", ")}]`;
        }
      }
      expect(
        worst,
        `largest miss ${worst.toFixed(1)} mm at ${where} (tolerance ${tol.toFixed(1)} mm)`,
      ).toBeLessThanOrEqual(tol);
    },
  );
});

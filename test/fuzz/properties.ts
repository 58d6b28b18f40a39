/**
 * Properties every arm's analysis must have, checked independently of the analysis code: the arm file goes through
 * the real validation and the whole analysis (analyseArm), and the output is checked against forward kinematics at
 * poses drawn with a seeded PRNG, against a brute-force enumeration of the joint-rate box, and against its own
 * stated bounds. Shared by the unit-suite property tests (test/fuzz/*.test.ts) and the long run (longRun.ts).
 */
import { validateArm } from "../../src/catalog/validate";
import { armFacts } from "../../src/catalog/analysis";
import type { Arm } from "../../src/catalog/load";
import { analyseArm, type AnalysisOptions, type ArmAnalysis } from "../../src/core/analysis/analyseArm";
import type { Chain } from "../../src/core/kinematics/chain";
import { createScratch, forwardInto, jacobianInto, wristCentreInto } from "../../src/core/kinematics/forward";
import { createSpeedScratch, guaranteedLineSpeed, maxToolSpeed } from "../../src/core/measures/speed";
import { mulberry32 } from "../helpers/prng";

/** Reduced resolution so one arm takes well under a second or two on one core (published analyses use the defaults). */
export const FUZZ_ANALYSIS: AnalysisOptions = {
  mapStepMm: 100,
  seed: 7,
  envelope: { toleranceOfReach: 0.01, minToleranceMm: 10, workBudget: 300_000 },
  payload: { atReach: { reachStepMm: 200, offsetsMm: [0, 100], searchNodesByDims: [1, 200, 200, 400] } },
  capability: { gridMm: 200, directions: 24, numericSamples: 300, numericTries: 2 },
};

/** Passes of the envelope per point (side + plan; a prismatic base adds a section): bounds the joint-grid samples. */
const ENVELOPE_PASSES_PER_POINT = 3;

/** The message a deliberately unsupported chain must carry. */
export const UNSUPPORTED_MARK = "not supported because";

export interface ArmCheck {
  /** "analysed": analysis ran (violations may still be listed); "unsupported": a clear refusal; "rejected": the
   * validation refused the file; "threw": an unexpected error. */
  readonly outcome: "analysed" | "unsupported" | "rejected" | "threw";
  readonly violations: readonly string[];
  readonly message?: string;
  readonly analysis?: ArmAnalysis;
  readonly drivenCount?: number;
  readonly layout?: string;
}

/** Paths of every number in `value` that is NaN or ±Infinity (typed arrays included), at most `limit` of them. */
export function nonFiniteNumbers(value: unknown, limit = 5): string[] {
  const out: string[] = [];
  const walk = (v: unknown, path: string): void => {
    if (out.length >= limit) return;
    if (typeof v === "number") {
      if (!Number.isFinite(v)) out.push(`${path} = ${v}`);
    } else if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
      const a = v as unknown as ArrayLike<number | bigint>;
      for (let i = 0; i < a.length; i++) if (typeof a[i] === "number") walk(a[i], `${path}[${i}]`);
    } else if (Array.isArray(v)) {
      v.forEach((x, i) => walk(x, `${path}[${i}]`));
    } else if (v !== null && typeof v === "object") {
      for (const [k, x] of Object.entries(v)) walk(x, path ? `${path}.${k}` : k);
    }
  };
  walk(value, "");
  return out;
}

type Ring = readonly (readonly [number, number])[];
interface Polygon {
  readonly outer: Ring;
  readonly holes: readonly Ring[];
}

/**
 * Winding number of a closed ring about (x, y) (Sunday's crossing rule; the ring's first point repeats at its end).
 * Written here independently of src/core/geometry/polygon.ts. @see D. Sunday, "Inclusion of a point in a polygon"
 * (winding number algorithm) [from memory]
 */
export function windingNumber(x: number, y: number, ring: Ring): number {
  let w = 0;
  for (let k = 0; k + 1 < ring.length; k++) {
    const [x0, y0] = ring[k]!,
      [x1, y1] = ring[k + 1]!;
    const side = (x1 - x0) * (y - y0) - (x - x0) * (y1 - y0);
    if (y0 <= y) {
      if (y1 > y && side > 0) w++;
    } else if (y1 <= y && side < 0) w--;
  }
  return w;
}

/** Distance from (x, y) to the nearest edge of any ring of the polygons, mm. */
export function distanceToBoundary(x: number, y: number, polygons: readonly Polygon[]): number {
  let best = Infinity;
  for (const p of polygons) {
    for (const ring of [p.outer, ...p.holes]) {
      for (let k = 0; k + 1 < ring.length; k++) {
        const [ax, ay] = ring[k]!,
          [bx, by] = ring[k + 1]!;
        const dx = bx - ax,
          dy = by - ay,
          l2 = dx * dx + dy * dy;
        const t = l2 > 0 ? Math.min(1, Math.max(0, ((x - ax) * dx + (y - ay) * dy) / l2)) : 0;
        best = Math.min(best, Math.hypot(x - ax - t * dx, y - ay - t * dy));
      }
    }
  }
  return best;
}

/** Inside one polygon's outer ring and outside all its holes (non-zero winding). */
export function insidePolygons(x: number, y: number, polygons: readonly Polygon[]): boolean {
  return polygons.some((p) => windingNumber(x, y, p.outer) !== 0 && p.holes.every((h) => windingNumber(x, y, h) === 0));
}

/** Driven joint vector drawn uniformly within the limits (a full turn where a range is wider). */
function randomJoints(chain: Chain, rnd: () => number, out: Float64Array): Float64Array {
  for (let i = 0; i < chain.drivenCount; i++) {
    const lo = chain.lowerSi[i]!,
      hi = chain.upperSi[i]!;
    // the ends of the range are drawn on purpose: the reach is often attained at a limit
    const u = rnd();
    out[i] = u < 0.05 ? lo : u > 0.95 ? hi : lo + (hi - lo) * rnd();
  }
  return out;
}

/**
 * Largest ‖J_v q̇‖ over the vertices of the joint-rate box, by enumerating all 2^m sign vectors (brute force,
 * independent of maxToolSpeed's Gray-code walk). A convex function's maximum over a box is at a vertex
 * (Rockafellar, Convex Analysis, Cor. 32.3.2) [from memory].
 */
export function bruteMaxToolSpeed(j: Float64Array, m: number, maxRate: Float64Array): number {
  let best = 0;
  for (let s = 0; s < 1 << m; s++) {
    let x = 0,
      y = 0,
      z = 0;
    for (let i = 0; i < m; i++) {
      const w = (s >> i) & 1 ? -maxRate[i]! : maxRate[i]!;
      x += w * j[i]!;
      y += w * j[m + i]!;
      z += w * j[2 * m + i]!;
    }
    best = Math.max(best, Math.hypot(x, y, z));
  }
  return best;
}

export interface CheckOptions {
  readonly analysis: AnalysisOptions;
  /** Poses drawn for the reach, envelope and speed checks. */
  readonly poses: number;
  /** PRNG state of the pose draws. */
  readonly seed: number;
  /** Check that the side view contains every sampled pose's point (see checkPoses). On in the unit suite (off with
   * ARMDEX_FUZZ_ENVELOPE=0) and in the long run; arms still failing it are kept in openCounterexamples.json. */
  readonly envelopeContainment: boolean;
}

export const DEFAULT_CHECK: CheckOptions = { analysis: FUZZ_ANALYSIS, poses: 200, seed: 1, envelopeContainment: true };

/** Validates and analyses one arm file and checks every property; never throws. */
export function checkArm(json: unknown, options: CheckOptions = DEFAULT_CHECK): ArmCheck {
  const id = typeof (json as { id?: unknown }).id === "string" ? (json as { id: string }).id : "fuzz-arm";
  const validated = validateArm(json, `${id}.json`, id);
  if (!validated.ok) {
    return {
      outcome: "rejected",
      violations: [
        `validation refused a generated arm: ${validated.issues.map((i) => `${i.path}: ${i.message}`).join("; ")}`,
      ],
    };
  }
  const { spec, chain } = validated;
  const arm: Arm = { id, file: `${id}.json`, spec, chain, specHash: "fuzz", warnings: [] };
  let analysis: ArmAnalysis;
  try {
    analysis = analyseArm(chain, armFacts(arm), options.analysis);
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    if (message.includes(UNSUPPORTED_MARK))
      return { outcome: "unsupported", violations: [], message, drivenCount: chain.drivenCount };
    return {
      outcome: "threw",
      violations: [`analysis threw: ${e instanceof Error ? (e.stack ?? message) : message}`],
      message,
      drivenCount: chain.drivenCount,
    };
  }
  const violations: string[] = [];
  const fail = (msg: string) => {
    if (violations.length < 20) violations.push(msg);
  };
  for (const p of nonFiniteNumbers(analysis)) fail(`non-finite number at ${p}`);
  checkBudget(analysis, options.analysis, fail);
  checkSpeedMaps(analysis, fail);
  checkPayload(analysis, spec.ratedPayloadKg, fail);
  checkCapability(analysis, fail);
  checkPoses(chain, analysis, options, fail);
  return {
    outcome: "analysed",
    violations,
    analysis,
    drivenCount: chain.drivenCount,
    layout: analysis.envelope.layout,
  };
}

/** Bounded work: the envelope stays within its sample budget and the maps within the grid the reach implies. */
function checkBudget(a: ArmAnalysis, o: AnalysisOptions, fail: (m: string) => void): void {
  const budget = o.envelope?.workBudget ?? 8_000_000;
  for (const e of [a.envelope.wcp, a.envelope.flange]) {
    if (e && e.samples > ENVELOPE_PASSES_PER_POINT * budget)
      fail(
        `envelope ${e.point}: ${e.samples} joint samples, more than ${ENVELOPE_PASSES_PER_POINT} × workBudget ${budget}`,
      );
  }
  const f = a.envelope.flange;
  for (const map of a.speed.maps) {
    const g = map.computedGrid;
    // the map's plane spans the flange reach (both sides of axis 1) and its heights, with a margin of a few cells
    const spanR = 2 * Math.max(Math.abs(f.maxReachMm), 1) + 8 * g.stepMm;
    const spanZ = Math.abs(f.maxHeightMm - f.minHeightMm) + 8 * g.stepMm;
    const bound = (spanR / g.stepMm + 2) * (spanZ / g.stepMm + 2);
    if (g.nx * g.ny > bound)
      fail(
        `map ${map.orientation}: ${g.nx} × ${g.ny} cells, more than the flange envelope implies (${Math.round(bound)})`,
      );
  }
}

/**
 * Per map cell: the guaranteed straight-line speed is at most the maximum tool speed (the constant-orientation
 * velocity set lies inside the orientation-free one, and its inradius is at most the other's largest radius); both
 * are null together; the published maximum is the largest map value. Rounding to whole mm/s is monotone, so the
 * inequality holds on the rounded values as well.
 */
function checkSpeedMaps(a: ArmAnalysis, fail: (m: string) => void): void {
  let largest = 0;
  for (const map of a.speed.maps) {
    map.guaranteedMmPerS.forEach((g, i) => {
      const v = map.maxMmPerS[i] ?? null;
      if ((g === null) !== (v === null)) fail(`map ${map.orientation} cell ${i}: guaranteed ${g} but maximum ${v}`);
      else if (g !== null && v !== null && !(g <= v))
        fail(`map ${map.orientation} cell ${i}: guaranteed ${g} mm/s > maximum tool speed ${v} mm/s`);
      if (g !== null && g < 0) fail(`map ${map.orientation} cell ${i}: negative guaranteed speed ${g}`);
    });
    largest = Math.max(largest, map.maxToolSpeedMmPerS ?? 0);
  }
  if (a.speed.maxToolSpeedMmPerS !== null && Math.abs(a.speed.maxToolSpeedMmPerS - largest) > 1) {
    fail(`speed.maxToolSpeedMmPerS ${a.speed.maxToolSpeedMmPerS} is not the largest map value ${largest}`);
  }
}

/** The capability map: a map or a reason (never both), one share in [0, 1] per node or null, headline in [0, 1]. */
function checkCapability(a: ArmAnalysis, fail: (m: string) => void): void {
  const c = a.capability;
  if ((c === null) === (a.capabilityReason === null))
    fail(`capability ${c ? "map" : "null"} with reason ${a.capabilityReason}`);
  if (!c) return;
  if (c.share.length !== c.rMm.length * c.zMm.length)
    fail(`capability: ${c.share.length} shares for ${c.rMm.length} × ${c.zMm.length} nodes`);
  c.share.forEach((v, i) => {
    if (v !== null && !(v >= 0 && v <= 1)) fail(`capability node ${i}: share ${v} outside [0, 1]`);
  });
  for (const v of [c.areaShareAtLeastHalf, c.meanShare])
    if (v !== null && !(v >= 0 && v <= 1)) fail(`capability headline ${v} outside [0, 1]`);
}

/** Payload at reach and the load diagram never exceed the rated payload, and are never negative. */
function checkPayload(a: ArmAnalysis, ratedKg: number, fail: (m: string) => void): void {
  const cap = ratedKg * (1 + 1e-9);
  for (const row of a.payload.atReach) {
    if (!(row.payloadKg <= cap && row.payloadKg >= 0))
      fail(
        `payload at reach ${row.reachMm} mm (${row.mounting}, offset ${row.offsetMm}): ${row.payloadKg} kg outside [0, rated ${ratedKg}]`,
      );
  }
  for (const v of a.payload.loadDiagram.grid?.allowedKg ?? []) {
    if (!(v <= cap && v >= 0)) fail(`load diagram: ${v} kg outside [0, rated ${ratedKg}]`);
  }
}

/**
 * At poses drawn within the joint limits: the envelope point's distance from axis 1 (or from the base z axis) is at
 * most the computed maximum reach and at least the minimum, its height within the computed heights, and its
 * side-view position inside the side-view polygons, each within the envelope's stated boundary tolerance (+ 0.1 mm
 * of rounding). At the same poses the per-pose speed figures are checked against brute force.
 */
function checkPoses(chain: Chain, a: ArmAnalysis, o: CheckOptions, fail: (m: string) => void): void {
  const env = a.envelope.wcp ?? a.envelope.flange;
  const useWcp = a.envelope.wcp !== null;
  if (chain.wrist && !useWcp) fail("the chain has a wrist centre but the analysis has no wrist-centre envelope");
  const tol = env.toleranceMm + 0.1;
  const maxReach = (useWcp ? a.reach.wcpMaxMm : a.reach.flangeMaxMm)!;
  const minReach = (useWcp ? a.reach.wcpMinMm : a.reach.flangeMinMm)!;
  const s = createScratch(chain),
    m = chain.drivenCount;
  const q = new Float64Array(m),
    p = new Float64Array(3),
    jac = new Float64Array(6 * m),
    sp = createSpeedScratch(m);
  const rnd = mulberry32(o.seed);
  const axis = a.envelope.axis1;
  const k0 = axis ? -chain.couplingOffset[0]! / chain.couplingGain[0]! : 0;
  let reported = 0;
  const once = (msg: string) => {
    if (reported++ < 3) fail(msg);
  };
  for (let n = 0; n < o.poses; n++) {
    randomJoints(chain, rnd, q);
    // --- reach and height, at the pose as drawn
    const t = forwardInto(chain, q, s);
    if (useWcp) wristCentreInto(p, chain, s);
    else p.set([t[3]!, t[7]!, t[11]!]);
    const pMm = [p[0]! * 1000, p[1]! * 1000, p[2]! * 1000];
    let rho: number, h: number;
    if (axis) {
      const d = axis.direction,
        o0 = axis.pointMm;
      const rel = [pMm[0]! - o0[0], pMm[1]! - o0[1], pMm[2]! - o0[2]];
      const along = rel[0]! * d[0] + rel[1]! * d[1] + rel[2]! * d[2];
      rho = Math.hypot(rel[0]! - along * d[0], rel[1]! - along * d[1], rel[2]! - along * d[2]);
      h = pMm[0]! * d[0] + pMm[1]! * d[1] + pMm[2]! * d[2];
    } else {
      rho = Math.hypot(pMm[0]!, pMm[1]!);
      h = pMm[2]!;
    }
    const where = `q = [${Array.from(q, (v) => v.toFixed(4)).join(", ")}]`;
    if (rho > maxReach + tol)
      once(
        `reach ${rho.toFixed(1)} mm at ${where} beyond the computed maximum ${maxReach} mm (tolerance ${tol.toFixed(1)})`,
      );
    if (rho < minReach - tol)
      once(
        `reach ${rho.toFixed(1)} mm at ${where} below the computed minimum ${minReach} mm (tolerance ${tol.toFixed(1)})`,
      );
    if (h > env.maxHeightMm + tol || h < env.minHeightMm - tol)
      once(
        `height ${h.toFixed(1)} mm at ${where} outside [${env.minHeightMm.toFixed(1)}, ${env.maxHeightMm.toFixed(1)}] (tolerance ${tol.toFixed(1)})`,
      );
    // --- per-pose speed figures at the flange (speed.ts), checked by brute force and by construction
    jacobianInto(jac, chain, s, t[3]!, t[7]!, t[11]!);
    const v = maxToolSpeed(jac, m, chain.maxSpeedSi, sp);
    const brute = bruteMaxToolSpeed(jac, m, chain.maxSpeedSi);
    if (!(Math.abs(v - brute) <= 1e-9 * Math.max(1, brute)))
      once(`maxToolSpeed ${v} differs from the brute-force vertex maximum ${brute} at ${where}`);
    const g = guaranteedLineSpeed(jac, m, chain.maxSpeedSi, sp);
    if (!Number.isFinite(g) || g < 0) once(`guaranteedLineSpeed ${g} at ${where}`);
    if (!(g <= v * (1 + 1e-9) + 1e-12))
      once(`guaranteed line speed ${g} m/s > maximum tool speed ${v} m/s at ${where}`);
    if (g > 0) checkLineSpeedReached(chain, jac, sp.b, g, rnd, where, once);
    // --- side view, with joint 1 at kinematic 0 (revolute base) or as drawn (projections on base planes)
    let side: [number, number];
    if (axis) {
      q[0] = k0;
      forwardInto(chain, q, s);
      if (useWcp) wristCentreInto(p, chain, s);
      else p.set([s.flange[3]!, s.flange[7]!, s.flange[11]!]);
      const f = axis.forward,
        d = axis.direction,
        o0 = axis.pointMm;
      const lat = [d[1] * f[2] - d[2] * f[1], d[2] * f[0] - d[0] * f[2], d[0] * f[1] - d[1] * f[0]];
      const rel = [p[0]! * 1000 - o0[0], p[1]! * 1000 - o0[1], p[2]! * 1000 - o0[2]];
      const xf = rel[0]! * f[0] + rel[1]! * f[1] + rel[2]! * f[2];
      const yl = rel[0]! * lat[0]! + rel[1]! * lat[1]! + rel[2]! * lat[2]!;
      const r = Math.hypot(xf, yl);
      side = [xf < 0 ? -r : r, p[0]! * 1000 * d[0] + p[1]! * 1000 * d[1] + p[2]! * 1000 * d[2]];
      // a point right on axis 1 has no sign: either side counts, whichever is nearer the envelope. (Flipping only
      // when the first side is "not inside" was wrong: a point just outside its own side's polygon, well within the
      // tolerance, was flipped onto the far side and reported hundreds of mm away; a WCP held purely lateral to
      // axis 1, x_f = ±1e-13 mm, showed it.)
      if (Math.abs(xf) < tol && !insidePolygons(side[0], side[1], env.side)) {
        const flipped: [number, number] = [-side[0], side[1]];
        if (
          insidePolygons(flipped[0], flipped[1], env.side) ||
          distanceToBoundary(flipped[0], flipped[1], env.side) < distanceToBoundary(side[0], side[1], env.side)
        )
          side = flipped;
      }
    } else {
      side = [pMm[0]!, pMm[2]!];
    }
    if (o.envelopeContainment && !insidePolygons(side[0], side[1], env.side)) {
      const dist = distanceToBoundary(side[0], side[1], env.side);
      if (dist > tol)
        once(
          `side-view point (${side[0].toFixed(1)}, ${side[1].toFixed(1)}) mm at ${where} is outside the envelope by ${dist.toFixed(1)} mm (tolerance ${tol.toFixed(1)})`,
        );
    }
  }
}

/**
 * The guaranteed speed r is reached in every direction: for random unit u, the joint rates q̇ = B·(r·u) stay within
 * the joint speed limits and J·q̇ = (r·u, 0) (a straight line at constant orientation). Checked by multiplying out.
 */
function checkLineSpeedReached(
  chain: Chain,
  jac: Float64Array,
  b: Float64Array,
  r: number,
  rnd: () => number,
  where: string,
  once: (m: string) => void,
): void {
  const m = chain.drivenCount;
  const qd = new Float64Array(m);
  for (let trial = 0; trial < 4; trial++) {
    const u = [rnd() * 2 - 1, rnd() * 2 - 1, rnd() * 2 - 1];
    const nu = Math.hypot(u[0]!, u[1]!, u[2]!) || 1;
    for (let c = 0; c < 3; c++) u[c] = (u[c]! / nu) * r;
    for (let i = 0; i < m; i++) {
      qd[i] = b[i * 3]! * u[0]! + b[i * 3 + 1]! * u[1]! + b[i * 3 + 2]! * u[2]!;
      if (Math.abs(qd[i]!) > chain.maxSpeedSi[i]! * (1 + 1e-7)) {
        once(`guaranteed speed ${r} m/s needs joint ${i} at ${qd[i]} > limit ${chain.maxSpeedSi[i]} at ${where}`);
        return;
      }
    }
    for (let row = 0; row < 6; row++) {
      let v = 0;
      for (let i = 0; i < m; i++) v += jac[row * m + i]! * qd[i]!;
      const want = row < 3 ? u[row]! : 0;
      if (Math.abs(v - want) > 1e-6 * Math.max(1, r)) {
        once(
          `joint rates for the guaranteed speed give ${row < 3 ? "v" : "ω"}[${row % 3}] = ${v}, expected ${want} at ${where}`,
        );
        return;
      }
    }
  }
}

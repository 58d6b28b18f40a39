/**
 * The requirements panel of the side-by-side page: what a cell needs, and pass or fail per arm with the reason in
 * numbers. Pure: arm summaries (src/view/compareData.ts) in, verdicts out; no DOM. The tool point is the flange
 * centre throughout (the analysis computes payload rows, envelopes and speed maps for it; no tool is fitted).
 *
 * The rules, exactly:
 *
 * - **Mounting** passes when the arm file lists the mounting.
 * - **Payload** (needs the payload and the reach band). The rows of the chosen mounting (the arm's first listed
 *   mounting when none is chosen) are read at the CG offset: a tabled offset is used as it stands; between two
 *   tabled offsets the LOWER payload of the two bracketing columns counts (no interpolation, which could promise
 *   more than either row); beyond the largest tabled offset the payload is not decided. Along the reach, the rows
 *   inside the band and the two rows bracketing it (the last row at or below its start, the first at or above its
 *   end) count, and the lowest of them is what the arm holds across the band (at least as low as any linear
 *   interpolation between rows). A band that starts before the first row or ends after the last row, or that meets
 *   a row out of reach, fails. Passes when that lowest payload ≥ the payload with tooling.
 * - **Reach** (needs the reach band and the height band). The band is the rectangle [reach min, reach max] ×
 *   [height min, height max] in the side view (distance from axis 1 against height along axis 1, mm). Passes when
 *   the flange centre's side-view envelope (any orientation) contains the whole closed rectangle: its centre lies
 *   inside (even–odd rule over every ring) and no envelope edge meets the rectangle.
 * - **Speed** (needs the minimum speed and both bands). The speed map of the chosen tool orientation is read on the
 *   map nodes in the band (in a direction where the band is narrower than the node spacing, the nearest node). Every
 *   such node must be reached with that orientation, and the guaranteed straight-line speed is the lowest over the
 *   blocks holding those nodes (block minima: conservative by up to one block). Passes when it ≥ the minimum. Maps
 *   are computed for the arm's first listed mounting: for another mounting the speed is not decided.
 */
import type { PolygonData, PointData } from "../charts/geometry";
import type { CompareArmSummary, ComparePayloadSeries, CompareSpeedMap } from "./compareData";
import { formatNumber, UNIT_SPACE } from "./format";

export type ToolOrientation = "down" | "outward";

export const TOOL_ORIENTATIONS: readonly ToolOrientation[] = ["down", "outward"];

export interface Requirements {
  /** Payload with tooling, kg; null: not asked. */
  readonly payloadKg: number | null;
  /** CG offset of the payload along the tool axis from the flange, mm. */
  readonly cgOffsetMm: number;
  /** [min, max] distance of the flange centre from axis 1, mm; null: not asked. */
  readonly reachMm: readonly [number, number] | null;
  /** [min, max] height along axis 1, mm; null: not asked. */
  readonly heightMm: readonly [number, number] | null;
  /** Minimum guaranteed straight-line speed over the band, m/s; null: not asked. */
  readonly minSpeedMPerS: number | null;
  readonly tool: ToolOrientation;
  /** "floor", "ceiling", "wall" or "angled"; null: not asked. */
  readonly mounting: string | null;
}

export const NO_REQUIREMENTS: Requirements = {
  payloadKg: null,
  cgOffsetMm: 0,
  reachMm: null,
  heightMm: null,
  minSpeedMPerS: null,
  tool: "down",
  mounting: null,
};

export const MOUNTINGS = ["floor", "ceiling", "wall", "angled"] as const;

export type RequirementKey = "mounting" | "payload" | "reach" | "speed";
export type VerdictStatus = "pass" | "fail" | "undecided";

export interface Verdict {
  readonly key: RequirementKey;
  readonly status: VerdictStatus;
  /** The reason in numbers: "holds 7.2 kg at 1,250 mm; needs 8 kg". */
  readonly reason: string;
}

/** What the checks read of an arm (a subset of the compare summary, so tests can state small arms). */
export interface RequirementsArm {
  readonly mountings: readonly string[];
  readonly flange: readonly PolygonData[];
  readonly payload: readonly ComparePayloadSeries[];
  readonly maps: readonly Pick<CompareSpeedMap, "orientation" | "nodes" | "reachedRuns" | "blocks">[];
}

export function requirementsArmOf(s: CompareArmSummary): RequirementsArm {
  return { mountings: s.declared.mountings, flange: s.envelope.flange, payload: s.payload.series, maps: s.speed.maps };
}

// ---------------------------------------------------------------------------------------------------------------
// Words

const n0 = (v: number) => formatNumber(v, 0);
const kg = (v: number) => `${formatNumber(Math.floor(v * 100 + 1e-9) / 100, 2)}${UNIT_SPACE}kg`;
const mmText = (v: number) => `${n0(v)}${UNIT_SPACE}mm`;
const band = (b: readonly [number, number]) => (b[0] === b[1] ? mmText(b[0]) : `${n0(b[0])}–${mmText(b[1])}`);
/** m/s rounded DOWN to the centimetre per second, so a shown figure never exceeds the computed one. */
const mps = (mmPerS: number) => `${formatNumber(Math.floor(mmPerS / 10 + 1e-9) / 100, 2)}${UNIT_SPACE}m/s`;

// ---------------------------------------------------------------------------------------------------------------
// Payload

/** The payload verdict (see the module comment). */
export function checkPayload(arm: RequirementsArm, req: Requirements): Verdict | null {
  if (req.payloadKg === null || req.reachMm === null) return null;
  const key = "payload" as const;
  const mounting = req.mounting ?? arm.mountings[0] ?? "floor";
  const series = arm.payload.filter((s) => s.mounting === mounting).sort((a, b) => a.offsetMm - b.offsetMm);
  const needs = `needs ${kg(req.payloadKg)}`;
  if (series.length === 0)
    return { key, status: "undecided", reason: `no payload rows for ${mounting} mounting; ${needs}` };
  const cg = req.cgOffsetMm;
  const lower = [...series].reverse().find((s) => s.offsetMm <= cg);
  const upper = series.find((s) => s.offsetMm >= cg);
  if (!upper || !lower) {
    const top = series[series.length - 1]!.offsetMm;
    return {
      key,
      status: "undecided",
      reason: `payload rows go up to a CG offset of ${mmText(top)}; asked ${mmText(cg)}; ${needs}`,
    };
  }
  const columns = lower === upper ? [lower] : [lower, upper];
  const [a, b] = req.reachMm;
  let worst: { kg: number; reachMm: number; offsetMm: number; limit: string | null } | null = null;
  for (const col of columns) {
    const reach = col.reachMm;
    const first = reach[0],
      last = reach[reach.length - 1];
    if (first === undefined || last === undefined)
      return { key, status: "undecided", reason: `no payload rows; ${needs}` };
    if (a < first || b > last) {
      return {
        key,
        status: "fail",
        reason: `payload rows cover ${n0(first)}–${mmText(last)} of reach; the band ${band(req.reachMm)} is not covered; ${needs}`,
      };
    }
    let i0 = 0;
    for (let i = 0; i < reach.length; i++) if (reach[i]! <= a) i0 = i;
    let i1 = reach.length - 1;
    for (let i = reach.length - 1; i >= 0; i--) if (reach[i]! >= b) i1 = i;
    for (let i = i0; i <= i1; i++) {
      const r = reach[i]!;
      const p = col.payloadKg[i];
      if (p === null || p === undefined) {
        return {
          key,
          status: "fail",
          reason: `out of reach at ${mmText(r)} with the tool along gravity (${mounting} mounting); ${needs}`,
        };
      }
      if (worst === null || p < worst.kg)
        worst = { kg: p, reachMm: r, offsetMm: col.offsetMm, limit: col.limit[i] ?? null };
    }
  }
  if (worst === null) return { key, status: "undecided", reason: `no payload rows in the band; ${needs}` };
  const offsetWords = cg === worst.offsetMm ? "" : `, read at the ${mmText(worst.offsetMm)} offset row`;
  const limitWords = worst.limit ? `, limited by ${worst.limit}` : "";
  const pass = worst.kg >= req.payloadKg;
  return {
    key,
    status: pass ? "pass" : "fail",
    reason: pass
      ? `holds at least ${kg(worst.kg)} across ${band(req.reachMm)} (lowest at ${mmText(worst.reachMm)}${offsetWords}${limitWords}); ${needs}`
      : `holds ${kg(worst.kg)} at ${mmText(worst.reachMm)}${offsetWords}${limitWords}; ${needs}`,
  };
}

// ---------------------------------------------------------------------------------------------------------------
// Reach

/**
 * Even–odd point in polygons: true when (x, y) lies inside an odd number of rings.
 * @see W. R. Franklin, "PNPOLY — Point Inclusion in Polygon Test" (crossing-number rule)
 */
export function insideEvenOdd(polygons: readonly PolygonData[], x: number, y: number): boolean {
  let inside = false;
  for (const p of polygons) {
    for (const ring of [p.outer, ...p.holes]) {
      for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
        const [xi, yi] = ring[i]!;
        const [xj, yj] = ring[j]!;
        if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
      }
    }
  }
  return inside;
}

/**
 * The part of segment p→q inside the closed box [x0, x1] × [y0, y1] (Liang–Barsky clipping), or null.
 * @see Liang & Barsky, "A new concept and method for line clipping", ACM TOG 3(1), 1984
 */
export function clipSegment(
  p: PointData,
  q: PointData,
  x0: number,
  x1: number,
  y0: number,
  y1: number,
): [PointData, PointData] | null {
  const dx = q[0] - p[0],
    dy = q[1] - p[1];
  let t0 = 0,
    t1 = 1;
  const tests: [number, number][] = [
    [-dx, p[0] - x0],
    [dx, x1 - p[0]],
    [-dy, p[1] - y0],
    [dy, y1 - p[1]],
  ];
  for (const [pp, qq] of tests) {
    if (pp === 0) {
      if (qq < 0) return null;
    } else {
      const t = qq / pp;
      if (pp < 0) {
        if (t > t1) return null;
        if (t > t0) t0 = t;
      } else {
        if (t < t0) return null;
        if (t < t1) t1 = t;
      }
    }
  }
  return [
    [p[0] + t0 * dx, p[1] + t0 * dy],
    [p[0] + t1 * dx, p[1] + t1 * dy],
  ];
}

/**
 * Whether the closed rectangle lies inside the polygons (even–odd), and if not a point of it that does not.
 * @returns null when covered; else a witness point [r, z] in the rectangle outside (or on the edge of) the region
 */
export function uncoveredPoint(
  polygons: readonly PolygonData[],
  r: readonly [number, number],
  z: readonly [number, number],
): PointData | null {
  const [x0, x1] = r,
    [y0, y1] = z;
  // A sampled point outside makes the clearest reason; corners first, then a 21 × 21 lattice.
  const samples: PointData[] = [
    [x0, y0],
    [x1, y0],
    [x0, y1],
    [x1, y1],
  ];
  for (let i = 0; i <= 20; i++)
    for (let j = 0; j <= 20; j++) samples.push([x0 + ((x1 - x0) * i) / 20, y0 + ((y1 - y0) * j) / 20]);
  for (const s of samples) if (!insideEvenOdd(polygons, s[0], s[1])) return s;
  // Exact part: no boundary edge may meet the rectangle.
  for (const p of polygons) {
    for (const ring of [p.outer, ...p.holes]) {
      for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
        const hit = clipSegment(ring[j]!, ring[i]!, x0, x1, y0, y1);
        if (hit) return [(hit[0][0] + hit[1][0]) / 2, (hit[0][1] + hit[1][1]) / 2];
      }
    }
  }
  return null;
}

function extentOf(polygons: readonly PolygonData[]): { r: [number, number]; z: [number, number] } | null {
  let r0 = Infinity,
    r1 = -Infinity,
    z0 = Infinity,
    z1 = -Infinity;
  for (const p of polygons) {
    for (const [x, y] of p.outer) {
      r0 = Math.min(r0, x);
      r1 = Math.max(r1, x);
      z0 = Math.min(z0, y);
      z1 = Math.max(z1, y);
    }
  }
  return r0 <= r1 ? { r: [r0, r1], z: [z0, z1] } : null;
}

/** The reach verdict (see the module comment). */
export function checkReach(arm: RequirementsArm, req: Requirements): Verdict | null {
  if (req.reachMm === null || req.heightMm === null) return null;
  const key = "reach" as const;
  const where = `${band(req.reachMm)} from axis 1 at ${band(req.heightMm)} height`;
  const witness = uncoveredPoint(arm.flange, req.reachMm, req.heightMm);
  if (witness === null) return { key, status: "pass", reason: `the flange centre reaches all of ${where}` };
  const ext = extentOf(arm.flange);
  const extWords = ext
    ? ` (its envelope spans ${band([Math.round(ext.r[0]), Math.round(ext.r[1])])} × ${band([Math.round(ext.z[0]), Math.round(ext.z[1])])} height)`
    : "";
  return {
    key,
    status: "fail",
    reason: `the flange centre does not reach ${mmText(Math.round(witness[0]))} from axis 1 at ${mmText(Math.round(witness[1]))} height${extWords}; needs ${where}`,
  };
}

// ---------------------------------------------------------------------------------------------------------------
// Speed

/** Node indices covering [lo, hi] on a node line v = v0 + i·step (nearest node when the band falls between nodes). */
export function nodeSpan(lo: number, hi: number, v0: number, step: number): [number, number] {
  const eps = 1e-9;
  let i0 = Math.ceil((lo - v0) / step - eps);
  let i1 = Math.floor((hi - v0) / step + eps);
  if (i0 > i1) {
    const mid = Math.round(((lo + hi) / 2 - v0) / step);
    i0 = mid;
    i1 = mid;
  }
  return [i0, i1];
}

/** The speed verdict (see the module comment). */
export function checkSpeed(arm: RequirementsArm, req: Requirements, mapMounting: string): Verdict | null {
  if (req.minSpeedMPerS === null || req.reachMm === null || req.heightMm === null) return null;
  const key = "speed" as const;
  const needs = `needs ${formatNumber(req.minSpeedMPerS, 2)}${UNIT_SPACE}m/s`;
  const toolWords = req.tool === "down" ? "tool pointing down" : "tool pointing outward";
  if (req.mounting !== null && req.mounting !== mapMounting) {
    return { key, status: "undecided", reason: `speed maps are computed for ${mapMounting} mounting only; ${needs}` };
  }
  const map = arm.maps.find((m) => m.orientation === req.tool);
  if (!map)
    return {
      key,
      status: "undecided",
      reason: `no speed map with the ${toolWords} (only ${arm.maps.map((m) => m.orientation).join(", ") || "none"}); ${needs}`,
    };
  const g = map.nodes;
  const [ix0, ix1] = nodeSpan(req.reachMm[0], req.reachMm[1], g.rMinMm, g.stepMm);
  const [iy0, iy1] = nodeSpan(req.heightMm[0], req.heightMm[1], g.zMinMm, g.stepMm);
  for (let iy = iy0; iy <= iy1; iy++) {
    const runs = iy >= 0 && iy < g.ny ? (map.reachedRuns[iy] ?? []) : [];
    for (let ix = ix0; ix <= ix1; ix++) {
      const reached = ix >= 0 && ix < g.nx && runs.some(([a, b]) => ix >= a && ix <= b);
      if (!reached) {
        return {
          key,
          status: "fail",
          reason: `the flange centre cannot reach ${mmText(g.rMinMm + ix * g.stepMm)} from axis 1 at ${mmText(g.zMinMm + iy * g.stepMm)} height with the ${toolWords}; ${needs}`,
        };
      }
    }
  }
  const b = map.blocks;
  const per = Math.round(b.blockMm / g.stepMm);
  let worst: { v: number; bx: number; by: number } | null = null;
  for (let by = Math.floor(iy0 / per); by <= Math.floor(iy1 / per); by++) {
    for (let bx = Math.floor(ix0 / per); bx <= Math.floor(ix1 / per); bx++) {
      const v = b.minMmPerS[bx + by * b.nx];
      if (v === null || v === undefined) continue;
      if (worst === null || v < worst.v) worst = { v, bx, by };
    }
  }
  if (worst === null) return { key, status: "undecided", reason: `no speed figure in the band; ${needs}` };
  const pass = worst.v >= req.minSpeedMPerS * 1000;
  const r0 = b.rMinMm + worst.bx * b.blockMm,
    z0 = b.zMinMm + worst.by * b.blockMm;
  const blockWords = `${n0(r0)}–${mmText(r0 + b.blockMm)} from axis 1, ${n0(z0)}–${mmText(z0 + b.blockMm)} height`;
  return {
    key,
    status: pass ? "pass" : "fail",
    reason: pass
      ? `guaranteed at least ${mps(worst.v)} over the band with the ${toolWords} (lowest near ${blockWords}); ${needs}`
      : `guaranteed speed falls to ${mps(worst.v)} near ${blockWords} with the ${toolWords}; ${needs}`,
  };
}

// ---------------------------------------------------------------------------------------------------------------
// All

export function checkMounting(arm: RequirementsArm, req: Requirements): Verdict | null {
  if (req.mounting === null) return null;
  const ok = arm.mountings.includes(req.mounting);
  return {
    key: "mounting",
    status: ok ? "pass" : "fail",
    reason: ok
      ? `${req.mounting} mounting is listed`
      : `listed mountings: ${arm.mountings.join(", ")}; needs ${req.mounting}`,
  };
}

/** Every asked requirement's verdict, in the panel's order (mounting, payload, reach, speed). */
export function checkRequirements(
  arm: RequirementsArm,
  req: Requirements,
  mapMounting = arm.mountings[0] ?? "floor",
): Verdict[] {
  return [
    checkMounting(arm, req),
    checkPayload(arm, req),
    checkReach(arm, req),
    checkSpeed(arm, req, mapMounting),
  ].filter((v): v is Verdict => v !== null);
}

// ---------------------------------------------------------------------------------------------------------------
// Address

/** Query keys of the requirements (the line check uses from, to, orientation, speed; the page uses arms, offset). */
export const REQUIREMENT_KEYS = {
  payloadKg: "need-kg",
  cgOffsetMm: "need-cg",
  reachMm: "need-reach",
  heightMm: "need-height",
  minSpeedMPerS: "need-speed",
  tool: "need-tool",
  mounting: "need-mounting",
} as const;

export const MAX_REQUIREMENT_MM = 20_000;

export interface ParsedRequirements {
  readonly requirements: Requirements;
  /** One message per field that could not be read (that field is left out). */
  readonly errors: readonly string[];
}

function parseNumber(text: string): number | null {
  if (!/^\s*-?\d+(\.\d+)?\s*$/.test(text)) return null;
  const v = Number(text);
  return Number.isFinite(v) ? v : null;
}

/**
 * Reads requirements from query values; empty or missing keys are "not asked".
 * @example parseRequirements((k) => ({ "need-kg": "8", "need-reach": "300,1250" })[k] ?? null).requirements.payloadKg // 8
 */
export function parseRequirements(get: (key: string) => string | null): ParsedRequirements {
  const errors: string[] = [];
  const value = (k: string) => {
    const v = get(k);
    return v === null || v.trim() === "" ? null : v.trim();
  };
  const num = (k: string, what: string, min: number, max: number, exclusiveMin: boolean): number | null => {
    const text = value(k);
    if (text === null) return null;
    const v = parseNumber(text);
    if (v === null || v < min || v > max || (exclusiveMin && v === min)) {
      errors.push(
        `${what}: expected a number ${exclusiveMin ? "above" : "from"} ${formatNumber(min)} to ${formatNumber(max)}, found "${text}"`,
      );
      return null;
    }
    return v;
  };
  const pair = (k: string, what: string): [number, number] | null => {
    const text = value(k);
    if (text === null) return null;
    const parts = text.split(",").map(parseNumber);
    const [a, b] = parts;
    if (
      parts.length !== 2 ||
      a === null ||
      b === null ||
      a === undefined ||
      b === undefined ||
      Math.abs(a) > MAX_REQUIREMENT_MM ||
      Math.abs(b) > MAX_REQUIREMENT_MM ||
      a > b
    ) {
      errors.push(`${what}: expected "min,max" in mm with min ≤ max, found "${text}"`);
      return null;
    }
    return [a, b];
  };
  const tool = value(REQUIREMENT_KEYS.tool);
  if (tool !== null && !TOOL_ORIENTATIONS.includes(tool as ToolOrientation))
    errors.push(`tool orientation: expected down or outward, found "${tool}"`);
  const mounting = value(REQUIREMENT_KEYS.mounting);
  if (mounting !== null && !(MOUNTINGS as readonly string[]).includes(mounting))
    errors.push(`mounting: expected ${MOUNTINGS.join(", ")}, found "${mounting}"`);
  return {
    requirements: {
      payloadKg: num(REQUIREMENT_KEYS.payloadKg, "payload", 0, 10_000, true),
      cgOffsetMm: num(REQUIREMENT_KEYS.cgOffsetMm, "CG offset", 0, MAX_REQUIREMENT_MM, false) ?? 0,
      reachMm: pair(REQUIREMENT_KEYS.reachMm, "reach band"),
      heightMm: pair(REQUIREMENT_KEYS.heightMm, "height band"),
      minSpeedMPerS: num(REQUIREMENT_KEYS.minSpeedMPerS, "minimum speed", 0, 20, true),
      tool: tool === "outward" ? "outward" : "down",
      mounting: mounting !== null && (MOUNTINGS as readonly string[]).includes(mounting) ? mounting : null,
    },
    errors,
  };
}

/** The query pairs of requirements (not-asked fields and defaults left out); parseRequirements reads them back. */
export function requirementPairs(req: Requirements): [string, string][] {
  const out: [string, string][] = [];
  const num = (v: number) => String(v);
  if (req.payloadKg !== null) out.push([REQUIREMENT_KEYS.payloadKg, num(req.payloadKg)]);
  if (req.cgOffsetMm !== 0) out.push([REQUIREMENT_KEYS.cgOffsetMm, num(req.cgOffsetMm)]);
  if (req.reachMm !== null) out.push([REQUIREMENT_KEYS.reachMm, `${num(req.reachMm[0])},${num(req.reachMm[1])}`]);
  if (req.heightMm !== null) out.push([REQUIREMENT_KEYS.heightMm, `${num(req.heightMm[0])},${num(req.heightMm[1])}`]);
  if (req.minSpeedMPerS !== null) out.push([REQUIREMENT_KEYS.minSpeedMPerS, num(req.minSpeedMPerS)]);
  if (req.tool !== "down") out.push([REQUIREMENT_KEYS.tool, req.tool]);
  if (req.mounting !== null) out.push([REQUIREMENT_KEYS.mounting, req.mounting]);
  return out;
}

/** True when nothing is asked. */
export function isEmptyRequirements(req: Requirements): boolean {
  return requirementPairs({ ...req, tool: "down", cgOffsetMm: 0 }).length === 0;
}

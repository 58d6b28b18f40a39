/**
 * The straight-line check as the site shows it, shared by the build (standard lines) and the browser (the form):
 * the query a user states (mm, deg, mm/s), its text form for the URL, the call into the core's lineCheck set up
 * exactly as `armdex line` sets it up (src/cli/line.ts: gravity of the first mounting, "down"/"outward" taken at
 * the line's start, roll-pitch-yaw as URDF, flange centre as the tool point, 101 samples), and the result turned
 * into display sentences and chart data. Pure: no DOM, no Astro, no I/O.
 */
import type { Chain, LineCheckResult, Mounting } from "../core";
import { checkLineMm, DEFAULT_LINE_CHECK, gravityDirectionInBase } from "../core";
import type { LineRatesChartInput } from "../charts/lineRatesChart";
import { formatNumber, formatQuantity } from "./format";

/** Tool orientation held along the line: a named reference or roll, pitch, yaw (deg, URDF fixed axes). */
export type LineOrientation =
  | { readonly kind: "down" }
  | { readonly kind: "outward" }
  | { readonly kind: "rpy"; readonly rpyDeg: readonly [number, number, number] };

/** One line as a user states it (file units). */
export interface LineQuery {
  readonly fromMm: readonly [number, number, number];
  readonly toMm: readonly [number, number, number];
  readonly orientation: LineOrientation;
  readonly speedMmPerS: number;
}

/** URL query keys of the line state (kept apart from other keys of the page, e.g. `arms` on the comparison page). */
export const LINE_QUERY_KEYS = ["from", "to", "orientation", "speed"] as const;

/** Samples along the line: the CLI's default, so the site and `armdex line` report the same figures. */
export const LINE_SAMPLES = DEFAULT_LINE_CHECK.samples;

/** Largest line length accepted from the form, mm (a typo guard; no arm in the catalog reaches 20 m). */
export const MAX_LINE_COORDINATE_MM = 20_000;

export type ParsedLineQuery =
  { readonly ok: true; readonly query: LineQuery } | { readonly ok: false; readonly errors: readonly string[] };

/** A number as the URL and the form write it: plain ASCII, at most 3 decimals, no exponent. */
function plain(value: number): string {
  const text = String(Math.round(value * 1000) / 1000);
  return text === "-0" ? "0" : text;
}

/** "450,-250,400" → [450, −250, 400]; a message naming the field otherwise. */
export function parseTriple(text: string, field: string): readonly [number, number, number] | string {
  const parts = text.split(",").map((p) => p.trim());
  if (parts.length !== 3 || parts.some((p) => p === ""))
    return `${field}: expected three numbers x, y, z (mm), found "${text}"`;
  const values = parts.map(Number);
  if (!values.every(Number.isFinite)) return `${field}: expected three numbers x, y, z (mm), found "${text}"`;
  if (values.some((v) => Math.abs(v) > MAX_LINE_COORDINATE_MM))
    return `${field}: coordinates above ${formatNumber(MAX_LINE_COORDINATE_MM)} mm are not accepted, found "${text}"`;
  return [values[0]!, values[1]!, values[2]!];
}

/** "down", "outward" or "roll,pitch,yaw" (deg). */
export function parseOrientation(text: string): LineOrientation | string {
  const t = text.trim();
  if (t === "down") return { kind: "down" };
  if (t === "outward") return { kind: "outward" };
  const parts = t.split(",").map((p) => p.trim());
  const values = parts.map(Number);
  if (parts.length !== 3 || parts.some((p) => p === "") || !values.every(Number.isFinite)) {
    return `orientation: expected down, outward or roll,pitch,yaw in degrees, found "${text}"`;
  }
  return { kind: "rpy", rpyDeg: [values[0]!, values[1]!, values[2]!] };
}

/** The orientation as the URL and `armdex line --orientation` write it. */
export function orientationText(o: LineOrientation): string {
  return o.kind === "rpy" ? o.rpyDeg.map(plain).join(",") : o.kind;
}

/** Words for the orientation, as a sentence start: "Tool pointing down …", "Roll 180°, pitch 0°, yaw 90°". */
export function orientationWords(o: LineOrientation): string {
  if (o.kind === "down") return "Tool pointing down (along gravity)";
  if (o.kind === "outward") return "Tool pointing away from axis 1";
  const [r, p, y] = o.rpyDeg;
  return `Roll ${formatQuantity(r, "°", 1)}, pitch ${formatQuantity(p, "°", 1)}, yaw ${formatQuantity(y, "°", 1)}`;
}

/**
 * Reads the line state from a query string lookup (URLSearchParams.get). Returns null when none of the keys is
 * present (nothing to run), the query when all are present and valid, and every problem otherwise.
 * @example parseLineQuery((k) => new URLSearchParams("from=450,-250,400&to=450,250,400&orientation=down&speed=500").get(k))
 *   // { ok: true, query: { fromMm: [450, -250, 400], toMm: [450, 250, 400], orientation: { kind: "down" }, speedMmPerS: 500 } }
 */
export function parseLineQuery(get: (key: string) => string | null): ParsedLineQuery | null {
  const raw = LINE_QUERY_KEYS.map((k) => get(k));
  if (raw.every((v) => v === null)) return null;
  const errors: string[] = [];
  const [fromText = null, toText = null, orientationTextValue = null, speedText = null] = raw;
  const from = fromText === null ? "from: missing (x, y, z in mm)" : parseTriple(fromText, "from");
  const to = toText === null ? "to: missing (x, y, z in mm)" : parseTriple(toText, "to");
  const orientation =
    orientationTextValue === null
      ? "orientation: missing (down, outward or roll,pitch,yaw)"
      : parseOrientation(orientationTextValue);
  if (typeof from === "string") errors.push(from);
  if (typeof to === "string") errors.push(to);
  if (typeof orientation === "string") errors.push(orientation);
  const speed = speedText === null ? NaN : Number(speedText.trim());
  if (speedText === null) errors.push("speed: missing (mm/s)");
  else if (speedText.trim() === "" || !Number.isFinite(speed) || speed <= 0)
    errors.push(`speed: expected a positive number of mm/s, found "${speedText}"`);
  else if (speed > 100_000) errors.push(`speed: above 100,000 mm/s is not accepted, found "${speedText}"`);
  if (typeof from !== "string" && typeof to !== "string" && from.every((v, i) => v === to[i]))
    errors.push("from and to are the same point: the line has no length");
  if (errors.length > 0 || typeof from === "string" || typeof to === "string" || typeof orientation === "string")
    return { ok: false, errors };
  return { ok: true, query: { fromMm: from, toMm: to, orientation, speedMmPerS: speed } };
}

/**
 * The line state as query-string pairs, in a fixed order.
 * @example lineQueryPairs({ fromMm: [450, -250, 400], toMm: [450, 250, 400], orientation: { kind: "down" }, speedMmPerS: 500 })
 *   // [["from", "450,-250,400"], ["to", "450,250,400"], ["orientation", "down"], ["speed", "500"]]
 */
export function lineQueryPairs(q: LineQuery): [string, string][] {
  return [
    ["from", q.fromMm.map(plain).join(",")],
    ["to", q.toMm.map(plain).join(",")],
    ["orientation", orientationText(q.orientation)],
    ["speed", plain(q.speedMmPerS)],
  ];
}

/** "from=450%2C-250%2C400&to=…": the query string of a line (URLSearchParams encoding). */
export function lineQueryString(q: LineQuery): string {
  return new URLSearchParams(lineQueryPairs(q)).toString();
}

/** The `armdex line` command that reproduces a line (for a reader who wants the full JSON). */
export function lineCommandText(armFile: string, q: LineQuery): string {
  const [from, to, orientation, speed] = lineQueryPairs(q).map(([, v]) => v);
  return `npx armdex line ${armFile} --from ${from} --to ${to} --orientation ${orientation} --speed ${speed}`;
}

/** Orientations the form offers for an arm: arms with fewer than six driven joints hold "down" only (their tool
 * turns about one axis), as the speed maps do. */
export function orientationKindsFor(drivenCount: number): readonly LineOrientation["kind"][] {
  return drivenCount >= 6 ? ["down", "outward", "rpy"] : ["down"];
}

/**
 * Runs the core's lineCheck for a query, set up as `armdex line` does (src/cli/line.ts).
 * @param mountings the arm file's mountings; the first decides gravity and so the meaning of "down"
 * @throws RangeError from lineCheck on invalid input (the form validates first)
 */
export function runLineQuery(
  chain: Chain,
  mountings: readonly Mounting[],
  q: LineQuery,
  samples = LINE_SAMPLES,
): LineCheckResult {
  const o = q.orientation;
  return checkLineMm(
    chain,
    gravityDirectionInBase(mountings[0] ?? "floor"),
    q.fromMm,
    q.toMm,
    o.kind === "rpy" ? { rpyDeg: o.rpyDeg } : o.kind,
    q.speedMmPerS,
    { samples },
  );
}

// ---------------------------------------------------------------------------------------------------------------
// Display

/** Decimals shown for a speed: one below 100 mm/s, none above. */
export function speedDecimals(mmPerS: number): number {
  return Math.abs(mmPerS) < 100 ? 1 : 0;
}

/** What the page says about one result. Every string is finished (units, rounding). */
export interface LineFigures {
  /** The largest constant speed, e.g. "412 mm/s", or "0 mm/s"; null-valued when no joint with a limit moves. */
  readonly feasibleText: string;
  /** The raw figure (mm/s) behind feasibleText; null when unbounded. */
  readonly feasibleMmPerS: number | null;
  /** Why the figure is 0 when no start posture follows the line (out of reach, a joint range, a jump, a singular
   * pose); null when the line is followed. */
  readonly feasibleCaveat: string | null;
  /** "within" / "above" the commanded speed, as a sentence. */
  readonly commandedText: string;
  readonly commandedFeasible: boolean;
  /** "J1 at 212 mm from the start (42 % along)". */
  readonly bottleneckText: string;
  /** "wrist kind, closest at 130 mm from the start (…); inverse condition 0.012", or "none close: …". */
  readonly singularityText: string;
  /** "front, elbow up, wrist − (best of 7 starts)". */
  readonly startText: string;
  /** Out of reach, range violations, branch changes, joints without a limit; empty when none. */
  readonly problems: readonly string[];
}

/** Inverse condition below which the page names the kind of the nearest singular pose (above it: "none close"). */
export const NEAR_SINGULAR_LINE_INVERSE_CONDITION = 0.05;

const percent = (fraction: number) => `${formatNumber(fraction * 100, 0)} %`;
const along = (fraction: number, lengthMm: number) =>
  `${formatQuantity(fraction * lengthMm, "mm")} from the start (${percent(fraction)} along)`;

/** True when joint i's rate ratio is the same at every reached sample (a gantry axis on a straight line). */
function constantRatio(r: LineCheckResult, i: number): boolean {
  let lo = Infinity,
    hi = -Infinity;
  for (const s of r.samples) {
    const v = s.rateRatios?.[i];
    if (v === null || v === undefined) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return hi > 0 && hi - lo <= 1e-9 * hi;
}

/** Why the reported start posture does not follow the line, from its reason in the core's result. */
function notFollowedText(r: LineCheckResult): string {
  const b = r.startBranch;
  const where = b && b.atFraction !== null ? ` at ${along(b.atFraction, r.lengthMm)}` : "";
  const reason = b?.reason ?? "out of reach";
  const what =
    reason === "joint limit"
      ? `${b?.joint ?? "a joint"} leaves its range${where}`
      : reason === "jump"
        ? `${b?.joint ?? "the joints"} must jump${where}`
        : reason === "singular"
          ? `${b?.joint ?? "a joint"} would need an unbounded rate${where}`
          : `out of reach${where}`;
  const others = r.startBranches.length > 1 ? `, and every other start posture fails too` : "";
  return `not followed: ${what}${others} (see below)`;
}

/** The result as sentences. */
export function lineFigures(r: LineCheckResult): LineFigures {
  const f = r.feasibleConstantSpeedMmPerS;
  const feasibleText = f === null ? "not limited by any joint speed" : formatQuantity(f, "mm/s", speedDecimals(f));
  const commanded = formatQuantity(r.speedMmPerS, "mm/s", speedDecimals(r.speedMmPerS));
  const commandedText = r.commandedSpeedFeasible
    ? `The commanded ${commanded} is within it.`
    : !r.followed
      ? `The commanded ${commanded} is not feasible: no start posture follows the whole line within reach, within the joint ranges and without a jump.`
      : `The commanded ${commanded} is above it: at least one joint cannot keep up.`;
  const b = r.bottleneck;
  let bottleneckText = "none";
  if (b) {
    const where = along(b.fraction, r.lengthMm);
    if (b.reason === "joint rate") {
      const needing = `needing ${formatNumber(b.rateRatio ?? 0, 2)} × its speed limit at ${commanded}`;
      bottleneckText =
        b.jointIndex !== null && constantRatio(r, b.jointIndex)
          ? `${b.joint ?? "a joint"}, the same all along the line, ${needing}`
          : `${b.joint ?? "a joint"} at ${where}, ${needing}`;
    } else if (b.reason === "out of reach") bottleneckText = `out of reach at ${where}`;
    else if (b.reason === "joint limit")
      bottleneckText = `${b.joint ?? "a joint"} leaves its range at ${where} (no start posture stays within the joint ranges)`;
    else if (b.reason === "jump")
      bottleneckText = `${b.joint ?? "the joints"} must jump at ${where} (no continuous motion: the arm stops and changes posture)`;
    else bottleneckText = `${b.joint ?? "a joint"} would need an unbounded rate at ${where} (singular pose)`;
  }
  const s = r.nearestSingularity;
  const singularityText = !s
    ? "not known (no point of the line was reached)"
    : s.singular
      ? `${s.kind} kind, crossed at ${along(s.fraction, r.lengthMm)} (inverse condition ${formatNumber(s.inverseCondition, 3)})`
      : s.inverseCondition < NEAR_SINGULAR_LINE_INVERSE_CONDITION
        ? `${s.kind} kind, closest at ${along(s.fraction, r.lengthMm)}; inverse condition ${formatNumber(s.inverseCondition, 3)}`
        : `none close: the lowest inverse condition is ${formatNumber(s.inverseCondition, 3)}, at ${along(s.fraction, r.lengthMm)} (0 means singular, 1 best)`;
  const startText = r.startBranch
    ? `${r.startBranch.branch}${r.startBranches.length > 1 ? ` (best of ${r.startBranches.length} start postures)` : ""}`
    : "no posture reaches the start";
  const problems: string[] = [];
  for (const g of r.outOfReach)
    problems.push(
      `Out of reach from ${formatQuantity(g.fromFraction * r.lengthMm, "mm")} to ${formatQuantity(g.toFraction * r.lengthMm, "mm")} along the line.`,
    );
  for (const v of r.jointLimitViolations) {
    problems.push(
      `${v.joint} passes its ${v.bound} limit (${formatQuantity(v.limitValue, v.unit === "deg" ? "°" : "mm", 1)}, reaching ${formatQuantity(v.extremeValue, v.unit === "deg" ? "°" : "mm", 1)}) from ${formatQuantity(v.fromFraction * r.lengthMm, "mm")} to ${formatQuantity(v.toFraction * r.lengthMm, "mm")}.`,
    );
  }
  for (const c of r.branchChanges) {
    problems.push(
      c.passesAxis1
        ? `Passes axis 1 at ${formatQuantity(c.fraction * r.lengthMm, "mm")} (${c.from} → ${c.to}): the arm reaches behind axis 1 continuously, with finite joint rates; not a posture change.`
        : `Posture change (${c.kind}${c.continuous ? ", continuous" : ", a jump"}) at ${formatQuantity(c.fraction * r.lengthMm, "mm")}: ${c.from} → ${c.to}.`,
    );
  }
  if (r.orientationHeld === "tool axis")
    problems.push(
      "Only the tool axis is held: the arm cannot keep the full orientation, so the rotation about the tool axis is left free.",
    );
  if (r.jointsWithoutSpeedLimit.length > 0)
    problems.push(`No speed limit in the file for ${r.jointsWithoutSpeedLimit.join(", ")}: not counted.`);
  const feasibleCaveat = r.followed ? null : notFollowedText(r);
  return {
    feasibleText,
    feasibleMmPerS: f,
    feasibleCaveat,
    commandedText,
    commandedFeasible: r.commandedSpeedFeasible,
    bottleneckText,
    singularityText,
    startText,
    problems,
  };
}

/** Chart data of a result: rate ratios against the distance along the line, one series per driven joint. */
export function lineRatesChartInput(r: LineCheckResult, id: string, title: string): LineRatesChartInput {
  const b = r.bottleneck;
  return {
    id,
    title,
    lengthMm: r.lengthMm,
    speedMmPerS: r.speedMmPerS,
    positionsMm: r.samples.map((s) => s.fraction * r.lengthMm),
    series: r.jointNames.map((joint, i) => ({
      joint,
      values: r.samples.map((s) => (s.rateRatios ? (s.rateRatios[i] ?? null) : null)),
    })),
    bottleneck: b
      ? {
          positionMm: b.fraction * r.lengthMm,
          jointIndex: b.jointIndex,
          rateRatio: b.reason === "joint rate" ? b.rateRatio : null,
          label:
            b.reason === "joint rate"
              ? `bottleneck ${b.joint ?? ""}`.trim()
              : b.reason === "out of reach"
                ? "out of reach"
                : b.reason === "jump"
                  ? `${b.joint ?? "joints"} jump`
                  : b.reason === "joint limit"
                    ? `${b.joint ?? "joint"} out of range`
                    : "singular",
        }
      : null,
    gapsMm: r.outOfReach.map((g) => [g.fromFraction * r.lengthMm, g.toFraction * r.lengthMm] as const),
    feasibleMmPerS: r.feasibleConstantSpeedMmPerS,
  };
}

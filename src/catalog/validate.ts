import type { $ZodIssue } from "zod/v4/core";
import { ArmSpecSchema, type ArmSpec } from "./schema";
import { type ArmIssue, describeValue, toPath } from "./issues";
import { compileChain, type Chain } from "../core";
import { datasheetIssues } from "./datasheetRules";

export type ValidatedArm =
  | { readonly ok: true; readonly spec: ArmSpec; readonly chain: Chain; readonly issues: readonly ArmIssue[] }
  | { readonly ok: false; readonly issues: readonly ArmIssue[] };

type Loose = Record<string, unknown>;
const isObject = (v: unknown): v is Loose => typeof v === "object" && v !== null && !Array.isArray(v);
const isNumber = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

/** One zod issue as "expected …, found …"; `format` names the file format in unknown-field messages. */
export function zodIssueMessage(issue: $ZodIssue, format = "arm"): string {
  const input = (issue as { input?: unknown }).input;
  switch (issue.code) {
    case "invalid_type": {
      // zod reports a non-finite number as received "Infinity" or "NaN" with input null.
      const received = (issue as { received?: unknown }).received;
      if (received === "Infinity" || received === "NaN") {
        return `expected ${issue.expected}, found ${received}${received === "Infinity" ? " (a number too large for a double, such as 1e400, reads as Infinity)" : ""}`;
      }
      return input === undefined
        ? `missing required field: expected ${issue.expected}`
        : `expected ${issue.expected}, found ${describeValue(input)}`;
    }
    case "invalid_format":
      if (issue.format === "date") return `expected a calendar date as YYYY-MM-DD, found ${describeValue(input)}`;
      return `${issue.message}, found ${describeValue(input)}`;
    case "unrecognized_keys":
      return `unknown field${issue.keys.length > 1 ? "s" : ""} ${issue.keys.map((k) => JSON.stringify(k)).join(", ")}: not part of the ${format} format (check spelling and the unit in the name)`;
    case "invalid_value":
      return `expected one of ${issue.values.map((v) => JSON.stringify(v)).join(", ")}, found ${describeValue(input)}`;
    case "too_small":
    case "too_big": {
      const what = issue.origin === "array" ? "items" : issue.origin === "string" ? "characters" : "value";
      const bound = issue.code === "too_small" ? issue.minimum : issue.maximum;
      const op = issue.code === "too_small" ? (issue.inclusive ? ">=" : ">") : issue.inclusive ? "<=" : "<";
      const found = issue.origin === "array" && Array.isArray(input) ? `${input.length} items` : describeValue(input);
      return `expected ${what} ${op} ${String(bound)}, found ${found}`;
    }
    default:
      return `${issue.message.replace(/^Invalid input: /, "")}${input !== undefined ? `, found ${describeValue(input)}` : ""}`;
  }
}

/**
 * zod issues as path and message pairs: a value of the wrong type gets one message (not also its size checks, nor at
 * the root the schema's own when the file is no object: the caller says that); one message per unknown key, at the
 * key's own path. `format` names the file format ("arm", "cell").
 */
export function schemaIssueMessages(issues: readonly $ZodIssue[], data: unknown, format = "arm"): PathMessage[] {
  const out: PathMessage[] = [];
  const wrongType = new Set(issues.filter((i) => i.code === "invalid_type").map((i) => toPath(i.path)));
  for (const issue of issues) {
    const at = toPath(issue.path);
    if (issue.code !== "invalid_type" && wrongType.has(at)) continue;
    if (at === "" && !isObject(data)) continue;
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys)
        out.push({
          path: toPath([...issue.path, key]),
          message: `unknown field: not part of the ${format} format (check the spelling and the unit in the name)`,
        });
    } else {
      out.push({ path: at, message: zodIssueMessage(issue, format) });
    }
  }
  return out;
}

/**
 * Validates one parsed arm file: the schema, then the cross-field rules, then compilation into a chain.
 * Reports every issue found, not only the first. `fileId` is the file name without `.json`.
 */
export function validateArm(data: unknown, file: string, fileId: string): ValidatedArm {
  const issues: ArmIssue[] = [];
  const error = (path: string, message: string) => issues.push({ file, path, message, severity: "error" });
  const parsed = ArmSpecSchema.safeParse(data, { reportInput: true });
  if (!parsed.success) for (const i of schemaIssueMessages(parsed.error.issues, data)) error(i.path, i.message);
  for (const s of semanticIssues(data)) error(s.path, s.message);
  if (isObject(data) && typeof data.id === "string" && data.id !== fileId) {
    error(
      "id",
      `expected the file name "${fileId}", found ${describeValue(data.id)} (the id is the file name and the URL)`,
    );
  }
  if (issues.length > 0 || !parsed.success) return { ok: false, issues: dedupe(issues) };
  let chain: Chain;
  try {
    chain = compileChain(parsed.data);
  } catch (e) {
    error("joints", `the chain cannot be built: ${e instanceof Error ? e.message : String(e)}`);
    return { ok: false, issues };
  }
  return { ok: true, spec: parsed.data, chain, issues };
}

/** Drops repeated (path, message) pairs, keeping the first. */
export function dedupe(issues: ArmIssue[]): ArmIssue[] {
  const seen = new Set<string>();
  return issues.filter((i) => {
    const key = `${i.path}\u0000${i.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

export interface PathMessage {
  readonly path: string;
  readonly message: string;
}

/** Path of a joint's field (or of the joint itself), e.g. `joints[2].axis`. */
type JointPath = (field?: string) => string;

/**
 * Rules a type cannot express, run defensively on the raw file so they are reported together with schema issues:
 * the parameter block matches the convention, fields match the joint kind, driven joints have a range and a speed,
 * passive joints have none, couplings name earlier joints of the same kind, at least one joint is driven,
 * axes are unit vectors, and names used elsewhere exist.
 */
export function semanticIssues(data: unknown): PathMessage[] {
  const out: PathMessage[] = [];
  if (!isObject(data)) {
    out.push({ path: "", message: `expected a JSON object describing one arm, found ${describeValue(data)}` });
    return out;
  }
  const convention = data.convention;
  const joints = Array.isArray(data.joints) ? data.joints : [];
  const names = new Map<string, number>();
  const kinds: (string | undefined)[] = [];
  let driven = 0;
  joints.forEach((j, i) => {
    const at: JointPath = (field?: string) => toPath(field ? ["joints", i, field] : ["joints", i]);
    if (!isObject(j)) return;
    const kind = typeof j.kind === "string" ? j.kind : undefined;
    kinds.push(kind);
    uniqueNameIssues(out, j, i, names, at);
    conventionIssues(out, j, convention, at);
    axisIssues(out, j, at);
    kindFieldIssues(out, j, kind, at);
    if (drivenOrPassiveIssues(out, j, kind, at)) driven++;
    couplingIssues(out, j, i, kind, joints, names, kinds);
  });
  dimensionsIssues(out, data, joints);
  if (joints.length > 0 && driven === 0) {
    out.push({
      path: "joints",
      message:
        "expected at least one driven joint (with a range and a speed): with every joint passive the flange cannot move",
    });
  }
  out.push(...datasheetIssues(data));
  // Without a joints array the names used elsewhere cannot be checked (the joints error says enough).
  if (!Array.isArray(data.joints)) return out;
  jointReferenceIssues(out, data, names);
  return out;
}

/** Joint names are unique; records the first index of each name in `names`. */
function uniqueNameIssues(out: PathMessage[], j: Loose, i: number, names: Map<string, number>, at: JointPath): void {
  if (typeof j.name !== "string") return;
  if (names.has(j.name))
    out.push({
      path: at("name"),
      message: `expected a unique joint name, found ${describeValue(j.name)} again (first at joints[${names.get(j.name)}])`,
    });
  else names.set(j.name, i);
}

/**
 * The arm-level rules of convention "dimensions" (a dimension drawing of an ortho-parallel six-axis arm): the
 * `dimensions` block is there exactly when the convention asks for it; the flange follows from c4, so `flange` is
 * given with every other convention and not with this one; exactly six revolute joints; no declared wrist centre
 * (the drawing puts it where axes 4, 5 and 6 meet).
 */
function dimensionsIssues(out: PathMessage[], data: Loose, joints: unknown[]): void {
  const dims = data.convention === "dimensions";
  const known = data.convention === "dh" || data.convention === "mdh" || data.convention === "frames" || dims;
  if (!known) return;
  if (dims && data.dimensions === undefined)
    out.push({
      path: "dimensions",
      message:
        'missing required field: convention "dimensions" needs "dimensions" { a1Mm, a2Mm, bMm, c1Mm, c2Mm, c3Mm, c4Mm }',
    });
  if (!dims && data.dimensions !== undefined)
    out.push({
      path: "dimensions",
      message: `not used with convention "${String(data.convention)}": expected convention "dimensions"`,
    });
  if (!dims && data.flange === undefined)
    out.push({ path: "flange", message: "missing required field: expected the flange frame { xyzMm, rpyDeg }" });
  if (dims && data.flange !== undefined)
    out.push({
      path: "flange",
      message: 'not used with convention "dimensions": the flange lies c4 beyond the wrist centre along axis 6',
    });
  if (!dims) return;
  if (data.wristCentre !== undefined)
    out.push({
      path: "wristCentre",
      message: 'not used with convention "dimensions": the wrist centre is where axes 4, 5 and 6 meet',
    });
  if (Array.isArray(data.joints) && joints.length !== 6)
    out.push({
      path: "joints",
      message: `convention "dimensions" describes six-axis arms: expected 6 joints (J1 … J6, base to flange), found ${joints.length}`,
    });
  joints.forEach((j, i) => {
    if (isObject(j) && j.kind !== undefined && j.kind !== "revolute")
      out.push({
        path: toPath(["joints", i, "kind"]),
        message: `convention "dimensions" has six revolute joints: expected "revolute", found ${describeValue(j.kind)}`,
      });
  });
}

/**
 * The parameter block matches the convention (dh, mdh, or origin and axis for frames; nothing for dimensions), and
 * no other block is given; sign and zeroOffsetDeg only with dimensions, where couplings are not used.
 */
function conventionIssues(out: PathMessage[], j: Loose, convention: unknown, at: JointPath): void {
  if (convention === "dimensions") {
    for (const other of ["dh", "mdh", "origin", "axis"] as const) {
      if (j[other] !== undefined)
        out.push({
          path: at(other),
          message: `not used with convention "dimensions": the joint axes follow from "dimensions" (give only sign and zeroOffsetDeg)`,
        });
    }
    if (j.coupling !== undefined)
      out.push({
        path: at("coupling"),
        message: `not used with convention "dimensions": expected sign and zeroOffsetDeg (θ = sign·q + zeroOffsetDeg)`,
      });
    return;
  }
  const blocks = { dh: "dh", mdh: "mdh", frames: "origin" } as const;
  if (convention !== "dh" && convention !== "mdh" && convention !== "frames") return;
  for (const f of ["sign", "zeroOffsetDeg"] as const) {
    if (j[f] !== undefined)
      out.push({
        path: at(f),
        message: `not used with convention "${convention}": ${f} belongs to convention "dimensions"${convention === "frames" ? " (turn the axis round or the origin instead)" : " (put a zero offset in thetaDeg and a sign in the row)"}`,
      });
  }
  const want = blocks[convention];
  if (j[want] === undefined)
    out.push({
      path: at(want),
      message: `missing required field: convention "${convention}" needs "${want}" on every joint`,
    });
  if (convention === "frames" && j.axis === undefined)
    out.push({
      path: at("axis"),
      message: `missing required field: convention "frames" needs a unit "axis" on every joint`,
    });
  for (const other of ["dh", "mdh", "origin", "axis"] as const) {
    if (other === want || (convention === "frames" && other === "axis")) continue;
    if (j[other] !== undefined)
      out.push({
        path: at(other),
        message: `not used with convention "${convention}": expected ${convention === "frames" ? "origin and axis" : want}`,
      });
  }
}

/** A given axis of three numbers is a unit vector. */
function axisIssues(out: PathMessage[], j: Loose, at: JointPath): void {
  if (Array.isArray(j.axis) && j.axis.length === 3 && j.axis.every(isNumber)) {
    const len = Math.hypot(j.axis[0] as number, j.axis[1] as number, j.axis[2] as number);
    if (!(Math.abs(len - 1) <= 1e-3))
      out.push({
        path: at("axis"),
        message: `expected a unit vector (length 1 ± 0.001), found length ${len.toPrecision(4)}`,
      });
  }
}

/** Fields match the joint kind: no mm fields on a revolute joint, no degree fields on a prismatic one. */
function kindFieldIssues(out: PathMessage[], j: Loose, kind: string | undefined, at: JointPath): void {
  const degFields = ["rangeDeg", "maxSpeedDegPerS", "maxAccelDegPerS2", "ratedTorqueNm"];
  const mmFields = ["rangeMm", "maxSpeedMmPerS", "maxAccelMmPerS2", "ratedForceN"];
  const wrong = kind === "revolute" ? mmFields : kind === "prismatic" ? degFields : [];
  for (const f of wrong) {
    if (j[f] !== undefined)
      out.push({
        path: at(f),
        message: `not used on a ${kind} joint: expected ${kind === "revolute" ? degFields[mmFields.indexOf(f)] : mmFields[degFields.indexOf(f)]}`,
      });
  }
}

/**
 * A passive joint (a coupling and no range) has no speed, acceleration or rating of its own; a driven one has a
 * range and a speed. Returns whether the joint counts as driven.
 */
function drivenOrPassiveIssues(out: PathMessage[], j: Loose, kind: string | undefined, at: JointPath): boolean {
  const rangeField = kind === "prismatic" ? "rangeMm" : "rangeDeg";
  const speedField = kind === "prismatic" ? "maxSpeedMmPerS" : "maxSpeedDegPerS";
  const passive = j.coupling !== undefined && j[rangeField] === undefined;
  if (passive) {
    for (const f of [
      speedField,
      kind === "prismatic" ? "maxAccelMmPerS2" : "maxAccelDegPerS2",
      kind === "prismatic" ? "ratedForceN" : "ratedTorqueNm",
    ]) {
      if (j[f] !== undefined)
        out.push({ path: at(f), message: `a passive joint (coupling and no ${rangeField}) has no ${f} of its own` });
    }
    return false;
  }
  if (kind !== "revolute" && kind !== "prismatic") return false;
  if (j[rangeField] === undefined)
    out.push({
      path: at(rangeField),
      message: `missing required field: a driven ${kind} joint needs ${rangeField} [min, max]`,
    });
  if (j[speedField] === undefined)
    out.push({
      path: at(speedField),
      message: `missing required field: a driven ${kind} joint needs ${speedField}`,
    });
  return true;
}

/** Coupling terms name an earlier joint of the same kind (not the joint itself); the offset has the joint's unit. */
function couplingIssues(
  out: PathMessage[],
  j: Loose,
  i: number,
  kind: string | undefined,
  joints: unknown[],
  names: Map<string, number>,
  kinds: (string | undefined)[],
): void {
  const coupling = j.coupling;
  if (!isObject(coupling) || !Array.isArray(coupling.terms)) return;
  coupling.terms.forEach((t, k) => {
    if (!isObject(t) || typeof t.joint !== "string") return;
    const p = toPath(["joints", i, "coupling", "terms", k, "joint"]);
    const target = names.get(t.joint);
    if (t.joint === j.name)
      out.push({ path: p, message: `a joint cannot follow itself, found ${describeValue(t.joint)}` });
    else if (target === undefined) {
      const later = joints.findIndex((o, idx) => idx > i && isObject(o) && o.name === t.joint);
      out.push({
        path: p,
        message:
          later >= 0
            ? `expected an earlier joint, found ${describeValue(t.joint)} which comes later (joints[${later}]); couplings follow the chain from base to flange`
            : `expected the name of an earlier joint, found ${describeValue(t.joint)} which is not a joint of this arm`,
      });
    } else if (kinds[target] !== kind) {
      out.push({
        path: p,
        message: `expected a ${kind} joint (gains are unitless), found ${describeValue(t.joint)} which is ${kinds[target]}`,
      });
    }
  });
  if (kind === "revolute" && coupling.offsetMm !== undefined)
    out.push({
      path: toPath(["joints", i, "coupling", "offsetMm"]),
      message: "not used on a revolute joint: expected offsetDeg",
    });
  if (kind === "prismatic" && coupling.offsetDeg !== undefined)
    out.push({
      path: toPath(["joints", i, "coupling", "offsetDeg"]),
      message: "not used on a prismatic joint: expected offsetMm",
    });
}

/** Joint names used outside the joints (wristCentre.joints, wrist moments and inertias, links[].after) exist. */
function jointReferenceIssues(out: PathMessage[], data: Loose, names: Map<string, number>): void {
  const known = (name: unknown) => typeof name === "string" && names.has(name);
  if (isObject(data.wristCentre) && Array.isArray(data.wristCentre.joints)) {
    data.wristCentre.joints.forEach((name, k) => {
      if (!known(name))
        out.push({
          path: toPath(["wristCentre", "joints", k]),
          message: `expected a joint name of this arm, found ${describeValue(name)}`,
        });
    });
  }
  if (isObject(data.wrist)) {
    for (const key of ["momentNm", "inertiaKgM2"] as const) {
      const rec = data.wrist[key];
      if (!isObject(rec)) continue;
      for (const name of Object.keys(rec)) {
        if (!known(name))
          out.push({
            path: toPath(["wrist", key, name]),
            message: `expected a joint name of this arm, found ${describeValue(name)}`,
          });
      }
    }
  }
  if (Array.isArray(data.links)) {
    data.links.forEach((l, k) => {
      if (isObject(l) && l.after !== undefined && !known(l.after))
        out.push({
          path: toPath(["links", k, "after"]),
          message: `expected a joint name of this arm, found ${describeValue(l.after)}`,
        });
    });
  }
}

/**
 * Bounds of the plausibility warnings: common practice, no source. Numbers outside them are legal but usually a
 * typo or a wrong unit, so `armdex check` warns and does not fail.
 */
export const PLAUSIBILITY = {
  /** Pose repeatability RP (ISO 9283) of an industrial arm, mm. */
  repeatabilityMm: [0.005, 2],
  /** Maximum speed of a driven revolute joint, deg/s: below is a crawl (rad/s or rev/s typed?), above a motor speed. */
  revoluteSpeedDegPerS: [10, 1000],
  /** Rated payload per kg of arm mass. Serial arms carry well under their own mass; 3 leaves room for odd classes
   * and still catches a mass typed in tonnes. */
  payloadPerMass: 3,
  /** A stated reach below this is almost surely metres typed into a mm field, mm. */
  minReachMm: 50,
  /** A stated reach above this multiple of the summed link lengths is unreachable in any pose (5 % for rounding). */
  reachOverLinkSum: 1.05,
} as const;

const fmt = (x: number) => String(Number(x.toPrecision(4)));

/**
 * Sum of the lengths of every fixed offset of the chain (DH/MDH rows, joint origins or the drawing's offsets, the
 * flange) plus the largest stroke of each prismatic joint, mm. By the triangle inequality no point of the arm is
 * farther than this from the base origin or from the J1 axis, so it bounds any stated reach. Null when a prismatic
 * joint follows others (its stroke has no simple bound).
 */
export function linkLengthSumMm(spec: ArmSpec): number | null {
  const d = spec.dimensions;
  if (spec.convention === "dimensions" && d)
    return Math.hypot(d.a1Mm, d.c1Mm) + d.c2Mm + Math.hypot(d.c3Mm, d.bMm, d.a2Mm) + d.c4Mm;
  let sum = spec.flange ? Math.hypot(...spec.flange.xyzMm) : 0;
  for (const j of spec.joints) {
    const row = spec.convention === "dh" ? j.dh : spec.convention === "mdh" ? j.mdh : undefined;
    if (row) sum += Math.hypot(row.aMm, row.dMm);
    else if (j.origin) sum += Math.hypot(...j.origin.xyzMm);
    if (j.kind === "prismatic") {
      if (j.coupling || !j.rangeMm) return null;
      sum += Math.max(Math.abs(j.rangeMm[0]), Math.abs(j.rangeMm[1]));
    }
  }
  return sum;
}

/**
 * Implausible but valid data: warnings (severity "warning") that `armdex check` prints without failing, and that the
 * arm page lists. Pure: reads only the validated spec. Thresholds in `PLAUSIBILITY` (common practice, no source).
 */
export function plausibilityWarnings(spec: ArmSpec, file = ""): ArmIssue[] {
  const out: ArmIssue[] = [];
  const warn = (path: string, message: string) => out.push({ file, path, message, severity: "warning" });
  const [repLo, repHi] = PLAUSIBILITY.repeatabilityMm;
  if (spec.repeatabilityMm < repLo || spec.repeatabilityMm > repHi) {
    const r = spec.repeatabilityMm;
    const hint =
      r < repLo
        ? `typed in metres? ${fmt(r)} m = ${fmt(r * 1000)} mm`
        : `typed in µm? ${fmt(r)} µm = ${fmt(r / 1000)} mm`;
    warn("repeatabilityMm", `expected a repeatability between ${repLo} and ${repHi} mm, found ${fmt(r)} (${hint})`);
  }
  const [speedLo, speedHi] = PLAUSIBILITY.revoluteSpeedDegPerS;
  spec.joints.forEach((j, i) => {
    const v = j.maxSpeedDegPerS;
    if (j.kind !== "revolute" || v === undefined) return;
    if (v < speedLo) {
      warn(
        toPath(["joints", i, "maxSpeedDegPerS"]),
        `expected a revolute joint speed between ${speedLo} and ${speedHi} deg/s, found ${fmt(v)} (if it was typed in rad/s it is ${fmt((v * 180) / Math.PI)} deg/s; in rev/s, ${fmt(v * 360)} deg/s)`,
      );
    } else if (v > speedHi) {
      warn(
        toPath(["joints", i, "maxSpeedDegPerS"]),
        `expected a revolute joint speed between ${speedLo} and ${speedHi} deg/s, found ${fmt(v)} (a motor speed before the gearbox, or rpm?)`,
      );
    }
  });
  if (spec.links && spec.links.length > 0) {
    const total = spec.links.reduce((s, l) => s + l.massKg, 0);
    if (total > spec.massKg * (1 + 1e-9)) {
      warn(
        "links",
        `expected the link masses to add up to at most massKg (${fmt(spec.massKg)} kg), found ${fmt(total)} kg`,
      );
    }
  }
  const maxPayload = spec.massKg * PLAUSIBILITY.payloadPerMass;
  if (spec.ratedPayloadKg > maxPayload) {
    warn(
      "ratedPayloadKg",
      `expected at most ${PLAUSIBILITY.payloadPerMass} × massKg (${fmt(maxPayload)} kg), found ${fmt(spec.ratedPayloadKg)} kg (check the units of ratedPayloadKg and massKg)`,
    );
  }
  if (spec.reachMm !== undefined) {
    const bound = linkLengthSumMm(spec);
    if (spec.reachMm < PLAUSIBILITY.minReachMm) {
      warn(
        "reachMm",
        `expected a reach of at least ${PLAUSIBILITY.minReachMm} mm, found ${fmt(spec.reachMm)}: was it typed in metres? (${fmt(spec.reachMm)} m = ${fmt(spec.reachMm * 1000)} mm)`,
      );
    } else if (bound !== null && spec.reachMm > bound * PLAUSIBILITY.reachOverLinkSum) {
      warn(
        "reachMm",
        `expected at most ${fmt(bound)} mm (the sum of the arm's link lengths: no pose reaches farther), found ${fmt(spec.reachMm)} (check the unit, mm, and the link dimensions)`,
      );
    }
  }
  return out;
}

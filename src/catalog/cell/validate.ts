/**
 * Validation of one cell file: the schema (schema.ts), then the rules a type cannot express, all reported at once
 * with the file, the JSON path and what was expected:
 *   - the id is the file name; candidates and `placements` keys are arm ids of the loaded catalog (a placement for an
 *     arm that is no candidate is a warning: it is used when that arm is chosen on the command line);
 *   - names are unique (targets, parts, tool bodies); `to`, `relativeTo` and `grip` name existing entries;
 *     `relativeTo` chains end at an absolute target (no loop);
 *   - the grip walk (core gripWalk): no release with empty hands, no grip while a part is held, the loop wrapping
 *     round (the arm starts at the last step's target carrying what it carries at the end of the loop);
 *   - speedPercent only on joint moves, speedMmPerS only on linear moves (an error, not a warning: a speed field the
 *     move ignores would silently give a figure the author did not ask for);
 *   - an inertia is one a real body can have (principal moments ≥ 0, each at most the sum of the other two);
 *   - a target nothing visits or refers to is a warning.
 */
import type { $ZodIssue } from "zod/v4/core";
import { type CellSpec, gripWalk, symmetricEigenvalues3 } from "../../core";
import { type ArmIssue, describeValue, toPath } from "../issues";
import { type PathMessage, dedupe, schemaIssueMessages } from "../validate";
import { CellSpecSchema } from "./schema";

export type ValidatedCell =
  | { readonly ok: true; readonly spec: CellSpec; readonly issues: readonly ArmIssue[] }
  | { readonly ok: false; readonly issues: readonly ArmIssue[] };

type Loose = Record<string, unknown>;
const isObject = (v: unknown): v is Loose => typeof v === "object" && v !== null && !Array.isArray(v);
const isNumber = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
const SLUG = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;

interface CellMessage extends PathMessage {
  readonly severity: "error" | "warning";
}

/**
 * Validates one parsed cell file against the schema and the cross-checks (module notes). Reports every issue found.
 * @param fileId the file name without `.json`
 * @param armIds ids of the valid arms of the catalog the cell is checked against
 */
export function validateCell(data: unknown, file: string, fileId: string, armIds: Iterable<string>): ValidatedCell {
  const issues: ArmIssue[] = [];
  const push = (m: CellMessage) => issues.push({ file, path: m.path, message: m.message, severity: m.severity });
  const parsed = CellSpecSchema.safeParse(data, { reportInput: true });
  if (!parsed.success) for (const m of cellSchemaMessages(parsed.error.issues, data)) push({ ...m, severity: "error" });
  for (const m of cellSemanticIssues(data, new Set(armIds))) push(m);
  if (isObject(data) && typeof data.id === "string" && data.id !== fileId)
    push({
      path: "id",
      message: `expected the file name "${fileId}", found ${describeValue(data.id)} (the id is the file name and the URL)`,
      severity: "error",
    });
  const all = dedupe(issues);
  if (!parsed.success || all.some((i) => i.severity === "error")) return { ok: false, issues: all };
  // The validated file is a CellSpec (checked by the compiler here); $schema is left out.
  const { $schema: _schema, ...spec } = parsed.data;
  const cell: CellSpec = spec;
  return { ok: true, spec: cell, issues: all };
}

const EMPTY_LIST: Record<string, string> = {
  cycle: "expected at least one step (the cycle is the loop of moves the arm repeats), found an empty list",
  candidates: "expected at least one candidate arm id, found an empty list",
  targets: "expected at least one target, found an empty list",
};

/** zod issues in the arm loader's grammar; a target that fits neither form is told which forms there are. */
function cellSchemaMessages(zodIssues: readonly $ZodIssue[], data: unknown): PathMessage[] {
  const out: PathMessage[] = [];
  const rest: $ZodIssue[] = [];
  // A target with fields of both forms gets one message, not one per field the other form does not know.
  const targets = isObject(data) && Array.isArray(data.targets) ? data.targets : [];
  const mixed = new Set(targets.flatMap((t, i) => (typeof targetForm(t) === "string" && isObject(t) ? [i] : [])));
  for (const i of mixed) out.push({ path: toPath(["targets", i]), message: targetForm(targets[i]) as string });
  for (const issue of zodIssues) {
    const at = toPath(issue.path);
    if (issue.path[0] === "targets" && mixed.has(issue.path[1] as number)) continue;
    if (issue.code === "too_small" && issue.origin === "array" && EMPTY_LIST[at] && issue.minimum === 1) {
      const found = isObject(data) && Array.isArray(data[at]) ? (data[at] as unknown[]).length : -1;
      if (found === 0) {
        out.push({ path: at, message: EMPTY_LIST[at]! });
        continue;
      }
    }
    if (issue.code === "invalid_union" && issue.path.length === 2 && issue.path[0] === "targets") {
      const form = targetForm(targets[issue.path[1] as number]);
      if (typeof form === "string") out.push({ path: at, message: form });
      else for (const sub of issue.errors[form] ?? []) rest.push({ ...sub, path: [...issue.path, ...sub.path] });
      continue;
    }
    rest.push(issue);
  }
  return [...out, ...schemaIssueMessages(rest, data, "cell")];
}

const FORMS =
  "positionMm and rpyDeg (an absolute target) or relativeTo and offsetMm (a point offset from another target)";

/** 0: the absolute form, 1: the relative form (index of the union branch to report), or a message. */
function targetForm(raw: unknown): 0 | 1 | string {
  if (!isObject(raw)) return `expected a target object with a name and ${FORMS}, found ${describeValue(raw)}`;
  const abs = ["positionMm", "rpyDeg"].filter((k) => k in raw);
  const rel = ["relativeTo", "offsetMm"].filter((k) => k in raw);
  if (abs.length && rel.length) return `expected either ${FORMS}, found both ${[...abs, ...rel].join(", ")}`;
  if (abs.length) return 0;
  if (rel.length) return 1;
  return `missing required fields: expected ${FORMS}`;
}

/** "a, b, c" of at most 12 names, for messages. */
function listOf(names: Iterable<string>): string {
  const all = [...names];
  return all.length > 12 ? `${all.slice(0, 12).join(", ")}, … (${all.length} in all)` : all.join(", ");
}

/** Cross-checks on the raw file (defensive: reported together with schema issues). */
export function cellSemanticIssues(data: unknown, armIds: ReadonlySet<string>): CellMessage[] {
  const out: CellMessage[] = [];
  if (!isObject(data)) {
    out.push({
      path: "",
      message: `expected a JSON object describing one cell, found ${describeValue(data)}`,
      severity: "error",
    });
    return out;
  }
  armIssues(out, data, armIds);
  const parts = uniqueNames(out, data.parts, "parts", "part");
  if (isObject(data.tool)) uniqueNames(out, data.tool.bodies, "tool.bodies", "tool body");
  bodyInertiaIssues(out, isObject(data.tool) ? data.tool.bodies : undefined, ["tool", "bodies"]);
  bodyInertiaIssues(out, data.parts, ["parts"]);
  const targets = uniqueNames(out, data.targets, "targets", "target");
  targetReferenceIssues(out, data.targets, targets);
  if (Array.isArray(data.cycle)) cycleIssues(out, data.cycle, targets, parts, data.targets);
  return out;
}

/** Candidates and placement keys are arm ids of the catalog; candidates once each. */
function armIssues(out: CellMessage[], data: Loose, armIds: ReadonlySet<string>): void {
  const known = armIds.size ? `known arms: ${listOf([...armIds].sort())}` : "the catalog has no valid arm";
  const candidates = Array.isArray(data.candidates) ? data.candidates : [];
  const seen = new Map<string, number>();
  candidates.forEach((c, i) => {
    if (typeof c !== "string" || !SLUG.test(c)) return;
    const path = toPath(["candidates", i]);
    if (seen.has(c))
      out.push({
        path,
        message: `expected each candidate once, found ${describeValue(c)} again (first at candidates[${seen.get(c)}])`,
        severity: "error",
      });
    else seen.set(c, i);
    if (!armIds.has(c))
      out.push({
        path,
        message: `expected the id of an arm in the catalog, found ${describeValue(c)}, which no valid arm file has (${known})`,
        severity: "error",
      });
  });
  if (!isObject(data.placements)) return;
  for (const id of Object.keys(data.placements)) {
    const path = toPath(["placements", id]);
    if (!armIds.has(id))
      out.push({
        path,
        message: `expected the id of an arm in the catalog as the key, found ${describeValue(id)}, which no valid arm file has (${known})`,
        severity: "error",
      });
    else if (!seen.has(id))
      out.push({
        path,
        message: `${describeValue(id)} is not a candidate: this placement is used only when the arm is chosen on the command line (--arms)`,
        severity: "warning",
      });
  }
}

/** Names of a list of named entries are unique; returns the names (valid strings) with their first index. */
function uniqueNames(out: CellMessage[], list: unknown, at: string, what: string): Map<string, number> {
  const names = new Map<string, number>();
  if (!Array.isArray(list)) return names;
  list.forEach((e, i) => {
    if (!isObject(e) || typeof e.name !== "string") return;
    if (names.has(e.name))
      out.push({
        path: `${at}[${i}].name`,
        message: `expected a unique ${what} name, found ${describeValue(e.name)} again (first at ${at}[${names.get(e.name)}])`,
        severity: "error",
      });
    else names.set(e.name, i);
  });
  return names;
}

/** Tolerance of the physical-inertia check, relative to the largest principal moment (rounded CAD values). */
const INERTIA_REL_TOL = 1e-3;

/** An inertia of six numbers is one a rigid body can have: principal moments ≥ 0 and a triangle inequality. */
function bodyInertiaIssues(out: CellMessage[], list: unknown, at: (string | number)[]): void {
  if (!Array.isArray(list)) return;
  list.forEach((b, i) => {
    const I = isObject(b) ? b.inertiaKgM2 : undefined;
    if (!isObject(I)) return;
    const v = [I.xx, I.yy, I.zz, I.xy, I.xz, I.yz];
    if (!v.every(isNumber)) return;
    const [l1, l2, l3] = symmetricEigenvalues3(...(v as [number, number, number, number, number, number]));
    const tol = INERTIA_REL_TOL * Math.max(Math.abs(l1), Math.abs(l3));
    if (l1 >= -tol && l1 + l2 >= l3 - tol) return;
    const fmt = (x: number) => String(Number(x.toPrecision(4)));
    out.push({
      path: toPath([...at, i, "inertiaKgM2"]),
      message:
        `expected the inertia of a real body (principal moments ≥ 0, the largest at most the sum of the other two), ` +
        `found principal moments ${fmt(l1)}, ${fmt(l2)}, ${fmt(l3)} kg·m² (xy, xz, yz are tensor entries, −∫xy dm)`,
      severity: "error",
    });
  });
}

/** relativeTo names another, existing target, and chains end at an absolute target (each loop reported once). */
function targetReferenceIssues(out: CellMessage[], list: unknown, names: Map<string, number>): void {
  if (!Array.isArray(list)) return;
  const base = new Map<string, string>();
  list.forEach((t, i) => {
    if (!isObject(t) || typeof t.relativeTo !== "string") return;
    const path = toPath(["targets", i, "relativeTo"]);
    if (t.relativeTo === t.name)
      out.push({
        path,
        message: `expected another target's name, found ${describeValue(t.relativeTo)}, the target itself`,
        severity: "error",
      });
    else if (!names.has(t.relativeTo))
      out.push({
        path,
        message: `expected the name of a target, found ${describeValue(t.relativeTo)} (targets: ${listOf(names.keys())})`,
        severity: "error",
      });
    if (typeof t.name === "string" && names.get(t.name) === i) base.set(t.name, t.relativeTo);
  });
  const reported = new Set<string>();
  for (const start of base.keys()) {
    const chain: string[] = [];
    let at: string | undefined = start;
    while (at !== undefined && !chain.includes(at)) {
      chain.push(at);
      at = base.get(at);
    }
    if (at === undefined) continue;
    const loop = chain.slice(chain.indexOf(at));
    if (loop.length < 2 || loop.some((n) => reported.has(n))) continue;
    loop.forEach((n) => reported.add(n));
    const first = loop.reduce((a, b) => (names.get(a)! <= names.get(b)! ? a : b));
    const from = loop.indexOf(first);
    const ordered = [...loop.slice(from), ...loop.slice(0, from), first];
    out.push({
      path: toPath(["targets", names.get(first)!, "relativeTo"]),
      message: `expected a chain of relativeTo that ends at an absolute target, found a loop: ${ordered.join(" → ")}`,
      severity: "error",
    });
  }
}

/** Steps name targets and parts that exist, speed fields fit the motion, and the grip walk holds. */
function cycleIssues(
  out: CellMessage[],
  cycle: unknown[],
  targets: Map<string, number>,
  parts: Map<string, number>,
  rawTargets: unknown,
): void {
  const visited = new Set<string>();
  cycle.forEach((s, i) => {
    if (!isObject(s)) return;
    const at = (f: string) => toPath(["cycle", i, f]);
    if (typeof s.to === "string") {
      visited.add(s.to);
      if (!targets.has(s.to))
        out.push({
          path: at("to"),
          message: `expected the name of a target, found ${describeValue(s.to)} (targets: ${listOf(targets.keys())})`,
          severity: "error",
        });
    }
    if (typeof s.grip === "string" && !parts.has(s.grip))
      out.push({
        path: at("grip"),
        message: `expected the name of a part, found ${describeValue(s.grip)} (${parts.size ? `parts: ${listOf(parts.keys())}` : "the cell lists no parts"})`,
        severity: "error",
      });
    if (s.motion === "linear" && s.speedPercent !== undefined)
      out.push({
        path: at("speedPercent"),
        message: "not used on a linear move: expected speedMmPerS (a cap on the tool-point speed, mm/s)",
        severity: "error",
      });
    if (s.motion === "joint" && s.speedMmPerS !== undefined)
      out.push({
        path: at("speedMmPerS"),
        message: "not used on a joint move: expected speedPercent (a share of every joint's speed, %)",
        severity: "error",
      });
  });
  gripIssues(out, cycle);
  if (!Array.isArray(rawTargets) || cycle.length === 0) return;
  const bases = new Set(
    rawTargets.flatMap((t) => (isObject(t) && typeof t.relativeTo === "string" ? [t.relativeTo] : [])),
  );
  rawTargets.forEach((t, i) => {
    if (!isObject(t) || typeof t.name !== "string" || targets.get(t.name) !== i) return;
    if (!visited.has(t.name) && !bases.has(t.name))
      out.push({
        path: toPath(["targets", i, "name"]),
        message: `target ${describeValue(t.name)} is not visited by any cycle step and no target is offset from it`,
        severity: "warning",
      });
  });
}

/** The grip walk of the core on the raw steps: every release with empty hands and grip with full hands. */
function gripIssues(out: CellMessage[], cycle: unknown[]): void {
  const steps = cycle.map((s) => ({
    to: "",
    motion: "joint" as const,
    grip: isObject(s) && typeof s.grip === "string" ? s.grip : undefined,
    release: isObject(s) && s.release === true ? true : undefined,
  }));
  for (const p of gripWalk(steps).problems) {
    if (p.kind === "release-empty")
      out.push({
        path: toPath(["cycle", p.step, "release"]),
        message:
          "expected a part to be carried here, found empty hands: no part is gripped before this step (a part is " +
          'carried from its "grip" to the next "release": true; the loop wraps round, so the first steps carry ' +
          "what the last ones leave)",
        severity: "error",
      });
    else
      out.push({
        path: toPath(["cycle", p.step, "grip"]),
        message:
          `expected empty hands to grip ${describeValue(p.part)}, found ${describeValue(p.carried)} still carried ` +
          `(gripped at cycle[${p.grippedAt}]${p.grippedAt !== null && p.grippedAt >= p.step ? ", carried round the loop" : ""}; ` +
          'set it down first with "release": true)',
        severity: "error",
      });
  }
}

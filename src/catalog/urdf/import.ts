/**
 * URDF → arm file (convention "frames"): the chain of joints between two links.
 * - A joint's origin (xyz m, rpy rad about fixed axes, R = Rz(yaw)·Ry(pitch)·Rx(roll)) becomes `origin` in mm and
 *   deg; fixed joints are multiplied into the next movable joint's origin; the fixed joints after the last movable
 *   one give the flange (the tip link's frame). `axis` (default 1 0 0) is normalised.
 * - `limit lower/upper` → rangeDeg / rangeMm, `velocity` → maxSpeedDegPerS / maxSpeedMmPerS. `effort` is a limit a
 *   simulator enforces (often a peak or a placeholder), never a rated torque: it goes into source.notes only.
 * - `mimic` (value = multiplier·master + offset) → a coupling on a joint without a range of its own. Consecutive
 *   mimic joints about one axis at one place (nothing between them) are summed into one joint: this is how
 *   `exportUrdf` writes a coupling with several masters, or a driven joint whose value adds to a coupling.
 * - The merge file (see `UrdfMerge`) supplies what URDF does not carry.
 */
import { fromXyzRpyInto, identity4Into, mul4Into, rpyOfInto } from "../../core";
import type { JointSpec } from "../schema";
import { readUrdf, UrdfError, type UrdfJoint, type UrdfModel } from "./read";

/** Largest origin offset (m) taken as plausible for one joint of an arm; larger means mm written as m. */
export const URDF_MAX_ORIGIN_M = 50;

/** Fields of the arm file a merge file may give at its top level. */
export const MERGE_TOP_FIELDS = [
  "maker",
  "model",
  "class",
  "description",
  "mountings",
  "massKg",
  "ratedPayloadKg",
  "repeatabilityMm",
  "protection",
  "reachMm",
  "wristCentre",
  "wrist",
  "links",
  "source",
  "commercial",
] as const;

/** Per-joint fields a merge file may give (by URDF joint name); `name` renames the joint. */
export const MERGE_JOINT_FIELDS = [
  "name",
  "rangeDeg",
  "rangeMm",
  "maxSpeedDegPerS",
  "maxSpeedMmPerS",
  "maxAccelDegPerS2",
  "maxAccelMmPerS2",
  "ratedTorqueNm",
  "ratedForceN",
  "note",
] as const;

/** What a datasheet adds to a URDF: the arm file's top-level fields and, per URDF joint name, joint fields. */
export type UrdfMerge = Partial<Record<(typeof MERGE_TOP_FIELDS)[number], unknown>> & {
  joints?: Record<string, Partial<Record<(typeof MERGE_JOINT_FIELDS)[number], unknown>>>;
};

export interface UrdfImportOptions {
  readonly root: string;
  readonly tip: string;
  readonly id: string;
  readonly merge?: UrdfMerge | undefined;
  /** Named in source.notes (e.g. the file name). */
  readonly sourceName?: string | undefined;
}

const RAD_TO_DEG = 180 / Math.PI;
/** Rounds away float noise (89.99999999999999 → 90) far below the 1e-12 m the round trip is held to. */
const round = (x: number, digits: number) => Number(x.toFixed(digits)) + 0;

/** The joints from root to tip, in order; errors when the two links are not on one chain. */
export function chainBetween(model: UrdfModel, root: string, tip: string): UrdfJoint[] {
  const links = new Set(model.links);
  for (const [flag, link] of [
    ["--root", root],
    ["--tip", tip],
  ] as const) {
    if (!links.has(link))
      throw new UrdfError(
        `${flag}: no link named "${link}" in the file; its links are ${model.links.map((l) => `"${l}"`).join(", ")}`,
      );
  }
  const parentJoint = new Map(model.joints.map((j) => [j.child, j] as const));
  const path: UrdfJoint[] = [];
  const walked = [tip];
  for (let link = tip; link !== root;) {
    const j = parentJoint.get(link);
    if (!j)
      throw new UrdfError(
        `root "${root}" and tip "${tip}" are not on one chain: going up from "${tip}" passes ${walked.map((l) => `"${l}"`).join(" ← ")} ` +
          `and ends at "${link}" without reaching "${root}"; pick a root link that is an ancestor of the tip`,
      );
    path.push(j);
    link = j.parent;
    walked.push(link);
  }
  return path.reverse();
}

function frameOf(t: Float64Array): { xyzMm: [number, number, number]; rpyDeg: [number, number, number] } {
  const rpy = rpyOfInto([0, 0, 0], t) as number[];
  const mm = (v: number) => round(v * 1000, 10);
  const deg = (v: number) => round(v * RAD_TO_DEG, 12);
  return { xyzMm: [mm(t[3]!), mm(t[7]!), mm(t[11]!)], rpyDeg: [deg(rpy[0]!), deg(rpy[1]!), deg(rpy[2]!)] };
}

function isIdentity(t: Float64Array): boolean {
  const id = identity4Into(new Float64Array(16));
  return t.every((v, i) => Math.abs(v - id[i]!) <= 1e-12);
}

/** Plausibility of one joint's numbers: lengths in m, angles in rad (a link 0.8 km long is mm written as m). */
function plausibility(j: UrdfJoint, errors: string[]): void {
  const far = Math.hypot(...j.xyzM);
  if (far > URDF_MAX_ORIGIN_M)
    errors.push(
      `joint "${j.name}": origin xyz="${j.xyzM.join(" ")}" puts it ${far.toPrecision(4)} m from its parent link, ` +
        `not plausible for an arm: URDF lengths are in metres, so these look like millimetres (divide by 1000)`,
    );
  if (j.rpyRad.some((v) => Math.abs(v) > 2 * Math.PI + 1e-9))
    errors.push(
      `joint "${j.name}": origin rpy="${j.rpyRad.join(" ")}" has an angle beyond 2π: URDF angles are in radians, ` +
        `so these look like degrees (multiply by π/180)`,
    );
  const l = j.limit;
  if (!l) return;
  const bound = j.type === "prismatic" ? URDF_MAX_ORIGIN_M : 4 * Math.PI + 1e-9;
  if ([l.lower, l.upper].some((v) => v !== undefined && Math.abs(v) > bound))
    errors.push(
      j.type === "prismatic"
        ? `joint "${j.name}": limit lower="${l.lower}" upper="${l.upper}" is a stroke over ${URDF_MAX_ORIGIN_M} m: URDF strokes are in metres, so these look like millimetres (divide by 1000)`
        : `joint "${j.name}": limit lower="${l.lower}" upper="${l.upper}" goes beyond two turns: URDF limits are in radians, so these look like degrees (multiply by π/180)`,
    );
}

interface Movable {
  readonly joint: UrdfJoint;
  /** The joint frame in the previous movable joint's link frame (or the root), fixed joints folded in. */
  readonly origin: Float64Array;
}

/** Groups consecutive joints that a coupling export split into pieces (same axis, same place, mimics unreferenced). */
function groupPieces(movables: readonly Movable[], referenced: ReadonlySet<string>): Movable[][] {
  const groups: Movable[][] = [];
  for (const m of movables) {
    const last = groups[groups.length - 1];
    const prev = last?.[last.length - 1];
    const joinable =
      prev !== undefined &&
      isIdentity(m.origin) &&
      (m.joint.type === "prismatic") === (prev.joint.type === "prismatic") &&
      m.joint.axis.every((v, i) => Math.abs(v - prev.joint.axis[i]!) <= 1e-12) &&
      (m.joint.mimic !== undefined || last!.every((p) => p.joint.mimic !== undefined)) &&
      !referenced.has(m.joint.name) &&
      !last!.some((p) => referenced.has(p.joint.name));
    if (joinable) last!.push(m);
    else groups.push([m]);
  }
  return groups;
}

type MergeJoint = NonNullable<UrdfMerge["joints"]>[string] | undefined;

/** One arm joint from a group of URDF joints; pushes errors for what is missing. */
function buildJoint(group: Movable[], extra: MergeJoint, errors: string[], efforts: string[]): JointSpec {
  const own = group.find((g) => g.joint.mimic === undefined)?.joint;
  const head = group[0]!;
  const j = own ?? head.joint;
  const prismatic = j.type === "prismatic";
  const axisLen = Math.hypot(...j.axis);
  if (!(axisLen > 0)) errors.push(`joint "${j.name}": axis xyz="${j.axis.join(" ")}" has length 0: give a direction`);
  const axis = j.axis.map((v) => (axisLen > 0 ? v / axisLen : v)) as [number, number, number];
  const out: Record<string, unknown> = {
    name: j.name,
    kind: prismatic ? "prismatic" : "revolute",
    origin: frameOf(head.origin),
    axis,
  };
  const rangeKey = prismatic ? "rangeMm" : "rangeDeg";
  const speedKey = prismatic ? "maxSpeedMmPerS" : "maxSpeedDegPerS";
  const scale = prismatic ? 1000 : RAD_TO_DEG;
  const unit = prismatic ? "m" : "rad";
  const mergeAt = `the merge file (joints.${JSON.stringify(j.name)}.${rangeKey})`;
  if (own) {
    const l = own.limit;
    if (own.type === "continuous" && extra?.[rangeKey] === undefined)
      errors.push(
        `joint "${own.name}" is continuous (no position limits) but an arm joint needs a range: give ${mergeAt}, ` +
          `e.g. [-360, 360], or make it type="revolute" with <limit lower="…" upper="…"> in rad`,
      );
    else if (own.type !== "continuous" && extra?.[rangeKey] === undefined) {
      if (!l || l.lower === undefined || l.upper === undefined || !(l.lower < l.upper))
        errors.push(
          `joint "${own.name}" has no position limits (<limit lower="…" upper="…"> in ${unit}, lower < upper; ` +
            `found ${l ? `lower="${l.lower ?? ""}" upper="${l.upper ?? ""}"` : "no <limit>"}): add them to the URDF, or give ${mergeAt}`,
        );
      else out[rangeKey] = [round(l.lower * scale, 9), round(l.upper * scale, 9)];
    }
    if (extra?.[speedKey] === undefined) {
      if (!l || l.velocity === undefined || !(l.velocity > 0))
        errors.push(
          `joint "${own.name}" has no velocity limit (<limit velocity="…"> in ${unit}/s): add it to the URDF, or give ` +
            `the merge file's joints.${JSON.stringify(own.name)}.${speedKey}`,
        );
      else out[speedKey] = round(l.velocity * scale, 9);
    }
    if (l?.effort !== undefined && l.effort > 0) efforts.push(`${own.name} ${l.effort} ${prismatic ? "N" : "N·m"}`);
  }
  const mimics = group.filter((g) => g.joint.mimic !== undefined).map((g) => g.joint.mimic!);
  if (mimics.length) {
    const offset = mimics.reduce((s, m) => s + m.offset, 0) * scale;
    out.coupling = {
      terms: mimics.map((m) => ({ joint: m.joint, gain: m.multiplier })),
      ...(offset !== 0 ? { [prismatic ? "offsetMm" : "offsetDeg"]: round(offset, 12) } : {}),
    };
  }
  for (const [k, v] of Object.entries(extra ?? {})) if (v !== undefined) out[k] = v;
  return out as JointSpec;
}

/** Checks the merge file's keys: every top-level and joint field known, every joint on the chain. */
function checkMerge(merge: UrdfMerge, chainNames: readonly string[]): void {
  const unknown = Object.keys(merge).filter(
    (k) => k !== "joints" && !(MERGE_TOP_FIELDS as readonly string[]).includes(k),
  );
  if (unknown.length)
    throw new UrdfError(
      `merge file: unknown field${unknown.length > 1 ? "s" : ""} ${unknown.map((k) => `"${k}"`).join(", ")}; ` +
        `a merge file gives ${MERGE_TOP_FIELDS.join(", ")} and joints (by URDF joint name)`,
    );
  for (const [name, extra] of Object.entries(merge.joints ?? {})) {
    if (!chainNames.includes(name))
      throw new UrdfError(
        `merge file: joints."${name}" is not a movable joint of the chain; its joints are ${chainNames.map((n) => `"${n}"`).join(", ")}`,
      );
    const bad = Object.keys(extra ?? {}).filter((k) => !(MERGE_JOINT_FIELDS as readonly string[]).includes(k));
    if (bad.length)
      throw new UrdfError(
        `merge file: joints."${name}": unknown field${bad.length > 1 ? "s" : ""} ${bad.map((k) => `"${k}"`).join(", ")}; expected ${MERGE_JOINT_FIELDS.join(", ")}`,
      );
  }
}

/** Walks the chain: folds fixed joints, rejects planar and floating ones, returns movables and the flange. */
function walkChain(path: readonly UrdfJoint[], errors: string[]): { movables: Movable[]; flange: Float64Array } {
  let acc = identity4Into(new Float64Array(16));
  const movables: Movable[] = [];
  const t = new Float64Array(16);
  for (const j of path) {
    plausibility(j, errors);
    if (j.type === "planar" || j.type === "floating")
      errors.push(
        `joint "${j.name}" is ${j.type}: it moves in ${j.type === "planar" ? "two translations and a turn" : "six degrees of freedom"}, ` +
          `which no arm joint does; choose --root and --tip so the chain avoids it, or model it as revolute and prismatic joints`,
      );
    fromXyzRpyInto(t, ...j.xyzM, ...j.rpyRad);
    acc = mul4Into(new Float64Array(16), acc, t);
    if (j.type === "fixed" || j.type === "planar" || j.type === "floating") continue;
    movables.push({ joint: j, origin: acc });
    acc = identity4Into(new Float64Array(16));
  }
  return { movables, flange: acc };
}

/**
 * Builds an arm file (frames convention) from a URDF text: the chain from `root` to `tip`, merged with the
 * datasheet fields of `merge`. The result is plain data; run `validateArm` on it for what is still missing.
 * @throws UrdfError listing every problem with the chain (what to add, where)
 */
export function importUrdf(text: string, options: UrdfImportOptions): Record<string, unknown> {
  const model = readUrdf(text);
  const path = chainBetween(model, options.root, options.tip);
  const errors: string[] = [];
  const { movables, flange } = walkChain(path, errors);
  if (movables.length === 0 && errors.length === 0)
    throw new UrdfError(`the chain "${options.root}" → "${options.tip}" has no movable joint (only fixed joints)`);
  const names = movables.map((m) => m.joint.name);
  const merge = options.merge ?? {};
  for (const [k, m] of movables.entries()) {
    const mimic = m.joint.mimic;
    if (!mimic) continue;
    const at = names.indexOf(mimic.joint);
    if (at < 0 || at >= k)
      errors.push(
        `joint "${m.joint.name}" mimics "${mimic.joint}", which is ${at < 0 ? "not a movable joint of the chain" : "a later joint"}: ` +
          `a coupling follows an earlier joint of the chain (choose --root and --tip to include it, or remove the <mimic>)`,
      );
  }
  const referenced = new Set(movables.flatMap((m) => (m.joint.mimic ? [m.joint.mimic.joint] : [])));
  const efforts: string[] = [];
  const groups = groupPieces(movables, referenced);
  const urdfNames = groups.map((g) => (g.find((p) => !p.joint.mimic) ?? g[0]!).joint.name);
  checkMerge(merge, urdfNames);
  const joints = groups.map((g, i) => buildJoint(g, merge.joints?.[urdfNames[i]!], errors, efforts));
  if (errors.length) throw new UrdfError(errors.join("\n"));
  renameJoints(joints, urdfNames);

  const notes = [
    `Kinematics imported from URDF${options.sourceName ? ` ${options.sourceName}` : ""}${model.name ? ` (robot "${model.name}")` : ""}, chain "${options.root}" → "${options.tip}".`,
    efforts.length
      ? `URDF effort limits (${efforts.join(", ")}) are simulator limits, not rated torques: not copied into ratedTorqueNm.`
      : "",
  ].filter(Boolean);
  const source = (merge.source ?? {}) as Record<string, unknown>;
  const mergedNotes = [typeof source.notes === "string" ? source.notes : "", ...notes].filter(Boolean).join(" ");
  const top = Object.fromEntries(MERGE_TOP_FIELDS.filter((k) => merge[k] !== undefined).map((k) => [k, merge[k]]));
  const arm: Record<string, unknown> = {
    $schema: "../public/schema/arm.schema.json",
    id: options.id,
    ...top,
    convention: "frames",
    joints,
    flange: frameOf(flange),
    source: { ...source, notes: mergedNotes },
  };
  // Key order as the demo arms write it.
  const order = ["$schema", "id", "maker", "model", "class", "description", "mountings", "massKg", "ratedPayloadKg"];
  const rest = ["repeatabilityMm", "protection", "reachMm", "convention", "joints", "flange", "wristCentre", "wrist"];
  const keys = [...order, ...rest, "links", "source", "commercial"];
  return Object.fromEntries(keys.filter((k) => arm[k] !== undefined).map((k) => [k, arm[k]]));
}

/** Applies the merge file's `name` renames, in couplings too. */
function renameJoints(joints: JointSpec[], urdfNames: readonly string[]): void {
  const rename = new Map<string, string>();
  joints.forEach((j, i) => {
    if (j.name !== urdfNames[i]) rename.set(urdfNames[i]!, j.name);
  });
  if (rename.size === 0) return;
  for (const j of joints) {
    if (j.coupling)
      (j as { coupling: unknown }).coupling = {
        ...j.coupling,
        terms: j.coupling.terms.map((t) => ({ ...t, joint: rename.get(t.joint) ?? t.joint })),
      };
  }
}

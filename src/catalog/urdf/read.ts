/**
 * Reads a URDF document (the ROS wiki's "urdf/XML" pages: `robot`, `link`, `joint` with `origin`, `axis`, `limit`,
 * `mimic`) into plain data: links and joints, lengths in m, angles in rad. Only what kinematics needs is read;
 * meshes, inertia, transmissions and plugins are skipped. Every problem is a `UrdfError` whose message names the
 * element and says what to change. XML syntax is checked by fast-xml-parser's validator (line and column).
 */
import { XMLParser, XMLValidator } from "fast-xml-parser";

/** A URDF problem the user can fix; the message says where and what to do. */
export class UrdfError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UrdfError";
  }
}

export interface XmlElement {
  readonly name: string;
  readonly attrs: Readonly<Record<string, string>>;
  readonly children: readonly XmlElement[];
}

export type UrdfJointType = "revolute" | "continuous" | "prismatic" | "fixed" | "floating" | "planar";
const JOINT_TYPES: readonly string[] = ["revolute", "continuous", "prismatic", "fixed", "floating", "planar"];

export interface UrdfJoint {
  readonly name: string;
  readonly type: UrdfJointType;
  readonly parent: string;
  readonly child: string;
  /** origin xyz (m) and rpy (rad, R = Rz(yaw)·Ry(pitch)·Rx(roll)); zeros when absent. */
  readonly xyzM: readonly [number, number, number];
  readonly rpyRad: readonly [number, number, number];
  /** axis in the joint frame; (1, 0, 0) when absent. */
  readonly axis: readonly [number, number, number];
  /** `<limit>` attributes as given (rad or m, rad/s or m/s, N·m or N); undefined when absent. */
  readonly limit?: { lower?: number; upper?: number; velocity?: number; effort?: number } | undefined;
  readonly mimic?: { joint: string; multiplier: number; offset: number } | undefined;
}

export interface UrdfModel {
  readonly name: string;
  readonly links: readonly string[];
  readonly joints: readonly UrdfJoint[];
}

type Ordered = Record<string, unknown>;

function toElements(nodes: readonly Ordered[]): XmlElement[] {
  const out: XmlElement[] = [];
  for (const node of nodes) {
    const name = Object.keys(node).find((k) => k !== ":@");
    if (!name || name === "#text" || name.startsWith("?")) continue;
    const attrs = (node[":@"] as Record<string, string> | undefined) ?? {};
    out.push({ name, attrs, children: toElements((node[name] as Ordered[]) ?? []) });
  }
  return out;
}

/** Parses XML text into elements (comments, text and processing instructions dropped). */
export function parseXml(text: string): XmlElement[] {
  const valid = XMLValidator.validate(text);
  if (valid !== true)
    throw new UrdfError(
      `malformed XML at line ${valid.err.line}, column ${valid.err.col}: ${valid.err.msg} (a URDF file must be well-formed XML)`,
    );
  const parser = new XMLParser({
    ignoreAttributes: false,
    attributeNamePrefix: "",
    preserveOrder: true,
    parseAttributeValue: false,
    trimValues: true,
  });
  return toElements(parser.parse(text) as Ordered[]);
}

function anyXacro(e: XmlElement): boolean {
  if (e.name.startsWith("xacro:")) return true;
  if (Object.keys(e.attrs).some((k) => k === "xmlns:xacro")) return true;
  if (Object.values(e.attrs).some((v) => v.includes("${"))) return true;
  return e.children.some(anyXacro);
}

const XACRO_MESSAGE =
  "this is a Xacro file (xacro namespace, xacro: elements or ${…} expressions), and Xacro is not URDF: " +
  "expand its macros into plain URDF first with a Xacro processor, then import the expanded file";

function numbers(text: string | undefined, count: number, where: string, fallback: number[]): number[] {
  if (text === undefined) return fallback;
  const parts = text.trim().split(/\s+/);
  const values = parts.map(Number);
  if (parts.length !== count || values.some((v) => !Number.isFinite(v)))
    throw new UrdfError(`${where}: expected ${count} numbers separated by spaces, found ${JSON.stringify(text)}`);
  return values;
}

function optionalNumber(text: string | undefined, where: string): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text.trim());
  if (text.trim() === "" || !Number.isFinite(v))
    throw new UrdfError(`${where}: expected a number, found ${JSON.stringify(text)}`);
  return v;
}

function child(e: XmlElement, name: string): XmlElement | undefined {
  return e.children.find((c) => c.name === name);
}

function readJoint(e: XmlElement, index: number): UrdfJoint {
  const name = e.attrs.name;
  if (!name) throw new UrdfError(`joint #${index + 1}: missing the name attribute (<joint name="…" type="…">)`);
  const at = `joint "${name}"`;
  const type = e.attrs.type;
  if (!type || !JOINT_TYPES.includes(type))
    throw new UrdfError(
      `${at}: unsupported joint type ${JSON.stringify(type ?? "")}: URDF joints are ${JOINT_TYPES.join(", ")}`,
    );
  const parent = child(e, "parent")?.attrs.link;
  const childLink = child(e, "child")?.attrs.link;
  if (!parent) throw new UrdfError(`${at}: missing <parent link="…"/>`);
  if (!childLink) throw new UrdfError(`${at}: missing <child link="…"/>`);
  const origin = child(e, "origin");
  const xyz = numbers(origin?.attrs.xyz, 3, `${at} origin xyz`, [0, 0, 0]);
  const rpy = numbers(origin?.attrs.rpy, 3, `${at} origin rpy`, [0, 0, 0]);
  const axis = numbers(child(e, "axis")?.attrs.xyz, 3, `${at} axis xyz`, [1, 0, 0]);
  const lim = child(e, "limit");
  const limit = lim
    ? {
        lower: optionalNumber(lim.attrs.lower, `${at} limit lower`),
        upper: optionalNumber(lim.attrs.upper, `${at} limit upper`),
        velocity: optionalNumber(lim.attrs.velocity, `${at} limit velocity`),
        effort: optionalNumber(lim.attrs.effort, `${at} limit effort`),
      }
    : undefined;
  const m = child(e, "mimic");
  if (m && !m.attrs.joint) throw new UrdfError(`${at}: <mimic> needs joint="…" (the joint it follows)`);
  const mimic = m
    ? {
        joint: m.attrs.joint!,
        multiplier: optionalNumber(m.attrs.multiplier, `${at} mimic multiplier`) ?? 1,
        offset: optionalNumber(m.attrs.offset, `${at} mimic offset`) ?? 0,
      }
    : undefined;
  return {
    name,
    type: type as UrdfJointType,
    parent,
    child: childLink,
    xyzM: [xyz[0]!, xyz[1]!, xyz[2]!],
    rpyRad: [rpy[0]!, rpy[1]!, rpy[2]!],
    axis: [axis[0]!, axis[1]!, axis[2]!],
    limit,
    mimic,
  };
}

/**
 * Reads a URDF document. Checks: well-formed XML, not Xacro, a `<robot>` root, named links and joints, every
 * joint's parent and child declared as links, no link the child of two joints, numbers where numbers belong.
 * @throws UrdfError with a message that names the element and what to change
 */
export function readUrdf(text: string): UrdfModel {
  if (text.trim() === "") throw new UrdfError("the file is empty: expected a URDF document (<robot>…</robot>)");
  const roots = parseXml(text.replace(/^\uFEFF/, ""));
  if (roots.some(anyXacro)) throw new UrdfError(XACRO_MESSAGE);
  const robot = roots.find((e) => e.name === "robot");
  if (!robot)
    throw new UrdfError(
      `expected a <robot> root element, found ${roots.length ? `<${roots[0]!.name}>` : "no element"}: this is not a URDF document`,
    );
  const links = robot.children
    .filter((c) => c.name === "link")
    .map((l, i) => {
      if (!l.attrs.name) throw new UrdfError(`link #${i + 1}: missing the name attribute (<link name="…"/>)`);
      return l.attrs.name;
    });
  const linkSet = new Set(links);
  const joints = robot.children.filter((c) => c.name === "joint").map(readJoint);
  const childOf = new Map<string, string>();
  const jointNames = new Set<string>();
  for (const j of joints) {
    if (jointNames.has(j.name)) throw new UrdfError(`joint "${j.name}" is declared twice: joint names must be unique`);
    jointNames.add(j.name);
    for (const [role, link] of [
      ["parent", j.parent],
      ["child", j.child],
    ] as const) {
      if (!linkSet.has(link))
        throw new UrdfError(
          `joint "${j.name}" names ${role} link "${link}", which the file does not declare: add <link name="${link}"/> or fix the name`,
        );
    }
    const other = childOf.get(j.child);
    if (other)
      throw new UrdfError(
        `link "${j.child}" is the child of two joints ("${other}" and "${j.name}"): a URDF is a tree, each link has one parent joint`,
      );
    childOf.set(j.child, j.name);
  }
  return { name: robot.attrs.name ?? "", links, joints };
}

/**
 * Arm → URDF text: the kinematic chain only (links without meshes or inertia), SI units as URDF wants them.
 * - A `frames` arm keeps its own joint frames (origin mm/deg → m/rad, its axis); a `dh`/`mdh` arm writes the
 *   compiled chain's fixed transforms (joint frame i = motion frame i, axis z), so T(q) is the same product.
 * - Limits: lower/upper and velocity of the driven joint (rad, m, rad/s, m/s); effort = rated torque (N·m) or force
 *   (N) where the arm file gives one, else 0; a revolute joint without a range is `continuous`.
 * - Couplings: a joint's value = Σ G·(driven values) + offset (the compiled coupling matrix). A passive joint with one
 *   master is one `mimic` joint; with several masters it is a series of mimic joints about the same axis at the same
 *   place (rotations about one axis add), the first named after the joint; a driven joint whose value adds to a
 *   coupling gets the mimic pieces first and its own joint last. `importUrdf` sums such series back into one joint.
 * - A `flange` link at the flange, on a fixed joint `flange_joint`.
 */
import { fromXyzRpyInto, mul4Into, rotationAxisAngleInto, rpyOfInto, translationInto, type Chain } from "../../core";
import type { ArmSpec } from "../schema";

const DEG = Math.PI / 180;

const esc = (s: string) =>
  s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&apos;");
/** Shortest text that reads back as the same double; float noise below 1e-15 written as 0. */
const fmt = (x: number) => (Math.abs(x) < 1e-15 ? "0" : String(x));
const vec = (v: readonly number[]) => v.map(fmt).join(" ");

interface JointFrame {
  readonly xyzM: number[];
  readonly rpyRad: number[];
  readonly axis: number[];
}

function frameOfMatrix(t: Float64Array): { xyzM: number[]; rpyRad: number[] } {
  return { xyzM: [t[3]!, t[7]!, t[11]!], rpyRad: Array.from(rpyOfInto([0, 0, 0], t)) };
}

/** Each joint's frame in the previous joint's link frame, and the flange's. */
function jointFrames(
  spec: ArmSpec,
  chain: Chain,
): { joints: JointFrame[]; flange: { xyzM: number[]; rpyRad: number[] } } {
  // A frames arm keeps its own joint frames (validation requires its flange); other conventions (dh, mdh,
  // dimensions) are written from the compiled chain.
  if (spec.convention === "frames" && spec.flange) {
    const f = (o: { xyzMm: readonly number[]; rpyDeg: readonly number[] }) => ({
      xyzM: o.xyzMm.map((v) => v / 1000),
      rpyRad: o.rpyDeg.map((v) => v * DEG),
    });
    return {
      joints: spec.joints.map((j) => ({ ...f(j.origin!), axis: [...j.axis!] })),
      flange: f(spec.flange),
    };
  }
  const n = chain.jointCount;
  return {
    joints: Array.from({ length: n }, (_, i) => ({
      ...frameOfMatrix(chain.fixed.subarray(16 * i, 16 * i + 16)),
      axis: Array.from(chain.axisLocal.subarray(3 * i, 3 * i + 3)),
    })),
    flange: frameOfMatrix(chain.fixed.subarray(16 * n, 16 * n + 16)),
  };
}

interface Piece {
  readonly name: string;
  readonly type: "revolute" | "continuous" | "prismatic" | "fixed";
  readonly frame: { xyzM: number[]; rpyRad: number[] };
  readonly axis: number[];
  readonly lower: number;
  readonly upper: number;
  readonly velocity: number;
  readonly effort: number;
  readonly mimic?: { joint: string; multiplier: number; offset: number };
}

const ZERO_FRAME = { xyzM: [0, 0, 0], rpyRad: [0, 0, 0] };

/** The URDF joints of arm joint i: mimic pieces (one per driven master), then its own joint when it is driven. */
function piecesOf(spec: ArmSpec, chain: Chain, i: number, frame: JointFrame): Piece[] {
  const m = chain.drivenCount;
  const j = spec.joints[i]!;
  const prismatic = j.kind === "prismatic";
  const own = Array.from(chain.drivenJoint).indexOf(i);
  const masters: { column: number; gain: number }[] = [];
  for (let c = 0; c < m; c++) {
    const g = chain.couplingGain[i * m + c]!;
    if (c !== own && g !== 0) masters.push({ column: c, gain: g });
  }
  const offset = chain.couplingOffset[i]!;
  const pieces: Piece[] = [];
  const typeOf = (lo: number, hi: number) =>
    prismatic ? "prismatic" : Number.isFinite(lo) && Number.isFinite(hi) ? "revolute" : "continuous";
  masters.forEach(({ column, gain }, k) => {
    const master = chain.jointNames[chain.drivenJoint[column]!]!;
    const add = k === 0 ? offset : 0;
    const a = gain * chain.lowerSi[column]! + add,
      b = gain * chain.upperSi[column]! + add;
    pieces.push({
      name: own < 0 && k === 0 ? j.name : `${j.name}_from_${master}`,
      type: typeOf(a, b),
      frame: ZERO_FRAME,
      axis: frame.axis,
      lower: Math.min(a, b),
      upper: Math.max(a, b),
      velocity: Math.abs(gain) * chain.maxSpeedSi[column]!,
      effort: 0,
      mimic: { joint: master, multiplier: gain, offset: add },
    });
  });
  if (own >= 0) {
    const lo = chain.lowerSi[own]!,
      hi = chain.upperSi[own]!,
      effort = chain.ratedEffortSi[own]!;
    pieces.push({
      name: j.name,
      type: typeOf(lo, hi),
      frame: ZERO_FRAME,
      axis: frame.axis,
      lower: lo,
      upper: hi,
      velocity: chain.maxSpeedSi[own]!,
      effort: Number.isFinite(effort) ? effort : 0,
    });
  } else if (masters.length === 0) {
    // A coupling whose gains cancel: the joint stays at its offset, a fixed joint turned (or moved) by it.
    const n = Math.hypot(frame.axis[0]!, frame.axis[1]!, frame.axis[2]!);
    const [ax, ay, az] = frame.axis.map((v) => v / n) as [number, number, number];
    const motion = prismatic
      ? translationInto(new Float64Array(16), ax * offset, ay * offset, az * offset)
      : rotationAxisAngleInto(new Float64Array(16), ax, ay, az, offset);
    const origin = fromXyzRpyInto(
      new Float64Array(16),
      ...(frame.xyzM as [number, number, number]),
      ...(frame.rpyRad as [number, number, number]),
    );
    const fixed = frameOfMatrix(mul4Into(new Float64Array(16), origin, motion));
    return [
      { name: j.name, type: "fixed", frame: fixed, axis: frame.axis, lower: 0, upper: 0, velocity: 0, effort: 0 },
    ];
  }
  // The joint's origin belongs to its first piece; the others sit at the same place.
  pieces[0] = { ...pieces[0]!, frame };
  return pieces;
}

function jointXml(p: Piece, parent: string, child: string): string {
  const limit =
    p.type === "fixed"
      ? ""
      : p.type === "continuous"
        ? `    <limit velocity="${fmt(Number.isFinite(p.velocity) ? p.velocity : 0)}" effort="${fmt(p.effort)}"/>\n`
        : `    <limit lower="${fmt(p.lower)}" upper="${fmt(p.upper)}" velocity="${fmt(Number.isFinite(p.velocity) ? p.velocity : 0)}" effort="${fmt(p.effort)}"/>\n`;
  return (
    `  <joint name="${esc(p.name)}" type="${p.type}">\n` +
    `    <parent link="${esc(parent)}"/>\n` +
    `    <child link="${esc(child)}"/>\n` +
    `    <origin xyz="${vec(p.frame.xyzM)}" rpy="${vec(p.frame.rpyRad)}"/>\n` +
    (p.type === "fixed" ? "" : `    <axis xyz="${vec(p.axis)}"/>\n`) +
    limit +
    (p.mimic
      ? `    <mimic joint="${esc(p.mimic.joint)}" multiplier="${fmt(p.mimic.multiplier)}" offset="${fmt(p.mimic.offset)}"/>\n`
      : "") +
    `  </joint>\n`
  );
}

/**
 * The URDF of an arm's kinematic chain: links `base`, `<joint>_link` …, `flange`.
 * @example exportUrdf(arm.spec, arm.chain) // '<?xml version="1.0"?>\n<robot name="…">…'
 */
export function exportUrdf(spec: ArmSpec, chain: Chain): string {
  const { joints, flange } = jointFrames(spec, chain);
  let xml =
    `<?xml version="1.0"?>\n` +
    `<!-- Armdex export of arms/${esc(spec.id)}.json: the kinematic chain only (no meshes, no inertia). ` +
    `Lengths in m, angles in rad; effort is the rated torque or force where the arm file gives one, else 0. -->\n` +
    `<robot name="${esc(spec.id)}">\n  <link name="base"/>\n`;
  let parent = "base";
  spec.joints.forEach((_, i) => {
    for (const p of piecesOf(spec, chain, i, joints[i]!)) {
      const child = `${p.name}_link`;
      xml += jointXml(p, parent, child) + `  <link name="${esc(child)}"/>\n`;
      parent = child;
    }
  });
  xml +=
    `  <joint name="flange_joint" type="fixed">\n    <parent link="${esc(parent)}"/>\n    <child link="flange"/>\n` +
    `    <origin xyz="${vec(flange.xyzM)}" rpy="${vec(flange.rpyRad)}"/>\n  </joint>\n  <link name="flange"/>\n</robot>\n`;
  return xml;
}

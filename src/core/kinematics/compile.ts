import type { Chain, WristCentre } from "./chain";
import { fromXyzRpyInto, identity4Into, mul4Into, rotationAxisAngleInto, translationInto } from "../math/mat4";
import { degToRad, mmToM } from "../units";
import { createScratch, forwardInto } from "./forward";
import { DIMENSIONS_JOINT_COUNT, dimensionFrames, type DimensionsInput } from "./dimensions";

/** Denavit–Hartenberg parameters as they appear in an arm file (mm, deg). */
export interface DhParamsInput {
  readonly aMm: number;
  readonly alphaDeg: number;
  readonly dMm: number;
  readonly thetaDeg: number;
}

export interface FrameInput {
  readonly xyzMm: readonly [number, number, number] | readonly number[];
  readonly rpyDeg: readonly [number, number, number] | readonly number[];
}

export interface CouplingInput {
  readonly terms: readonly { readonly joint: string; readonly gain: number }[];
  readonly offsetDeg?: number | undefined;
  readonly offsetMm?: number | undefined;
}

/** One joint as an arm file describes it (file units). The catalog validates; compile trusts its input. */
export interface JointInput {
  readonly name: string;
  readonly kind: "revolute" | "prismatic";
  readonly dh?: DhParamsInput | undefined;
  readonly mdh?: DhParamsInput | undefined;
  readonly origin?: FrameInput | undefined;
  readonly axis?: readonly number[] | undefined;
  readonly rangeDeg?: readonly number[] | undefined;
  readonly rangeMm?: readonly number[] | undefined;
  readonly maxSpeedDegPerS?: number | undefined;
  readonly maxSpeedMmPerS?: number | undefined;
  readonly maxAccelDegPerS2?: number | undefined;
  readonly maxAccelMmPerS2?: number | undefined;
  readonly ratedTorqueNm?: number | undefined;
  readonly ratedForceN?: number | undefined;
  readonly coupling?: CouplingInput | undefined;
  /** Convention "dimensions": θ = sign·q + zeroOffset; sign +1 or −1 (default +1). See dimensionsAsFrames. */
  readonly sign?: number | undefined;
  /** Convention "dimensions": the model angle at the joint reading q = 0, deg (default 0). See dimensionsAsFrames. */
  readonly zeroOffsetDeg?: number | undefined;
}

export interface ArmKinematicsInput {
  readonly convention: "dh" | "mdh" | "frames" | "dimensions";
  /** The seven lengths of the dimension drawing (convention "dimensions" only; see dimensions.ts). */
  readonly dimensions?: DimensionsInput | undefined;
  readonly joints: readonly JointInput[];
  /** Flange frame in the last joint's frame (dh, mdh, frames; a dimensions arm's flange follows from c4). */
  readonly flange?: FrameInput | undefined;
  readonly wristCentre?: { readonly joints: readonly string[] } | undefined;
}

/** A joint is driven when it has its own range; a joint with a coupling and no range is passive. */
export function isDrivenJoint(joint: JointInput): boolean {
  return joint.rangeDeg !== undefined || joint.rangeMm !== undefined || joint.coupling === undefined;
}

function poseFromFrame(out: Float64Array, f: FrameInput): Float64Array {
  return fromXyzRpyInto(
    out,
    mmToM(f.xyzMm[0]!),
    mmToM(f.xyzMm[1]!),
    mmToM(f.xyzMm[2]!),
    degToRad(f.rpyDeg[0]!),
    degToRad(f.rpyDeg[1]!),
    degToRad(f.rpyDeg[2]!),
  );
}

function mulNew(a: Float64Array, b: Float64Array): Float64Array {
  return mul4Into(new Float64Array(16), a, b);
}

function rotX(rad: number): Float64Array {
  return rotationAxisAngleInto(new Float64Array(16), 1, 0, 0, rad);
}
function rotZ(rad: number): Float64Array {
  return rotationAxisAngleInto(new Float64Array(16), 0, 0, 1, rad);
}
function trans(x: number, y: number, z: number): Float64Array {
  return translationInto(new Float64Array(16), x, y, z);
}

/**
 * A rotation (4×4, no translation) taking ẑ to the unit vector (x, y, z): the turn about ẑ × a by the angle between
 * them (Rodrigues), or a half turn about x̂ when a = −ẑ; the identity when a = ẑ.
 */
function rotationTakingZTo(x: number, y: number, z: number): Float64Array {
  const out = identity4Into(new Float64Array(16));
  if (x === 0 && y === 0) {
    if (z < 0) {
      out[5] = -1;
      out[10] = -1;
    }
    return out;
  }
  // k = ẑ × a / |ẑ × a| = (−y, x, 0)/s, s = sin θ = √(x² + y²), c = cos θ = z.
  const s = Math.sqrt(x * x + y * y),
    c = z,
    kx = -y / s,
    ky = x / s,
    v = 1 - c;
  out[0] = c + kx * kx * v;
  out[1] = kx * ky * v;
  out[2] = ky * s;
  out[4] = kx * ky * v;
  out[5] = c + ky * ky * v;
  out[6] = -kx * s;
  out[8] = -ky * s;
  out[9] = kx * s;
  out[10] = c;
  return out;
}

/** Transpose of the rotation block of a 4×4 rotation (no translation). */
function transposeRotation(r: Float64Array): Float64Array {
  const out = identity4Into(new Float64Array(16));
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) out[i * 4 + j] = r[j * 4 + i]!;
  return out;
}

/**
 * A dimensions arm written as an exactly equivalent frames arm (file units): the drawing's joint frames
 * (dimensions.ts) with θ = sign·q + zeroOffset folded in by Rot(a, sign·q + zeroOffset) = Rot(a, zeroOffset)·
 * Rot(sign·a, q): the zero offset turns the joint's origin about its own axis (one rpy component, the axes being
 * x, y or z) and a sign of −1 turns the axis round. The joint variable is then the maker's reading q itself (G stays
 * the identity, as the closed-form inverse asks), and each frame after a joint's motion is the dimensions link
 * frame, so link masses keep their meaning. Ranges, speeds and ratings are kept; other conventions pass through.
 * @example dimensionsAsFrames(arm with J3 sign −1 and J6 zeroOffsetDeg 180)
 *   // J3 axis [0, −1, 0], origin rpy [0, 0, 0]; J6 axis [1, 0, 0], origin rpy [180, 0, 0]; flange Tr(c4)·Ry(90°)
 */
export function dimensionsAsFrames(input: ArmKinematicsInput): ArmKinematicsInput {
  if (input.convention !== "dimensions") return input;
  const d = input.dimensions;
  if (!d) throw new RangeError("invalid chain: convention dimensions without dimensions");
  if (input.joints.length !== DIMENSIONS_JOINT_COUNT || input.joints.some((j) => j.kind !== "revolute"))
    throw new RangeError(`invalid chain: convention dimensions needs ${DIMENSIONS_JOINT_COUNT} revolute joints`);
  const frames = dimensionFrames(d);
  return {
    convention: "frames",
    joints: input.joints.map((j, i) => {
      const f = frames.joints[i]!,
        sign = j.sign ?? 1,
        offsetDeg = j.zeroOffsetDeg ?? 0;
      const { sign: _sign, zeroOffsetDeg: _offset, ...rest } = j;
      return {
        ...rest,
        origin: { xyzMm: f.origin.xyzMm, rpyDeg: f.axis.map((v) => (v === 0 ? 0 : v * offsetDeg)) },
        axis: f.axis.map((v) => (v === 0 ? 0 : sign * v)),
      };
    }),
    flange: frames.flange,
    wristCentre: input.wristCentre,
  };
}

/**
 * Compiles an arm description (standard DH, modified DH, explicit frames or a dimension drawing; file units) into
 * the chain form F₀·M₁·F₁⋯Mₙ·Fₙ in SI, with the coupling matrix and the wrist centre.
 *
 * - Standard DH (Spong et al.): Aᵢ = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ); the joint variable adds to θᵢ or dᵢ.
 * - Modified DH (Craig): Aᵢ = Rx(αᵢ₋₁)·Tx(aᵢ₋₁)·Rz(θᵢ)·Tz(dᵢ); the row of joint i holds aᵢ₋₁ and αᵢ₋₁.
 * - Frames (as URDF): joint origin (xyz, rpy) in the previous joint's frame, then motion about/along `axis`.
 * - Dimensions (ortho-parallel six-axis arms, dimensions.ts): first written as the equivalent frames arm
 *   (dimensionsAsFrames: signs turn axes round, zero offsets turn origins), then compiled as frames.
 * @throws RangeError when the input breaks a rule validation should have caught (programmer error)
 */
export function compileChain(input: ArmKinematicsInput): Chain {
  if (input.convention === "dimensions") return compileChain(dimensionsAsFrames(input));
  const joints = input.joints;
  const n = joints.length;
  if (n === 0) throw new RangeError("invalid chain: no joints");
  const names = joints.map((j) => j.name);
  const indexOf = new Map(names.map((name, i) => [name, i] as const));
  if (indexOf.size !== n) throw new RangeError("invalid chain: duplicate joint names");

  const pre: Float64Array[] = [];
  const post: Float64Array[] = [];
  const axisLocal = new Float64Array(3 * n);
  const isPrismatic = new Uint8Array(n);
  joints.forEach((j, i) => {
    isPrismatic[i] = j.kind === "prismatic" ? 1 : 0;
    if (input.convention === "dh") {
      const p = j.dh;
      if (!p) throw new RangeError(`invalid joint ${j.name}: missing dh`);
      pre.push(identity4Into(new Float64Array(16)));
      axisLocal[3 * i + 2] = 1;
      post.push(
        mulNew(
          mulNew(rotZ(degToRad(p.thetaDeg)), trans(0, 0, mmToM(p.dMm))),
          mulNew(trans(mmToM(p.aMm), 0, 0), rotX(degToRad(p.alphaDeg))),
        ),
      );
    } else if (input.convention === "mdh") {
      const p = j.mdh;
      if (!p) throw new RangeError(`invalid joint ${j.name}: missing mdh`);
      pre.push(mulNew(rotX(degToRad(p.alphaDeg)), trans(mmToM(p.aMm), 0, 0)));
      axisLocal[3 * i + 2] = 1;
      post.push(mulNew(rotZ(degToRad(p.thetaDeg)), trans(0, 0, mmToM(p.dMm))));
    } else {
      const o = j.origin,
        a = j.axis;
      if (!o || !a) throw new RangeError(`invalid joint ${j.name}: missing origin or axis`);
      const len = Math.hypot(a[0]!, a[1]!, a[2]!);
      if (!(len > 0)) throw new RangeError(`invalid joint ${j.name}: zero axis`);
      // The motion frame is turned so the axis is its z: Rot(a, q) = R·Rz(q)·Rᵀ with R·ẑ = a (likewise for a
      // translation), so pre = origin·R, post = Rᵀ and every joint takes forward kinematics' z-axis fast path.
      // The link frame (joint origin frame, in which link masses are given) stays post = Rᵀ after the motion frame.
      const r = rotationTakingZTo(a[0]! / len, a[1]! / len, a[2]! / len);
      pre.push(mulNew(poseFromFrame(new Float64Array(16), o), r));
      axisLocal[3 * i + 2] = 1;
      post.push(transposeRotation(r));
    }
  });

  const flange = input.flange;
  if (!flange) throw new RangeError("invalid chain: missing flange");
  const fixed = new Float64Array(16 * (n + 1));
  const linkFromMotion = new Float64Array(16 * n);
  fixed.set(pre[0]!, 0);
  for (let i = 0; i < n; i++) {
    linkFromMotion.set(post[i]!, 16 * i);
    const next = i + 1 < n ? pre[i + 1]! : poseFromFrame(new Float64Array(16), flange);
    fixed.set(mulNew(post[i]!, next), 16 * (i + 1));
  }

  // Driven joints and the coupling matrix G (n × m) with offsets.
  const drivenList: number[] = [];
  joints.forEach((j, i) => {
    if (isDrivenJoint(j)) drivenList.push(i);
  });
  const m = drivenList.length;
  if (m === 0) throw new RangeError("invalid chain: no driven joint");
  const drivenColumn = new Map(drivenList.map((k, c) => [k, c] as const));
  const g = new Float64Array(n * m);
  const offset = new Float64Array(n);
  joints.forEach((j, i) => {
    const column = drivenColumn.get(i);
    if (column !== undefined) g[i * m + column] = 1;
    const c = j.coupling;
    if (!c) return;
    offset[i] = j.kind === "prismatic" ? mmToM(c.offsetMm ?? 0) : degToRad(c.offsetDeg ?? 0);
    for (const term of c.terms) {
      const k = indexOf.get(term.joint);
      if (k === undefined || k >= i)
        throw new RangeError(`invalid coupling of ${j.name}: ${term.joint} is not an earlier joint`);
      for (let col = 0; col < m; col++) g[i * m + col] = g[i * m + col]! + term.gain * g[k * m + col]!;
      offset[i] = offset[i]! + term.gain * offset[k]!;
    }
  });

  const lowerSi = new Float64Array(m),
    upperSi = new Float64Array(m),
    maxSpeedSi = new Float64Array(m);
  const maxAccelSi = new Float64Array(m),
    ratedEffortSi = new Float64Array(m);
  drivenList.forEach((k, c) => {
    const j = joints[k]!;
    if (j.kind === "prismatic") {
      lowerSi[c] = j.rangeMm ? mmToM(j.rangeMm[0]!) : -Infinity;
      upperSi[c] = j.rangeMm ? mmToM(j.rangeMm[1]!) : Infinity;
      maxSpeedSi[c] = j.maxSpeedMmPerS !== undefined ? mmToM(j.maxSpeedMmPerS) : NaN;
      maxAccelSi[c] = j.maxAccelMmPerS2 !== undefined ? mmToM(j.maxAccelMmPerS2) : NaN;
      ratedEffortSi[c] = j.ratedForceN ?? NaN;
    } else {
      lowerSi[c] = j.rangeDeg ? degToRad(j.rangeDeg[0]!) : -Infinity;
      upperSi[c] = j.rangeDeg ? degToRad(j.rangeDeg[1]!) : Infinity;
      maxSpeedSi[c] = j.maxSpeedDegPerS !== undefined ? degToRad(j.maxSpeedDegPerS) : NaN;
      maxAccelSi[c] = j.maxAccelDegPerS2 !== undefined ? degToRad(j.maxAccelDegPerS2) : NaN;
      ratedEffortSi[c] = j.ratedTorqueNm ?? NaN;
    }
  });

  const partial: Chain = {
    jointCount: n,
    drivenCount: m,
    jointNames: names,
    drivenJoint: Int32Array.from(drivenList),
    isPrismatic,
    axisLocal,
    fixed,
    linkFromMotion,
    couplingGain: g,
    couplingOffset: offset,
    lowerSi,
    upperSi,
    maxSpeedSi,
    maxAccelSi,
    ratedEffortSi,
    wrist: null,
    characteristicLengthM: 0,
  };
  const declared = input.wristCentre?.joints.map((name) => {
    const k = indexOf.get(name);
    if (k === undefined) throw new RangeError(`invalid wristCentre: unknown joint ${name}`);
    return k;
  });
  const wrist = findWristCentre(partial, declared);
  return { ...partial, wrist, characteristicLengthM: characteristicLength(partial) };
}

/** Largest distance from the base origin of any joint-axis origin or the flange at q_driven = 0, m. */
function characteristicLength(chain: Chain): number {
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(chain.drivenCount), s);
  let best = Math.hypot(s.flange[3]!, s.flange[7]!, s.flange[11]!);
  for (let i = 0; i < chain.jointCount; i++) {
    const f = 16 * i;
    best = Math.max(best, Math.hypot(s.motionFrames[f + 3]!, s.motionFrames[f + 7]!, s.motionFrames[f + 11]!));
  }
  return best > 0 ? best : 1;
}

/** Largest distance (m) at which axes still count as meeting in one point. */
export const WRIST_AXES_TOLERANCE_M = 1e-6;

/**
 * The wrist centre point: the point where the last three revolute axes meet (a spherical wrist), or the point
 * nearest to the declared axes. Null when the axes do not meet (offset wrists) and none are declared.
 * Found at the home pose; three revolute axes that meet in one point keep meeting there in every pose.
 */
function findWristCentre(chain: Chain, declared: readonly number[] | undefined): WristCentre | null {
  let axes: number[];
  if (declared) {
    axes = [...declared].sort((a, b) => a - b);
  } else {
    const revolute: number[] = [];
    for (let i = 0; i < chain.jointCount; i++) if (!chain.isPrismatic[i]) revolute.push(i);
    if (revolute.length < 3) return null;
    axes = revolute.slice(-3);
    for (let i = axes[0]!; i < chain.jointCount; i++) if (chain.isPrismatic[i]) return null;
  }
  if (axes.length === 0) return null;
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(chain.drivenCount), s);
  // Least-squares point nearest to the lines (oᵢ, zᵢ): Σ (I − zzᵀ) x = Σ (I − zzᵀ) oᵢ.
  const a = new Float64Array(9),
    b = new Float64Array(3);
  const lines: number[][] = [];
  for (const i of axes) {
    const f = 16 * i,
      fr = s.motionFrames;
    const ax = chain.axisLocal[3 * i]!,
      ay = chain.axisLocal[3 * i + 1]!,
      az = chain.axisLocal[3 * i + 2]!;
    const z = [
      fr[f]! * ax + fr[f + 1]! * ay + fr[f + 2]! * az,
      fr[f + 4]! * ax + fr[f + 5]! * ay + fr[f + 6]! * az,
      fr[f + 8]! * ax + fr[f + 9]! * ay + fr[f + 10]! * az,
    ];
    const o = [fr[f + 3]!, fr[f + 7]!, fr[f + 11]!];
    lines.push([...o, ...z]);
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        const p = (r === c ? 1 : 0) - z[r]! * z[c]!;
        a[r * 3 + c] = a[r * 3 + c]! + p;
        b[r] = b[r]! + p * o[c]!;
      }
    }
  }
  const x = solve3(a, b);
  if (!x) {
    // Parallel axes: no single point. A declared single axis gives its origin.
    if (!declared) return null;
    const l = lines[lines.length - 1]!;
    return toWrist(chain, s, axes, [l[0]!, l[1]!, l[2]!], "declared");
  }
  if (!declared) {
    for (const l of lines) {
      const rx = x[0]! - l[0]!,
        ry = x[1]! - l[1]!,
        rz = x[2]! - l[2]!;
      const along = rx * l[3]! + ry * l[4]! + rz * l[5]!;
      const dist = Math.hypot(rx - along * l[3]!, ry - along * l[4]!, rz - along * l[5]!);
      if (dist > WRIST_AXES_TOLERANCE_M) return null;
    }
  }
  return toWrist(chain, s, axes, [x[0]!, x[1]!, x[2]!], declared ? "declared" : "spherical");
}

function toWrist(
  chain: Chain,
  s: ReturnType<typeof createScratch>,
  axes: number[],
  pointInBase: number[],
  basis: WristCentre["basis"],
): WristCentre {
  // Fix the point in the link frame of the first wrist joint: baseFromLink⁻¹ · p.
  const k = axes[0]!;
  const link = mul4Into(
    new Float64Array(16),
    s.motionFrames.subarray(16 * k, 16 * k + 16),
    chain.linkFromMotion.subarray(16 * k, 16 * k + 16),
  );
  const dx = pointInBase[0]! - link[3]!,
    dy = pointInBase[1]! - link[7]!,
    dz = pointInBase[2]! - link[11]!;
  const p = new Float64Array([
    link[0]! * dx + link[4]! * dy + link[8]! * dz,
    link[1]! * dx + link[5]! * dy + link[9]! * dz,
    link[2]! * dx + link[6]! * dy + link[10]! * dz,
  ]);
  return { joint: k, pointInLinkM: p, axes, basis };
}

function solve3(a: Float64Array, b: Float64Array): Float64Array | null {
  const det =
    a[0]! * (a[4]! * a[8]! - a[5]! * a[7]!) -
    a[1]! * (a[3]! * a[8]! - a[5]! * a[6]!) +
    a[2]! * (a[3]! * a[7]! - a[4]! * a[6]!);
  if (Math.abs(det) < 1e-9) return null;
  const x = new Float64Array(3);
  for (let c = 0; c < 3; c++) {
    const m = Float64Array.from(a);
    for (let r = 0; r < 3; r++) m[r * 3 + c] = b[r]!;
    x[c] =
      (m[0]! * (m[4]! * m[8]! - m[5]! * m[7]!) -
        m[1]! * (m[3]! * m[8]! - m[5]! * m[6]!) +
        m[2]! * (m[3]! * m[7]! - m[4]! * m[6]!)) /
      det;
  }
  return x;
}

/** The joint table (limits and ratings) and the kinematic parameter table of an arm sheet. */
import type { Arm, ArmSpec, JointSpec } from "../catalog";
import { formatNumber, formatOptionalQuantity, formatQuantity, formatRange, formatVector, NOT_STATED } from "./format";
import type { TableCell, TableModel, TableRow } from "./table";

/** Indices (in file order) of the driven joints, from the compiled chain. */
export function drivenJointIndices(arm: Arm): ReadonlySet<number> {
  return new Set(Array.from(arm.chain.drivenJoint));
}

function signedTerm(gain: number, name: string, first: boolean): string {
  const magnitude = Math.abs(gain);
  const body = magnitude === 1 ? name : `${formatNumber(magnitude, 4)}\u00b7${name}`;
  if (first) return gain < 0 ? `\u2212${body}` : body;
  return gain < 0 ? ` \u2212 ${body}` : ` + ${body}`;
}

/**
 * The relation a coupled joint follows, in file units. A passive joint with terms (J2, −1), (J3, −1) gives
 * "angle = −J2 − J3"; a driven J3 with the term (J2, −1) and offsetDeg 90 gives "angle = J3 − J2 + 90°".
 */
export function couplingFormula(joint: JointSpec, driven: boolean): string {
  const c = joint.coupling;
  if (!c) return "";
  const prismatic = joint.kind === "prismatic";
  let text = driven ? joint.name : "";
  for (const t of c.terms) text += signedTerm(t.gain, t.joint, text === "");
  const offset = prismatic ? c.offsetMm : c.offsetDeg;
  if (offset !== undefined && offset !== 0) {
    const o = prismatic ? formatQuantity(Math.abs(offset), "mm", 3) : formatQuantity(Math.abs(offset), "°", 3);
    text += offset < 0 ? ` \u2212 ${o}` : ` + ${o}`;
  }
  return `${prismatic ? "position" : "angle"} = ${text}`;
}

const DASH: TableCell = { text: "\u2014" };

function limitCells(joint: JointSpec): TableCell[] {
  if (joint.kind === "prismatic") {
    const [min, max] = joint.rangeMm ?? [NaN, NaN];
    return [
      joint.rangeMm ? { text: formatRange(min, max, "mm", 1), sortValue: max - min } : { text: NOT_STATED },
      {
        text: formatOptionalQuantity(joint.maxSpeedMmPerS, "mm/s", 1),
        ...(joint.maxSpeedMmPerS !== undefined && { sortValue: joint.maxSpeedMmPerS }),
      },
      {
        text: formatOptionalQuantity(joint.maxAccelMmPerS2, "mm/s\u00b2"),
        ...(joint.maxAccelMmPerS2 !== undefined && { sortValue: joint.maxAccelMmPerS2 }),
      },
      {
        text: formatOptionalQuantity(joint.ratedForceN, "N", 1),
        ...(joint.ratedForceN !== undefined && { sortValue: joint.ratedForceN }),
      },
    ];
  }
  const [min, max] = joint.rangeDeg ?? [NaN, NaN];
  return [
    joint.rangeDeg ? { text: formatRange(min, max, "°", 1), sortValue: max - min } : { text: NOT_STATED },
    {
      text: formatOptionalQuantity(joint.maxSpeedDegPerS, "°/s", 1),
      ...(joint.maxSpeedDegPerS !== undefined && { sortValue: joint.maxSpeedDegPerS }),
    },
    {
      text: formatOptionalQuantity(joint.maxAccelDegPerS2, "°/s\u00b2"),
      ...(joint.maxAccelDegPerS2 !== undefined && { sortValue: joint.maxAccelDegPerS2 }),
    },
    {
      text: formatOptionalQuantity(joint.ratedTorqueNm, "N\u00b7m", 1),
      ...(joint.ratedTorqueNm !== undefined && { sortValue: joint.ratedTorqueNm }),
    },
  ];
}

/** Joint table: range, maximum speed and acceleration, rated torque (or force); passive joints say what they follow. */
export function jointTable(arm: Arm): TableModel {
  const driven = drivenJointIndices(arm);
  const rows: TableRow[] = arm.spec.joints.map((joint, i) => {
    const isDriven = driven.has(i);
    const follows = joint.coupling ? joint.coupling.terms.map((t) => t.joint).join(", ") : "";
    const drive: TableCell = isDriven
      ? joint.coupling
        ? { text: "driven", note: couplingFormula(joint, true) }
        : { text: "driven" }
      : { text: `passive: follows ${follows}`, note: couplingFormula(joint, false) };
    return {
      key: joint.name,
      cells: [
        { text: joint.name, ...(joint.note !== undefined && { note: joint.note }) },
        { text: joint.kind },
        drive,
        ...(isDriven ? limitCells(joint) : [DASH, DASH, DASH, DASH]),
      ],
    };
  });
  return {
    id: "joint-table",
    caption: "Joint limits and ratings, as declared in the arm file",
    rowHeaders: true,
    columns: [
      { key: "joint", label: "Joint", numeric: false },
      { key: "kind", label: "Type", numeric: false },
      { key: "drive", label: "Drive", numeric: false },
      { key: "range", label: "Range", numeric: true },
      { key: "speed", label: "Max speed", numeric: true },
      { key: "accel", label: "Max acceleration", numeric: true },
      { key: "effort", label: "Rated torque or force", numeric: true },
    ],
    rows,
  };
}

function dhCells(p: NonNullable<JointSpec["dh"]>): TableCell[] {
  return [
    { text: formatNumber(p.aMm, 3), sortValue: p.aMm },
    { text: formatNumber(p.alphaDeg, 3), sortValue: p.alphaDeg },
    { text: formatNumber(p.dMm, 3), sortValue: p.dMm },
    { text: formatNumber(p.thetaDeg, 3), sortValue: p.thetaDeg },
  ];
}

/** Axis of each joint of a dimensions arm at θ = 0 (src/core/kinematics/dimensions.ts), in words. */
function dimensionAxes(d: NonNullable<ArmSpec["dimensions"]>): string[] {
  const f = (x: number) => formatNumber(x, 3);
  const wrist = `(${f(d.a1Mm + d.c3Mm)}, ${f(d.bMm)}, ${f(d.c1Mm + d.c2Mm + d.a2Mm)}) mm`;
  return [
    "+z through (0, 0, 0) mm",
    `+y through (${f(d.a1Mm)}, 0, ${f(d.c1Mm)}) mm`,
    `+y through (${f(d.a1Mm)}, 0, ${f(d.c1Mm + d.c2Mm)}) mm`,
    `+x through the wrist centre ${wrist}`,
    `+y through the wrist centre`,
    `+x through the wrist centre`,
  ];
}

/** The dimension drawing: the seven lengths in the caption's footnote, per joint its axis at θ = 0, sign and offset. */
function dimensionsTable(spec: ArmSpec, d: NonNullable<ArmSpec["dimensions"]>): TableModel {
  const f = (x: number) => formatNumber(x, 3);
  const axes = dimensionAxes(d);
  return {
    id: "parameter-table",
    caption:
      "Dimension drawing (ortho-parallel arm, spherical wrist): each joint\u2019s axis at \u03b8 = 0 in the base frame; " +
      "the model angle is \u03b8 = sign\u00b7q + zero offset",
    footnote:
      `a1 ${f(d.a1Mm)}, a2 ${f(d.a2Mm)}, b ${f(d.bMm)}, c1 ${f(d.c1Mm)}, c2 ${f(d.c2Mm)}, c3 ${f(d.c3Mm)}, ` +
      `c4 ${f(d.c4Mm)} mm. Flange centre at \u03b8 = 0: (${f(d.a1Mm + d.c3Mm + d.c4Mm)}, ${f(d.bMm)}, ` +
      `${f(d.c1Mm + d.c2Mm + d.a2Mm)}) mm, flange z along +x, flange x along \u2212z.`,
    rowHeaders: true,
    columns: [
      { key: "joint", label: "Joint", numeric: false },
      { key: "axis", label: "Axis at \u03b8 = 0", numeric: false },
      { key: "sign", label: "Sign", numeric: true },
      { key: "zero", label: "Zero offset", unit: "\u00b0", numeric: true },
    ],
    rows: spec.joints.map((j, i) => ({
      key: j.name,
      cells: [
        { text: j.name },
        { text: axes[i] ?? NOT_STATED },
        { text: (j.sign ?? 1) < 0 ? "\u22121" : "+1", sortValue: j.sign ?? 1 },
        { text: formatNumber(j.zeroOffsetDeg ?? 0, 3), sortValue: j.zeroOffsetDeg ?? 0 },
      ],
    })),
  };
}

/** The kinematic parameters exactly as the file gives them (the input of every computed figure). */
export function parameterTable(spec: ArmSpec): TableModel {
  if (spec.convention === "dimensions" && spec.dimensions) return dimensionsTable(spec, spec.dimensions);
  const flange = spec.flange ?? { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] };
  const footnote =
    `Flange frame after the last joint: xyz ${formatVector(flange.xyzMm, 3)} mm, ` +
    `rpy ${formatVector(flange.rpyDeg, 3)}\u00b0 (roll, pitch, yaw as URDF: R = Rz(yaw)\u00b7Ry(pitch)\u00b7Rx(roll)).`;
  if (spec.convention === "frames") {
    return {
      id: "parameter-table",
      caption: "Joint frames: origin of each joint in the previous joint\u2019s frame, and the joint axis",
      footnote,
      rowHeaders: true,
      columns: [
        { key: "joint", label: "Joint", numeric: false },
        { key: "xyz", label: "Origin xyz", unit: "mm", numeric: true },
        { key: "rpy", label: "Origin rpy", unit: "\u00b0", numeric: true },
        { key: "axis", label: "Axis", numeric: true },
        { key: "motion", label: "Joint motion", numeric: false },
      ],
      rows: spec.joints.map((j) => ({
        key: j.name,
        cells: [
          { text: j.name },
          { text: j.origin ? formatVector(j.origin.xyzMm, 3) : NOT_STATED },
          { text: j.origin ? formatVector(j.origin.rpyDeg, 3) : NOT_STATED },
          { text: j.axis ? formatVector(j.axis, 4) : NOT_STATED },
          { text: j.kind === "revolute" ? "rotation about the axis" : "translation along the axis" },
        ],
      })),
    };
  }
  const modified = spec.convention === "mdh";
  const prev = modified ? " (i\u22121)" : "";
  return {
    id: "parameter-table",
    caption: modified
      ? "Modified DH (Craig): row i holds a and \u03b1 of link i\u22121; A = Rx(\u03b1)\u00b7Tx(a)\u00b7Rz(\u03b8)\u00b7Tz(d)"
      : "Standard DH: A = Rz(\u03b8)\u00b7Tz(d)\u00b7Tx(a)\u00b7Rx(\u03b1) for each row",
    footnote,
    rowHeaders: true,
    columns: [
      { key: "joint", label: "Joint", numeric: false },
      { key: "a", label: `a${prev}`, unit: "mm", numeric: true },
      { key: "alpha", label: `\u03b1${prev}`, unit: "\u00b0", numeric: true },
      { key: "d", label: "d", unit: "mm", numeric: true },
      { key: "theta", label: "\u03b8 offset", unit: "\u00b0", numeric: true },
      { key: "variable", label: "Joint variable", numeric: false },
    ],
    rows: spec.joints.map((j) => {
      const p = modified ? j.mdh : j.dh;
      return {
        key: j.name,
        cells: [
          { text: j.name },
          ...(p
            ? dhCells(p)
            : [{ text: NOT_STATED }, { text: NOT_STATED }, { text: NOT_STATED }, { text: NOT_STATED }]),
          { text: j.kind === "revolute" ? "adds to \u03b8" : "adds to d" },
        ],
      };
    }),
  };
}

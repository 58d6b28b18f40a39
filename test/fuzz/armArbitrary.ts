/**
 * fast-check arbitraries of valid arm files (plain JSON objects in the arm file format, src/catalog/schema.ts):
 * standard DH, modified DH or frames chains with 2–7 driven joints, prismatic joints, couplings (driven and
 * passive), joint ranges and speeds, optional torque ratings, link masses, wrist ratings and mountings.
 *
 * Bounds are those of a plausible catalog entry: link lengths and offsets 0–1500 mm, twists and rotations biased
 * to the exact values drawings use (0, ±90°, 180°) as well as arbitrary ones, strokes up to 1500 mm. Exact zeros are
 * drawn often so that degenerate layouts (zero-length links, parallel or coincident axes) come up by themselves.
 * Makers, models and numbers are invented.
 */
import fc from "fast-check";

type Json = Record<string, unknown>;

const EXACT_ANGLES_DEG = [0, 90, -90, 180] as const;

/** Angle, deg: an exact drawing value, an integer, or an arbitrary double. */
const angleDeg = (limit = 180) =>
  fc.oneof(
    { weight: 5, arbitrary: fc.constantFrom(...EXACT_ANGLES_DEG) },
    { weight: 2, arbitrary: fc.integer({ min: -limit, max: limit }) },
    { weight: 1, arbitrary: fc.double({ min: -limit, max: limit, noNaN: true, noDefaultInfinity: true }) },
  );

/** Length, mm: exactly 0 often, else an integer or a double in ±maxMm (non-negative when `signed` is false). */
const lengthMm = (maxMm = 1500, signed = true) =>
  fc.oneof(
    { weight: 4, arbitrary: fc.constant(0) },
    { weight: 4, arbitrary: fc.integer({ min: signed ? -maxMm : 0, max: maxMm }) },
    { weight: 1, arbitrary: fc.double({ min: signed ? -maxMm : 0, max: maxMm, noNaN: true, noDefaultInfinity: true }) },
  );

const dhRow = fc.record({ aMm: lengthMm(1500, false), alphaDeg: angleDeg(), dMm: lengthMm(), thetaDeg: angleDeg() });

/** A unit axis: mostly a base axis (±x, ±y, ±z), sometimes an arbitrary direction rounded to 6 decimals. */
const unitAxis = fc.oneof(
  {
    weight: 5,
    arbitrary: fc.constantFrom<[number, number, number]>(
      [0, 0, 1],
      [0, 0, -1],
      [0, 1, 0],
      [0, -1, 0],
      [1, 0, 0],
      [-1, 0, 0],
    ),
  },
  {
    weight: 1,
    arbitrary: fc
      .tuple(
        fc.double({ min: -1, max: 1, noNaN: true }),
        fc.double({ min: -1, max: 1, noNaN: true }),
        fc.double({ min: -1, max: 1, noNaN: true }),
      )
      .filter(([x, y, z]) => Math.hypot(x, y, z) > 0.1)
      .map(([x, y, z]): [number, number, number] => {
        const n = Math.hypot(x, y, z);
        return [Number((x / n).toFixed(6)), Number((y / n).toFixed(6)), Number((z / n).toFixed(6))];
      }),
  },
);

const frame = fc.record({
  xyzMm: fc.tuple(lengthMm(), lengthMm(), lengthMm()),
  rpyDeg: fc.tuple(angleDeg(), angleDeg(), angleDeg()),
});

/** Everything drawn for one joint; whether it is used depends on the convention and the joint's role. */
const jointDraw = fc.record({
  prismatic: fc.constantFrom(false, false, false, false, false, true),
  dh: dhRow,
  origin: frame,
  axis: unitAxis,
  /** revolute range: lower limit and width, deg */
  loDeg: fc.integer({ min: -360, max: 350 }),
  widthDeg: fc.oneof(
    { weight: 1, arbitrary: fc.integer({ min: 1, max: 30 }) },
    { weight: 4, arbitrary: fc.integer({ min: 30, max: 720 }) },
  ),
  /** prismatic stroke: lower limit and width, mm */
  loMm: fc.integer({ min: -1500, max: 1400 }),
  widthMm: fc.integer({ min: 1, max: 1500 }),
  speedDegPerS: fc.integer({ min: 10, max: 1000 }),
  speedMmPerS: fc.integer({ min: 50, max: 3000 }),
  torqueNm: fc.option(fc.integer({ min: 5, max: 20_000 }), { nil: undefined, freq: 3 }),
  forceN: fc.option(fc.integer({ min: 50, max: 50_000 }), { nil: undefined, freq: 3 }),
  /** coupling: none, driven (with a range) or passive (no range); terms pick earlier joints by a fraction */
  coupling: fc.oneof(
    { weight: 8, arbitrary: fc.constant("none") },
    { weight: 1, arbitrary: fc.constant("driven") },
    { weight: 1, arbitrary: fc.constant("passive") },
  ),
  terms: fc.array(
    fc.record({
      pick: fc.double({ min: 0, max: 0.999, noNaN: true }),
      gain: fc.oneof(fc.constantFrom(1, -1, 0.5, -0.5, 2), fc.double({ min: -2, max: 2, noNaN: true })),
    }),
    { minLength: 1, maxLength: 2 },
  ),
  couplingOffsetDeg: fc.oneof(fc.constant(0), fc.integer({ min: -180, max: 180 })),
  couplingOffsetMm: fc.oneof(fc.constant(0), fc.integer({ min: -500, max: 500 })),
});

type JointDraw = typeof jointDraw extends fc.Arbitrary<infer T> ? T : never;

const MOUNTINGS = ["floor", "ceiling", "wall", "angled"] as const;
const CLASSES = ["articulated", "collaborative", "scara", "palletizer", "gantry", "other"] as const;

export interface ArmDraw {
  readonly convention: "dh" | "mdh" | "frames";
  readonly joints: readonly JointDraw[];
  readonly sphericalWrist: boolean;
  readonly flange: { xyzMm: number[]; rpyDeg: number[] };
  readonly mountings: readonly (typeof MOUNTINGS)[number][];
  readonly cls: (typeof CLASSES)[number];
  readonly ratedPayloadKg: number;
  readonly links: readonly { pick: number; massKg: number; comMm: number[] }[];
  readonly wristMoment: boolean;
}

const armDraw = fc.record({
  convention: fc.constantFrom("dh" as const, "mdh" as const, "frames" as const),
  joints: fc.array(jointDraw, { minLength: 2, maxLength: 9 }),
  sphericalWrist: fc.boolean(),
  flange: fc.record({
    xyzMm: fc.tuple(lengthMm(300), lengthMm(300), lengthMm(300)),
    rpyDeg: fc.tuple(angleDeg(), angleDeg(), angleDeg()),
  }),
  mountings: fc.shuffledSubarray([...MOUNTINGS], { minLength: 1, maxLength: 4 }),
  cls: fc.constantFrom(...CLASSES),
  ratedPayloadKg: fc.oneof(fc.integer({ min: 1, max: 500 }), fc.double({ min: 0.1, max: 500, noNaN: true })),
  links: fc.array(
    fc.record({
      pick: fc.double({ min: 0, max: 0.999, noNaN: true }),
      massKg: fc.integer({ min: 1, max: 200 }),
      comMm: fc.tuple(lengthMm(400), lengthMm(400), lengthMm(400)),
    }),
    { maxLength: 4 },
  ),
  wristMoment: fc.boolean(),
});

/**
 * Turns one draw into a valid arm file. Joints beyond 12, or driven joints beyond 7, become plain driven joints or
 * are dropped; at least two joints are driven; couplings name earlier joints of the same kind (or are dropped).
 */
export function armFromDraw(d: ArmDraw, id = "fuzz-arm"): Json {
  const joints: Json[] = [];
  const kinds: ("revolute" | "prismatic")[] = [];
  let driven = 0;
  const n = d.joints.length;
  d.joints.forEach((j, i) => {
    const kind = j.prismatic ? "prismatic" : "revolute";
    const name = `J${joints.length + 1}`;
    const out: Json = { name, kind };
    let row = { ...j.dh };
    let origin = { xyzMm: [...j.origin.xyzMm], rpyDeg: [...j.origin.rpyDeg] };
    // spherical wrist template on the last three joints (all revolute): their axes meet in one point
    const wristIndex = i - (n - 3);
    if (d.sphericalWrist && n >= 5 && wristIndex >= 0 && d.joints.slice(n - 3).every((w) => !w.prismatic)) {
      if (d.convention === "dh" && wristIndex <= 1)
        row = { ...row, aMm: 0, alphaDeg: row.alphaDeg === 0 ? 90 : row.alphaDeg, dMm: wristIndex === 1 ? 0 : row.dMm };
      if (d.convention === "mdh" && wristIndex >= 1)
        row = {
          ...row,
          aMm: 0,
          alphaDeg: row.alphaDeg === 0 ? -90 : row.alphaDeg,
          dMm: wristIndex === 1 ? 0 : row.dMm,
        };
      if (d.convention === "frames" && wristIndex >= 1) origin = { ...origin, xyzMm: [0, 0, 0] };
    }
    if (d.convention === "frames") {
      out.origin = origin;
      out.axis = j.axis;
    } else {
      out[d.convention] = row;
    }
    // coupling terms: earlier joints of the same kind
    // (joint 1 only when it is the only candidate: a coupling to joint 1 turns the envelope into base-plane
    // projections, which a few draws cover well enough)
    const sameKind = kinds.map((k, idx) => (k === kind ? idx : -1)).filter((idx) => idx >= 0);
    const earlier = sameKind.length > 1 ? sameKind.filter((idx) => idx > 0) : sameKind;
    const wantCoupling = j.coupling !== "none" && earlier.length > 0;
    const remaining = n - i - 1;
    // passive only when enough driven joints remain possible and the driven count stays ≥ 2
    let passive = wantCoupling && j.coupling === "passive" && driven + remaining >= 2;
    if (!passive && driven >= 7) return; // at most 7 driven joints: drop the rest
    if (wantCoupling) {
      const terms = new Map<number, number>();
      for (const t of j.terms) {
        const k = earlier[Math.floor(t.pick * earlier.length)]!;
        if (!terms.has(k)) terms.set(k, t.gain);
      }
      out.coupling = {
        terms: [...terms].map(([k, gain]) => ({ joint: `J${k + 1}`, gain })),
        ...(kind === "prismatic" ? { offsetMm: j.couplingOffsetMm } : { offsetDeg: j.couplingOffsetDeg }),
      };
    } else {
      passive = false;
    }
    if (!passive) {
      driven++;
      if (kind === "prismatic") {
        out.rangeMm = [j.loMm, j.loMm + j.widthMm];
        out.maxSpeedMmPerS = j.speedMmPerS;
        if (j.forceN !== undefined) out.ratedForceN = j.forceN;
      } else {
        out.rangeDeg = [j.loDeg, Math.min(720, j.loDeg + j.widthDeg)];
        out.maxSpeedDegPerS = j.speedDegPerS;
        if (j.torqueNm !== undefined) out.ratedTorqueNm = j.torqueNm;
      }
    }
    joints.push(out);
    kinds.push(kind);
  });
  // fewer than two driven joints (every later joint passive or dropped): make passive joints driven
  for (const j of joints) {
    if (driven >= 2) break;
    if (j.rangeDeg || j.rangeMm) continue;
    if (j.kind === "prismatic") Object.assign(j, { rangeMm: [0, 500], maxSpeedMmPerS: 500 });
    else Object.assign(j, { rangeDeg: [-170, 170], maxSpeedDegPerS: 180 });
    driven++;
  }
  const names = joints.map((j) => j.name as string);
  const arm: Json = {
    id,
    maker: "Fuzzwerk",
    model: "Random chain",
    class: d.cls,
    mountings: [...d.mountings],
    massKg: Math.max(10, Math.ceil(d.ratedPayloadKg)),
    ratedPayloadKg: d.ratedPayloadKg,
    repeatabilityMm: 0.05,
    protection: "IP54",
    convention: d.convention,
    joints,
    flange: d.flange,
    source: { document: "Generated chain", revision: "1", date: "2026-01-01" },
  };
  if (d.links.length > 0)
    arm.links = d.links.map((l) => ({
      after: names[Math.floor(l.pick * names.length)]!,
      massKg: l.massKg,
      comMm: l.comMm,
    }));
  if (d.wristMoment) arm.wrist = { momentNm: { [names[names.length - 1]!]: Math.max(1, d.ratedPayloadKg) * 2 } };
  return arm;
}

/** Arbitrary of valid arm files with 2–7 driven joints. */
export const armArbitrary: fc.Arbitrary<Json> = armDraw.map((d) => armFromDraw(d as ArmDraw));

/**
 * The arm description format: one JSON file per arm model in `arms/`, `<id>.json`.
 * Units live in the field names (mm, deg, deg/s, deg/s², kg, N·m, kg·m²). Objects are strict: an unknown key (a
 * stray `reachM` or `speed`) is an error. Cross-field rules that a type cannot express live in `semanticIssues`.
 * This file is the single source of the JSON Schema in public/schema/arm.schema.json (see `armJsonSchema`).
 */
import { z } from "zod";
import { DATASHEET_SHAPE } from "./datasheetSchema";

const LENGTH_LIMIT_MM = 100_000;
const ANGLE_LIMIT_DEG = 720;

const finite = () => z.number();
const lengthMm = () => z.number().min(-LENGTH_LIMIT_MM).max(LENGTH_LIMIT_MM);
const angleDeg = () => z.number().min(-360).max(360);
const vec3Mm = () => z.tuple([lengthMm(), lengthMm(), lengthMm()]);
const rpyDeg = () => z.tuple([angleDeg(), angleDeg(), angleDeg()]);
const positive = (max: number) => z.number().positive().max(max);
const text = (max = 200) => z.string().trim().min(1).max(max);

const orderedPair = (limit: number, unit: string) =>
  z
    .tuple([z.number().min(-limit).max(limit), z.number().min(-limit).max(limit)])
    .refine((r) => r[0] < r[1], { message: `expected [min, max] with min < max (${unit})` });

export const DhParamsSchema = z
  .strictObject({
    aMm: lengthMm().describe("link length a along x, mm"),
    alphaDeg: angleDeg().describe("link twist α about x, deg"),
    dMm: lengthMm().describe("link offset d along z, mm (a prismatic joint's variable adds to it)"),
    thetaDeg: angleDeg().describe("joint angle offset θ about z, deg (a revolute joint's variable adds to it)"),
  })
  .describe("Denavit–Hartenberg parameters");

export const FrameSchema = z
  .strictObject({
    xyzMm: vec3Mm().describe("translation, mm"),
    rpyDeg: rpyDeg().describe("roll, pitch, yaw in deg; R = Rz(yaw)·Ry(pitch)·Rx(roll) about fixed axes (as URDF)"),
  })
  .describe("a rigid transform");

export const CouplingSchema = z
  .strictObject({
    terms: z
      .array(
        z.strictObject({
          joint: text(40).describe("name of an earlier joint of the same kind"),
          gain: z.number().min(-100).max(100).describe("kinematic rate of this joint per rate of `joint`"),
        }),
      )
      .min(1)
      .max(12),
    offsetDeg: angleDeg().optional().describe("constant added to a revolute joint, deg"),
    offsetMm: lengthMm().optional().describe("constant added to a prismatic joint, mm"),
  })
  .describe(
    "value = Σ gain·(value of joint) + offset. A joint with a coupling and no range is passive (a parallelogram link); " +
      "with a range it is driven and its own variable adds to the sum (a maker's J3 measured from the horizontal).",
  );

const DIMENSIONS_ZERO_POSE =
  "At θ = 0, in the base frame (z up along axis 1, origin on axis 1 at the mounting face): axis 1 along +z through " +
  "the origin; axis 2 along +y through (a1, 0, c1); the upper arm points straight up: axis 3 along +y through " +
  "(a1, 0, c1 + c2); the forearm points along +x: axis 4 along +x through (·, b, c1 + c2 + a2); the wrist centre at " +
  "(a1 + c3, b, c1 + c2 + a2); axis 5 along +y and axis 6 along +x through the wrist centre; the flange centre at " +
  "(a1 + c3 + c4, b, c1 + c2 + a2), flange z along +x, flange x along −z. Every joint turns by the right-hand rule " +
  "about those directions: positive θ2 tilts the upper arm towards +x, positive θ3 turns the forearm down, positive " +
  "θ5 turns the flange down. Link frames (links[].comMm) are parallel to the base frame at θ = 0, with origins " +
  "J1 (0, 0, 0), J2 (a1, 0, c1), J3 (a1, 0, c1 + c2), J4–J6 the wrist centre.";

export const DimensionsSchema = z
  .strictObject({
    a1Mm: lengthMm().describe("shoulder offset: axis 2 lies a1 from axis 1 along +x at θ = 0, mm"),
    a2Mm: lengthMm().describe("elbow offset: axis 4 lies a2 above axis 3 at θ = 0 (across the forearm), mm"),
    bMm: lengthMm().describe("lateral offset of the forearm and wrist along +y at θ = 0, mm"),
    c1Mm: lengthMm().describe("shoulder height: axis 2 above the mounting face, mm"),
    c2Mm: positive(LENGTH_LIMIT_MM).describe("upper arm: axis 2 to axis 3, mm"),
    c3Mm: positive(LENGTH_LIMIT_MM).describe("forearm: axis 3 to the wrist centre, along axis 4, mm"),
    c4Mm: positive(LENGTH_LIMIT_MM).describe("wrist centre to the flange face, along axis 6, mm"),
  })
  .describe(
    "Dimension drawing of an ortho-parallel six-axis arm with a spherical wrist (convention dimensions; names after " +
      "Brandstötter, Angerer & Hofbaur 2014). " +
      DIMENSIONS_ZERO_POSE,
  );

export const JointSchema = z
  .strictObject({
    name: text(40).describe("joint name as the maker labels it, e.g. J1"),
    kind: z.enum(["revolute", "prismatic"]),
    dh: DhParamsSchema.optional().describe("standard DH row (convention: dh): Aᵢ = Rz(θ)·Tz(d)·Tx(a)·Rx(α)"),
    mdh: DhParamsSchema.optional().describe("modified DH row (convention: mdh): Aᵢ = Rx(αᵢ₋₁)·Tx(aᵢ₋₁)·Rz(θᵢ)·Tz(dᵢ)"),
    origin: FrameSchema.optional().describe("joint frame in the previous joint's frame (convention: frames)"),
    axis: z
      .tuple([finite(), finite(), finite()])
      .optional()
      .describe("unit joint axis in the joint frame (convention: frames)"),
    rangeDeg: orderedPair(ANGLE_LIMIT_DEG, "deg")
      .optional()
      .describe("[min, max] joint range of a revolute joint, deg"),
    rangeMm: orderedPair(LENGTH_LIMIT_MM, "mm").optional().describe("[min, max] stroke of a prismatic joint, mm"),
    maxSpeedDegPerS: positive(5000).optional().describe("maximum joint speed, deg/s"),
    maxSpeedMmPerS: positive(50_000).optional().describe("maximum joint speed, mm/s"),
    maxAccelDegPerS2: positive(1_000_000).optional().describe("maximum joint acceleration, deg/s²"),
    maxAccelMmPerS2: positive(10_000_000).optional().describe("maximum joint acceleration, mm/s²"),
    ratedTorqueNm: positive(1_000_000).optional().describe("rated continuous holding torque, N·m"),
    ratedForceN: positive(10_000_000).optional().describe("rated continuous force of a prismatic joint, N"),
    coupling: CouplingSchema.optional(),
    sign: z
      .literal([1, -1])
      .optional()
      .describe(
        "convention dimensions only: +1 (default) when the maker's positive joint reading q turns the joint as the " +
          "dimension-drawing model does (right-hand rule about the axis direction at θ = 0), −1 when it turns the " +
          "other way; the model angle is θ = sign·q + zeroOffsetDeg",
      ),
    zeroOffsetDeg: angleDeg()
      .optional()
      .describe(
        "convention dimensions only: the model angle θ at the maker's reading q = 0, deg (default 0); " +
          "θ = sign·q + zeroOffsetDeg, and θ = 0 is the pose of the dimension drawing",
      ),
    note: z.string().max(1000).optional(),
  })
  .describe("one joint, base to flange");

const mountingEnum = z.enum(["floor", "ceiling", "wall", "angled"]);

export const ArmSpecSchema = z
  .strictObject({
    $schema: z.string().max(500).optional().describe("path or URL of this JSON Schema, for editors"),
    id: z
      .string()
      .regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, { message: "expected a lowercase slug of a–z, 0–9 and single hyphens" })
      .max(80)
      .describe("lowercase slug; equals the file name without .json; the arm's URL"),
    maker: text(120),
    model: text(120),
    class: z.enum(["articulated", "collaborative", "scara", "palletizer", "gantry", "other"]),
    mountings: z
      .array(mountingEnum)
      .min(1)
      .max(4)
      .refine((m) => new Set(m).size === m.length, { message: "expected each mounting at most once" })
      .describe("mountings the maker offers; the first is the one the envelope views assume"),
    massKg: positive(100_000).describe("arm mass without controller, kg"),
    ratedPayloadKg: positive(10_000).describe("rated payload at the flange, tooling included, kg"),
    repeatabilityMm: positive(100).describe(
      "pose repeatability RP as ISO 9283 defines it, as declared by the maker, mm",
    ),
    protection: z
      .string()
      .regex(/^IP[0-6X][0-9X][A-D]?[HMSW]?$/, { message: "expected an IEC 60529 code such as IP54 or IP67" })
      .describe("IEC 60529 code of the arm body"),
    reachMm: positive(LENGTH_LIMIT_MM).optional().describe("reach as stated by the maker (usually wrist centre), mm"),
    convention: z
      .enum(["dh", "mdh", "frames", "dimensions"])
      .describe(
        "dh and mdh: a DH row per joint; frames: origin and axis per joint (as URDF); dimensions: the seven lengths " +
          "of a six-axis arm's dimension drawing in `dimensions`, and per joint only sign and zeroOffsetDeg",
      ),
    dimensions: DimensionsSchema.optional(),
    joints: z.array(JointSchema).min(1).max(12),
    flange: FrameSchema.optional().describe(
      "flange frame in the last joint's frame (conventions dh, mdh and frames; with dimensions the flange follows " +
        "from c4 and is not given)",
    ),
    wristCentre: z
      .strictObject({ joints: z.array(text(40)).min(1).max(3) })
      .optional()
      .describe("joints whose axes define the wrist centre point, for layouts without a spherical wrist"),
    wrist: z
      .strictObject({
        momentNm: z
          .record(z.string(), positive(1_000_000))
          .optional()
          .describe("allowed load moment per wrist joint, N·m"),
        inertiaKgM2: z
          .record(z.string(), positive(100_000))
          .optional()
          .describe("allowed load inertia per wrist joint, kg·m²"),
      })
      .optional(),
    links: z
      .array(
        z.strictObject({
          after: text(40).describe("the joint whose link frame holds this mass"),
          massKg: positive(100_000),
          comMm: vec3Mm().describe("centre of mass in that joint's link frame, mm"),
        }),
      )
      .max(24)
      .optional(),
    ...DATASHEET_SHAPE,
    source: z.strictObject({
      document: text(300).describe("title of the datasheet or manual the numbers came from"),
      revision: text(80),
      date: z.iso.date().describe("YYYY-MM-DD"),
      notes: z.string().max(2000).optional(),
    }),
    commercial: z
      .strictObject({
        listPrice: z.number().nonnegative().max(1e9),
        currency: z.string().regex(/^[A-Z]{3}$/, { message: "expected an ISO 4217 code such as EUR" }),
        leadTimeWeeks: z.number().nonnegative().max(520).optional(),
        quoteRef: z.string().max(200).optional(),
      })
      .optional(),
    description: z.string().max(2000).optional(),
  })
  .describe("Armdex arm description");

export type ArmSpec = z.infer<typeof ArmSpecSchema>;
export type JointSpec = z.infer<typeof JointSchema>;

/** The JSON Schema written to public/schema/arm.schema.json (editor completion and checking). */
export function armJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(ArmSpecSchema, { target: "draft-2020-12", io: "input" }) as Record<string, unknown>;
  // The rule the zod object leaves to validate.ts, for editors: a dimensions arm has `dimensions` and no `flange`
  // (the flange follows from c4); every other convention has a `flange` and no `dimensions`.
  const byConvention = {
    if: { properties: { convention: { const: "dimensions" } }, required: ["convention"] },
    then: { required: ["dimensions"], not: { required: ["flange"] } },
    else: { required: ["flange"], not: { required: ["dimensions"] } },
  };
  return { ...schema, ...byConvention, $id: "arm.schema.json", title: "Armdex arm description" };
}

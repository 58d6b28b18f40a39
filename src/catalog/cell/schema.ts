/**
 * The cell file format: one JSON file per cell study in `arms/cells/`, `<id>.json`. Units in the field names (mm,
 * deg, kg, kg·m², s, mm/s, %); the cell frame has z up and gravity along −z; rpy is R = Rz(yaw)·Ry(pitch)·Rx(roll)
 * about fixed axes everywhere. Objects are strict. Rules a type cannot express (names that refer to other entries,
 * the grip walk, fields that belong to one kind of move) live in validate.ts. This file is the single source of the
 * JSON Schema in public/schema/cell.schema.json (see `cellJsonSchema`).
 */
import { z } from "zod";

const LENGTH_LIMIT_MM = 100_000;
const NAME_MAX = 80;

const lengthMm = () => z.number().min(-LENGTH_LIMIT_MM).max(LENGTH_LIMIT_MM);
const angleDeg = () => z.number().min(-360).max(360);
const vec3Mm = () => z.tuple([lengthMm(), lengthMm(), lengthMm()]);
const rpyDeg = () =>
  z
    .tuple([angleDeg(), angleDeg(), angleDeg()])
    .describe("roll, pitch, yaw in deg; R = Rz(yaw)·Ry(pitch)·Rx(roll) about fixed axes");
const text = (max = 200) => z.string().trim().min(1).max(max);
const name = () => text(NAME_MAX);
const armId = () =>
  z
    .string()
    .regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, { message: "expected a lowercase slug of a–z, 0–9 and single hyphens" })
    .max(80);

export const PlacementSchema = z
  .strictObject({
    positionMm: vec3Mm().describe("origin of the arm's base frame in the cell frame, mm"),
    rpyDeg: rpyDeg(),
  })
  .describe(
    "the arm's base frame in the cell frame. The mounting it implies must be one the arm file lists: base z up " +
      "(floor), down (ceiling), horizontal (wall), otherwise angled",
  );

const inertiaTerm = (what: string) => z.number().min(-100_000).max(100_000).describe(what);
export const InertiaSchema = z
  .strictObject({
    xx: z.number().min(0).max(100_000).describe("I_xx, kg·m²"),
    yy: z.number().min(0).max(100_000).describe("I_yy, kg·m²"),
    zz: z.number().min(0).max(100_000).describe("I_zz, kg·m²"),
    xy: inertiaTerm("tensor entry I_xy = −∫xy dm (as URDF's ixy), kg·m²"),
    xz: inertiaTerm("tensor entry I_xz = −∫xz dm, kg·m²"),
    yz: inertiaTerm("tensor entry I_yz = −∫yz dm, kg·m²"),
  })
  .describe("inertia tensor about the body's own centre of gravity, in flange axes, kg·m² (zero when absent)");

export const BodySchema = z
  .strictObject({
    name: name(),
    massKg: z.number().positive().max(10_000).describe("mass, kg (> 0)"),
    cogMm: vec3Mm().describe("centre of gravity in the flange frame, mm (a part: while gripped)"),
    inertiaKgM2: InertiaSchema.optional(),
  })
  .describe("a rigid body: a piece of the tool, or a part the tool grips");

export const AbsoluteTargetSchema = z
  .strictObject({
    name: name(),
    positionMm: vec3Mm().describe("tool point in the cell frame, mm"),
    rpyDeg: rpyDeg().describe("tool orientation in the cell frame, deg; R = Rz(yaw)·Ry(pitch)·Rx(roll)"),
  })
  .describe("a tool-point pose in the cell frame");

export const RelativeTargetSchema = z
  .strictObject({
    name: name(),
    relativeTo: name().describe("name of the target this one is offset from"),
    offsetMm: vec3Mm().describe("offset in the cell frame, mm; the orientation is the other target's"),
  })
  .describe("a point offset from another target (an approach or departure point)");

export const TargetSchema = z.union([AbsoluteTargetSchema, RelativeTargetSchema]);

export const CycleStepSchema = z
  .strictObject({
    to: name().describe("the target this move goes to"),
    motion: z
      .enum(["joint", "linear"])
      .describe(
        "joint: all joints start and stop together; linear: the tool point moves on a straight line, the " +
          "orientation turning uniformly",
      ),
    speedPercent: z
      .number()
      .gt(0)
      .max(100)
      .optional()
      .describe("joint moves only: share of every joint's speed, (0, 100] % (default 100)"),
    speedMmPerS: z
      .number()
      .positive()
      .max(100_000)
      .optional()
      .describe("linear moves only: cap on the tool-point speed, mm/s (default: none, the joints limit)"),
    dwellS: z.number().min(0).max(3600).optional().describe("wait on arrival, s (default 0)"),
    grip: name().optional().describe("name of the part picked up on arrival (after any release)"),
    release: z.boolean().optional().describe("true: the carried part is set down on arrival (before any grip)"),
  })
  .describe("one move of the loop; the arm starts at the last step's target");

export const RequirementsSchema = z
  .strictObject({
    maxCycleS: z.number().positive().max(86_400).optional().describe("longest acceptable cycle time, s"),
    minJointMarginDeg: z
      .number()
      .min(0)
      .max(360)
      .optional()
      .describe("smallest acceptable distance of a joint from its range end at a target, deg"),
  })
  .describe("what the cell needs: a candidate passes when it meets each");

export const CellSpecSchema = z
  .strictObject({
    $schema: z.string().max(500).optional().describe("path or URL of this JSON Schema, for editors"),
    id: armId().describe("lowercase slug; equals the file name without .json; the study's URL"),
    title: text(200),
    description: z.string().max(2000).optional(),
    candidates: z.array(armId()).min(1).max(32).describe("ids of the arms to compare (arm files in arms/)"),
    placement: PlacementSchema,
    placements: z
      .record(z.string(), PlacementSchema)
      .optional()
      .describe("per arm id: a placement that replaces `placement` for that arm (another pedestal)"),
    tool: z
      .strictObject({
        tcp: z
          .strictObject({
            xyzMm: vec3Mm().describe("tool point in the flange frame, mm"),
            rpyDeg: rpyDeg().describe("tool frame in the flange frame, deg"),
          })
          .describe("the tool point (TCP) and tool frame in the flange frame"),
        bodies: z.array(BodySchema).max(32).default([]).describe("the tool's rigid bodies (gripper, changer, …)"),
      })
      .describe("the tool on the flange"),
    parts: z.array(BodySchema).max(32).default([]).describe("parts the tool grips, each while gripped"),
    targets: z.array(TargetSchema).min(1).max(500),
    cycle: z.array(CycleStepSchema).min(1).max(500).describe("the loop of moves, repeated"),
    requirements: RequirementsSchema.optional(),
  })
  .describe("Armdex cell study");

/** A cell file as validated (`parts` and `tool.bodies` default to []). */
export type CellFile = z.infer<typeof CellSpecSchema>;

/** The JSON Schema written to public/schema/cell.schema.json (editor completion and checking). */
export function cellJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(CellSpecSchema, {
    target: "draft-2020-12",
    io: "input",
    override: (ctx) => {
      // The rule validate.ts applies, for editors: speedPercent belongs to joint moves, speedMmPerS to linear ones.
      if (ctx.zodSchema !== CycleStepSchema) return;
      ctx.jsonSchema.allOf = [
        {
          if: { properties: { motion: { const: "linear" } }, required: ["motion"] },
          then: { not: { required: ["speedPercent"] } },
          else: { not: { required: ["speedMmPerS"] } },
        },
      ];
    },
  }) as Record<string, unknown>;
  return { ...schema, $id: "cell.schema.json", title: "Armdex cell study" };
}

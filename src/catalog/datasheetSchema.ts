/**
 * The datasheet fields of an arm file: what a maker presents beside the kinematics (after the list of ISO 9946) and
 * what buyers put side by side. Every field is optional and shown as declared, never computed. Spread into
 * `ArmSpecSchema` (schema.ts); the rules a type cannot express (a stopping-data joint names a joint of the arm, a
 * declared value in the unit of its characteristic) live in datasheetRules.ts.
 */
import { z } from "zod";

const text = (max = 200) => z.string().trim().min(1).max(max);
const percent = () => z.number().min(0).max(100);

/**
 * ISO 9283:1998 performance characteristics a maker may declare, with the unit each is measured in. The list follows
 * the clauses of ISO 9283 [from memory]: pose accuracy and repeatability, multi-directional pose accuracy variation,
 * distance accuracy and repeatability, position stabilization time, position overshoot, drift of pose
 * characteristics, exchangeability, path accuracy and repeatability, cornering deviations, minimum positioning time.
 * Characteristics in other units (path velocity in %, static compliance in mm/N, orientation parts in deg) are left
 * out: a file gives them in the source notes.
 */
export const PERFORMANCE_CHARACTERISTICS = {
  "pose accuracy": "mm",
  "pose repeatability": "mm",
  "multi-directional pose accuracy variation": "mm",
  "distance accuracy": "mm",
  "distance repeatability": "mm",
  "position stabilization time": "s",
  "position overshoot": "mm",
  "pose accuracy drift": "mm",
  "pose repeatability drift": "mm",
  exchangeability: "mm",
  "path accuracy": "mm",
  "path repeatability": "mm",
  "cornering round-off error": "mm",
  "cornering overshoot": "mm",
  "positioning time": "s",
} as const satisfies Record<string, "mm" | "s">;

export type PerformanceCharacteristic = keyof typeof PERFORMANCE_CHARACTERISTICS;

const characteristicNames = Object.keys(PERFORMANCE_CHARACTERISTICS) as [
  PerformanceCharacteristic,
  ...PerformanceCharacteristic[],
];

export const DeclaredPerformanceSchema = z
  .strictObject({
    characteristic: z
      .enum(characteristicNames)
      .describe("the ISO 9283 characteristic; its unit decides whether valueMm or valueS is given"),
    valueMm: z
      .number()
      .nonnegative()
      .max(100)
      .optional()
      .describe("declared value of a characteristic measured as a length, mm"),
    valueS: z
      .number()
      .nonnegative()
      .max(100)
      .optional()
      .describe("declared value of a characteristic measured as a time, s"),
    loadPercent: percent().describe("test load as a share of the rated load, % (ISO 9283 tests at 100 % and 10 %)"),
    speedPercent: percent().describe("test speed as a share of the rated speed, % (ISO 9283 tests at 100, 50, 10 %)"),
    standard: z.literal("ISO 9283").describe("the standard the value was measured under"),
    note: z.string().max(500).optional().describe("test conditions beyond load and speed (test cube, cycles…)"),
  })
  .describe("one performance characteristic as the maker declares it, with the conditions it was measured at");

export const StoppingDataSchema = z
  .strictObject({
    joint: text(40).describe("name of a driven revolute joint of this arm"),
    stopCategory: z.literal([0, 1]).describe("IEC 60204-1 stop category of the measurement: 0 or 1"),
    speedPercent: percent().describe("joint speed at the stop command, % of its maximum"),
    extensionPercent: percent().describe("arm extension, % of the maximum"),
    payloadPercent: percent().describe("payload, % of the rated payload"),
    distanceDeg: z.number().nonnegative().max(720).describe("angle the joint turns from the stop command, deg"),
    timeS: z.number().nonnegative().max(60).describe("time from the stop command to standstill, s"),
  })
  .describe("one stopping measurement as the maker publishes it (ISO 10218-1, annex on stopping data)");

export const ControllerSchema = z
  .strictObject({
    model: text(120).describe("controller model as the maker names it"),
    massKg: z.number().positive().max(10_000).optional().describe("controller mass, kg"),
    supplyKva: z.number().positive().max(10_000).optional().describe("rated supply power, kVA"),
  })
  .describe("the controller the arm is sold with");

/** The optional datasheet fields of an arm file, spread into the arm object. */
export const DATASHEET_SHAPE = {
  footprintMm: z
    .tuple([z.number().positive().max(100_000), z.number().positive().max(100_000)])
    .optional()
    .describe("[width, depth] of the base footprint, mm"),
  mountingFace: text(300).optional().describe("base mounting face: bolt pattern as the maker gives it"),
  flangeInterface: text(120)
    .optional()
    .describe("mechanical interface of the flange as its ISO 9409-1 designation, e.g. ISO 9409-1-50-4-M6"),
  ambientC: z
    .tuple([z.number().min(-100).max(200), z.number().min(-100).max(200)])
    .refine((r) => r[0] < r[1], { message: "expected [min, max] with min < max (°C)" })
    .optional()
    .describe("[min, max] ambient temperature in operation, °C"),
  controller: ControllerSchema.optional(),
  noiseDbA: z.number().positive().max(200).optional().describe("declared noise level, dB(A)"),
  declaredPerformance: z
    .array(DeclaredPerformanceSchema)
    .max(60)
    .optional()
    .describe("ISO 9283 performance characteristics as declared, each with its test load and speed"),
  stoppingData: z
    .array(StoppingDataSchema)
    .max(400)
    .optional()
    .describe("stopping distances and times per joint, as the maker publishes them; shown, never computed"),
} as const;

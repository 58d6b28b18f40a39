/**
 * The datasheet fields of the arm format (src/catalog/datasheetSchema.ts, datasheetRules.ts): accepted when well
 * formed, every problem reported with the file, the JSON path and what was expected, and the JSON Schema carries the
 * fields with their descriptions. Arms and numbers are invented.
 */
import { describe, expect, it } from "vitest";
import { armJsonSchema, validateArm } from "../../src/catalog";
import { PERFORMANCE_CHARACTERISTICS } from "../../src/catalog/datasheetSchema";

function arm(extra: Record<string, unknown> = {}): Record<string, unknown> {
  const joint = (name: string, aMm: number, alphaDeg: number, dMm: number) => ({
    name,
    kind: "revolute",
    dh: { aMm, alphaDeg, dMm, thetaDeg: 0 },
    rangeDeg: [-170, 170],
    maxSpeedDegPerS: 200,
  });
  return {
    id: "sheet-arm",
    maker: "Test Maker",
    model: "S-1",
    class: "articulated",
    mountings: ["floor"],
    massKg: 50,
    ratedPayloadKg: 5,
    repeatabilityMm: 0.03,
    protection: "IP54",
    convention: "dh",
    joints: [
      joint("J1", 100, -90, 400),
      joint("J2", 500, 0, 0),
      joint("J3", 50, -90, 0),
      joint("J4", 0, 90, 450),
      joint("J5", 0, -90, 0),
      joint("J6", 0, 0, 80),
    ],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
    source: { document: "Test sheet", revision: "A", date: "2026-01-01" },
    ...extra,
  };
}

const stop = (over: Record<string, unknown> = {}) => ({
  joint: "J1",
  stopCategory: 0,
  speedPercent: 100,
  extensionPercent: 100,
  payloadPercent: 100,
  distanceDeg: 30,
  timeS: 0.4,
  ...over,
});

const FULL = {
  footprintMm: [320, 300],
  mountingFace: "4 × M12 on a 250 mm square",
  flangeInterface: "ISO 9409-1-50-4-M6",
  ambientC: [0, 45],
  controller: { model: "Box 1", massKg: 30, supplyKva: 2 },
  noiseDbA: 68,
  declaredPerformance: [
    { characteristic: "pose repeatability", valueMm: 0.03, loadPercent: 100, speedPercent: 100, standard: "ISO 9283" },
    { characteristic: "positioning time", valueS: 0.5, loadPercent: 100, speedPercent: 100, standard: "ISO 9283" },
  ],
  stoppingData: [stop(), stop({ stopCategory: 1, speedPercent: 66, distanceDeg: 14, timeS: 0.3 })],
};

const errors = (data: unknown) =>
  validateArm(data, "arms/sheet-arm.json", "sheet-arm")
    .issues.filter((i) => i.severity === "error")
    .map((i) => `${i.file}: ${i.path}: ${i.message}`);

describe("datasheet fields", () => {
  it("accepts an arm with every datasheet field, and one with none", () => {
    expect(errors(arm(FULL))).toEqual([]);
    expect(errors(arm())).toEqual([]);
    const r = validateArm(arm(FULL), "arms/sheet-arm.json", "sheet-arm");
    expect(r.ok && r.spec.stoppingData?.length).toBe(2);
  });

  it("names the file and path of a stopping-data row whose joint is not a joint of the arm", () => {
    expect(errors(arm({ stoppingData: [stop(), stop({ joint: "J9" })] }))).toEqual([
      'arms/sheet-arm.json: stoppingData[1].joint: expected a joint name of this arm, found "J9"',
    ]);
  });

  it("refuses stopping data of a prismatic or a passive joint", () => {
    const a = arm();
    const joints = a.joints as Record<string, unknown>[];
    joints[2] = { ...joints[2], kind: "prismatic", rangeDeg: undefined, maxSpeedDegPerS: undefined };
    joints[2]!.rangeMm = [0, 200];
    joints[2]!.maxSpeedMmPerS = 500;
    joints[5] = { ...joints[5], rangeDeg: undefined, maxSpeedDegPerS: undefined };
    joints[5]!.coupling = { terms: [{ joint: "J4", gain: -1 }] };
    const list = errors({ ...a, stoppingData: [stop({ joint: "J3" }), stop({ joint: "J6" })] });
    expect(list).toContain(
      'arms/sheet-arm.json: stoppingData[0].joint: expected a revolute joint (stopping distances are in deg), found "J3", which is prismatic',
    );
    expect(
      list.some((m) => m.startsWith('arms/sheet-arm.json: stoppingData[1].joint: expected a driven joint, found "J6"')),
    ).toBe(true);
  });

  it("asks for the value in the unit of its characteristic, exactly once per condition", () => {
    const perf = (over: Record<string, unknown>) => ({
      characteristic: "pose accuracy",
      loadPercent: 100,
      speedPercent: 100,
      standard: "ISO 9283",
      ...over,
    });
    const list = errors(
      arm({
        declaredPerformance: [
          perf({ valueS: 0.2 }),
          perf({ characteristic: "positioning time" }),
          perf({ characteristic: "path accuracy", valueMm: 0.4 }),
          perf({ characteristic: "path accuracy", valueMm: 0.5 }),
        ],
      }),
    );
    expect(list).toEqual([
      'arms/sheet-arm.json: declaredPerformance[0].valueS: not used with "pose accuracy", which is measured in mm: expected valueMm',
      'arms/sheet-arm.json: declaredPerformance[1].valueS: missing required field: "positioning time" is measured in s, expected valueS',
      'arms/sheet-arm.json: declaredPerformance[3]: expected each characteristic once per test load and speed, found "path accuracy" at 100 % load and 100 % speed again (first at declaredPerformance[2])',
    ]);
  });

  it("reports a repeated stopping condition, and bad values by path", () => {
    const list = errors(
      arm({
        stoppingData: [stop(), stop({ distanceDeg: 31 }), stop({ stopCategory: 2, speedPercent: 140 })],
        ambientC: [45, 0],
        footprintMm: [300],
        declaredPerformance: [
          { characteristic: "pose wobble", valueMm: 1, loadPercent: 100, speedPercent: 100, standard: "ISO 9283" },
          { characteristic: "pose accuracy", valueMm: 1, loadPercent: 100, speedPercent: 100, standard: "ISO 9999" },
        ],
        controller: { model: "Box", powerKw: 3 },
      }),
    );
    expect(list).toEqual(
      expect.arrayContaining([
        "arms/sheet-arm.json: stoppingData[1]: expected one row per joint, stop category, speed, extension and payload, found the conditions of stoppingData[0] again",
        "arms/sheet-arm.json: stoppingData[2].stopCategory: expected one of 0, 1, found 2",
        "arms/sheet-arm.json: stoppingData[2].speedPercent: expected value <= 100, found 140",
        "arms/sheet-arm.json: ambientC: expected [min, max] with min < max (°C), found [45,0]",
        'arms/sheet-arm.json: declaredPerformance[1].standard: expected one of "ISO 9283", found "ISO 9999"',
        "arms/sheet-arm.json: controller.powerKw: unknown field: not part of the arm format (check the spelling and the unit in the name)",
      ]),
    );
    expect(list.some((m) => m.startsWith("arms/sheet-arm.json: footprintMm:"))).toBe(true);
    expect(
      list.some((m) => m.startsWith("arms/sheet-arm.json: declaredPerformance[0].characteristic: expected one of")),
    ).toBe(true);
  });

  it("writes the fields with their descriptions into the JSON Schema", () => {
    const props = (armJsonSchema() as { properties: Record<string, { description?: string }> }).properties;
    for (const key of [
      "footprintMm",
      "mountingFace",
      "flangeInterface",
      "ambientC",
      "controller",
      "noiseDbA",
      "declaredPerformance",
      "stoppingData",
    ]) {
      expect(props[key], key).toBeDefined();
      expect(props[key]!.description, key).toMatch(/\w/);
    }
    const perf = JSON.stringify(props.declaredPerformance);
    for (const name of Object.keys(PERFORMANCE_CHARACTERISTICS)) expect(perf).toContain(`"${name}"`);
    // The ISO 9283 characteristics the issue names are among them [from memory: ISO 9283:1998 clause titles].
    for (const name of [
      "pose repeatability",
      "pose accuracy",
      "path repeatability",
      "path accuracy",
      "positioning time",
    ])
      expect(Object.keys(PERFORMANCE_CHARACTERISTICS)).toContain(name);
  });
});

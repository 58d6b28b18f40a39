import { describe, expect, it } from "vitest";
import { mkdtemp, mkdir, readFile, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { loadArms, validateArm, armJsonSchema, formatIssue } from "../../src/catalog";
import { schemaErrors } from "../helpers/jsonSchemaCheck";

// A small valid arm of our own (invented numbers), standard DH.
function validArm(): Record<string, unknown> {
  const joint = (name: string, aMm: number, alphaDeg: number, dMm: number) => ({
    name,
    kind: "revolute",
    dh: { aMm, alphaDeg, dMm, thetaDeg: 0 },
    rangeDeg: [-170, 170],
    maxSpeedDegPerS: 200,
  });
  return {
    id: "test-arm",
    maker: "Test Maker",
    model: "T-1",
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
  };
}

const messages = (data: unknown, fileId = "test-arm") => {
  const r = validateArm(data, "arms/test-arm.json", fileId);
  return r.issues.filter((i) => i.severity === "error").map((i) => `${i.path}: ${i.message}`);
};

describe("validateArm", () => {
  it("accepts a valid arm and compiles its chain", () => {
    const r = validateArm(validArm(), "arms/test-arm.json", "test-arm");
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.chain.drivenCount).toBe(6);
      expect(r.chain.wrist?.basis).toBe("spherical");
    }
  });

  it("reports every problem at once, each with its JSON path, what was expected and what was found", () => {
    const a = validArm();
    const joints = a.joints as Record<string, unknown>[];
    joints[1]!.rangeDeg = [10, -10];
    joints[2]!.maxSpeedDegPerS = -5;
    (a as Record<string, unknown>).reachM = 1.2;
    a.massKg = "50";
    const list = messages(a);
    expect(list).toEqual(
      expect.arrayContaining([
        "joints[1].rangeDeg: expected [min, max] with min < max (deg), found [10,-10]",
        "joints[2].maxSpeedDegPerS: expected value > 0, found -5",
        "reachM: unknown field: not part of the arm format (check the spelling and the unit in the name)",
        'massKg: expected number, found "50"',
      ]),
    );
    expect(list.length).toBeGreaterThanOrEqual(4);
  });

  it("names a missing required field", () => {
    const a = validArm();
    delete a.source;
    expect(messages(a)).toContain("source: missing required field: expected object");
  });

  it("catches an id that differs from the file name", () => {
    expect(messages(validArm(), "other-name")).toContain(
      'id: expected the file name "other-name", found "test-arm" (the id is the file name and the URL)',
    );
  });

  it("catches couplings to unknown and later joints, and joints of another kind", () => {
    const a = validArm();
    const joints = a.joints as Record<string, unknown>[];
    joints[2]!.coupling = { terms: [{ joint: "J5", gain: -1 }] };
    joints[3]!.coupling = { terms: [{ joint: "J9", gain: 1 }] };
    const list = messages(a);
    expect(
      list.some(
        (m) =>
          m.startsWith("joints[2].coupling.terms[0].joint: expected an earlier joint") && m.includes("comes later"),
      ),
    ).toBe(true);
    expect(
      list.some((m) => m.startsWith("joints[3].coupling.terms[0].joint: expected the name of an earlier joint")),
    ).toBe(true);
  });

  it("catches a chain whose flange cannot move (every joint passive)", () => {
    const a = validArm();
    const joints = (a.joints as Record<string, unknown>[]).map((j, i) => {
      const { rangeDeg: _r, maxSpeedDegPerS: _s, ...rest } = j;
      return { ...rest, coupling: { terms: [{ joint: i === 0 ? "J6" : `J${i}`, gain: 1 }] } };
    });
    a.joints = joints;
    expect(messages(a)).toContain(
      "joints: expected at least one driven joint (with a range and a speed): with every joint passive the flange cannot move",
    );
  });

  it("catches a zero or non-unit axis in the frames convention", () => {
    const a = validArm();
    a.convention = "frames";
    a.joints = (a.joints as Record<string, unknown>[]).map((j, i) => {
      const { dh: _dh, ...rest } = j;
      return {
        ...rest,
        origin: { xyzMm: [0, 0, 100], rpyDeg: [0, 0, 0] },
        axis: i === 0 ? [0, 0, 0] : i === 1 ? [0, 2, 0] : [0, 0, 1],
      };
    });
    const list = messages(a);
    expect(list).toContain("joints[0].axis: expected a unit vector (length 1 ± 0.001), found length 0.000");
    expect(list).toContain("joints[1].axis: expected a unit vector (length 1 ± 0.001), found length 2.000");
  });

  it("rejects non-finite numbers (JSON cannot carry them, but programmatic input can)", () => {
    const a = validArm();
    a.massKg = Infinity;
    expect(messages(a).some((m) => m.startsWith("massKg: expected number"))).toBe(true);
  });
});

describe("loadArms", () => {
  it("reports broken files, duplicate ids, a directory named *.json and a $schema pointing nowhere, all at once", async () => {
    const dir = await mkdtemp(join(tmpdir(), "armdex-load-"));
    const good = validArm();
    await writeFile(join(dir, "test-arm.json"), JSON.stringify(good));
    await writeFile(join(dir, "copy.json"), JSON.stringify({ ...good, id: "copy" }));
    await writeFile(join(dir, "truncated.json"), JSON.stringify(good).slice(0, 80));
    await writeFile(join(dir, "empty.json"), "");
    await writeFile(join(dir, "latin1.json"), Buffer.from([0x7b, 0x22, 0xe9, 0x22, 0x7d]));
    await writeFile(
      join(dir, "schema-ref.json"),
      JSON.stringify({ ...good, id: "schema-ref", $schema: "../nowhere/arm.schema.json" }),
    );
    await mkdir(join(dir, "folder.json"));
    const { arms, issues } = await loadArms([dir, join(dir, "test-arm.json")]);
    const text = issues.map(formatIssue).join("\n");
    expect(arms.map((a) => a.id)).toEqual(["copy", "test-arm"]);
    expect(text).toMatch(/truncated\.json: expected valid JSON, found a syntax error.*\(the file looks truncated\)/);
    expect(text).toMatch(/empty\.json: expected a JSON object describing one arm, found an empty file/);
    expect(text).toMatch(/latin1\.json: expected UTF-8 text/);
    expect(text).toMatch(
      /schema-ref\.json: \$schema: expected a path to the arm JSON Schema .* which points to no file/,
    );
    expect(text).toMatch(/folder\.json: expected a JSON file, found a directory/);
    expect(text).toMatch(/test-arm\.json: id: expected a unique id, found "test-arm"/);
  });

  it("accepts every demo arm with no errors, and the $schema path of the demo files resolves", async () => {
    const { arms, issues } = await loadArms(["arms"]);
    expect(issues.filter((i) => i.severity === "error")).toEqual([]);
    expect(arms.length).toBeGreaterThanOrEqual(8);
  });
});

describe("armJsonSchema", () => {
  it("the committed schema accepts every demo arm file and rejects schema-level defects at their JSON paths", async () => {
    // Checked by the JSON Schema rules themselves (schemaErrors above), not against the generator's own output: a
    // schema that lost a field, a constraint or a required entry in the export fails here.
    const committed = JSON.parse(await readFile("public/schema/arm.schema.json", "utf8")) as Record<string, any>;
    const { arms } = await loadArms(["arms"]);
    expect(arms.length).toBeGreaterThanOrEqual(8);
    for (const arm of arms) {
      const data = JSON.parse(await readFile(arm.file, "utf8")) as unknown;
      expect(schemaErrors(committed, data), arm.file).toEqual([]);
    }
    const rejected: [file: string, path: string][] = [
      ["unknown-field-reach-m.json", "reachM"],
      ["type-mass-string.json", "massKg"],
      ["type-kind-unknown.json", "joints[2].kind"],
      ["missing-id.json", "id"],
      ["type-range-string.json", "joints[1].rangeDeg"],
      ["type-mountings-string.json", "mountings"],
      ["range-three-values.json", "joints[0].rangeDeg"],
      ["negative-mass.json", "massKg"],
    ];
    for (const [file, path] of rejected) {
      const data = JSON.parse(await readFile(`test/fixtures/bad-arms/${file}`, "utf8")) as unknown;
      expect(schemaErrors(committed, data), file).toContain(path);
    }
    // The convention's conditional: a dimensions arm passes; with a flange, or a dh arm without one, it fails.
    const dims = validDimensionsArm();
    expect(schemaErrors(committed, dims)).toEqual([]);
    expect(schemaErrors(committed, { ...dims, flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] } })).toContain("");
    const { flange: _flange, ...noFlange } = validArm();
    expect(schemaErrors(committed, noFlange)).toContain("flange");
    const badSign = validDimensionsArm();
    (badSign.joints as Record<string, unknown>[])[0]!.sign = 2;
    expect(schemaErrors(committed, badSign)).toContain("joints[0].sign");
  });

  it("is what public/schema/arm.schema.json holds: a freshness check of the generated file (regenerate with `npx armdex schema`)", async () => {
    const committed = JSON.parse(await readFile("public/schema/arm.schema.json", "utf8"));
    expect(committed).toEqual(JSON.parse(JSON.stringify(armJsonSchema())));
  });

  it("forbids unknown keys and requires the contract fields", () => {
    const schema = armJsonSchema() as { additionalProperties?: boolean; required?: string[] };
    expect(schema.additionalProperties).toBe(false);
    expect(schema.required).toEqual(
      expect.arrayContaining([
        "id",
        "maker",
        "model",
        "class",
        "mountings",
        "massKg",
        "ratedPayloadKg",
        "repeatabilityMm",
        "protection",
        "convention",
        "joints",
        "source",
      ]),
    );
    // flange or dimensions by convention (JSON Schema 2020-12 §10.2.2 if/then/else).
    const conditional = schema as { if?: unknown; then?: unknown; else?: unknown };
    expect(conditional.if).toEqual({ properties: { convention: { const: "dimensions" } }, required: ["convention"] });
    expect(conditional.then).toEqual({ required: ["dimensions"], not: { required: ["flange"] } });
    expect(conditional.else).toEqual({ required: ["flange"], not: { required: ["dimensions"] } });
  });
});

// The same invented arm as validArm() in the dimension-drawing form (convention dimensions): the DH rows read as
// a1 100, c1 400, c2 500, a2 50, c3 450, c4 80 (the derivation is in test/core/kinematics/dimensions.test.ts).
function validDimensionsArm(): Record<string, unknown> {
  const a = validArm();
  const joints = (a.joints as Record<string, unknown>[]).map(({ dh: _dh, ...rest }) => rest);
  joints[5]!.zeroOffsetDeg = 180;
  joints[2]!.sign = -1;
  joints[2]!.rangeDeg = [-170, 170];
  delete a.flange;
  return {
    ...a,
    convention: "dimensions",
    dimensions: { a1Mm: 100, a2Mm: 50, bMm: 0, c1Mm: 400, c2Mm: 500, c3Mm: 450, c4Mm: 80 },
    joints,
  };
}

describe("validateArm: convention dimensions", () => {
  it("accepts a dimensions arm; its chain has a spherical wrist and matches the DH arm it was read from", () => {
    const r = validateArm(validDimensionsArm(), "arms/test-arm.json", "test-arm");
    expect(r.issues).toEqual([]);
    expect(r.ok && r.chain.wrist?.basis).toBe("spherical");
    expect(r.ok && r.chain.drivenCount).toBe(6);
  });

  it("reports every dimensions rule at once with its path", () => {
    const a = validDimensionsArm();
    const joints = a.joints as Record<string, unknown>[];
    joints[0]!.dh = { aMm: 0, alphaDeg: 0, dMm: 0, thetaDeg: 0 };
    joints[1]!.axis = [0, 1, 0];
    joints[2]!.coupling = { terms: [{ joint: "J2", gain: -1 }] };
    joints[3]!.sign = 2;
    a.flange = { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] };
    a.wristCentre = { joints: ["J4", "J5", "J6"] };
    (a.dimensions as Record<string, unknown>).c4Mm = 0;
    (a.dimensions as Record<string, unknown>).dMm = 5;
    expect(messages(a)).toEqual(
      expect.arrayContaining([
        'joints[0].dh: not used with convention "dimensions": the joint axes follow from "dimensions" (give only sign and zeroOffsetDeg)',
        'joints[1].axis: not used with convention "dimensions": the joint axes follow from "dimensions" (give only sign and zeroOffsetDeg)',
        'joints[2].coupling: not used with convention "dimensions": expected sign and zeroOffsetDeg (θ = sign·q + zeroOffsetDeg)',
        "joints[3].sign: expected one of 1, -1, found 2",
        'flange: not used with convention "dimensions": the flange lies c4 beyond the wrist centre along axis 6',
        'wristCentre: not used with convention "dimensions": the wrist centre is where axes 4, 5 and 6 meet',
        "dimensions.c4Mm: expected value > 0, found 0",
        "dimensions.dMm: unknown field: not part of the arm format (check the spelling and the unit in the name)",
      ]),
    );
  });

  it("asks for the dimensions block, six revolute joints, and no sign or flange rules crossing conventions", () => {
    const a = validDimensionsArm();
    delete a.dimensions;
    (a.joints as unknown[]).pop();
    expect(messages(a)).toEqual(
      expect.arrayContaining([
        'dimensions: missing required field: convention "dimensions" needs "dimensions" { a1Mm, a2Mm, bMm, c1Mm, c2Mm, c3Mm, c4Mm }',
        'joints: convention "dimensions" describes six-axis arms: expected 6 joints (J1 … J6, base to flange), found 5',
      ]),
    );
    const b = validArm();
    (b.joints as Record<string, unknown>[])[1]!.zeroOffsetDeg = 90;
    b.dimensions = validDimensionsArm().dimensions;
    delete b.flange;
    expect(messages(b)).toEqual(
      expect.arrayContaining([
        'joints[1].zeroOffsetDeg: not used with convention "dh": zeroOffsetDeg belongs to convention "dimensions" (put a zero offset in thetaDeg and a sign in the row)',
        'dimensions: not used with convention "dh": expected convention "dimensions"',
        "flange: missing required field: expected the flange frame { xyzMm, rpyDeg }",
      ]),
    );
  });
});

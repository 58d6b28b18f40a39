/**
 * Plausibility warnings: legal but implausible numbers (usually a typo or a wrong unit) give issues of severity
 * "warning" that `armdex check` prints without failing. Thresholds are PLAUSIBILITY in src/catalog/validate.ts
 * (common practice, no source). test/fixtures/implausible-arms/ holds one valid arm per rule.
 */
import { execFile } from "node:child_process";
import { readFileSync } from "node:fs";
import { join, relative } from "node:path";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import {
  type ArmSpec,
  ArmSpecSchema,
  PLAUSIBILITY,
  linkLengthSumMm,
  loadArmFile,
  loadArms,
  plausibilityWarnings,
} from "../../src/catalog";
import { createScratch, forwardInto, wristCentreInto } from "../../src/core";
import { mulberry32, uniform } from "../helpers/prng";

const root = new URL("../..", import.meta.url).pathname;
const IMPLAUSIBLE = "test/fixtures/implausible-arms";

function demo(id: string): ArmSpec {
  return ArmSpecSchema.parse(JSON.parse(readFileSync(join(root, "arms", `${id}.json`), "utf8")));
}

/** A demo six-axis arm (standard DH, links, stated reach 840 mm) with one change. */
function tern(change: (s: ArmSpec) => void = () => {}): ArmSpec {
  const spec = structuredClone(demo("corvell-tern-7"));
  change(spec);
  return spec;
}

const warningsOf = (spec: ArmSpec) => plausibilityWarnings(spec, "arms/x.json").map((w) => `${w.path}: ${w.message}`);

describe("plausibilityWarnings", () => {
  it("returns nothing for a plausible arm, and only warnings, each with file and path", () => {
    expect(warningsOf(tern())).toEqual([]);
    const issues = plausibilityWarnings(
      tern((s) => (s.repeatabilityMm = 20)),
      "arms/x.json",
    );
    expect(issues).toEqual([
      {
        file: "arms/x.json",
        path: "repeatabilityMm",
        severity: "warning",
        message: expect.stringContaining("found 20"),
      },
    ]);
  });

  it("repeatability: warns outside 0.005–2 mm, with the likely unit slip", () => {
    expect(PLAUSIBILITY.repeatabilityMm).toEqual([0.005, 2]);
    expect(warningsOf(tern((s) => (s.repeatabilityMm = 0.005)))).toEqual([]);
    expect(warningsOf(tern((s) => (s.repeatabilityMm = 2)))).toEqual([]);
    expect(warningsOf(tern((s) => (s.repeatabilityMm = 0.00002)))).toEqual([
      "repeatabilityMm: expected a repeatability between 0.005 and 2 mm, found 0.00002 (typed in metres? 0.00002 m = 0.02 mm)",
    ]);
    expect(warningsOf(tern((s) => (s.repeatabilityMm = 20)))).toEqual([
      "repeatabilityMm: expected a repeatability between 0.005 and 2 mm, found 20 (typed in µm? 20 µm = 0.02 mm)",
    ]);
  });

  it("revolute joint speed: warns below 10 or above 1000 deg/s, naming the joint", () => {
    expect(PLAUSIBILITY.revoluteSpeedDegPerS).toEqual([10, 1000]);
    expect(
      warningsOf(tern((s) => ((s.joints[0]!.maxSpeedDegPerS = 10), (s.joints[5]!.maxSpeedDegPerS = 1000)))),
    ).toEqual([]);
    expect(warningsOf(tern((s) => (s.joints[0]!.maxSpeedDegPerS = 4)))).toEqual([
      "joints[0].maxSpeedDegPerS: expected a revolute joint speed between 10 and 1000 deg/s, found 4 (if it was typed in rad/s it is 229.2 deg/s; in rev/s, 1440 deg/s)",
    ]);
    expect(warningsOf(tern((s) => (s.joints[5]!.maxSpeedDegPerS = 3000)))).toEqual([
      "joints[5].maxSpeedDegPerS: expected a revolute joint speed between 10 and 1000 deg/s, found 3000 (a motor speed before the gearbox, or rpm?)",
    ]);
  });

  it("does not judge prismatic joints (mm/s) or passive joints by the revolute speed rule", () => {
    const scara = demo("yarrowfield-sable-600");
    const prismatic = scara.joints.find((j) => j.kind === "prismatic")!;
    expect(prismatic.maxSpeedMmPerS).toBeGreaterThan(1000);
    expect(warningsOf(scara)).toEqual([]);
    const palletizer = demo("yarrowfield-pl-180");
    expect(palletizer.joints.some((j) => j.coupling && !j.rangeDeg)).toBe(true);
    expect(warningsOf(palletizer)).toEqual([]);
  });

  it("link masses: warns when they add up to more than massKg", () => {
    const total = tern().links!.reduce((s, l) => s + l.massKg, 0);
    expect(warningsOf(tern((s) => (s.massKg = total)))).toEqual([]);
    expect(warningsOf(tern((s) => (s.massKg = 19)))).toEqual([
      `links: expected the link masses to add up to at most massKg (19 kg), found ${total} kg`,
    ]);
  });

  it("rated payload: warns above 3 × massKg", () => {
    expect(PLAUSIBILITY.payloadPerMass).toBe(3);
    expect(warningsOf(tern((s) => (s.ratedPayloadKg = 3 * s.massKg)))).toEqual([]);
    expect(warningsOf(tern((s) => (s.ratedPayloadKg = 120)))).toEqual([
      "ratedPayloadKg: expected at most 3 × massKg (102 kg), found 120 kg (check the units of ratedPayloadKg and massKg)",
    ]);
  });

  it("stated reach: warns below 50 mm (metres typed) and above the summed link lengths", () => {
    expect(PLAUSIBILITY.minReachMm).toBe(50);
    expect(warningsOf(tern((s) => (s.reachMm = 50)))).toEqual([]);
    expect(warningsOf(tern((s) => (s.reachMm = 0.84)))).toEqual([
      "reachMm: expected a reach of at least 50 mm, found 0.84: was it typed in metres? (0.84 m = 840 mm)",
    ]);
    const bound = linkLengthSumMm(tern())!;
    // Tern 7 rows: hypot(75, 340) + 360 + 45 + 400 + 80 (standard DH: each row translates by hypot(a, d)).
    expect(bound).toBeCloseTo(Math.hypot(75, 340) + 360 + 45 + 400 + 80, 9);
    expect(warningsOf(tern((s) => (s.reachMm = Math.floor(bound))))).toEqual([]);
    expect(warningsOf(tern((s) => (s.reachMm = 8400)))).toEqual([
      `reachMm: expected at most ${Number(bound.toPrecision(4))} mm (the sum of the arm's link lengths: no pose reaches farther), found 8400 (check the unit, mm, and the link dimensions)`,
    ]);
    expect(warningsOf(tern((s) => delete s.reachMm))).toEqual([]);
  });

  it("linkLengthSumMm bounds the distance of the flange and wrist centre from the base in sampled poses of every demo arm", async () => {
    // Triangle inequality check against forward kinematics (independent of how the bound is summed).
    const { arms } = await loadArms([join(root, "arms")]);
    expect(arms.length).toBeGreaterThan(0);
    const rand = mulberry32(20260605);
    for (const arm of arms) {
      const bound = linkLengthSumMm(arm.spec);
      expect(bound, arm.id).not.toBeNull();
      const chain = arm.chain;
      const s = createScratch(chain);
      const q = new Float64Array(chain.drivenCount);
      const wcp = new Float64Array(3);
      let farthest = 0;
      for (let k = 0; k < 500; k++) {
        for (let i = 0; i < q.length; i++) q[i] = uniform(rand, chain.lowerSi[i]!, chain.upperSi[i]!);
        forwardInto(chain, q, s);
        farthest = Math.max(farthest, Math.hypot(s.flange[3]!, s.flange[7]!, s.flange[11]!) * 1000);
        if (wristCentreInto(wcp, chain, s)) farthest = Math.max(farthest, Math.hypot(wcp[0]!, wcp[1]!, wcp[2]!) * 1000);
      }
      expect(farthest, arm.id).toBeGreaterThan(0);
      expect(farthest, arm.id).toBeLessThanOrEqual(bound! + 1e-6);
      if (arm.spec.reachMm !== undefined) expect(arm.spec.reachMm, arm.id).toBeLessThanOrEqual(bound!);
    }
  });
});

describe("warnings through the loader and the CLI", () => {
  const cases: readonly [file: string, path: string, includes: string][] = [
    [
      "link-masses-exceed-arm.json",
      "links",
      "expected the link masses to add up to at most massKg (19 kg), found 21.8 kg",
    ],
    ["payload-above-mass.json", "ratedPayloadKg", "expected at most 3 × massKg (93 kg), found 120 kg"],
    [
      "reach-in-metres.json",
      "reachMm",
      "expected a reach of at least 50 mm, found 0.88: was it typed in metres? (0.88 m = 880 mm)",
    ],
    [
      "reach-ten-times.json",
      "reachMm",
      "expected at most 1304 mm (the sum of the arm's link lengths: no pose reaches farther), found 8800",
    ],
    [
      "repeatability-in-micrometres.json",
      "repeatabilityMm",
      "expected a repeatability between 0.005 and 2 mm, found 20 (typed in µm?",
    ],
    [
      "speed-in-rad-per-s.json",
      "joints[0].maxSpeedDegPerS",
      "expected a revolute joint speed between 10 and 1000 deg/s, found 4 (if it was typed in rad/s it is 229.2 deg/s",
    ],
    [
      "speed-motor-rpm.json",
      "joints[5].maxSpeedDegPerS",
      "expected a revolute joint speed between 10 and 1000 deg/s, found 3000",
    ],
  ];

  it.each(cases)("%s loads as a valid arm carrying its warning at %s", async (file, path, includes) => {
    const { arm, issues } = await loadArmFile(join(root, IMPLAUSIBLE, file));
    expect(issues.filter((i) => i.severity === "error")).toEqual([]);
    expect(arm).not.toBeNull();
    const expected = {
      file: relative(process.cwd(), join(root, IMPLAUSIBLE, file)),
      path,
      severity: "warning",
      message: expect.stringContaining(includes),
    };
    expect(issues).toEqual([expected]);
    expect(arm!.warnings).toEqual([expected]);
  });

  it("the demo catalog is warning-free", async () => {
    const { arms, issues } = await loadArms([join(root, "arms")]);
    expect(arms.length).toBeGreaterThanOrEqual(8);
    expect(issues).toEqual([]);
  });

  it("armdex check prints every warning and still exits 0", async () => {
    const { stdout, stderr } = await promisify(execFile)("npx", ["tsx", "src/cli/armdex.ts", "check", IMPLAUSIBLE], {
      cwd: root,
    });
    expect(stderr).toBe("");
    for (const [file, path, includes] of cases)
      expect(stdout).toContain(`warning: ${IMPLAUSIBLE}/${file}: ${path}: ${includes}`);
    expect(stdout).toContain(`${cases.length} arms valid; 0 errors, ${cases.length} warnings`);
  }, 60_000);
});

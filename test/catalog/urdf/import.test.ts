/**
 * Tests of src/catalog/urdf/import.ts (and the CLI wrapper src/cli/urdf.ts) on an invented URDF written by hand,
 * test/reference/urdf/handmade-7j.urdf: fixed joints before, between and after the movable ones, a side branch, axes
 * other than z, a prismatic joint, a mimic joint and a tool frame.
 *
 * Outside reference: Orocos KDL (Debian python3-pykdl 1.5.1) reading the same file with Python's xml.etree, in
 * test/reference/urdf-kdl-fixture.json (test/reference/make_urdf_kdl_fixture.py): the imported arm's flange pose
 * (project's compileChain + forwardInto) equals KDL's tip pose. Unit conversions are checked against 180/π and 1000
 * written out; the mimic coupling against the URDF definition value = multiplier·master + offset.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { validateArm, type ArmSpec } from "../../../src/catalog";
import { importUrdf, type UrdfMerge } from "../../../src/catalog/urdf";
import { compileChain, createScratch, forwardInto } from "../../../src/core";

const FILE = fileURLToPath(new URL("../../reference/urdf/handmade-7j.urdf", import.meta.url));
const TEXT = readFileSync(FILE, "utf8");
const KDL = JSON.parse(readFileSync(new URL("../../reference/urdf-kdl-fixture.json", import.meta.url), "utf8")) as {
  cases: { file: string; samples: { driven: Record<string, number>; pose: number[][] }[] }[];
};
const OPTIONS = { root: "world", tip: "tool0", id: "handmade-7j" };
const DATASHEET: UrdfMerge = {
  maker: "Armdex test fixtures",
  model: "Handmade 7J",
  class: "other",
  mountings: ["floor"],
  massKg: 80,
  ratedPayloadKg: 6,
  repeatabilityMm: 0.05,
  protection: "IP54",
  source: { document: "Handmade 7J test sheet", revision: "1", date: "2026-12-04" },
  joints: { wrist_roll: { ratedTorqueNm: 25, maxAccelDegPerS2: 900 } },
};

describe("import urdf: the hand-written 7-joint URDF", () => {
  const arm = importUrdf(TEXT, { ...OPTIONS, merge: DATASHEET }) as unknown as ArmSpec;

  it("passes the arm validator once the datasheet fields are merged", () => {
    const r = validateArm(arm, "arms/handmade-7j.json", "handmade-7j");
    expect(r.issues.filter((i) => i.severity === "error")).toEqual([]);
    expect(r.ok).toBe(true);
  });

  it("gives KDL's tip pose at KDL's joint values (fixed joints folded, tip frame as flange)", () => {
    const chain = compileChain(arm);
    const c = KDL.cases.find((k) => k.file === "handmade-7j.urdf")!;
    expect(c.samples.length).toBeGreaterThan(0);
    let worst = 0;
    for (const s of c.samples) {
      const q = Array.from(chain.drivenJoint, (k) => s.driven[chain.jointNames[k]!]!);
      const t = forwardInto(chain, q, createScratch(chain));
      for (let r = 0; r < 3; r++)
        for (let k = 0; k < 4; k++) worst = Math.max(worst, Math.abs(t[r * 4 + k]! - s.pose[r]![k]!));
    }
    expect(worst).toBeLessThanOrEqual(1e-12);
    console.log(`KDL vs import of handmade-7j.urdf: max difference ${worst.toExponential(2)}`);
  });

  it("keeps the movable joints in order, converts limits and speeds, and turns mimic into a passive coupling", () => {
    expect(arm.joints.map((j) => j.name)).toEqual([
      "shoulder_pan",
      "shoulder_lift",
      "telescope",
      "elbow",
      "elbow_follow",
      "wrist_roll",
      "wrist_bend",
    ]);
    const byName = Object.fromEntries(arm.joints.map((j) => [j.name, j]));
    // lower/upper rad · 180/π; velocity rad/s · 180/π; prismatic m · 1000.
    expect(byName.shoulder_pan!.rangeDeg![0]).toBeCloseTo((-2.9 * 180) / Math.PI, 8);
    expect(byName.shoulder_lift!.maxSpeedDegPerS).toBeCloseTo((2.0 * 180) / Math.PI, 8);
    expect(byName.telescope!.rangeMm).toEqual([0, 350]);
    expect(byName.telescope!.maxSpeedMmPerS).toBe(500);
    expect(byName.telescope!.kind).toBe("prismatic");
    // mimic: value = −0.5·elbow + 0.25 rad; no range of its own (passive).
    expect(byName.elbow_follow!.coupling).toEqual({
      terms: [{ joint: "elbow", gain: -0.5 }],
      offsetDeg: Number(((0.25 * 180) / Math.PI).toFixed(12)),
    });
    expect(byName.elbow_follow!.rangeDeg).toBeUndefined();
    expect(byName.wrist_roll!.axis).toEqual([0.6, 0, 0.8]);
  });

  it("never copies effort into ratedTorqueNm; notes it in source.notes; merge extras land on their joint", () => {
    for (const j of arm.joints) if (j.name !== "wrist_roll") expect(j.ratedTorqueNm).toBeUndefined();
    expect(arm.joints.find((j) => j.name === "wrist_roll")!.ratedTorqueNm).toBe(25);
    expect(arm.source.notes).toContain("shoulder_pan 320 N·m");
    expect(arm.source.notes).toContain("not rated torques");
    expect(arm.source.notes).not.toContain("elbow_follow");
  });

  it("renames joints from the merge file, couplings included", () => {
    const renamed = importUrdf(TEXT, {
      ...OPTIONS,
      merge: { ...DATASHEET, joints: { elbow: { name: "J4" }, elbow_follow: { name: "P1" } } },
    }) as unknown as ArmSpec;
    expect(renamed.joints.map((j) => j.name)).toContain("J4");
    expect(renamed.joints.find((j) => j.name === "P1")!.coupling!.terms).toEqual([{ joint: "J4", gain: -0.5 }]);
    expect(validateArm(renamed, "arms/handmade-7j.json", "handmade-7j").ok).toBe(true);
  });

  it("a sub-chain: root base_link, tip l4 (the fixed joints above the root are left out)", () => {
    const sub = importUrdf(TEXT, { root: "base_link", tip: "l4", id: "sub" }) as unknown as ArmSpec;
    expect(sub.joints.map((j) => j.name)).toEqual(["shoulder_pan", "shoulder_lift", "telescope", "elbow"]);
    expect(sub.joints[0]!.origin).toEqual({ xyzMm: [0, 0, 320], rpyDeg: [0, 0, 0] });
    expect(sub.flange).toEqual({ xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] });
  });
});

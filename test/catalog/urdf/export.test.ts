/**
 * Tests of src/catalog/urdf/export.ts and import.ts together, on every demo arm of arms/.
 *
 * Check (1), round trip: export then import of each demo arm gives a frames arm whose flange pose equals the original
 * arm's at 50 random driven joint values per arm (both through the project's compileChain + forwardInto; the two
 * chains are built from different descriptions: DH/MDH rows or frames on one side, the URDF's xyz/rpy on the other)
 * to 1e-12 m and 1e-12 in the rotation, with the same ranges, speeds and couplings, and passes the validator.
 * Check (2), an independent reader: Orocos KDL (Debian python3-pykdl 1.5.1), with the URDF read by Python's
 * xml.etree, in test/reference/urdf-kdl-fixture.json (written by test/reference/make_urdf_kdl_fixture.py from the
 * exported copies in test/reference/urdf/): the arm file's own pose at KDL's joint values equals KDL's pose.
 */
import { readdirSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { loadArmFile, validateArm, type Arm, type ArmSpec } from "../../../src/catalog";
import { exportUrdf, importUrdf, type UrdfMerge } from "../../../src/catalog/urdf";
import { compileChain, createScratch, forwardInto, type Chain } from "../../../src/core";
import { mulberry32, uniform } from "../../helpers/prng";

const ARMS = readdirSync(new URL("../../../arms/", import.meta.url)).filter((f) => f.endsWith(".json"));

interface KdlCase {
  file: string;
  root: string;
  tip: string;
  samples: { driven: Record<string, number>; pose: number[][] }[];
}
const KDL = JSON.parse(readFileSync(new URL("../../reference/urdf-kdl-fixture.json", import.meta.url), "utf8")) as {
  cases: KdlCase[];
};

/** What a maintainer's merge file would hold for this arm: every field URDF does not carry. */
export function mergeOf(spec: ArmSpec): UrdfMerge {
  const joints: NonNullable<UrdfMerge["joints"]> = {};
  for (const j of spec.joints) {
    const { maxAccelDegPerS2, maxAccelMmPerS2, ratedTorqueNm, ratedForceN, note } = j;
    const extra = { maxAccelDegPerS2, maxAccelMmPerS2, ratedTorqueNm, ratedForceN, note };
    joints[j.name] = Object.fromEntries(Object.entries(extra).filter(([, v]) => v !== undefined));
  }
  const { maker, model, description, mountings, massKg, ratedPayloadKg, repeatabilityMm, protection } = spec;
  return {
    maker,
    model,
    class: spec.class,
    description,
    mountings,
    massKg,
    ratedPayloadKg,
    repeatabilityMm,
    protection,
    reachMm: spec.reachMm,
    wrist: spec.wrist,
    wristCentre: spec.wristCentre,
    // Link masses sit in the joint frame after its motion for frames arms on both sides; DH link frames differ.
    links: spec.convention === "frames" ? spec.links : undefined,
    source: spec.source,
    joints,
  };
}

/** Largest position (m) and rotation-entry difference of the flange poses of two chains at the same driven values. */
function poseDifference(a: Chain, b: Chain, q: ArrayLike<number>): { positionM: number; rotation: number } {
  const ta = Float64Array.from(forwardInto(a, q, createScratch(a)));
  const tb = forwardInto(b, q, createScratch(b));
  let rotation = 0;
  for (const k of [0, 1, 2, 4, 5, 6, 8, 9, 10]) rotation = Math.max(rotation, Math.abs(ta[k]! - tb[k]!));
  return { positionM: Math.hypot(ta[3]! - tb[3]!, ta[7]! - tb[7]!, ta[11]! - tb[11]!), rotation };
}

function randomDriven(chain: Chain, rand: () => number): Float64Array {
  return Float64Array.from({ length: chain.drivenCount }, (_, c) =>
    uniform(rand, Math.max(chain.lowerSi[c]!, -Math.PI), Math.min(chain.upperSi[c]!, Math.PI)),
  );
}

async function loadDemo(file: string): Promise<Arm> {
  const loaded = await loadArmFile(new URL(`../../../arms/${file}`, import.meta.url).pathname);
  if (!loaded.arm) throw new Error(`demo arm ${file} does not load`);
  return loaded.arm;
}

describe("URDF round trip of every demo arm (export, then import with the datasheet fields as a merge file)", () => {
  it.each(ARMS)("%s", async (file) => {
    const arm = await loadDemo(file);
    const text = exportUrdf(arm.spec, arm.chain);
    const imported = importUrdf(text, { root: "base", tip: "flange", id: arm.id, merge: mergeOf(arm.spec) });
    const result = validateArm(imported, `arms/${arm.id}.json`, arm.id);
    expect(result.issues).toEqual([]);
    if (!result.ok) return;
    const back = result.chain;
    expect(back.jointNames).toEqual(arm.chain.jointNames);
    expect(Array.from(back.drivenJoint)).toEqual(Array.from(arm.chain.drivenJoint));
    // Ranges, speeds and couplings as declared (file units; the import rounds away float noise at 1e-9).
    result.spec.joints.forEach((j, i) => {
      const o = arm.spec.joints[i]!;
      expect([j.rangeDeg, j.rangeMm, j.maxSpeedDegPerS, j.maxSpeedMmPerS]).toEqual([
        o.rangeDeg,
        o.rangeMm,
        o.maxSpeedDegPerS,
        o.maxSpeedMmPerS,
      ]);
      expect(j.coupling).toEqual(o.coupling);
      expect(j.ratedTorqueNm).toBe(o.ratedTorqueNm);
    });
    expect(Array.from(back.couplingGain)).toEqual(Array.from(arm.chain.couplingGain));
    const rand = mulberry32(14);
    let worstM = 0,
      worstR = 0;
    for (let s = 0; s < 50; s++) {
      const d = poseDifference(arm.chain, back, randomDriven(arm.chain, rand));
      worstM = Math.max(worstM, d.positionM);
      worstR = Math.max(worstR, d.rotation);
    }
    // Issue 14: the same poses to 1e-12 m.
    expect(worstM).toBeLessThanOrEqual(1e-12);
    expect(worstR).toBeLessThanOrEqual(1e-12);
    console.log(`round trip ${arm.id}: max |Δp| = ${worstM.toExponential(2)} m, max |ΔR| = ${worstR.toExponential(2)}`);
    expect(back.wrist === null).toBe(arm.chain.wrist === null);
  });
});

describe("export against Orocos KDL reading the exported URDF (python3-pykdl fixture)", () => {
  const cases = KDL.cases.filter((c) => c.file !== "handmade-7j.urdf");
  it("the fixture covers every demo arm", () => {
    expect(cases.map((c) => c.file.replace(/\.urdf$/, ".json")).sort()).toEqual([...ARMS].sort());
  });
  it.each(cases.map((c) => [c.file, c] as const))("%s: the arm file's pose equals KDL's", async (_, c) => {
    const arm = await loadDemo(c.file.replace(/\.urdf$/, ".json"));
    let worst = 0;
    for (const s of c.samples) {
      const q = Array.from(arm.chain.drivenJoint, (k) => s.driven[arm.chain.jointNames[k]!]!);
      const t = forwardInto(arm.chain, q, createScratch(arm.chain));
      for (let r = 0; r < 3; r++)
        for (let k = 0; k < 4; k++) worst = Math.max(worst, Math.abs(t[r * 4 + k]! - s.pose[r]![k]!));
    }
    // KDL composes the same transforms in another order of operations: agreement to 1e-12 (m; rotation entries).
    expect(worst).toBeLessThanOrEqual(1e-12);
    console.log(`KDL vs arm file ${arm.id}: max difference ${worst.toExponential(2)}`);
  });
  it("the exported copies in test/reference/urdf/ import to the same chain as the arm (fixture not stale)", async () => {
    for (const c of cases) {
      const arm = await loadDemo(c.file.replace(/\.urdf$/, ".json"));
      const text = readFileSync(new URL(`../../reference/urdf/${c.file}`, import.meta.url), "utf8");
      const chain = compileChain(importUrdf(text, { root: "base", tip: "flange", id: arm.id }) as never);
      const q = randomDriven(arm.chain, mulberry32(7));
      expect(poseDifference(arm.chain, chain, q).positionM).toBeLessThanOrEqual(1e-12);
    }
  });
});

describe("export edge cases", () => {
  it("joint names with XML's special characters come back unchanged through the import", async () => {
    const arm = await loadDemo("quenby-span-g3.json");
    const names = [`X<&>`, `Y"'`, "Z --", "C]]>"];
    const spec = { ...arm.spec, joints: arm.spec.joints.map((j, i) => ({ ...j, name: names[i]! })) };
    const chain = compileChain(spec);
    const text = exportUrdf(spec, chain);
    expect(text).toContain(`name="X&lt;&amp;&gt;"`);
    const back = importUrdf(text, { root: "base", tip: "flange", id: "x" }) as { joints: { name: string }[] };
    expect(back.joints.map((j) => j.name)).toEqual(names);
  });

  it("a coupling whose gains cancel is a fixed joint turned by the offset (same poses after import)", async () => {
    const arm = await loadDemo("yarrowfield-pl-180.json");
    const joints = arm.spec.joints.map((j) =>
      j.name === "P1"
        ? {
            ...j,
            coupling: {
              terms: [
                { joint: "J2", gain: 1 },
                { joint: "J2", gain: -1 },
              ],
              offsetDeg: 30,
            },
          }
        : j,
    );
    const spec = { ...arm.spec, joints };
    const chain = compileChain(spec);
    const text = exportUrdf(spec, chain);
    expect(text).toMatch(/<joint name="P1" type="fixed">/);
    const back = compileChain(importUrdf(text, { root: "base", tip: "flange", id: "x" }) as never);
    expect(back.jointNames).not.toContain("P1");
    const rand = mulberry32(3);
    for (let s = 0; s < 20; s++)
      expect(poseDifference(chain, back, randomDriven(chain, rand)).positionM).toBeLessThanOrEqual(1e-12);
  });
});

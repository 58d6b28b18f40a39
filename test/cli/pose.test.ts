/**
 * Tests of the `armdex pose` contract (src/cli/pose.ts poseCommand, and one end-to-end run of src/cli/armdex.ts),
 * on the generic 6R of CHECKS §0 written as an arm file (src/catalog/schema.ts) into a temporary folder.
 *
 * Outside references: the independent mathjs DH product of test/helpers/testArms.ts (flange, wrist centre), central
 * finite differences of it (CHECKS C11: h = 1e-6, 1e-7 abs at metre scale), ml-matrix (`SingularValueDecomposition`,
 * `determinant`, `inverse`) for the singular values, manipulability (= |det J| for a square J, CHECKS C2),
 * condition number and the guaranteed line speed (CHECKS C13), naive enumeration of the 2^6 joint-rate vertices
 * for the maximum tool speed (CHECKS C12), URDF roll-pitch-yaw R = Rz(yaw)·Ry(pitch)·Rx(roll) written out by hand,
 * and the CHECKS C5 wrist singularity (q5 = 0).
 */
import { execFile } from "node:child_process";
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import { Matrix, SingularValueDecomposition, determinant, inverse } from "ml-matrix";
import { afterAll, describe, expect, it } from "vitest";
import { loadArmFile, type Arm } from "../../src/catalog/index";
import { poseCommand } from "../../src/cli/pose";
import { expectClose, expectRelClose } from "../helpers/expectClose";
import { finiteDifferenceJacobian } from "../helpers/finiteDifference";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI, Q_STAR } from "../helpers/testArms";

const DEG = Math.PI / 180;
const REPO = fileURLToPath(new URL("../..", import.meta.url));
/** CHECKS §0 invented joint speed limits, rad/s. */
const W = [150, 150, 180, 300, 300, 400].map((v) => v * DEG);

/** The generic 6R as an arm file (invented data; every field the schema requires). */
const ARM_ID = "generic-6r-test";
const armJson = {
  id: ARM_ID,
  maker: "Armdex test fixtures",
  model: "Generic 6R",
  class: "articulated",
  mountings: ["floor"],
  massKg: 100,
  ratedPayloadKg: 10,
  repeatabilityMm: 0.05,
  protection: "IP54",
  convention: "dh",
  joints: generic6rDh().joints,
  flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  source: { document: "Invented round-number chain for tests", revision: "1", date: "2026-01-01" },
};

const dir = await mkdtemp(join(tmpdir(), "armdex-pose-"));
const file = join(dir, `${ARM_ID}.json`);
await writeFile(file, JSON.stringify(armJson, null, 2));
const loaded = await loadArmFile(file);
afterAll(() => rm(dir, { recursive: true, force: true }));

function arm(): Arm {
  expect(loaded.issues.filter((i) => i.severity === "error")).toEqual([]);
  return loaded.arm!;
}

/** Runs poseCommand with joints in degrees and returns the JSON value (fails the test on an error result). */
function pose(qDeg: readonly number[], allowOutside = false): Record<string, any> {
  const r = poseCommand(arm(), qDeg.join(","), undefined, allowOutside);
  if (!r.ok) throw new Error(`poseCommand failed: ${r.message}`);
  return r.value as Record<string, any>;
}

const fkReference = (q: ArrayLike<number>) => flat4(dhFrameReference(GENERIC_6R_SI.rows, q));
const Q_STAR_DEG = Q_STAR.map((v) => v / DEG);

describe("poseCommand(generic 6R, q*) contract", () => {
  const out = pose(Q_STAR_DEG);
  const t = fkReference(Q_STAR);

  it("flange.positionMm and flange.rotation equal the mathjs DH product", () => {
    // Output rounded to 1e-9 mm and 1e-12: tolerances 1e-6 mm and 1e-11.
    expectClose(out.flange.positionMm, [t[3]! * 1000, t[7]! * 1000, t[11]! * 1000], 1e-6, "positionMm");
    expectClose(
      (out.flange.rotation as number[][]).flat(),
      [t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!],
      1e-11,
      "rotation",
    );
  });

  it("flange.rpyDeg rebuilds the rotation as Rz(yaw)·Ry(pitch)·Rx(roll) (URDF, fixed axes)", () => {
    // R = Rz(y)Ry(p)Rx(r) multiplied out by hand (ml-matrix products of the elementary rotations).
    const [r, p, y] = (out.flange.rpyDeg as number[]).map((v) => v * DEG);
    const rx = new Matrix([
      [1, 0, 0],
      [0, Math.cos(r!), -Math.sin(r!)],
      [0, Math.sin(r!), Math.cos(r!)],
    ]);
    const ry = new Matrix([
      [Math.cos(p!), 0, Math.sin(p!)],
      [0, 1, 0],
      [-Math.sin(p!), 0, Math.cos(p!)],
    ]);
    const rz = new Matrix([
      [Math.cos(y!), -Math.sin(y!), 0],
      [Math.sin(y!), Math.cos(y!), 0],
      [0, 0, 1],
    ]);
    expectClose(rz.mmul(ry).mmul(rx).to1DArray(), (out.flange.rotation as number[][]).flat(), 1e-9, "R(rpy)");
  });

  it("wcp.positionMm is the origin of DH frame 4 (CHECKS §0: the wrist centre)", () => {
    const w = dhFrameReference(GENERIC_6R_SI.rows, Q_STAR, 4);
    expectClose(out.wcp.positionMm, [w[0]![3]! * 1000, w[1]![3]! * 1000, w[2]![3]! * 1000], 1e-6, "wcp");
  });

  it("jacobian is 6 × 6 and matches central finite differences of the mathjs FK (CHECKS C11)", () => {
    const j = out.jacobian as number[][];
    expect(j.length).toBe(6);
    for (const row of j) expect(row.length).toBe(6);
    expectClose(j.flat(), finiteDifferenceJacobian(fkReference, Q_STAR, 1e-6), 1e-7, "J vs finite differences");
  });

  it("singularValues, manipulability (= |det J|), conditionNumber agree with ml-matrix", () => {
    // CHECKS C2: w = ∏σᵢ = |det J| for a square J. Output rounded to 12 significant digits: 1e-9 relative.
    const jm = new Matrix(out.jacobian as number[][]);
    const sv = new SingularValueDecomposition(jm).diagonal;
    expectRelClose(out.singularValues, sv, 1e-9, "singular values");
    expectRelClose(out.manipulability, Math.abs(determinant(jm)), 1e-9, "manipulability = |det J|");
    expectRelClose(out.conditionNumber, sv[0]! / sv[5]!, 1e-9, "condition number");
  });

  it("guaranteedLineSpeedMmPerS = minᵢ wᵢ/‖aᵢ‖ with A = inverse(J)[:, 0:3] (CHECKS C13), in mm/s", () => {
    const a = inverse(new Matrix(out.jacobian as number[][])).subMatrix(0, 5, 0, 2);
    let r = Infinity;
    for (let i = 0; i < 6; i++) r = Math.min(r, W[i]! / Math.hypot(a.get(i, 0), a.get(i, 1), a.get(i, 2)));
    expectRelClose(out.guaranteedLineSpeedMmPerS, r * 1000, 1e-9, "guaranteed");
  });

  it("maxToolSpeedMmPerS is the largest ‖Σ sᵢ wᵢ J_v,i‖ over all 64 sign vectors (CHECKS C12), in mm/s", () => {
    const j = (out.jacobian as number[][]).flat();
    let best = 0;
    for (let mask = 0; mask < 64; mask++) {
      const v = [0, 1, 2].map((row) =>
        W.reduce((sum, w, i) => sum + (mask & (1 << i) ? -1 : 1) * w * j[row * 6 + i]!, 0),
      );
      best = Math.max(best, Math.hypot(...v));
    }
    expectRelClose(out.maxToolSpeedMmPerS, best * 1000, 1e-9, "max tool speed");
    expect(out.guaranteedLineSpeedMmPerS).toBeLessThanOrEqual(out.maxToolSpeedMmPerS);
  });

  it("singularity: kind none at q*, with a unit 6-element null vector", () => {
    expect(out.singularity.kind).toBe("none");
    expect(out.singularity.nullVector).toHaveLength(6);
    expectClose(Math.hypot(...(out.singularity.nullVector as number[])), 1, 1e-8, "unit null vector");
  });
});

describe("poseCommand(generic 6R) at a singular pose and outside the joint ranges", () => {
  it("q5 = 0 (CHECKS C5 wrist): kind wrist, joints 4 and 6 opposite, guaranteed speed 0", () => {
    const out = pose([Q_STAR_DEG[0]!, Q_STAR_DEG[1]!, Q_STAR_DEG[2]!, Q_STAR_DEG[3]!, 0, Q_STAR_DEG[5]!]);
    expect(out.singularity.kind).toBe("wrist");
    const n = out.singularity.nullVector as number[];
    expectClose(Math.abs(n[3]!), Math.SQRT1_2, 1e-8, "|n4|");
    expectClose(n[3]! + n[5]!, 0, 1e-8, "n4 = −n6");
    expect(out.guaranteedLineSpeedMmPerS).toBeLessThan(1e-3);
  });

  it("a joint outside its range is an error naming the joint unless allowOutside is set", () => {
    // The generic 6R ranges are ±180°; 200° on J1 is outside.
    const q = [200, ...Q_STAR_DEG.slice(1)];
    const refused = poseCommand(arm(), q.join(","), undefined, false);
    expect(refused.ok).toBe(false);
    if (!refused.ok) {
      expect(refused.message).toMatch(/j1/);
      expect(refused.usage ?? false).toBe(false);
    }
    const allowed = pose(q, true);
    expect(allowed.outsideRange).toHaveLength(1);
    const t = fkReference([200 * DEG, ...Q_STAR.slice(1)]);
    expectClose(allowed.flange.positionMm, [t[3]! * 1000, t[7]! * 1000, t[11]! * 1000], 1e-6, "computed anyway");
  });

  it("the wrong number of joints is a usage error", () => {
    const r = poseCommand(arm(), "1,2,3", undefined, false);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.usage).toBe(true);
  });
});

describe("armdex pose (end to end, npx tsx src/cli/armdex.ts)", () => {
  const run = promisify(execFile);
  const cli = (args: string[]) =>
    run("npx", ["tsx", "src/cli/armdex.ts", "pose", file, ...args], { cwd: REPO, timeout: 60_000 });

  it("prints the pose of the mathjs DH product and the CHECKS C12/C13 speeds, and exits 1 outside the ranges without --allow-outside (0 with it)", async () => {
    // The printed JSON is checked against the same outside references as poseCommand above (not against
    // poseCommand itself): a CLI that misread the joints (radians, another order) or printed another arm fails here.
    const { stdout } = await cli(["--joints", Q_STAR_DEG.join(",")]);
    const printed = JSON.parse(stdout) as Record<string, any>;
    expect(printed.arm).toBe(ARM_ID);
    const t = fkReference(Q_STAR);
    expectClose(printed.flange.positionMm, [t[3]! * 1000, t[7]! * 1000, t[11]! * 1000], 1e-6, "printed positionMm");
    expectClose(
      (printed.flange.rotation as number[][]).flat(),
      [t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!],
      1e-11,
      "printed rotation",
    );
    // CHECKS C11: central finite differences of the mathjs FK, h = 1e-6, 1e-7 abs.
    expectClose(
      (printed.jacobian as number[][]).flat(),
      finiteDifferenceJacobian(fkReference, Q_STAR, 1e-6),
      1e-7,
      "printed J vs finite differences",
    );
    // CHECKS C13 with ml-matrix inverse, and C12 by the 64 sign vectors, on the finite-difference Jacobian.
    const jFd = finiteDifferenceJacobian(fkReference, Q_STAR, 1e-6);
    const a = inverse(Matrix.from1DArray(6, 6, Array.from(jFd))).subMatrix(0, 5, 0, 2);
    let guaranteed = Infinity;
    for (let i = 0; i < 6; i++)
      guaranteed = Math.min(guaranteed, W[i]! / Math.hypot(a.get(i, 0), a.get(i, 1), a.get(i, 2)));
    let best = 0;
    for (let mask = 0; mask < 64; mask++) {
      const v = [0, 1, 2].map((row) =>
        W.reduce((sum, w, i) => sum + (mask & (1 << i) ? -1 : 1) * w * jFd[row * 6 + i]!, 0),
      );
      best = Math.max(best, Math.hypot(...v));
    }
    // The finite-difference Jacobian carries ~1e-9 relative error: 1e-6 relative on the speeds.
    expectRelClose(printed.guaranteedLineSpeedMmPerS, guaranteed * 1000, 1e-6, "printed guaranteed speed");
    expectRelClose(printed.maxToolSpeedMmPerS, best * 1000, 1e-6, "printed max tool speed");
    expect(printed.singularity.kind).toBe("none");

    const outside = ["--joints", [200, ...Q_STAR_DEG.slice(1)].join(",")];
    const failure = await cli(outside).then(
      () => null,
      (e: { code?: number; stderr?: string }) => e,
    );
    expect(failure?.code).toBe(1);
    expect(failure?.stderr ?? "").toMatch(/allow-outside/);
    const { stdout: anyway } = await cli([...outside, "--allow-outside"]);
    expect((JSON.parse(anyway) as { outsideRange: string[] }).outsideRange).toHaveLength(1);
  }, 120_000);

  it("takes joints whose first value is negative ('--joints -30,…'), as `line` takes negative coordinates", async () => {
    const qDeg = [-30, 10, 20, 0, 45, 0];
    const { stdout } = await cli(["--joints", qDeg.join(",")]);
    const printed = JSON.parse(stdout) as Record<string, any>;
    expect(printed.flange).toEqual(pose(qDeg).flange);
    // Independent: the flange is where the mathjs DH product puts it for these joints (-30° on joint 1).
    const t = flat4(
      dhFrameReference(
        GENERIC_6R_SI.rows,
        qDeg.map((v) => v * DEG),
      ),
    );
    expectClose(printed.flange.positionMm, [t[3]! * 1000, t[7]! * 1000, t[11]! * 1000], 1e-6, "positionMm");
  }, 120_000);
});

/**
 * Tests of src/core/analysis/line/verdict.ts: a line the arm cannot follow within its joint ranges, without a jump
 * and within reach has no feasible speed (0, not feasible, a reason per start branch); a line through axis 1 that
 * the arm follows continuously by reaching behind it is labelled, not refused.
 *
 * Independent checks: joint ranges are read from the arm files themselves (rangeDeg / rangeMm, not the compiled
 * chain), and reported joints are put through the mathjs DH product of test/helpers/testArms.ts (an FK written
 * apart from src/core) to confirm they are the pose asked for. Random arms come from test/fuzz/armArbitrary.ts.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../../src/catalog/index";
import { validateArm } from "../../../../src/catalog/validate";
import { lineCommand } from "../../../../src/cli/line";
import { compileChain, createScratch, forwardInto, toolPointInto, type ArmKinematicsInput } from "../../../../src/core";
import { lineCheck, type LineCheckResult } from "../../../../src/core/analysis/line";
import { expectClose } from "../../../helpers/expectClose";
import { dhFrameReference, flat4, type DhRowSi } from "../../../helpers/testArms";
import { armArbitrary } from "../../../fuzz/armArbitrary";
import { DEG } from "./fixtures";

const ARMS_DIR = fileURLToPath(new URL("../../../../arms", import.meta.url));

interface DhJointJson {
  readonly name: string;
  readonly dh: { aMm: number; alphaDeg: number; dMm: number; thetaDeg: number };
  readonly rangeDeg?: [number, number];
  readonly coupling?: { terms: { joint: string; gain: number }[]; offsetDeg?: number };
}

/** The arm file as written (DH arms with identity flange only: both reproductions are). */
function armJson(id: string): { joints: DhJointJson[] } {
  return JSON.parse(readFileSync(`${ARMS_DIR}/${id}.json`, "utf8")) as { joints: DhJointJson[] };
}

/** Flange position (mm) of driven joints (deg) by the mathjs DH product, passive joints from their coupling sums. */
function flangeMm(arm: { joints: DhJointJson[] }, drivenDeg: readonly number[]): number[] {
  const value = new Map<string, number>();
  let k = 0;
  const q: number[] = [];
  for (const j of arm.joints) {
    const own = j.rangeDeg ? drivenDeg[k++]! : 0;
    const coupled = j.coupling
      ? j.coupling.terms.reduce((acc, t) => acc + t.gain * value.get(t.joint)!, j.coupling.offsetDeg ?? 0)
      : 0;
    value.set(j.name, own + coupled);
    q.push((own + coupled) * DEG);
  }
  const rows: DhRowSi[] = arm.joints.map((j) => ({
    a: j.dh.aMm / 1000,
    alpha: j.dh.alphaDeg * DEG,
    d: j.dh.dMm / 1000,
    theta: j.dh.thetaDeg * DEG,
  }));
  const t = flat4(dhFrameReference(rows, q));
  return [t[3]! * 1000, t[7]! * 1000, t[11]! * 1000];
}

function outOfFileRange(arm: { joints: DhJointJson[] }, drivenDeg: readonly number[]): string[] {
  const ranges = arm.joints.filter((j) => j.rangeDeg);
  return drivenDeg.flatMap((v, i) =>
    v < ranges[i]!.rangeDeg![0] - 1e-6 || v > ranges[i]!.rangeDeg![1] + 1e-6 ? [ranges[i]!.name] : [],
  );
}

describe("lines the arm cannot follow have no feasible speed (issue: numbers at their edges)", async () => {
  const { arms } = await loadArms([ARMS_DIR]);
  const run = (id: string, args: Record<string, string>) => {
    const res = lineCommand(
      arms.find((a) => a.id === id)!,
      args,
    );
    if (!res.ok) throw new Error(res.message);
    return res.value as unknown as LineCheckResult;
  };

  it("yarrowfield-pl-180 down line: J3 starts at 33.75° against its 25° limit, every branch fails → 0, not feasible", () => {
    const r = run("yarrowfield-pl-180", {
      from: "1500,-800,1000",
      to: "2200,400,1500",
      orientation: "down",
      speed: "1000",
    });
    const file = armJson("yarrowfield-pl-180");
    expect(r.feasibleConstantSpeedMmPerS).toBe(0);
    expect(r.commandedSpeedFeasible).toBe(false);
    expect(r.followed).toBe(false);
    expect(r.startBranches.length).toBeGreaterThan(1);
    for (const b of r.startBranches) {
      expect(b.followed).toBe(false);
      expect(b.feasibleConstantSpeedMmPerS).toBe(0);
      expect(["joint limit", "jump"]).toContain(b.reason);
      // Independent: the start joints are the asked start pose (mathjs DH product of the file's rows) …
      expectClose(flangeMm(file, b.startJointsDeg), [1500, -800, 1000], 1e-4, `${b.branch}: start pose`);
      // … and a branch refused for a joint limit at its start has that joint outside the file's range there.
      if (b.reason === "joint limit" && b.atFraction === 0)
        expect(outOfFileRange(file, b.startJointsDeg)).toContain(b.joint);
    }
    expect(r.startBranch).toMatchObject({ reason: "joint limit", joint: "J3", atFraction: 0 });
    expect(r.startBranch!.startJointsDeg[2]!).toBeGreaterThan(25); // rangeDeg [-115, 25] in the file
    expect(r.bottleneck).toMatchObject({ reason: "joint limit", joint: "J3" });
  });

  it("brandmoor-lyra-r7 down line: J4 and J1 leave their ranges on every branch → 0, not feasible", () => {
    const r = run("brandmoor-lyra-r7", { from: "300,-200,300", to: "650,200,500", orientation: "down", speed: "500" });
    const file = armJson("brandmoor-lyra-r7");
    expect(r.feasibleConstantSpeedMmPerS).toBe(0);
    expect(r.commandedSpeedFeasible).toBe(false);
    expect(new Set(r.jointLimitViolations.map((v) => v.joint))).toEqual(new Set(["J4", "J1"]));
    for (const b of r.startBranches) {
      expect(b).toMatchObject({ followed: false, reason: "joint limit", feasibleConstantSpeedMmPerS: 0 });
      expectClose(flangeMm(file, b.startJointsDeg), [300, -200, 300], 1e-4, `${b.branch}: start pose`);
      if (b.atFraction === 0) expect(outOfFileRange(file, b.startJointsDeg)).toContain(b.joint);
    }
    // The reported samples past the J1 violation's start are outside J1's file range [-170, 170].
    const v = r.jointLimitViolations.find((x) => x.joint === "J1")!;
    const inside = r.samples.filter((s) => s.fraction > v.fromFraction + 0.01 && s.fraction <= v.toFraction);
    expect(inside.length).toBeGreaterThan(0);
    for (const s of inside) {
      expect(outOfFileRange(file, s.jointsDeg!)).toContain("J1");
      expectClose(flangeMm(file, s.jointsDeg!), s.positionMm, 1e-4, `sample ${s.fraction}: pose`);
    }
  });
});

describe("a palletizer line through axis 1, followed by reaching behind the axis", () => {
  // Invented palletizer (4 driven axes, parallelogram P1 = −(J2 + J3)) with wide ranges so that it can lean back.
  const joint = (name: string, aMm: number, alphaDeg: number, dMm: number, thetaDeg: number, range?: number) => ({
    name,
    kind: "revolute" as const,
    dh: { aMm, alphaDeg, dMm, thetaDeg },
    ...(range ? { rangeDeg: [-range, range] as [number, number], maxSpeedDegPerS: 120 } : {}),
  });
  const pal: ArmKinematicsInput = {
    convention: "dh",
    joints: [
      joint("J1", 280, -90, 720, 0, 180),
      joint("J2", 1200, 0, 0, -90, 120),
      joint("J3", 1450, 0, 0, 90, 170),
      {
        ...joint("P1", 250, -90, 0, 0),
        coupling: {
          terms: [
            { joint: "J2", gain: -1 },
            { joint: "J3", gain: -1 },
          ],
        },
      },
      joint("J4", 0, 0, 210, 0, 360),
    ],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
  const chain = compileChain(pal);
  const down = [1, 0, 0, 0, -1, 0, 0, 0, -1]; // tool z along −z, x along +x (closed form)

  it("passes axis 1 continuously: finite rates, J1 constant, labelled passesAxis1, feasible speed given", () => {
    const r = lineCheck(chain, {
      startM: [0.8, 0, 1.2],
      endM: [-0.8, 0, 1.2],
      baseFromToolRotation: down,
      speedMPerS: 0.5,
    });
    expect(r.followed).toBe(true);
    expect(r.commandedSpeedFeasible).toBe(true);
    expect(r.feasibleConstantSpeedMmPerS!).toBeGreaterThan(0);
    expect(r.passesAxis1).toBe(true);
    const pass = r.branchChanges.filter((c) => c.passesAxis1);
    expect(pass).toHaveLength(1);
    expect(pass[0]).toMatchObject({ continuous: true, kind: "shoulder" });
    expect(pass[0]!.note).toMatch(/not a posture change/);
    expectClose(pass[0]!.fraction, 0.5, 0.05, "near the middle, where the wrist centre is over axis 1");
    // Reaching behind the axis, not turning it: J1 the same at every sample (it would turn 180° otherwise).
    for (const s of r.samples) expectClose(s.jointsDeg![0]!, r.samples[0]!.jointsDeg![0]!, 1e-6, "J1");
    for (const s of r.samples) expect(s.jointRatesDegPerS!.every(Number.isFinite)).toBe(true);
    expect(r.jointLimitViolations).toEqual([]);
  });
});

describe("property: a run with a range violation, a jump or an out-of-reach point has no feasible speed", () => {
  /** Driven ranges (deg or mm) from the arm file itself, in driven order. */
  const fileRanges = (json: Record<string, unknown>) =>
    (json.joints as { rangeDeg?: [number, number]; rangeMm?: [number, number] }[]).flatMap((j) =>
      j.rangeDeg ? [j.rangeDeg] : j.rangeMm ? [j.rangeMm] : [],
    );

  it("random arms and lines (fast-check, seeded)", () => {
    const draw = fc.record({
      arm: armArbitrary,
      pose: fc.array(fc.double({ min: 0.3, max: 0.7, noNaN: true }), { minLength: 7, maxLength: 7 }),
      dir: fc.tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true })),
      lengthM: fc.double({ min: 0.005, max: 0.15, noNaN: true }),
    });
    let checked = 0,
      problems = 0;
    fc.assert(
      fc.property(draw, ({ arm, pose, dir, lengthM }) => {
        const v = validateArm(arm, "fuzz.json", "fuzz-arm");
        if (!v.ok) return;
        const chain = v.chain,
          m = chain.drivenCount;
        const q = Float64Array.from({ length: m }, (_, i) => {
          const lo = chain.lowerSi[i]!,
            hi = chain.upperSi[i]!;
          return lo + pose[i]! * (hi - lo);
        });
        const s = createScratch(chain);
        const f = forwardInto(chain, q, s);
        const rot = [f[0]!, f[1]!, f[2]!, f[4]!, f[5]!, f[6]!, f[8]!, f[9]!, f[10]!];
        const tcp = new Float64Array(3);
        toolPointInto(tcp, s, 0, 0, 0);
        const z = Math.sqrt(Math.max(0, 1 - dir[0] ** 2 - dir[1] ** 2));
        const n = Math.hypot(dir[0], dir[1], z) || 1;
        const end = [0, 1, 2].map((i) => tcp[i]! + (lengthM * [dir[0], dir[1], z][i]!) / n);
        let r: LineCheckResult;
        try {
          r = lineCheck(
            chain,
            { startM: Array.from(tcp), endM: end, baseFromToolRotation: rot, speedMPerS: 0.5, startJointsSi: q },
            { samples: 11, discoverySeeds: 6, maxBranches: 3 },
          );
        } catch (e) {
          if (e instanceof RangeError && /same point/.test(e.message)) return;
          throw e;
        }
        checked++;
        const ranges = fileRanges(arm);
        // Independent of the core's own bookkeeping: a reported sample outside the file's range is a violation.
        const outside = r.samples.some(
          (smp) =>
            smp.jointsDeg !== null &&
            smp.jointsDeg.some((val, i) => val < ranges[i]![0] - 1e-6 || val > ranges[i]![1] + 1e-6),
        );
        const problem =
          outside ||
          r.jointLimitViolations.length > 0 ||
          r.branchChanges.some((c) => !c.continuous) ||
          r.outOfReach.length > 0 ||
          r.samples.some((smp) => !smp.reachable);
        if (problem) {
          problems++;
          expect(r.feasibleConstantSpeedMmPerS).toBe(0);
          expect(r.commandedSpeedFeasible).toBe(false);
          expect(r.followed).toBe(false);
        }
        for (const b of r.startBranches) {
          if (b.jumps > 0 || b.jointLimitViolations > 0) {
            expect(b.feasibleConstantSpeedMmPerS).toBe(0);
            expect(b.followed).toBe(false);
            expect(b.reason).not.toBeNull();
          }
          if (!b.followed) expect(b.feasibleConstantSpeedMmPerS).toBe(0);
        }
        if (r.commandedSpeedFeasible) expect(r.followed && !outside).toBe(true);
      }),
      { seed: 20261204, numRuns: 25 },
    );
    expect(checked).toBeGreaterThan(0);
    // The seeded draw covers both sides: lines with a problem and lines followed cleanly.
    expect(problems).toBeGreaterThan(0);
    expect(checked - problems).toBeGreaterThan(0);
  });
});

/**
 * Tests of `armdex line` (src/cli/line.ts lineCommand, and the subcommand of src/cli/armdex.ts run as a process),
 * on the generic 6R of CHECKS §0 written as an arm file into a temporary folder (invented data).
 *
 * Outside references: closed forms derived beside each check. For a tool-down line on this arm the wrist centre
 * stays d6 = 0.1 m straight above the TCP, so along the line y ∈ [−0.4, 0.4] m at x = 1.2 m the wrist centre's
 * horizontal distance from axis 1 is r = sqrt(1.2² + y²); at y = 0 the velocity is perpendicular to the radius,
 * so q̇1 = v / r (azimuth rate), r and the height are stationary (q̇2 = q̇3 = q̇5 = 0), the wrist stays in the arm
 * plane (q̇4 = 0) and joint 6 undoes joint 1's turn of the tool (|q̇6| = |q̇1|). The feasible constant speed of the
 * whole line is at most the bound at that point, q̇1max·r (CHECKS C13 along one direction).
 */
import { execFile } from "node:child_process";
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
import { loadArmFile } from "../../src/catalog/index";
import { lineCommand } from "../../src/cli/line";
import { expectClose, expectRelClose } from "../helpers/expectClose";
import { generic6rDh } from "../helpers/testArms";

const DEG = Math.PI / 180;
const REPO = fileURLToPath(new URL("../..", import.meta.url));

const armJson = {
  id: "generic-6r-line-test",
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

const dir = await mkdtemp(join(tmpdir(), "armdex-line-"));
const file = join(dir, `${armJson.id}.json`);
const badFile = join(dir, "generic-6r-line-bad.json");
await writeFile(file, JSON.stringify(armJson, null, 2));
await writeFile(badFile, JSON.stringify({ ...armJson, id: "generic-6r-line-bad", massKg: -1 }, null, 2));
afterAll(() => rm(dir, { recursive: true, force: true }));

const LINE = [
  "--from",
  "1200,-400,300",
  "--to",
  "1200,400,300",
  "--orientation",
  "down",
  "--speed",
  "500",
  "--samples",
  "11",
];

describe("armdex line (end to end, npx tsx src/cli/armdex.ts)", () => {
  const run = promisify(execFile);
  const cli = (path: string, args: string[]) =>
    run("npx", ["tsx", "src/cli/armdex.ts", "line", path, ...args], { cwd: REPO, timeout: 90_000 }).then(
      (r) => ({ code: 0, stdout: r.stdout, stderr: r.stderr }),
      (e: { code?: number; stdout?: string; stderr?: string }) => ({
        code: e.code ?? -1,
        stdout: e.stdout ?? "",
        stderr: e.stderr ?? "",
      }),
    );
  // The three runs start together (each pays the tsx start-up once).
  const runs = Promise.all([cli(file, LINE), cli(file, [...LINE.slice(0, 6), "--speed", "fast"]), cli(badFile, LINE)]);

  it("prints the contract keys and the closed-form joint rates at the point nearest axis 1", async () => {
    const [ok] = await runs;
    expect(ok.code, ok.stderr).toBe(0);
    const out = JSON.parse(ok.stdout) as Record<string, any>;
    for (const key of [
      "feasibleConstantSpeedMmPerS",
      "bottleneck",
      "nearestSingularity",
      "branchChanges",
      "outOfReach",
      "samples",
      "speedProfile",
      "jointLimitViolations",
    ]) {
      expect(out, key).toHaveProperty(key);
    }
    for (const key of ["joint", "positionMm", "fraction"]) expect(out.bottleneck).toHaveProperty(key);
    for (const key of ["kind", "positionMm", "inverseCondition"]) expect(out.nearestSingularity).toHaveProperty(key);
    expect(out.samples).toHaveLength(11);
    for (const key of ["fraction", "positionMm", "jointsDeg", "rateRatios"]) expect(out.samples[0]).toHaveProperty(key);
    expect(out.outOfReach).toEqual([]);
    const mid = out.samples[5] as {
      fraction: number;
      positionMm: number[];
      jointRatesDegPerS: number[];
      rateRatios: number[];
    };
    expectClose(mid.positionMm, [1200, 0, 300], 1e-9, "mid sample position");
    const v = 0.5,
      r = 1.2; // m/s, m
    const q1 = v / r / DEG; // deg/s
    // Printed with 9 significant digits (values below 1e-9 printed as 0): relative 1e-8, absolute 1e-6 deg/s.
    expectRelClose(mid.jointRatesDegPerS.map(Math.abs), [q1, 0, 0, 0, 0, q1], 1e-8, "|q̇| at y = 0", 1e-6 / 1e-8);
    expectRelClose(mid.rateRatios[0]!, v / r / (150 * DEG), 1e-8, "rateRatio of J1 at y = 0");
    expect(out.feasibleConstantSpeedMmPerS).toBeLessThanOrEqual(150 * DEG * r * 1000 * (1 + 1e-8));
    expect(out.feasibleConstantSpeedMmPerS).toBeGreaterThan(0);
    expect(out.commandedSpeedFeasible).toBe(out.feasibleConstantSpeedMmPerS >= 500);
  });

  it("exits 2 with a message naming the option on a bad argument", async () => {
    const [, bad] = await runs;
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--speed: expected a positive number of mm\/s/);
  });

  it("exits 1 with the validation messages on an invalid arm file", async () => {
    const [, , invalid] = await runs;
    expect(invalid.code).toBe(1);
    expect(invalid.stderr).toContain("massKg: expected value > 0, found -1");
  });
});

describe("lineCommand usage errors (pure)", async () => {
  const loaded = await loadArmFile(file);
  const arm = loaded.arm!;
  const base = { from: "1200,-400,300", to: "1200,400,300", orientation: "down", speed: "500" };
  it.each([
    ["missing --from", { ...base, from: undefined }, /--from x,y,z/],
    ["--to with two values", { ...base, to: "1,2" }, /--to: expected 3 values/],
    ["unknown orientation", { ...base, orientation: "sideways" }, /--orientation: .*down, outward or roll,pitch,yaw/],
    ["zero speed", { ...base, speed: "0" }, /--speed/],
    ["start joints count", { ...base, startJoints: "0,0,0" }, /--start-joints: expected 6 values.*j1, j2/],
    ["samples not whole", { ...base, samples: "2.5" }, /--samples/],
    ["zero-length line", { ...base, to: base.from }, /same point/],
  ])("%s", (_, args, message) => {
    // The arm file loads without errors (a null arm would pass toBeDefined, so check the issues).
    expect(loaded.issues.filter((i) => i.severity === "error")).toEqual([]);
    expect(arm).not.toBeNull();
    const r = lineCommand(arm, args);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.usage).toBe(true);
    expect(r.message).toMatch(message);
  });

  it("--orientation roll,pitch,yaw (deg) naming the 'down' rotation gives the same rotation and feasible speed", () => {
    // 'down' at the start (1200, −400, 300) mm: tool z = (0, 0, −1), tool x = outward = (cos ψ, sin ψ, 0) with
    // ψ = atan2(−0.4, 1.2), tool y = z × x = (sin ψ, −cos ψ, 0). That is Rz(ψ)·Rx(180°), URDF rpy (180°, 0, ψ).
    const psi = Math.atan2(-0.4, 1.2) / DEG;
    const a = lineCommand(arm, { ...base, samples: "11" });
    const b = lineCommand(arm, { ...base, samples: "11", orientation: `180,0,${psi}` });
    expect(a.ok && b.ok).toBe(true);
    if (!a.ok || !b.ok) return;
    const c = Math.cos(psi * DEG),
      s = Math.sin(psi * DEG);
    const expected = [c, s, 0, s, -c, 0, 0, 0, -1];
    // Printed with 9 significant digits: 1e-8.
    expectClose((a.value.orientation as { rotation: number[][] }).rotation.flat(), expected, 1e-8, "down rotation");
    expectClose((b.value.orientation as { rotation: number[][] }).rotation.flat(), expected, 1e-8, "rpy rotation");
    expectRelClose(
      b.value.feasibleConstantSpeedMmPerS as number,
      a.value.feasibleConstantSpeedMmPerS as number,
      1e-8,
      "feasible",
    );
  });
});

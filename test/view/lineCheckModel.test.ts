/**
 * The site's straight-line check set-up (src/view/lineCheckModel.ts): the URL state round-trips, bad input is
 * reported field by field, and runLineQuery gives exactly what `armdex line` gives (src/cli/line.ts lineCommand,
 * the reference: the browser and the CLI must agree), on a demo arm.
 *
 * Outside reference for the figure itself: for a level line with the tool down, crossing in front of an arm whose
 * arm plane contains axis 1 (corvell-tern-7: no lateral offset), the velocity at the point nearest axis 1 is
 * perpendicular to the radius, so joint 1 turns at v / d there (d = distance of the line from axis 1): the largest
 * constant speed is at most q̇1max·d, with equality when joint 1 binds (CHECKS C13 along one direction).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { loadArmFile, type Arm } from "../../src/catalog";
import { lineCommand } from "../../src/cli/line";
import {
  lineCommandText,
  lineFigures,
  lineQueryPairs,
  lineQueryString,
  lineRatesChartInput,
  orientationKindsFor,
  parseLineQuery,
  runLineQuery,
  type LineQuery,
} from "../../src/view/lineCheckModel";
import { expectRelClose } from "../helpers/expectClose";

let arm: Arm;

beforeAll(async () => {
  const loaded = await loadArmFile("arms/corvell-tern-7.json");
  if (!loaded.arm) throw new Error(`demo arm did not load: ${JSON.stringify(loaded.issues)}`);
  arm = loaded.arm;
});

const get = (qs: string) => {
  const p = new URLSearchParams(qs);
  return (k: string) => p.get(k);
};

describe("parseLineQuery / lineQueryString", () => {
  it("round-trips a line with roll, pitch, yaw through the query string", () => {
    const q: LineQuery = {
      fromMm: [500, -350, 300],
      toMm: [200, 300, 700.5],
      orientation: { kind: "rpy", rpyDeg: [180, -20, 30] },
      speedMmPerS: 800,
    };
    const parsed = parseLineQuery(get(lineQueryString(q)));
    expect(parsed).toEqual({ ok: true, query: q });
    expect(lineQueryPairs(q)).toEqual([
      ["from", "500,-350,300"],
      ["to", "200,300,700.5"],
      ["orientation", "180,-20,30"],
      ["speed", "800"],
    ]);
  });

  it("returns null when the address holds no line, and every problem when it holds a bad one", () => {
    expect(parseLineQuery(get("arms=a,b"))).toBeNull();
    const bad = parseLineQuery(get("from=1,2&to=3,4,x&orientation=sideways&speed=0"));
    expect(bad).toEqual({
      ok: false,
      errors: [
        'from: expected three numbers x, y, z (mm), found "1,2"',
        'to: expected three numbers x, y, z (mm), found "3,4,x"',
        'orientation: expected down, outward or roll,pitch,yaw in degrees, found "sideways"',
        'speed: expected a positive number of mm/s, found "0"',
      ],
    });
    expect(parseLineQuery(get("from=1,2,3&to=1,2,3&orientation=down&speed=5"))).toEqual({
      ok: false,
      errors: ["from and to are the same point: the line has no length"],
    });
    expect(parseLineQuery(get("from=1,2,3"))).toMatchObject({
      ok: false,
      errors: [
        "to: missing (x, y, z in mm)",
        "orientation: missing (down, outward or roll,pitch,yaw)",
        "speed: missing (mm/s)",
      ],
    });
  });

  it("offers roll, pitch, yaw and outward only to arms with six or more driven joints", () => {
    expect(orientationKindsFor(4)).toEqual(["down"]);
    expect(orientationKindsFor(6)).toEqual(["down", "outward", "rpy"]);
    expect(orientationKindsFor(7)).toEqual(["down", "outward", "rpy"]);
  });

  it("writes the armdex line command that reproduces a line", () => {
    const q: LineQuery = {
      fromMm: [450, -300, 400],
      toMm: [450, 300, 400],
      orientation: { kind: "down" },
      speedMmPerS: 500,
    };
    expect(lineCommandText("arms/corvell-tern-7.json", q)).toBe(
      "npx armdex line arms/corvell-tern-7.json --from 450,-300,400 --to 450,300,400 --orientation down --speed 500",
    );
  });
});

describe("runLineQuery", () => {
  const cases: [string, LineQuery][] = [
    [
      "down, level across the front",
      { fromMm: [450, -300, 400], toMm: [450, 300, 400], orientation: { kind: "down" }, speedMmPerS: 500 },
    ],
    [
      "roll, pitch, yaw, oblique",
      {
        fromMm: [500, -350, 300],
        toMm: [200, 300, 700],
        orientation: { kind: "rpy", rpyDeg: [180, -20, 30] },
        speedMmPerS: 800,
      },
    ],
    [
      "outward, oblique",
      { fromMm: [550, -150, 250], toMm: [250, 200, 550], orientation: { kind: "outward" }, speedMmPerS: 800 },
    ],
  ];

  it.each(cases)("gives the same result as armdex line (%s)", (_, q) => {
    const [from, to, orientation, speed] = lineQueryPairs(q).map(([, v]) => v);
    const cli = lineCommand(arm, { from, to, orientation, speed });
    if (!cli.ok) throw new Error(cli.message);
    const site = runLineQuery(arm.chain, arm.spec.mountings, q);
    const c = cli.value as { feasibleConstantSpeedMmPerS: number; bottleneck: { joint: string; fraction: number } };
    // The CLI rounds to 9 significant digits for display; the computation is the same.
    expectRelClose(site.feasibleConstantSpeedMmPerS!, c.feasibleConstantSpeedMmPerS, 1e-8, "feasible speed");
    expect(site.bottleneck?.joint).toBe(c.bottleneck.joint);
    expectRelClose(site.bottleneck!.fraction, c.bottleneck.fraction, 1e-7, "bottleneck fraction");
  });

  it("matches the closed form q̇1max·d for a level tool-down line where joint 1 binds", () => {
    const dMm = 450;
    const q: LineQuery = {
      fromMm: [dMm, -300, 400],
      toMm: [dMm, 300, 400],
      orientation: { kind: "down" },
      speedMmPerS: 500,
    };
    const r = runLineQuery(arm.chain, arm.spec.mountings, q);
    const j1 = arm.spec.joints[0]!.maxSpeedDegPerS! * (Math.PI / 180); // rad/s
    expect(r.bottleneck?.joint).toBe("J1");
    expectRelClose(r.feasibleConstantSpeedMmPerS!, j1 * dMm, 1e-6, "q̇1max·d (mm/s)");
    expectRelClose(r.bottleneck!.fraction, 0.5, 1e-6, "nearest point to axis 1");
  });
});

describe("lineFigures / lineRatesChartInput", () => {
  it("says the figures with units and names the bottleneck joint", () => {
    const q: LineQuery = {
      fromMm: [450, -300, 400],
      toMm: [450, 300, 400],
      orientation: { kind: "down" },
      speedMmPerS: 500,
    };
    const r = runLineQuery(arm.chain, arm.spec.mountings, q);
    const f = lineFigures(r);
    // The closed form of runLineQuery's test above: q̇1max·d with d = 450 mm, shown in whole mm/s with a thousands
    // separator (the figure is within 1e-6 of it, far from a rounding edge).
    const closedFormMmPerS = arm.spec.joints[0]!.maxSpeedDegPerS! * (Math.PI / 180) * 450;
    expect(f.feasibleText).toBe(`${Math.round(closedFormMmPerS).toLocaleString("en-US")}\u00a0mm/s`);
    expect(f.feasibleMmPerS).toBeCloseTo(closedFormMmPerS, 2);
    expect(f.commandedFeasible).toBe(true);
    expect(f.bottleneckText).toMatch(/^J1 at 300\u00a0mm from the start \(50 % along\)/);
    expect(f.problems).toEqual([]);
    const chart = lineRatesChartInput(r, "lr-test", "Test");
    expect(chart.series.map((s) => s.joint)).toEqual(["J1", "J2", "J3", "J4", "J5", "J6"]);
    expect(chart.positionsMm[0]).toBe(0);
    expect(chart.positionsMm.at(-1)).toBeCloseTo(600, 9);
    expect(chart.bottleneck).toMatchObject({ jointIndex: 0, label: "bottleneck J1" });
  });

  it("reports a line that leaves the reach, with zero speed", () => {
    const q: LineQuery = {
      fromMm: [500, 0, 400],
      toMm: [1500, 0, 400],
      orientation: { kind: "down" },
      speedMmPerS: 500,
    };
    const r = runLineQuery(arm.chain, arm.spec.mountings, q);
    const f = lineFigures(r);
    expect(f.feasibleMmPerS).toBe(0);
    expect(f.bottleneckText).toMatch(/^out of reach at /);
    expect(f.problems.some((p) => p.startsWith("Out of reach from "))).toBe(true);
    expect(lineRatesChartInput(r, "lr-gap", "Gap").gapsMm.length).toBeGreaterThan(0);
  });

  it("says a line no posture follows within the joint ranges is not feasible, with the joint and the place", async () => {
    // The first reproduction of the issue "Numbers at their edges": J3 starts above its 25° limit (arm file).
    const pal = await loadArmFile("arms/yarrowfield-pl-180.json");
    if (!pal.arm) throw new Error("demo arm did not load");
    const q: LineQuery = {
      fromMm: [1500, -800, 1000],
      toMm: [2200, 400, 1500],
      orientation: { kind: "down" },
      speedMmPerS: 1000,
    };
    const f = lineFigures(runLineQuery(pal.arm.chain, pal.arm.spec.mountings, q));
    expect(f.feasibleMmPerS).toBe(0);
    expect(f.commandedFeasible).toBe(false);
    expect(f.commandedText).toMatch(/is not feasible: no start posture follows the whole line/);
    expect(f.feasibleCaveat).toMatch(/^not followed: J3 leaves its range at 0\u00a0mm from the start/);
    expect(f.bottleneckText).toMatch(/^J3 leaves its range at /);
  });
});

/**
 * The DOM-free part of the browser module (src/scripts/lineCheck.ts): runLineCheckForArms runs one line for several
 * arm descriptions, as the comparison page will, and gives per arm exactly what the site's runLineQuery (and so
 * `armdex line`, test/view/lineCheckModel.test.ts) gives; an arm that cannot hold the orientation gets a message,
 * not a result. The descriptions are the arm files as the spec endpoint serves them (validated JSON).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { loadArmFile, type Arm } from "../../src/catalog";
import { runLineCheckForArms, urlWithLine, type LineCheckArm } from "../../src/scripts/lineCheck";
import { runLineQuery, type LineQuery } from "../../src/view/lineCheckModel";

let arms: Arm[];
let specs: LineCheckArm[];

beforeAll(async () => {
  arms = [];
  for (const id of ["corvell-tern-7", "yarrowfield-sable-600"]) {
    const loaded = await loadArmFile(`arms/${id}.json`);
    if (!loaded.arm) throw new Error(`demo arm ${id} did not load`);
    arms.push(loaded.arm);
  }
  // Through JSON, as the browser receives them.
  specs = arms.map((a) => ({
    id: a.id,
    name: a.spec.model,
    spec: JSON.parse(JSON.stringify(a.spec)) as LineCheckArm["spec"],
  }));
});

describe("runLineCheckForArms", () => {
  it("checks every arm, in order, with the same figures as the build (the served JSON compiles to the catalog's chain)", () => {
    const q: LineQuery = {
      fromMm: [400, -200, 250],
      toMm: [450, 200, 200],
      orientation: { kind: "down" },
      speedMmPerS: 800,
    };
    const out = runLineCheckForArms(specs, q);
    expect(out.map((o) => o.id)).toEqual(["corvell-tern-7", "yarrowfield-sable-600"]);
    out.forEach((o, i) => {
      expect(o.error).toBeNull();
      const direct = runLineQuery(arms[i]!.chain, arms[i]!.spec.mountings, q);
      expect(o.result!.feasibleConstantSpeedMmPerS).toBe(direct.feasibleConstantSpeedMmPerS);
      expect(o.result!.bottleneck).toEqual(direct.bottleneck);
    });
  });

  it("gives the closed form q̇1max·d for a level tool-down line in front of the six-axis arm (outside reference)", () => {
    // As in test/view/lineCheckModel.test.ts: corvell-tern-7 has no lateral offset, so at the point of the line
    // nearest axis 1 the velocity is perpendicular to the radius and joint 1 turns at v / d; joint 1 binds there
    // (CHECKS C13 along one direction). The browser module compiles the chain itself from the served JSON, so this
    // checks that path against geometry, not only against the build's runLineQuery.
    const dMm = 450;
    const q: LineQuery = {
      fromMm: [dMm, -300, 400],
      toMm: [dMm, 300, 400],
      orientation: { kind: "down" },
      speedMmPerS: 500,
    };
    const [six] = runLineCheckForArms([specs[0]!], q);
    expect(six!.error).toBeNull();
    const j1RadPerS = arms[0]!.spec.joints[0]!.maxSpeedDegPerS! * (Math.PI / 180);
    const feasible = six!.result!.feasibleConstantSpeedMmPerS!;
    expect(Math.abs(feasible / (j1RadPerS * dMm) - 1)).toBeLessThan(1e-6);
    expect(six!.result!.bottleneck?.joint).toBe("J1");
    expect(Math.abs(six!.result!.bottleneck!.fraction - 0.5)).toBeLessThan(1e-6);
  });

  it("gives a SCARA a message for an orientation other than down, and still checks the others", () => {
    const q: LineQuery = {
      fromMm: [400, -200, 250],
      toMm: [450, 200, 200],
      orientation: { kind: "outward" },
      speedMmPerS: 800,
    };
    const [six, scara] = runLineCheckForArms(specs, q);
    expect(six!.result).not.toBeNull();
    expect(scara!.result).toBeNull();
    expect(scara!.error).toBe(
      'This arm has 4 driven joints: its tool turns about one axis only, so only the "down" orientation can be checked.',
    );
  });

  it("reports a description that does not compile instead of throwing", () => {
    const broken = {
      id: "broken",
      name: "Broken",
      spec: { convention: "dh", joints: [], flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] } },
    } as unknown as LineCheckArm;
    const [o] = runLineCheckForArms([broken], {
      fromMm: [1, 0, 0],
      toMm: [2, 0, 0],
      orientation: { kind: "down" },
      speedMmPerS: 1,
    });
    expect(o!.result).toBeNull();
    expect(o!.error).toMatch(/^The (arm description could not be compiled|line could not be checked): /);
  });
});

describe("urlWithLine", () => {
  it("writes the line into the query, keeps the other keys and sets the fragment", () => {
    const q: LineQuery = {
      fromMm: [1, 2, 3],
      toMm: [4, 5, 6],
      orientation: { kind: "rpy", rpyDeg: [180, 0, 90] },
      speedMmPerS: 250,
    };
    const url = new URL(
      urlWithLine("https://example.test/tools/armdex/compare/?arms=a,b&speed=9#top", q, "line-check"),
    );
    expect(url.pathname).toBe("/tools/armdex/compare/");
    expect(url.searchParams.get("arms")).toBe("a,b");
    expect([
      url.searchParams.get("from"),
      url.searchParams.get("to"),
      url.searchParams.get("orientation"),
      url.searchParams.get("speed"),
    ]).toEqual(["1,2,3", "4,5,6", "180,0,90", "250"]);
    expect(url.hash).toBe("#line-check");
  });
});

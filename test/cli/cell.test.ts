/**
 * Tests of `armdex cell` and `armdex place` (src/cli/cell.ts): the JSON key names are a contract (issues 12 and 13),
 * checked here on a catalog the commands have not seen (a demo gantry copied into a temporary folder with a cell
 * written here), plus the exit codes and messages for bad input. The figures themselves are checked against closed
 * forms in test/core/analysis/cell and test/core/analysis/placement; here one linear move, a single-axis Z stroke,
 * against the trapezoid T = D/V + V/A (CHECKS C17) with V and A read from the arm file.
 */
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cellCommand, placeCommand } from "../../src/cli/cell";

const usage = (m: string) => new Error(`usage: ${m}`);
const GANTRY = fileURLToPath(new URL("../../arms/quenby-span-g3.json", import.meta.url));
let dir = "";
let cellFile = "";
let saved: string | undefined;

const cell = {
  id: "gantry-pick",
  title: "pick and place on a gantry",
  candidates: ["quenby-span-g3"],
  placement: { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  tool: { tcp: { xyzMm: [0, 0, 100], rpyDeg: [0, 0, 0] }, bodies: [{ name: "gripper", massKg: 4, cogMm: [0, 0, 40] }] },
  parts: [{ name: "crate", massKg: 8, cogMm: [0, 0, 200] }],
  targets: [
    { name: "P", positionMm: [1000, 500, 600], rpyDeg: [180, 0, 0] },
    { name: "P-up", relativeTo: "P", offsetMm: [0, 0, 300] },
    { name: "Q", positionMm: [2000, 1000, 800], rpyDeg: [180, 0, 90] },
  ],
  cycle: [
    { to: "P-up", motion: "joint" },
    { to: "P", motion: "linear", dwellS: 0.4, grip: "crate" },
    { to: "P-up", motion: "linear" },
    { to: "Q", motion: "joint", dwellS: 0.3, release: true },
  ],
  requirements: { maxCycleS: 20 },
};

beforeAll(() => {
  saved = process.env.ARMDEX_ARMS_DIR;
  delete process.env.ARMDEX_ARMS_DIR;
  dir = mkdtempSync(join(tmpdir(), "armdex-cell-"));
  mkdirSync(join(dir, "arms", "cells"), { recursive: true });
  writeFileSync(
    join(dir, "arms", "quenby-span-g3.json"),
    readFileSync(GANTRY, "utf8").replace(/"\$schema": "[^"]*",?/, ""),
  );
  cellFile = join(dir, "arms", "cells", "gantry-pick.json");
  writeFileSync(cellFile, JSON.stringify(cell));
});

afterAll(() => {
  if (saved !== undefined) process.env.ARMDEX_ARMS_DIR = saved;
});

describe("armdex cell", () => {
  it("prints every contract key, the arm found beside the cells folder", async () => {
    const out = await cellCommand([cellFile], usage);
    expect(out.stderr).toBe("");
    expect(out.code).toBe(0);
    const json = JSON.parse(out.stdout);
    expect(json.cell).toBe("gantry-pick");
    const arm = json.arms[0];
    for (const k of ["arm", "verdict", "reasons", "toolLoad", "targets", "moves", "cycleTimeS"])
      expect(arm).toHaveProperty(k);
    expect(arm.toolLoad.map((t: { carrying: string | null }) => t.carrying)).toEqual([null, "crate"]);
    for (const t of arm.toolLoad) {
      for (const k of ["carrying", "massKg", "cogMm", "withinRatedPayload", "ratings"]) expect(t).toHaveProperty(k);
      for (const r of t.ratings)
        for (const k of ["joint", "momentNm", "allowedMomentNm", "inertiaKgM2", "allowedInertiaKgM2", "ok"])
          expect(r).toHaveProperty(k);
    }
    for (const t of arm.targets)
      for (const k of ["name", "reachable", "solutions", "jointsDeg", "jointMarginDeg", "inverseCondition"])
        expect(t).toHaveProperty(k);
    for (const m of arm.moves)
      for (const k of ["step", "from", "to", "motion", "timeS", "dwellS", "limitedBy", "feasible", "problem"])
        expect(m).toHaveProperty(k);
    expect(arm.verdict).toBe("pass");
    // The cycle is the sum of the moves and the dwells.
    const sum = arm.moves.reduce((s: number, m: { timeS: number; dwellS: number }) => s + m.timeS + m.dwellS, 0);
    expect(arm.cycleTimeS).toBeCloseTo(sum, 2);
  });

  it("times the 300 mm Z stroke of the linear move as the trapezoid of the Z axis (0.5 %)", async () => {
    const file = JSON.parse(readFileSync(GANTRY, "utf8"));
    const z = file.joints.find((j: { name: string }) => j.name === "Z");
    const v = z.maxSpeedMmPerS / 1000,
      a = (z.maxAccelMmPerS2 ?? z.maxSpeedMmPerS / 0.25) / 1000;
    const d = 0.3;
    const expected = d >= (v * v) / a ? d / v + v / a : 2 * Math.sqrt(d / a);
    const json = JSON.parse((await cellCommand([cellFile], usage)).stdout);
    const down = json.arms[0].moves[1];
    expect(down.motion).toBe("linear");
    expect(Math.abs(down.timeS - expected) / expected).toBeLessThan(0.005);
  });

  it("refuses an unknown --arms id (usage) and reports a bad cell file with its path (exit 1)", async () => {
    await expect(cellCommand([cellFile, "--arms", "no-such-arm"], usage)).rejects.toThrow(
      'unknown arm id "no-such-arm"',
    );
    const bad = join(dir, "arms", "cells", "bad-cell.json");
    writeFileSync(bad, JSON.stringify({ ...cell, id: "bad-cell", cycle: [{ to: "nowhere", motion: "joint" }] }));
    const out = await cellCommand([bad], usage);
    expect(out.code).toBe(1);
    expect(out.stdout).toBe("");
    expect(out.stderr).toContain("bad-cell.json");
    expect(out.stderr).toContain("cycle[0].to");
  });
});

describe("armdex place", () => {
  it("prints the contract keys; rows follow yMm, columns xMm; the area is the feasible count times the cell area", async () => {
    const out = await placeCommand([cellFile, "--arm", "quenby-span-g3", "--grid-mm", "100"], usage);
    expect(out.code).toBe(0);
    const map = JSON.parse(out.stdout);
    for (const k of ["cell", "arm", "gridMm", "planeZMm", "xMm", "yMm", "feasible", "feasibleAreaM2", "best"])
      expect(map).toHaveProperty(k);
    expect(map.gridMm).toBe(100);
    expect(map.feasible.length).toBe(map.yMm.length);
    for (const row of map.feasible) expect(row.length).toBe(map.xMm.length);
    const count = map.feasible.flat().filter((v: number) => v === 1).length;
    expect(map.feasibleAreaM2).toBeCloseTo(count * 0.01, 6);
    // The gantry placed at the origin reaches every target, so the origin is feasible.
    expect(map.feasible[map.yMm.indexOf(0)][map.xMm.indexOf(0)]).toBe(1);
    expect(map.best.positionMm).toHaveLength(3);
  });

  it("refuses a grid step that is not a positive number and a missing --arm", async () => {
    await expect(placeCommand([cellFile, "--arm", "quenby-span-g3", "--grid-mm", "0"], usage)).rejects.toThrow(
      "--grid-mm",
    );
    await expect(placeCommand([cellFile], usage)).rejects.toThrow("--arm");
  });
});

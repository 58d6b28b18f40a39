/**
 * Tests of src/core/analysis/speedMap/output.ts (mapOutput and its bestSlot rule) on hand-made per-cell figures: a
 * map run of the invented planar 3R (test/core/analysis/line/fixtures.ts) whose cells are filled by hand with
 * solutions and guaranteed speeds, so the best branch per cell is known in advance.
 *
 * Independent checks: the best slot is the one with the largest hand-set guaranteed speed; on a tie the one with
 * the larger maximum tool speed, computed here by brute force over the 2³ vertices of the joint-rate box with the
 * planar 3R Jacobian written by hand (column i = ẑ × (p_tool − p_i), Siciliano et al. §3.1.3, from memory).
 */
import { describe, expect, it } from "vitest";
import { FIGURE_TIE_M_PER_S, mapOutput } from "../../../../src/core/analysis/speedMap/output";
import { createMapRun, storeQ, type MapRun } from "../../../../src/core/analysis/speedMap/state";
import { DEFAULT_SPEED_MAP } from "../../../../src/core/analysis/speedMap/types";
import { expectClose } from "../../../helpers/expectClose";
import { A1, A2, A3, CHAIN_3R, W3R } from "../line/fixtures";

function newRun(): MapRun {
  return createMapRun(
    CHAIN_3R,
    "down",
    { ...DEFAULT_SPEED_MAP, stepMm: 100, boundsMm: { rMax: 200, zMin: 0, zMax: 100 } },
    undefined,
  );
}

/** Stores q at `cell` with a hand-set guaranteed speed (m/s) and det J; returns the slot. */
function put(run: MapRun, cell: number, q: number[], gMPerS: number, det: number): number {
  const slot = storeQ(run, cell, Float64Array.from(q));
  expect(slot).toBeGreaterThanOrEqual(0);
  run.guaranteedVal[cell * run.K + slot] = gMPerS;
  run.detVal[cell * run.K + slot] = det;
  return slot;
}

/** Maximum tool speed of the planar 3R at q, m/s, by brute force over the joint-rate box vertices. */
function maxSpeedBrute(q: readonly number[]): number {
  const a = [A1, A2, A3];
  const pts: number[][] = [[0, 0]];
  let angle = 0;
  for (let i = 0; i < 3; i++) {
    angle += q[i]!;
    const p = pts[i]!;
    pts.push([p[0]! + a[i]! * Math.cos(angle), p[1]! + a[i]! * Math.sin(angle)]);
  }
  const tip = pts[3]!;
  const cols = [0, 1, 2].map((i) => [-(tip[1]! - pts[i]![1]!), tip[0]! - pts[i]![0]!]);
  let best = 0;
  for (let v = 0; v < 8; v++) {
    let x = 0,
      y = 0;
    for (let i = 0; i < 3; i++) {
      const s = (v >> i) & 1 ? 1 : -1;
      x += s * W3R[i]! * cols[i]![0]!;
      y += s * W3R[i]! * cols[i]![1]!;
    }
    best = Math.max(best, Math.hypot(x, y));
  }
  return best;
}

const QA = [0.3, 1.2, -0.5];
const QB = [0.3, 0.2, -0.5]; // nearly stretched elbow: a larger maximum tool speed than QA
const QC = [-0.4, -1.0, 0.8];

describe("mapOutput: best branch per cell on hand-made figures", () => {
  it("takes the slot with the largest guaranteed speed, in mm/s, with its joints and det sign", () => {
    const run = newRun();
    expect(run.cells).toBeGreaterThanOrEqual(4);
    put(run, 0, QA, 0.2, 1);
    put(run, 0, QB, 0.5, -2);
    put(run, 0, QC, 0.3, 3);
    put(run, 1, QC, 0.1, 0);
    const out = mapOutput(run);
    expect(out.guaranteedMmPerS[0]).toBeCloseTo(500, 9);
    expectClose(Array.from(out.joints.subarray(0, 3)), QB, 0, "cell 0 joints = slot of 0.5 m/s");
    expect(out.detSign[0]).toBe(-1);
    expect(out.maxMmPerS[0]).toBeCloseTo(1000 * maxSpeedBrute(QB), 6);
    // A single solution is the best one; det J = 0 gives sign 0.
    expect(out.guaranteedMmPerS[1]).toBeCloseTo(100, 9);
    expectClose(Array.from(out.joints.subarray(3, 6)), QC, 0, "cell 1 joints");
    expect(out.detSign[1]).toBe(0);
    expect(out.maxMmPerS[1]).toBeCloseTo(1000 * maxSpeedBrute(QC), 6);
    // Empty cells: NaN figures, no branch, not counted.
    for (let c = 2; c < run.cells; c++) {
      expect(Number.isNaN(out.guaranteedMmPerS[c]!)).toBe(true);
      expect(Number.isNaN(out.maxMmPerS[c]!)).toBe(true);
      expect(out.branch[c]).toBe(-1);
    }
    expect(out.reachableCells).toBe(2);
    // Cells 0 (QB, elbow q2 > 0) and 1 (QC, elbow q2 < 0) are on different branches, each named once.
    expect(out.branch[0]).toBeGreaterThanOrEqual(0);
    expect(out.branch[1]).toBeGreaterThanOrEqual(0);
    expect(out.branch[0]).not.toBe(out.branch[1]);
    expect(out.branchNames).toHaveLength(2);
  });

  it("a tie in guaranteed speed goes to the larger maximum tool speed (brute force), in either order", () => {
    expect(maxSpeedBrute(QB)).toBeGreaterThan(maxSpeedBrute(QA) * 1.01);
    const run = newRun();
    put(run, 0, QA, 0.4, 1);
    put(run, 0, QB, 0.4, -1);
    put(run, 1, QB, 0.4, -1);
    put(run, 1, QA, 0.4, 1);
    // Within FIGURE_TIE_M_PER_S (0.1 mm/s, the published resolution) counts as a tie too.
    put(run, 2, QA, 0.4 + 0.5 * FIGURE_TIE_M_PER_S, 1);
    put(run, 2, QB, 0.4, -1);
    const out = mapOutput(run);
    for (const c of [0, 1, 2]) {
      expectClose(Array.from(out.joints.subarray(3 * c, 3 * c + 3)), QB, 0, `cell ${c} joints`);
      expect(out.maxMmPerS[c]).toBeCloseTo(1000 * maxSpeedBrute(QB), 6);
      expect(out.detSign[c]).toBe(-1);
    }
    // The guaranteed speed reported is the chosen solution's own figure.
    expect(out.guaranteedMmPerS[0]).toBeCloseTo(400, 9);
    expect(out.guaranteedMmPerS[1]).toBeCloseTo(400, 9);
    expect(out.guaranteedMmPerS[2]).toBeCloseTo(400, 9);
  });

  it("a tie with equal maximum tool speeds goes to det J > 0, in either order (mirror image: same speeds by symmetry)", () => {
    const mirror = QA.map((v) => -v);
    // Reflection across the x axis keeps every vertex speed: the brute-force maxima agree.
    expect(maxSpeedBrute(mirror)).toBeCloseTo(maxSpeedBrute(QA), 12);
    const run = newRun();
    put(run, 0, QA, 0.4, 1);
    put(run, 0, mirror, 0.4, -1);
    put(run, 1, mirror, 0.4, -1);
    put(run, 1, QA, 0.4, 1);
    const out = mapOutput(run);
    expectClose(Array.from(out.joints.subarray(0, 3)), QA, 0, "cell 0: the positive det");
    expectClose(Array.from(out.joints.subarray(3, 6)), QA, 0, "cell 1: the positive det, stored second");
    expect([out.detSign[0], out.detSign[1]]).toEqual([1, 1]);
  });

  it("a slot better by more than the tie width wins even with a smaller maximum tool speed", () => {
    const run = newRun();
    put(run, 0, QB, 0.4, -1);
    put(run, 0, QA, 0.4 + 2 * FIGURE_TIE_M_PER_S, 1);
    const out = mapOutput(run);
    expectClose(Array.from(out.joints.subarray(0, 3)), QA, 0, "strictly better guaranteed speed");
    expect(out.guaranteedMmPerS[0]).toBeCloseTo(400 + 2000 * FIGURE_TIE_M_PER_S, 9);
    expect(out.maxMmPerS[0]).toBeCloseTo(1000 * maxSpeedBrute(QA), 6);
  });
});

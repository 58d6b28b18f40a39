/**
 * Speed maps of the ortho-parallel class in closed form (`closedForm: "auto"`, the default) against the same maps
 * solved numerically (`closedForm: false`: seeded damped least squares, continuation and joint-space sweeps), as
 * issue 14 §1 asks: the same reachable cells, figures within the solver tolerance, det J signs and loci over the
 * same points. The numeric path is an independent solver (kinematics/inverse.ts, checked against Orocos KDL poses
 * and by its own tests); the closed form is checked by test/core/kinematics/orthoParallel.test.ts.
 *
 * What may differ (measured on the five demo arms of the class with test/bench/closedFormMaps.ts, and here): the
 * closed form holds every solution of a cell, so where the numeric searches missed a branch (an island behind axis 1,
 * a second shoulder root) its best branch is faster or, at equal guaranteed speed, has the larger maximum speed;
 * never the other way, but on a family of solutions (wrist centre on axis 1: one column of the grid), where the
 * guaranteed speed is 0 either way and the maximum speed belongs to whichever member each search kept. A pose exactly
 * on a singularity has det J = 0 in closed form and a sign from the solver tolerance in the numeric map.
 * Arms: the generic 6R of CHECKS §0 (test/helpers/testArms.ts) and a dimension-drawing arm with a lateral offset.
 */
import { describe, expect, it } from "vitest";
import { compileChain, type ArmKinematicsInput, type Chain } from "../../../../src/core";
import { DEFAULT_SPEED_MAP, toolSpeedMap, type ToolSpeedMap } from "../../../../src/core/analysis/speedMap/speedMap";
import { createMapRun } from "../../../../src/core/analysis/speedMap/state";
import { generic6rDh, scaraRrprDh } from "../../../helpers/testArms";

const OPTIONS = { ...DEFAULT_SPEED_MAP, stepMm: 20, discoveryEveryCells: 10 };

function dimensionsArm(): ArmKinematicsInput {
  // Lengths of our own choosing (not any arm's), with a lateral offset b and mixed joint senses.
  return {
    convention: "dimensions",
    dimensions: { a1Mm: 120, a2Mm: 90, bMm: 60, c1Mm: 400, c2Mm: 560, c3Mm: 520, c4Mm: 90 },
    joints: [170, 120, 150, 190, 125, 360].map((r, i) => ({
      name: `J${i + 1}`,
      kind: "revolute" as const,
      rangeDeg: [-r, i === 2 ? 80 : r],
      maxSpeedDegPerS: [180, 160, 170, 300, 300, 450][i]!,
      sign: i === 2 || i === 4 ? -1 : 1,
      zeroOffsetDeg: i === 1 ? 90 : 0,
    })),
  } as ArmKinematicsInput;
}

interface Comparison {
  readonly onlyNumeric: number;
  readonly onlyClosed: number;
  readonly both: number;
  /** Largest amount by which the numeric figure exceeds the closed-form one, mm/s. */
  readonly maxNumericAboveMmPerS: number;
  /** Cells where the closed form found a branch faster by more than 1 mm/s (one the numeric searches missed). */
  readonly closedFaster: number;
  readonly detSignDiffers: number;
  /** Cells where the closed form kept a worse branch: lower guaranteed speed, or equal and a lower maximum speed. */
  readonly closedWorse: number;
}

function compare(a: ToolSpeedMap, b: ToolSpeedMap): Comparison {
  let onlyNumeric = 0,
    onlyClosed = 0,
    both = 0,
    dg = 0,
    faster = 0,
    det = 0,
    worse = 0;
  for (let i = 0; i < a.guaranteedMmPerS.length; i++) {
    const ra = Number.isFinite(a.guaranteedMmPerS[i]!),
      rb = Number.isFinite(b.guaranteedMmPerS[i]!);
    if (ra && !rb) onlyNumeric++;
    if (rb && !ra) onlyClosed++;
    if (!ra || !rb) continue;
    both++;
    const d = a.guaranteedMmPerS[i]! - b.guaranteedMmPerS[i]!;
    dg = Math.max(dg, d);
    if (d < -1) faster++;
    // A pose exactly on a singularity has det J = 0 in closed form; the numeric solution, within its tolerance of
    // it, keeps a sign: counted only where both have one.
    if (a.detSign[i] !== b.detSign[i] && a.detSign[i] !== 0 && b.detSign[i] !== 0) det++;
    if (d > 1 || (Math.abs(d) <= 0.1 && a.maxMmPerS[i]! > b.maxMmPerS[i]! + 1)) worse++;
  }
  return {
    onlyNumeric,
    onlyClosed,
    both,
    maxNumericAboveMmPerS: dg,
    closedFaster: faster,
    detSignDiffers: det,
    closedWorse: worse,
  };
}

/** Locus points of one kind, rounded to 1 mm, and the share of `a`'s within one grid step of one of `b`'s. */
function lociShare(a: ToolSpeedMap, b: ToolSpeedMap, stepMm: number): { points: number; share: number } {
  const pts = (m: ToolSpeedMap) =>
    m.loci.flatMap((l) => l.polylinesMm.flat().map((p) => [l.kind, p[0], p[1]] as const));
  const pa = pts(a),
    pb = pts(b);
  let near = 0;
  for (const [k, r, z] of pa)
    if (pb.some(([k2, r2, z2]) => k2 === k && Math.hypot(r2 - r, z2 - z) <= stepMm * Math.SQRT2)) near++;
  return { points: pa.length, share: pa.length ? near / pa.length : 1 };
}

describe("speed maps in closed form against the numeric maps (ortho-parallel class)", () => {
  const arms: [string, Chain][] = [
    ["generic 6R (CHECKS §0)", compileChain(generic6rDh())],
    ["dimension drawing with a lateral offset", compileChain(dimensionsArm())],
  ];
  for (const [name, chain] of arms)
    for (const orientation of ["down", "outward"] as const)
      it(`${name}, tool ${orientation}: same cells, figures, det signs and loci`, () => {
        expect(createMapRun(chain, orientation, OPTIONS, undefined).closedContinuation).toBe(true);
        const numeric = toolSpeedMap(chain, orientation, { ...OPTIONS, closedForm: false });
        const closed = toolSpeedMap(chain, orientation, OPTIONS);
        const c = compare(numeric, closed);
        expect(c.both).toBeGreaterThan(1000);
        // Every cell the numeric searches reach, the closed form reaches (it may reach a few more: islands).
        expect(c.onlyNumeric).toBe(0);
        expect(c.onlyClosed).toBeLessThanOrEqual(0.002 * c.both);
        // Figures within the solver tolerance (the numeric solutions are 1e-6 m, 1e-5 rad from exact): never below
        // the numeric map's; above it only where the closed form holds a branch the numeric searches missed.
        expect(c.maxNumericAboveMmPerS).toBeLessThan(1);
        expect(c.closedFaster).toBeLessThanOrEqual(0.005 * c.both);
        expect(c.detSignDiffers).toBeLessThanOrEqual(0.002 * c.both);
        // The best branch is never worse but on a family of solutions (wrist centre on axis 1: one column), where
        // the maximum speed belongs to whichever member each search kept.
        expect(c.closedWorse).toBeLessThanOrEqual(0.003 * c.both);
        // Loci over the same points: each one's points lie within a cell diagonal of the other's, but for a few.
        const ab = lociShare(numeric, closed, OPTIONS.stepMm),
          ba = lociShare(closed, numeric, OPTIONS.stepMm);
        expect(ab.share).toBeGreaterThan(0.95);
        expect(ba.share).toBeGreaterThan(0.95);
      });

  it("'auto' keeps the numeric solver for arms outside the class", () => {
    const scara = compileChain(scaraRrprDh());
    expect(createMapRun(scara, "down", OPTIONS, undefined).closedContinuation).toBe(false);
  });
});

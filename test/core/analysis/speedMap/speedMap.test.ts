/**
 * Tests of src/core/analysis/speedMap/ (toolSpeedMap) and its singularity loci (loci.ts), on the generic 6R of
 * CHECKS §0 (standard DH, θ offsets 0, all ranges ±180°), 20 mm grid.
 *
 * Closed forms the loci are checked against (derived here from CHECKS C5/C6, and the arm-plane formulas checked
 * against the independent mathjs DH product below). In the vertical plane of the arm (horizontal ρ along the arm's
 * azimuth, height h):
 *   wrist centre  W = (a1 + a2c2 + a3c23 − d4s23,  d1 − a2s2 − a3s23 − d4c23)
 *   forearm axis  z3 = (−s23, −c23)   (axis 4, through W)
 *   flange        F = W + d6·t        (t = tool axis z6)
 * The map's side plane holds the target at r ≥ 0 along a fixed radial: the arm reaches it from the front (ρ = r) or
 * from the back (joint 1 turned by 180°, ρ = −r). Tool axis t in the map plane: "down" (0, −1), "outward" (+1, 0);
 * in the arm plane (s·t_r, t_z) with s = +1 front, −1 back.
 * - Wrist (CHECKS C5: q5 ∈ {0, π}, axes 4 and 6 in line). At q5 = 0, z5 = z3, so the forearm axis is the tool axis:
 *   z3 = t, i.e. q23 = atan2(−t_ρ, −t_h). With q23 fixed, W runs over a circle of radius a2 as q2 turns, centred at
 *   (a1 + a3c23 − d4s23, d1 − a3s23 − d4c23); the flange circle is that centre + d6·t. Two circles per orientation
 *   (front, back). q5 = π (z3 = −t) is the other wrist condition, but there joint 5 sits at its ±180° limit: a
 *   continuous solution can touch it and never cross it, so it is no zero crossing of det J within a sheet and
 *   is not expected as a locus.
 * - Shoulder (C5: W on axis 1, ρ_w = 0): the flange is at r = d6·t_r: r = 0 (down), r = d6 = 100 mm (outward).
 * - Elbow (C5/C6: W in the plane of axes 2 and 3): |W − O1| = a2 + L or |a2 − L|, L = sqrt(a3² + d4²), with O1 the
 *   axis-2 point (s·a1, d1) in the map plane and W = F − d6·t.
 * Tolerance: a locus point is interpolated on a cell edge whose ends straddle the curve, so it lies within one cell
 * diagonal (step·√2) of the curve; the shoulder line within one step in r.
 * Grid: 20 mm with IK discovery every 10 cells, i.e. the default discovery spacing of 200 mm (20 cells of 10 mm).
 * Branch completeness is checked against a closed-form inverse kinematics of this arm (Pieper's decoupling of the
 * spherical wrist: position of the wrist centre, then the wrist angles; Spong et al., §3.3 [from memory]), whose
 * solutions are verified against the mathjs DH product before use.
 *
 * Also checked per cell: the figures of the best branch against direct recomputation (forward kinematics, speed
 * kernels), and the kept joint values reproduce the cell's target.
 */
import { describe, expect, it } from "vitest";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../../src/core";
import { createSpeedScratch, guaranteedLineSpeed, maxToolSpeed } from "../../../../src/core/measures/speed";
import {
  DEFAULT_SPEED_MAP,
  toolSpeedMap,
  type ReferenceOrientation,
  type ToolSpeedMap,
} from "../../../../src/core/analysis/speedMap/speedMap";
import { expectClose } from "../../../helpers/expectClose";
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { mulberry32, uniform } from "../../../helpers/prng";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI } from "../../../helpers/testArms";

const { a1, a2, a3, d1, d4, d6 } = GENERIC_6R_SI;
const L = Math.hypot(a3, d4);
const STEP_MM = 20;
const CELL_DIAGONAL_MM = STEP_MM * Math.SQRT2;

const chain = compileChain(generic6rDh());
const maps = new Map<ReferenceOrientation, ToolSpeedMap>();
/** The map of one orientation, computed once (about 3 s each). */
function mapOf(orientation: ReferenceOrientation): ToolSpeedMap {
  let map = maps.get(orientation);
  if (!map)
    maps.set(
      orientation,
      (map = toolSpeedMap(chain, orientation, { ...DEFAULT_SPEED_MAP, stepMm: STEP_MM, discoveryEveryCells: 10 })),
    );
  return map;
}

/** Tool axis in the map plane (r, z). */
const TOOL: Record<ReferenceOrientation, readonly [number, number]> = { down: [0, -1], outward: [1, 0] };

/** Arm-plane wrist centre (ρ, h) and forearm axis of the generic 6R, m (CHECKS C5/C6 layout). */
function armPlane(q2: number, q3: number): { w: [number, number]; forearm: [number, number] } {
  const c2 = Math.cos(q2),
    s2 = Math.sin(q2),
    c23 = Math.cos(q2 + q3),
    s23 = Math.sin(q2 + q3);
  return { w: [a1 + a2 * c2 + a3 * c23 - d4 * s23, d1 - a2 * s2 - a3 * s23 - d4 * c23], forearm: [-s23, -c23] };
}

/** Closed-form flange circles (centre in the map plane, mm; radius a2) of the wrist singularity q5 = 0: front, back. */
function wristCircles(orientation: ReferenceOrientation): { c: [number, number]; rMm: number }[] {
  const [tr, tz] = TOOL[orientation];
  return [1, -1].map((s) => {
    const t: [number, number] = [s * tr, tz];
    const q23 = Math.atan2(-t[0], -t[1]); // (−s23, −c23) = t
    const cRho = a1 + a3 * Math.cos(q23) - d4 * Math.sin(q23) + d6 * t[0];
    const cH = d1 - a3 * Math.sin(q23) - d4 * Math.cos(q23) + d6 * t[1];
    return { c: [s * cRho * 1000, cH * 1000], rMm: a2 * 1000 };
  });
}

function distanceToWristSet(p: readonly [number, number], orientation: ReferenceOrientation): number {
  return Math.min(
    ...wristCircles(orientation).map(({ c, rMm }) => Math.abs(Math.hypot(p[0] - c[0], p[1] - c[1]) - rMm)),
  );
}

function distanceToShoulderSet(p: readonly [number, number], orientation: ReferenceOrientation): number {
  return Math.abs(p[0] - d6 * TOOL[orientation][0] * 1000);
}

function distanceToElbowSet(p: readonly [number, number], orientation: ReferenceOrientation): number {
  const [tr, tz] = TOOL[orientation];
  const w = [p[0] - d6 * tr * 1000, p[1] - d6 * tz * 1000];
  let best = Infinity;
  for (const s of [1, -1]) {
    const rho = Math.hypot(w[0]! - s * a1 * 1000, w[1]! - d1 * 1000);
    best = Math.min(best, Math.abs(rho - (a2 + L) * 1000), Math.abs(rho - Math.abs(a2 - L) * 1000));
  }
  return best;
}

const DISTANCE = { wrist: distanceToWristSet, shoulder: distanceToShoulderSet, elbow: distanceToElbowSet } as const;

const wrapAngle = (a: number) => Math.atan2(Math.sin(a), Math.cos(a));

/**
 * Closed-form inverse kinematics of the generic 6R (rad, up to 8 solutions) for a flange pose T (nested 4×4, m):
 * W = p − d6·z; q1 = azimuth of W (front, ρ = |W_xy|) or azimuth + π (back, ρ = −|W_xy|); in the arm plane
 * (x, y) = (ρ − a1, d1 − h) = R(q2)·[(a2, 0) + R(q3)·(a3, d4)] gives cos(q3 + atan2(d4, a3)) by the law of cosines and
 * q2 = atan2(y, x) − atan2(k_y, k_x); the wrist R36 = R03ᵀR = Rz(q4)·Ry(−q5)·Rz(q6) (α4 = +90°, α5 = −90°) gives
 * ZYZ angles with θ = −q5, both signs. R03 from the mathjs DH product.
 */
function closedFormIk(T: readonly (readonly number[])[]): number[][] {
  const z = [T[0]![2]!, T[1]![2]!, T[2]![2]!];
  const w = [T[0]![3]! - d6 * z[0]!, T[1]![3]! - d6 * z[1]!, T[2]![3]! - d6 * z[2]!];
  const out: number[][] = [];
  const azimuth = Math.atan2(w[1]!, w[0]!),
    radial = Math.hypot(w[0]!, w[1]!);
  for (const [q1, rho] of [
    [azimuth, radial],
    [wrapAngle(azimuth + Math.PI), -radial],
  ] as const) {
    const x = rho - a1,
      y = d1 - w[2]!;
    const cosPsi = (x * x + y * y - a2 * a2 - L * L) / (2 * a2 * L);
    if (Math.abs(cosPsi) > 1) continue;
    for (const elbow of [1, -1]) {
      const q3 = wrapAngle(elbow * Math.acos(cosPsi) - Math.atan2(d4, a3));
      const kx = a2 + a3 * Math.cos(q3) - d4 * Math.sin(q3),
        ky = a3 * Math.sin(q3) + d4 * Math.cos(q3);
      const q2 = wrapAngle(Math.atan2(y, x) - Math.atan2(ky, kx));
      const r03 = dhFrameReference(GENERIC_6R_SI.rows, [q1, q2, q3, 0, 0, 0], 3);
      const r36 = (i: number, j: number) => r03[0]![i]! * T[0]![j]! + r03[1]![i]! * T[1]![j]! + r03[2]![i]! * T[2]![j]!;
      for (const flip of [1, -1]) {
        const theta = flip * Math.acos(Math.max(-1, Math.min(1, r36(2, 2)))),
          st = Math.sin(theta);
        out.push([
          q1,
          q2,
          q3,
          Math.atan2(r36(1, 2) / st, r36(0, 2) / st),
          -theta,
          Math.atan2(r36(2, 1) / st, -r36(2, 0) / st),
        ]);
      }
    }
  }
  return out;
}

/** Target flange pose of a map cell (module doc of speedMap.ts): at (r, 0, z) m, tool down or outward. */
function cellTarget(orientation: ReferenceOrientation, rM: number, zM: number): number[][] {
  return orientation === "down"
    ? [
        [1, 0, 0, rM],
        [0, -1, 0, 0],
        [0, 0, -1, zM],
        [0, 0, 0, 1],
      ] // x outward, z down
    : [
        [0, 0, 1, rM],
        [0, 1, 0, 0],
        [-1, 0, 0, zM],
        [0, 0, 0, 1],
      ]; // z outward, x down
}
const TOLERANCE_MM = { wrist: CELL_DIAGONAL_MM, shoulder: STEP_MM, elbow: CELL_DIAGONAL_MM } as const;

describe("closed-form loci of the generic 6R (the reference itself)", () => {
  it("the arm-plane wrist centre and forearm axis match the mathjs DH product at random poses", () => {
    // Independent check of the formulas above: W = origin of DH frame 4, z3 = z column of frame 3 (Spong et al.,
    // ch. 3), turned by q1 about the vertical axis 1. Tolerance 1e-12.
    const rand = mulberry32(5101);
    for (let k = 0; k < 20; k++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const { w, forearm } = armPlane(q[1]!, q[2]!);
      const t4 = dhFrameReference(GENERIC_6R_SI.rows, q, 4),
        t3 = dhFrameReference(GENERIC_6R_SI.rows, q, 3);
      const c1 = Math.cos(q[0]!),
        s1 = Math.sin(q[0]!);
      expectClose([t4[0]![3]!, t4[1]![3]!, t4[2]![3]!], [w[0] * c1, w[0] * s1, w[1]], 1e-12, "W");
      expectClose([t3[0]![2]!, t3[1]![2]!, t3[2]![2]!], [forearm[0] * c1, forearm[0] * s1, forearm[1]], 1e-12, "z3");
    }
  });

  it("poses with q5 = 0 and q23 as stated put the flange on the wrist circles with the tool axis as stated", () => {
    // Checks the circle construction with the mathjs DH product: q1 = 0 (front) or π (back), q2 anywhere,
    // q3 = q23 − q2, q5 = 0; the flange must lie on the circle, with z6 = tool axis. Tolerance 1e-9 mm, 1e-12.
    for (const orientation of ["down", "outward"] as const) {
      const [tr, tz] = TOOL[orientation];
      const circles = wristCircles(orientation);
      [1, -1].forEach((s, k) => {
        const q23 = Math.atan2(-s * tr, -tz);
        for (const q2 of [-2.5, -0.4, 0.3, 1.9]) {
          const q = [s > 0 ? 0 : Math.PI, q2, q23 - q2, 0.2, 0, -0.2];
          const t = dhFrameReference(GENERIC_6R_SI.rows, q);
          const p: [number, number] = [t[0]![3]! * 1000, t[2]![3]! * 1000]; // map r = base x (q1 ∈ {0, π} keeps y = 0)
          const { c, rMm } = circles[k]!;
          expectClose(Math.hypot(p[0] - c[0], p[1] - c[1]), rMm, 1e-9, `${orientation} circle ${k}`);
          expectClose([t[0]![2]!, t[2]![2]!], [tr, tz], 1e-12, `${orientation} circle ${k}: tool axis`);
        }
      });
    }
  });
});

describe("closed-form inverse kinematics of the generic 6R (the branch reference)", () => {
  it("closedFormIk returns 4 or 8 solutions that all reproduce random poses, one of them the pose itself", () => {
    // Verified against the independent mathjs DH product; tolerance 1e-9 (pose entries) and 1e-9 rad. Four when the
    // wrist centre is beyond the reach of the other side (CHECKS C6: the shoulder offset a1 shortens it by 2a1).
    const rand = mulberry32(5102);
    let poses = 0;
    while (poses < 30) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      if (Math.abs(Math.sin(q[4]!)) < 0.05) continue; // the wrist angles are undefined at q5 = 0 (CHECKS C5)
      poses++;
      const t = dhFrameReference(GENERIC_6R_SI.rows, q);
      const solutions = closedFormIk(t);
      expect([4, 8]).toContain(solutions.length);
      for (const sol of solutions)
        expectClose(flat4(dhFrameReference(GENERIC_6R_SI.rows, sol)), flat4(t), 1e-9, `q = ${q}`);
      const own = solutions.map((sol) => Math.max(...sol.map((v, i) => Math.abs(wrapAngle(v - q[i]!)))));
      expect(Math.min(...own)).toBeLessThan(1e-9);
    }
  });
});

describe.each(["down", "outward"] as const)(
  "toolSpeedMap(generic 6R, %s, 20 mm): best branch per cell",
  (orientation) => {
    it("at 1500 sampled reachable cells the kept branch has the highest guaranteed speed of all closed-form solutions", () => {
      // Issue 3: "several branches exist — keep the best per cell". Reference: closedFormIk (every solution within
      // the ±180° ranges), figures by jacobianInto + guaranteedLineSpeed (checked in speed.test.ts). Tolerance 1e-3
      // relative + 1e-3 mm/s (the map's IK stops at 1e-6 m).
      const map = mapOf(orientation);
      const g = map.grid,
        s = createScratch(chain),
        sp = createSpeedScratch(6);
      const rand = mulberry32(orientation === "down" ? 5301 : 5302);
      const missed: string[] = [];
      let checked = 0;
      while (checked < 1500) {
        const cell = Math.floor(rand() * g.nx * g.ny);
        if (map.branch[cell]! < 0) continue;
        checked++;
        const ix = cell % g.nx,
          iy = (cell - ix) / g.nx;
        const rMm = g.rMinMm + ix * g.stepMm,
          zMm = g.zMinMm + iy * g.stepMm;
        let best = 0,
          bestQ: number[] = [];
        for (const q of closedFormIk(cellTarget(orientation, rMm / 1000, zMm / 1000))) {
          const f = forwardInto(chain, q, s);
          const v =
            guaranteedLineSpeed(
              jacobianInto(new Float64Array(36), chain, s, f[3]!, f[7]!, f[11]!),
              6,
              chain.maxSpeedSi,
              sp,
            ) * 1000;
          if (v > best) {
            best = v;
            bestQ = q;
          }
        }
        const got = map.guaranteedMmPerS[cell]!;
        if (got < best * (1 - 1e-3) - 1e-3) {
          missed.push(
            `(${rMm}, ${zMm}) mm: ${got.toFixed(1)} mm/s kept, ${best.toFixed(1)} mm/s at q = [${bestQ.map((v) => ((v * 180) / Math.PI).toFixed(1))}]°`,
          );
        }
      }
      expect(
        missed,
        `${missed.length} of ${checked} cells keep a slower branch than the best one; first: ${missed.slice(0, 8).join("; ")}`,
      ).toEqual([]);
    });
  },
);

describe.each(["down", "outward"] as const)("toolSpeedMap(generic 6R, %s, 20 mm): singularity loci", (orientation) => {
  it("every locus point lies within one cell of the closed-form set of its kind (none labelled other)", () => {
    const map = mapOf(orientation);
    const bad: string[] = [];
    let points = 0;
    for (const locus of map.loci) {
      for (const line of locus.polylinesMm) {
        for (const p of line) {
          points++;
          if (locus.kind === "other") {
            bad.push(`other at (${p[0].toFixed(0)}, ${p[1].toFixed(0)})`);
            continue;
          }
          const d = DISTANCE[locus.kind](p, orientation);
          if (d > TOLERANCE_MM[locus.kind]) {
            const near = (["wrist", "shoulder", "elbow"] as const).filter(
              (k) => DISTANCE[k](p, orientation) <= TOLERANCE_MM[k],
            );
            bad.push(
              `${locus.kind} at (${p[0].toFixed(0)}, ${p[1].toFixed(0)}) is ${d.toFixed(0)} mm off${near.length ? ` (it lies on the ${near.join("/")} set)` : ""}`,
            );
          }
        }
      }
    }
    expect(points, "the map has loci").toBeGreaterThan(100);
    expect(
      bad.length,
      `${bad.length} of ${points} locus points off their closed-form set; first: ${bad.slice(0, 12).join("; ")}`,
    ).toBe(0);
  });

  it("the wrist circles and the shoulder line are found where the map reaches across them", () => {
    // Converse check: sample the closed-form curves every 10 mm; keep samples at least two cells inside the grid and
    // inside the reachable annulus of the wrist centre (CHECKS C6: |W − O1| within [|a2 − L|, a2 + L], either side)
    // and two cells away from the other closed-form sets; at least 90 % of them must have a locus point of the right
    // kind within one cell diagonal.
    const map = mapOf(orientation);
    const g = map.grid;
    const rMax = g.rMinMm + (g.nx - 1) * g.stepMm,
      zMax = g.zMinMm + (g.ny - 1) * g.stepMm;
    const [tr, tz] = TOOL[orientation];
    const margin = 2 * g.stepMm;
    const inside = (p: [number, number]) => {
      if (p[0] < g.rMinMm + margin || p[0] > rMax - margin || p[1] < g.zMinMm + margin || p[1] > zMax - margin)
        return false;
      const w = [p[0] - d6 * tr * 1000, p[1] - d6 * tz * 1000];
      return [1, -1].some((s) => {
        const rho = Math.hypot(w[0]! - s * a1 * 1000, w[1]! - d1 * 1000);
        return rho > Math.abs(a2 - L) * 1000 + margin && rho < (a2 + L) * 1000 - margin;
      });
    };
    const points = (kind: "wrist" | "shoulder") =>
      map.loci.filter((l) => l.kind === kind).flatMap((l) => l.polylinesMm.flat());
    const covered = (kind: "wrist" | "shoulder", samples: [number, number][]) => {
      const found = points(kind);
      const kept = samples.filter(
        (p) =>
          inside(p) &&
          (["wrist", "shoulder", "elbow"] as const).every((k) => k === kind || DISTANCE[k](p, orientation) > margin),
      );
      const hit = kept.filter((p) => found.some((f) => Math.hypot(f[0] - p[0], f[1] - p[1]) <= CELL_DIAGONAL_MM));
      return { kept: kept.length, hit: hit.length };
    };
    const wristSamples = wristCircles(orientation).flatMap(({ c, rMm }) =>
      Array.from({ length: Math.round((2 * Math.PI * rMm) / 10) }, (_, i): [number, number] => {
        const a = (i * 10) / rMm;
        return [c[0] + rMm * Math.cos(a), c[1] + rMm * Math.sin(a)];
      }),
    );
    const r0 = d6 * tr * 1000;
    const shoulderSamples = Array.from({ length: Math.round((zMax - g.zMinMm) / 10) }, (_, i): [number, number] => [
      r0,
      g.zMinMm + 10 * i,
    ]);
    for (const [kind, samples] of [
      ["wrist", wristSamples],
      ["shoulder", shoulderSamples],
    ] as const) {
      const { kept, hit } = covered(kind, samples);
      expect(kept, `${kind}: samples to check`).toBeGreaterThan(50);
      expect(
        hit / kept,
        `${kind}: ${hit} of ${kept} closed-form samples have a locus point nearby`,
      ).toBeGreaterThanOrEqual(0.9);
    }
  });
});

describe("toolSpeedMap(generic 6R, down, 20 mm): per-cell figures", () => {
  it("the kept joint values reach each cell's target, and the cell figures equal the speed kernels at those joints", () => {
    // Target of a cell (module doc): flange at (r, 0, z) (base x is the radial at the zero pose), z6 = −ẑ.
    // Checked with the independent mathjs DH product; figures recomputed from jacobianInto + speed.ts (mm/s).
    const map = mapOf("down");
    const g = map.grid,
      s = createScratch(chain),
      sp = createSpeedScratch(6),
      w = chain.maxSpeedSi;
    const rand = mulberry32(5201);
    let checked = 0;
    for (let tries = 0; tries < 5000 && checked < 200; tries++) {
      const cell = Math.floor(rand() * g.nx * g.ny);
      if (map.branch[cell]! < 0) continue;
      checked++;
      const ix = cell % g.nx,
        iy = (cell - ix) / g.nx;
      const q = Array.from(map.joints.subarray(cell * 6, cell * 6 + 6));
      const t = dhFrameReference(GENERIC_6R_SI.rows, q);
      // Continuation IK stops at 1e-6 m / 1e-5 rad: tolerances 2e-3 mm and 2e-5.
      expectClose(
        [t[0]![3]! * 1000, t[1]![3]! * 1000, t[2]![3]! * 1000],
        [g.rMinMm + ix * g.stepMm, 0, g.zMinMm + iy * g.stepMm],
        2e-3,
        `cell ${cell} position (mm)`,
      );
      expectClose([t[0]![2]!, t[1]![2]!, t[2]![2]!], [0, 0, -1], 2e-5, `cell ${cell} tool axis`);
      const f = forwardInto(chain, q, s);
      const j = jacobianInto(new Float64Array(36), chain, s, f[3]!, f[7]!, f[11]!);
      expectClose(
        map.guaranteedMmPerS[cell]!,
        guaranteedLineSpeed(j, 6, w, sp) * 1000,
        1e-9 * Math.max(1, map.guaranteedMmPerS[cell]!),
        `cell ${cell} guaranteed`,
      );
      expectClose(
        map.maxMmPerS[cell]!,
        maxToolSpeed(j, 6, w, sp) * 1000,
        1e-9 * map.maxMmPerS[cell]!,
        `cell ${cell} max`,
      );
      expect(map.guaranteedMmPerS[cell]!).toBeLessThanOrEqual(map.maxMmPerS[cell]! * (1 + 1e-12));
    }
    expect(checked).toBe(200);
  });

  it.each(["down", "outward"] as const)(
    "%s: the kept joint values of every reachable cell reach its target",
    (orientation) => {
      // Every cell, not a sample: a discovery solve once aimed at a stale target (the flood from the previous seed had
      // moved it) and stored a solution 1.6 m away from its cell as that cell's fastest branch. Forward kinematics by
      // forwardInto (itself checked against the mathjs DH product in forward.test.ts); tolerances as above.
      const map = mapOf(orientation);
      const g = map.grid,
        s = createScratch(chain);
      const [tr, tz] = TOOL[orientation];
      let checked = 0;
      const off: string[] = [];
      for (let cell = 0; cell < g.nx * g.ny; cell++) {
        if (map.branch[cell]! < 0) continue;
        checked++;
        const ix = cell % g.nx,
          iy = (cell - ix) / g.nx;
        const t = forwardInto(chain, map.joints.subarray(cell * 6, cell * 6 + 6), s);
        const dMm = Math.hypot(
          t[3]! * 1000 - (g.rMinMm + ix * g.stepMm),
          t[7]! * 1000,
          t[11]! * 1000 - (g.zMinMm + iy * g.stepMm),
        );
        const dAxis = Math.hypot(t[2]! - tr, t[6]!, t[10]! - tz);
        if (!(dMm <= 2e-3 && dAxis <= 2e-5))
          off.push(`cell (${ix}, ${iy}): ${dMm.toFixed(4)} mm, axis ${dAxis.toExponential(1)}`);
      }
      expect(checked).toBe(map.reachableCells);
      expect(off, `${off.length} of ${checked} cells; first: ${off.slice(0, 5).join("; ")}`).toEqual([]);
    },
  );

  it("with conditionMaxColumns the inverse condition is on every k-th node only, and equals σ_min/σ_max by ml-matrix's SVD", () => {
    // Reference: ml-matrix SingularValueDecomposition of J with its linear rows divided by the characteristic length
    // (module doc of singularity.ts), J by jacobianInto at the kept joints (checked against finite differences in
    // forward.test.ts). Tolerance 1e-9 absolute on a value in [0, 1].
    const map = toolSpeedMap(chain, "down", {
      ...DEFAULT_SPEED_MAP,
      stepMm: 40,
      discoveryEveryCells: 5,
      conditionMaxColumns: 16,
    });
    const g = map.grid,
      k = Math.ceil(g.nx / 16),
      s = createScratch(chain);
    expect(k).toBeGreaterThan(1);
    let kept = 0;
    for (let cell = 0; cell < g.nx * g.ny; cell++) {
      const ix = cell % g.nx,
        iy = (cell - ix) / g.nx,
        v = map.inverseCondition[cell]!;
      if (map.branch[cell]! < 0 || ix % k !== 0 || iy % k !== 0) {
        expect(Number.isNaN(v), `cell (${ix}, ${iy})`).toBe(true);
        continue;
      }
      kept++;
      const f = forwardInto(chain, map.joints.subarray(cell * 6, cell * 6 + 6), s);
      const j = jacobianInto(new Float64Array(36), chain, s, f[3]!, f[7]!, f[11]!);
      const scaled = Matrix.from1DArray(
        6,
        6,
        Array.from(j, (x, i) => (i < 18 ? x / chain.characteristicLengthM : x)),
      );
      const sv = new SingularValueDecomposition(scaled).diagonal;
      expectClose(v, Math.min(...sv) / Math.max(...sv), 1e-9, `cell (${ix}, ${iy})`);
    }
    expect(kept).toBeGreaterThan(20);
  });

  it("unreachable cells are NaN, and no cell beyond the flange reach (CHECKS C6) is reachable", () => {
    // C6: the wrist centre stays within a2 + L of the axis-2 point O1 = (±a1, d1); with the tool down the flange is
    // d6 below the wrist centre.
    const map = mapOf("down");
    const g = map.grid;
    let unreachable = 0;
    for (let cell = 0; cell < g.nx * g.ny; cell++) {
      const ix = cell % g.nx,
        iy = (cell - ix) / g.nx;
      const r = (g.rMinMm + ix * g.stepMm) / 1000,
        z = (g.zMinMm + iy * g.stepMm) / 1000 + d6;
      const rho = Math.min(Math.hypot(r - a1, z - d1), Math.hypot(r + a1, z - d1));
      if (map.branch[cell]! < 0) {
        unreachable++;
        expect(Number.isNaN(map.guaranteedMmPerS[cell]!) && Number.isNaN(map.maxMmPerS[cell]!)).toBe(true);
      } else {
        expect(rho, `cell (${r}, ${z - d6})`).toBeLessThanOrEqual(a2 + L + 1e-9);
      }
    }
    expect(unreachable).toBeGreaterThan(0);
    expect(map.reachableCells).toBe(g.nx * g.ny - unreachable);
  });
});

/**
 * Tests of src/core/analysis/speedMap/sweep.ts (joint-space sweep, discovery along axis 1): map cells the arm reaches
 * are not left empty.
 *
 * Reproductions (issue "Numbers at their edges", §3): joint values of demo arms, given there, that put the flange on
 * a map node with the reference tool direction. Each is checked first with an independent forward kinematics written
 * here from the arm files with mathjs matrix products (standard DH, Spong et al., Robot Modeling and Control, ch. 3:
 * Aᵢ = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ); frames: Trans(xyz)·Rz(y)·Ry(p)·Rx(r)·Rot(axis, q), Rodrigues): position, tool
 * direction and joint ranges; then the guaranteed line speed at those joints is recomputed independently (Jacobian by
 * central finite differences of that forward kinematics, inverted with ml-matrix; v = min_i q̇max,i / ‖row_i(B)‖, B
 * the first three columns of J⁻¹) and compared with the figure the issue states; the map must hold a value at the
 * node of at least that figure (its best branch may be better), within 0.5 %.
 *
 * Monte Carlo coverage: seeded random joint values within the ranges of a demo arm, turned about axis 1 into the map
 * plane and snapped by inverse kinematics onto the nearest node with the reference tool direction (accepted only when
 * the independent forward kinematics confirms the node and the direction, within the ranges): every such node must be
 * non-empty in the map.
 */
import { readFileSync } from "node:fs";
import * as math from "mathjs";
import { Matrix, inverse } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { solveIkInto, createIkScratch } from "../../../../src/core/kinematics/inverse";
import { DEFAULT_ENVELOPE_OPTIONS, workspaceEnvelope } from "../../../../src/core/analysis/envelope/envelope";
import { DEFAULT_SPEED_MAP, toolSpeedMap, type ToolSpeedMap } from "../../../../src/core/analysis/speedMap/speedMap";
import { mulberry32 } from "../../../helpers/prng";

type M4 = number[][];
const DEG = Math.PI / 180;

interface JointFile {
  kind: string;
  rangeDeg: [number, number];
  maxSpeedDegPerS: number;
  dh?: { aMm: number; alphaDeg: number; dMm: number; thetaDeg: number };
  origin?: { xyzMm: number[]; rpyDeg: number[] };
  axis?: number[];
  coupling?: { terms: { joint: string; gain: number }[] };
  name: string;
}
interface ArmFile {
  convention: "dh" | "frames";
  joints: JointFile[];
  flange: { xyzMm: number[]; rpyDeg: number[] };
}

function armFile(id: string): ArmFile & Record<string, unknown> {
  return JSON.parse(readFileSync(`arms/${id}.json`, "utf8"));
}

const rotX = (a: number): M4 => [
  [1, 0, 0, 0],
  [0, Math.cos(a), -Math.sin(a), 0],
  [0, Math.sin(a), Math.cos(a), 0],
  [0, 0, 0, 1],
];
const rotY = (a: number): M4 => [
  [Math.cos(a), 0, Math.sin(a), 0],
  [0, 1, 0, 0],
  [-Math.sin(a), 0, Math.cos(a), 0],
  [0, 0, 0, 1],
];
const rotZ = (a: number): M4 => [
  [Math.cos(a), -Math.sin(a), 0, 0],
  [Math.sin(a), Math.cos(a), 0, 0],
  [0, 0, 1, 0],
  [0, 0, 0, 1],
];
const trans = (x: number, y: number, z: number): M4 => [
  [1, 0, 0, x],
  [0, 1, 0, y],
  [0, 0, 1, z],
  [0, 0, 0, 1],
];
const mul = (...ms: M4[]): M4 => ms.reduce((a, b) => math.multiply(a, b) as M4);
/** Rotation by angle q about unit axis u (Rodrigues). */
function rotAxis(u: number[], q: number): M4 {
  const [x, y, z] = u as [number, number, number],
    c = Math.cos(q),
    s = Math.sin(q),
    v = 1 - c;
  return [
    [c + x * x * v, x * y * v - z * s, x * z * v + y * s, 0],
    [y * x * v + z * s, c + y * y * v, y * z * v - x * s, 0],
    [z * x * v - y * s, z * y * v + x * s, c + z * z * v, 0],
    [0, 0, 0, 1],
  ];
}
const rpy = (r: number[]): M4 => mul(rotZ(r[2]! * DEG), rotY(r[1]! * DEG), rotX(r[0]! * DEG));

/** Independent forward kinematics of an arm file (revolute joints; coupling: θ = q + Σ gain·q_other), m. */
function referenceFlange(arm: ArmFile, q: readonly number[]): M4 {
  const index = new Map(arm.joints.map((j, i) => [j.name, i]));
  let t = trans(0, 0, 0);
  arm.joints.forEach((j, i) => {
    let qk = q[i]!;
    for (const term of j.coupling?.terms ?? []) qk += term.gain * q[index.get(term.joint)!]!;
    if (arm.convention === "dh") {
      const dh = j.dh!;
      t = mul(
        t,
        rotZ(dh.thetaDeg * DEG + qk),
        trans(0, 0, dh.dMm / 1000),
        trans(dh.aMm / 1000, 0, 0),
        rotX(dh.alphaDeg * DEG),
      );
    } else {
      const o = j.origin!;
      t = mul(
        t,
        trans(o.xyzMm[0]! / 1000, o.xyzMm[1]! / 1000, o.xyzMm[2]! / 1000),
        rpy(o.rpyDeg),
        rotAxis(j.axis!, qk),
      );
    }
  });
  const f = arm.flange;
  return mul(t, trans(f.xyzMm[0]! / 1000, f.xyzMm[1]! / 1000, f.xyzMm[2]! / 1000), rpy(f.rpyDeg));
}

/**
 * Guaranteed straight-line speed (mm/s) at q, from the finite-difference Jacobian of referenceFlange: J⁻¹ for six
 * axes, the minimum-norm pseudo-inverse Jᵀ(JJᵀ)⁻¹ for more (ml-matrix inverse).
 */
function referenceGuaranteedMmPerS(arm: ArmFile, q: readonly number[]): number {
  const h = 1e-6;
  const cols: number[][] = [];
  for (let i = 0; i < q.length; i++) {
    const qp = [...q],
      qm = [...q];
    qp[i] = qp[i]! + h;
    qm[i] = qm[i]! - h;
    const tp = referenceFlange(arm, qp),
      tm = referenceFlange(arm, qm);
    const v = [0, 1, 2].map((r) => (tp[r]![3]! - tm[r]![3]!) / (2 * h));
    // ω from (R⁺ − R⁻)·Rᵀ / 2h = [ω]×.
    const r0 = referenceFlange(arm, q);
    const dR = math.multiply(
      math.subtract(
        tp.slice(0, 3).map((row) => row.slice(0, 3)),
        tm.slice(0, 3).map((row) => row.slice(0, 3)),
      ),
      math.transpose(r0.slice(0, 3).map((row) => row.slice(0, 3))),
    ) as number[][];
    const w = [dR[2]![1]! / (2 * h), dR[0]![2]! / (2 * h), dR[1]![0]! / (2 * h)];
    cols.push([...v, ...w]);
  }
  const jac = new Matrix(cols).transpose();
  const jinv = q.length === 6 ? inverse(jac) : jac.transpose().mmul(inverse(jac.mmul(jac.transpose())));
  let best = Infinity;
  arm.joints.forEach((j, i) => {
    const row = Math.hypot(jinv.get(i, 0), jinv.get(i, 1), jinv.get(i, 2));
    best = Math.min(best, (j.maxSpeedDegPerS * DEG) / row);
  });
  return best * 1000;
}

function withinRanges(arm: ArmFile, qDeg: readonly number[]): boolean {
  return arm.joints.every((j, i) => qDeg[i]! >= j.rangeDeg[0] - 1e-9 && qDeg[i]! <= j.rangeDeg[1] + 1e-9);
}

function valueAt(map: ToolSpeedMap, rMm: number, zMm: number): number {
  const g = map.grid;
  const ix = Math.round((rMm - g.rMinMm) / g.stepMm),
    iy = Math.round((zMm - g.zMinMm) / g.stepMm);
  return map.guaranteedMmPerS[ix + iy * g.nx]!;
}

/** Map options of the analysis (10 mm, floor gravity, the analysis seed); bounds from sampled poses. */
const MAP_OPTIONS = { ...DEFAULT_SPEED_MAP, seed: 20261202 };
/** The published map's options: bounds from the flange envelope plus two steps, as analyseArm sets them. */
function publishedOptions(chain: ReturnType<typeof compileChain>) {
  const flange = workspaceEnvelope(chain, DEFAULT_ENVELOPE_OPTIONS).flange!;
  const step = MAP_OPTIONS.stepMm;
  return {
    ...MAP_OPTIONS,
    boundsMm: {
      rMax: flange.maxReachMm + 2 * step,
      zMin: flange.minHeightMm - 2 * step,
      zMax: flange.maxHeightMm + 2 * step,
    },
  };
}

const REPRODUCTIONS = [
  {
    id: "corvell-heron-210l",
    orientation: "down" as const,
    jointsDeg: [0, -52.055, 69.309, -180, -20.691, -180],
    cellMm: [160, -30] as const,
    statedMmPerS: 307,
    publishedGridOnly: true,
  },
  {
    id: "brandmoor-lyra-c12",
    orientation: "outward" as const,
    jointsDeg: [-288.6717, -132.3229, -96.1426, -311.5345, -108.6717, -180],
    cellMm: [0, -700] as const,
    statedMmPerS: 63.7,
  },
  {
    id: "brandmoor-lyra-r7",
    orientation: "down" as const,
    // Joint values found with the numeric inverse kinematics from random seeds (3 of 3000 converge: a sliver with
    // joints 3 and 6 within 0.2° of their limits); the figure stated in the issue is 404 mm/s. The sweep finds it
    // on the published grid, not on every grid (a grid from sampled bounds misses it): checked on that grid only.
    jointsDeg: [5.0889, 21.5169, 169.8175, -38.8429, 4.2886, -119.8793, -2.2579],
    cellMm: [500, 800] as const,
    statedMmPerS: 404,
    publishedGridOnly: true,
  },
];

describe.each(REPRODUCTIONS)("reachable cell $id $orientation at $cellMm (issue §3)", (c) => {
  const arm = armFile(c.id);
  const q = c.jointsDeg.map((d) => d * DEG);
  const toolWanted = c.orientation === "down" ? [0, 0, -1] : [1, 0, 0];

  it("the given joints are within the ranges and put the flange on the node with the reference tool direction", () => {
    expect(withinRanges(arm, c.jointsDeg)).toBe(true);
    const t = referenceFlange(arm, q);
    // The map plane of these floor arms: radial = base x, height = base z (axis 1 along base z through the origin).
    expect(Math.hypot(t[0]![3]! * 1000 - c.cellMm[0], t[1]![3]! * 1000, t[2]![3]! * 1000 - c.cellMm[1])).toBeLessThan(
      0.1,
    );
    const tool = [t[0]![2]!, t[1]![2]!, t[2]![2]!];
    expect(Math.hypot(...tool.map((v, i) => v - toolWanted[i]!))).toBeLessThan(1e-3);
  });

  it("the map holds a value there of at least the figure at those joints (within 0.5 %)", () => {
    // Six axes: the figure recomputed from the finite-difference Jacobian, checked against the issue's figure.
    const figure = q.length === 6 ? referenceGuaranteedMmPerS(arm, q) : c.statedMmPerS;
    expect(Math.abs(figure - c.statedMmPerS)).toBeLessThan(0.005 * c.statedMmPerS + 0.5);
    const chain = compileChain(arm as never);
    const map = toolSpeedMap(chain, c.orientation, "publishedGridOnly" in c ? publishedOptions(chain) : MAP_OPTIONS);
    const value = valueAt(map, c.cellMm[0], c.cellMm[1]);
    expect(Number.isFinite(value)).toBe(true);
    expect(value).toBeGreaterThanOrEqual(figure * 0.995);
  });
});

// brandmoor-lyra-r7 outward (600, 1010): 75.6 mm/s at joints (deg) −0.1032, 38.528, −0.9769, −7.1326, 1.0162,
// 58.6034, 0.0791 (2 % of random IK seeds converge there). The cell is at the edge of the sheet the map holds around
// it (joint 1 at −170° there); the sheet above reaches it but finds its neighbours' slots full. Filled by the edge
// retry (edgeRetry.ts) from a neighbour's solution mirrored by the shoulder and wrist flips.
describe("reachable cell brandmoor-lyra-r7 outward at (600, 1010) (edge retry)", () => {
  const arm = armFile("brandmoor-lyra-r7");
  const issueJointsDeg = [-0.1032, 38.528, -0.9769, -7.1326, 1.0162, 58.6034, 0.0791];

  it("the issue's joints are within the ranges and put the flange on the node with the tool outward", () => {
    expect(withinRanges(arm, issueJointsDeg)).toBe(true);
    const t = referenceFlange(
      arm,
      issueJointsDeg.map((d) => d * DEG),
    );
    expect(Math.hypot(t[0]![3]! * 1000 - 600, t[1]![3]! * 1000, t[2]![3]! * 1000 - 1010)).toBeLessThan(0.1);
    expect(Math.hypot(t[0]![2]! - 1, t[1]![2]!, t[2]![2]!)).toBeLessThan(1e-3);
  });

  it("the published map holds there the figure of its own joints (within 0.5 %), near the issue's 75.6 mm/s", () => {
    const chain = compileChain(arm as never);
    const map = toolSpeedMap(chain, "outward", publishedOptions(chain));
    const value = valueAt(map, 600, 1010);
    expect(Number.isFinite(value)).toBe(true);
    const g = map.grid;
    const cell = Math.round((600 - g.rMinMm) / g.stepMm) + Math.round((1010 - g.zMinMm) / g.stepMm) * g.nx;
    const q = Array.from(map.joints.subarray(cell * 7, cell * 7 + 7));
    // The map's joints checked with the independent forward kinematics (node, tool direction, ranges).
    expect(
      withinRanges(
        arm,
        q.map((v) => v / DEG),
      ),
    ).toBe(true);
    const t = referenceFlange(arm, q);
    expect(Math.hypot(t[0]![3]! * 1000 - 600, t[1]![3]! * 1000, t[2]![3]! * 1000 - 1010)).toBeLessThan(0.01);
    expect(Math.hypot(t[0]![2]! - 1, t[1]![2]!, t[2]![2]!)).toBeLessThan(1e-4);
    // Finite-difference Jacobian + ml-matrix pseudo-inverse at those joints (referenceGuaranteedMmPerS).
    const figure = referenceGuaranteedMmPerS(arm, q);
    expect(Math.abs(value - figure)).toBeLessThan(0.005 * figure);
    // The issue's figure, recomputed the same way at the issue's joints: 75.6 mm/s.
    const stated = referenceGuaranteedMmPerS(
      arm,
      issueJointsDeg.map((d) => d * DEG),
    );
    expect(Math.abs(stated - 75.6)).toBeLessThan(0.5);
    expect(value).toBeGreaterThanOrEqual(stated * 0.9);
  });
});

describe("Monte Carlo coverage: corvell-heron-210l, down (published grid)", () => {
  it("every node that a random in-range posture snaps onto with the tool down is non-empty", () => {
    const arm = armFile("corvell-heron-210l");
    const chain = compileChain(arm as never);
    const map = toolSpeedMap(chain, "down", publishedOptions(chain));
    const g = map.grid;
    const rnd = mulberry32(0x70c0ffee);
    const ik = createIkScratch(chain);
    const qs = new Float64Array(6);
    const target = new Float64Array(16);
    let checked = 0;
    const missing: string[] = [];
    for (let n = 0; n < 3000 && checked < 400; n++) {
      for (let i = 0; i < 6; i++) {
        const [lo, hi] = arm.joints[i]!.rangeDeg;
        qs[i] = (lo + (hi - lo) * rnd()) * DEG;
      }
      // Turn about axis 1 (base z) so the flange lies on the +x half of the map plane.
      const t0 = referenceFlange(arm, Array.from(qs));
      qs[0] = qs[0]! - Math.atan2(t0[1]![3]!, t0[0]![3]!);
      if (Math.abs(qs[0]!) > arm.joints[0]!.rangeDeg[1] * DEG) continue;
      const r = Math.hypot(t0[0]![3]!, t0[1]![3]!) * 1000,
        z = t0[2]![3]! * 1000;
      const rMm = g.rMinMm + Math.round((r - g.rMinMm) / g.stepMm) * g.stepMm,
        zMm = g.zMinMm + Math.round((z - g.zMinMm) / g.stepMm) * g.stepMm;
      // Target: tool z down, tool x along +radial (base x), at the node.
      target.set([1, 0, 0, rMm / 1000, 0, -1, 0, 0, 0, 0, -1, zMm / 1000, 0, 0, 0, 1]);
      if (!solveIkInto(qs, chain, target, qs, ik)) continue;
      const qDeg = Array.from(qs, (v) => v / DEG);
      if (!withinRanges(arm, qDeg)) continue;
      const t = referenceFlange(arm, Array.from(qs));
      if (Math.hypot(t[0]![3]! * 1000 - rMm, t[1]![3]! * 1000, t[2]![3]! * 1000 - zMm) > 0.01) continue;
      if (t[2]![2]! > -1 + 1e-6) continue;
      checked++;
      if (!Number.isFinite(valueAt(map, rMm, zMm))) missing.push(`(${rMm}, ${zMm})`);
    }
    expect(checked).toBeGreaterThanOrEqual(100);
    expect(missing).toEqual([]);
  });
});

/**
 * Tests of src/core/analysis/cell/toolLoad.ts.
 * Outside references: the parallel-axis theorem (Steiner; Meriam & Kraige, Engineering Mechanics: Dynamics, ch. 7,
 * mass moments of inertia) on hand-worked examples written out below; mathjs matrix arithmetic as an independent
 * computation (a different route: inertia about the flange origin first, then transferred to the CG); hand statics
 * M = m·g·L on a test arm (CHECKS §0 generic 6R: spherical wrist, wrist centre d6 = 0.1 m behind the flange); and the
 * load diagram's own closed form (the end of a curve of equal mass on the Lz axis, loadDiagram.ts).
 */
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import { STANDARD_GRAVITY_M_PER_S2, compileChain } from "../../../../src/core";
import { combineBodies, toolLoadsOf, type MassBody } from "../../../../src/core/analysis/cell/toolLoad";
import { loadDiagram, payloadInputOf } from "../../../../src/core/analysis/payload";
import { expectClose, expectRelClose } from "../../../helpers/expectClose";
import { mulberry32, uniform } from "../../../helpers/prng";
import { generic6rDh } from "../../../helpers/testArms";

const g = STANDARD_GRAVITY_M_PER_S2;
const flat = (i: { xx: number; yy: number; zz: number; xy: number; xz: number; yz: number }) => [
  i.xx,
  i.yy,
  i.zz,
  i.xy,
  i.xz,
  i.yz,
];

describe("combineBodies (parallel-axis theorem)", () => {
  it("a dumbbell: two 1 kg point masses at z = ±100 mm → I_xx = I_yy = 2·1·0.1² = 0.02 kg·m², I_zz = 0", () => {
    // Meriam & Kraige (ch. 7): a point mass m at distance d from an axis has I = m·d²; two of them add.
    const c = combineBodies([
      { massKg: 1, cogMm: [0, 0, -100] },
      { massKg: 1, cogMm: [0, 0, 100] },
    ]);
    expect(c.massKg).toBe(2);
    expectClose(c.cogMm, [0, 0, 0], 1e-12, "cog");
    expectClose(flat(c.inertiaAboutCogKgM2), [0.02, 0.02, 0, 0, 0, 0], 1e-15, "inertia");
  });

  it("a hand-worked tool of two bodies (every step written out)", () => {
    // A: m = 2 kg, c = (0, 0, 100) mm, I_A = diag(0.01, 0.01, 0.02) kg·m².
    // B: m = 6 kg, c = (0, 80, 300) mm, I_B: xx 0.03, yy 0.02, zz 0.015, yz 0.004 (xy = xz = 0).
    // m = 8 kg; c = (2·(0,0,100) + 6·(0,80,300)) / 8 = (0, 480/8, 2000/8) = (0, 60, 250) mm.
    // r_A = (0, −0.06, −0.15) m, r_A·r_A = 0.0036 + 0.0225 = 0.0261:
    //   m_A((r·r)E − rrᵀ): xx 2·0.0261 = 0.0522; yy 2·(0.0261 − 0.0036) = 0.045; zz 2·(0.0261 − 0.0225) = 0.0072;
    //   yz −2·(−0.06)(−0.15) = −0.018.
    // r_B = (0, 0.02, 0.05) m, r_B·r_B = 0.0029:
    //   xx 6·0.0029 = 0.0174; yy 6·0.0025 = 0.015; zz 6·0.0004 = 0.0024; yz −6·0.02·0.05 = −0.006.
    // Sum: xx 0.01 + 0.03 + 0.0522 + 0.0174 = 0.1096; yy 0.01 + 0.02 + 0.045 + 0.015 = 0.09;
    //      zz 0.02 + 0.015 + 0.0072 + 0.0024 = 0.0446; yz 0.004 − 0.018 − 0.006 = −0.02; xy = xz = 0.
    const c = combineBodies([
      { massKg: 2, cogMm: [0, 0, 100], inertiaKgM2: { xx: 0.01, yy: 0.01, zz: 0.02, xy: 0, xz: 0, yz: 0 } },
      { massKg: 6, cogMm: [0, 80, 300], inertiaKgM2: { xx: 0.03, yy: 0.02, zz: 0.015, xy: 0, xz: 0, yz: 0.004 } },
    ]);
    expect(c.massKg).toBe(8);
    expectClose(c.cogMm, [0, 60, 250], 1e-12, "cog");
    expectClose(flat(c.inertiaAboutCogKgM2), [0.1096, 0.09, 0.0446, 0, 0, -0.02], 1e-14, "inertia");
  });

  it("no bodies: zero mass at the flange centre; a non-positive mass throws", () => {
    expect(combineBodies([])).toEqual({
      massKg: 0,
      cogMm: [0, 0, 0],
      inertiaAboutCogKgM2: { xx: 0, yy: 0, zz: 0, xy: 0, xz: 0, yz: 0 },
    });
    expect(() => combineBodies([{ massKg: -1, cogMm: [0, 0, 0] }])).toThrow(RangeError);
  });

  it("random bodies: equal to mathjs, computed about the flange origin and transferred to the CG", () => {
    // Independent route (mathjs matrices): I_O = Σ [Iᵢ + mᵢ((cᵢ·cᵢ)E − cᵢcᵢᵀ)] about the flange origin, then
    // I_c = I_O − m((c·c)E − ccᵀ) (the theorem applied backwards, Meriam & Kraige ch. 7).
    const rand = mulberry32(12);
    const E = math.identity(3) as math.Matrix;
    const steiner = (m: number, r: number[]) =>
      math.multiply(
        m,
        math.subtract(
          math.multiply(math.dot(r, r), E),
          math.multiply(math.matrix(r.map((x) => [x])), math.matrix([r])),
        ),
      );
    for (let trial = 0; trial < 20; trial++) {
      const n = 1 + Math.floor(rand() * 5);
      const bodies: MassBody[] = Array.from({ length: n }, () => {
        const a = uniform(rand, 0.01, 0.2),
          b = uniform(rand, 0.01, 0.2);
        return {
          massKg: uniform(rand, 0.1, 20),
          cogMm: [uniform(rand, -300, 300), uniform(rand, -300, 300), uniform(rand, -100, 500)] as const,
          // Physical by construction: a + b ≥ their difference.
          inertiaKgM2: { xx: a, yy: b, zz: a + b * 0.5, xy: uniform(rand, -0.005, 0.005), xz: 0, yz: 0 },
        };
      });
      let IO: math.Matrix = math.zeros(3, 3) as math.Matrix;
      let m = 0;
      let first = math.zeros(3) as math.Matrix;
      for (const b of bodies) {
        const cM = b.cogMm.map((x) => x / 1000);
        const i = b.inertiaKgM2!;
        const own = math.matrix([
          [i.xx, i.xy, i.xz],
          [i.xy, i.yy, i.yz],
          [i.xz, i.yz, i.zz],
        ]);
        IO = math.add(IO, math.add(own, steiner(b.massKg, cM))) as math.Matrix;
        m += b.massKg;
        first = math.add(first, math.multiply(b.massKg, math.matrix(cM))) as math.Matrix;
      }
      const cM = (math.divide(first, m) as math.Matrix).toArray() as number[];
      const Ic = (math.subtract(IO, steiner(m, cM)) as math.Matrix).toArray() as number[][];
      const ours = combineBodies(bodies);
      expectRelClose(ours.massKg, m, 1e-14, "mass");
      expectClose(
        ours.cogMm,
        cM.map((x) => x * 1000),
        1e-9,
        "cog mm",
      );
      const ref = [Ic[0]![0]!, Ic[1]![1]!, Ic[2]![2]!, Ic[0]![1]!, Ic[0]![2]!, Ic[1]![2]!];
      expectClose(flat(ours.inertiaAboutCogKgM2), ref, 1e-11, `inertia, trial ${trial}`);
    }
  });
});

/** The generic 6R (CHECKS §0): j4, j5 bend about the wrist centre 0.1 m behind the flange; j6 rolls on the flange axis. */
function testArm(ratings: { momentNm?: Record<string, number>; inertiaKgM2?: Record<string, number> }, ratedKg = 10) {
  return payloadInputOf({ ratedPayloadKg: ratedKg, mountings: ["floor"], wrist: ratings }, compileChain(generic6rDh()));
}

describe("toolLoadsOf", () => {
  // Tool: one 4 kg body at (30, 40, 120) mm with I = diag(0.02, 0.03, 0.01) kg·m² (λ_max = 0.03); part "box":
  // a 2 kg point mass at (0, 0, 200) mm.
  const cell = {
    tool: {
      bodies: [
        {
          name: "gripper",
          massKg: 4,
          cogMm: [30, 40, 120] as const,
          inertiaKgM2: { xx: 0.02, yy: 0.03, zz: 0.01, xy: 0, xz: 0, yz: 0 },
        },
      ],
    },
    parts: [{ name: "box", massKg: 2, cogMm: [0, 0, 200] as const }],
  };
  const payload = testArm({ momentNm: { j4: 50, j5: 40, j6: 20 }, inertiaKgM2: { j5: 1.2, j6: 0.5 } });

  it("the tool alone: hand statics M = m·g·L and the inertia bounds of the module notes", () => {
    // Lxy = √(30² + 40²) = 50 mm, Lz = 120 mm.
    // Bending (j4, j5), pivot d = 0.1 m behind the flange, e = 0: L = √(0.22² + 0.05²) = √0.0509 m;
    //   M = 4·g·√0.0509 N·m; J = 4·0.0509 + λ_max = 0.2036 + 0.03 = 0.2336 kg·m².
    // Roll (j6): L = Lxy = 0.05 m; M = 4·g·0.05 = 0.2·g N·m; J = I_zz + m·Lxy² = 0.01 + 4·0.0025 = 0.02 kg·m².
    const [tool] = toolLoadsOf(cell, payload);
    expect(tool!.carrying).toBeNull();
    expect(tool!.massKg).toBe(4);
    expect(tool!.loadDiagram.lxyMm).toBeCloseTo(50, 12);
    expect(tool!.loadDiagram.lzMm).toBeCloseTo(120, 12);
    const [j4, j5, j6] = tool!.ratings;
    expect([j4!.joint, j5!.joint, j6!.joint]).toEqual(["j4", "j5", "j6"]);
    expectRelClose(j5!.momentNm, 4 * g * Math.sqrt(0.0509), 1e-12, "j5 moment");
    expectRelClose(j5!.inertiaKgM2, 0.2336, 1e-12, "j5 inertia");
    expectRelClose(j4!.momentNm, 4 * g * Math.sqrt(0.0509), 1e-12, "j4 moment");
    expectRelClose(j6!.momentNm, 0.2 * g, 1e-12, "j6 moment");
    expectRelClose(j6!.inertiaKgM2, 0.02, 1e-12, "j6 inertia");
    // j4 rates only a moment: its inertia is reported, not checked.
    expect(j4!.allowedInertiaKgM2).toBeNull();
    expect(j4!.allowedMomentNm).toBe(50);
    // Shares: j4 8.85/50 = 0.177; j5 max(8.85/40, 0.2336/1.2) = 0.221; j6 max(1.96/20, 0.02/0.5) = 0.098.
    expectRelClose(j5!.share!, (4 * g * Math.sqrt(0.0509)) / 40, 1e-12, "j5 share");
    expect(tool!.limiting).toBe("j5");
    expect(tool!.ratings.every((r) => r.ok)).toBe(true);
    expect(tool!.withinRatedPayload).toBe(true);
  });

  it("the tool with the box: the combined CG, hand statics and the inertia from the combined tensor", () => {
    // m = 6 kg; c = (4·(30, 40, 120) + 2·(0, 0, 200)) / 6 = (20, 80/3, 440/3) mm; Lxy = √(20² + (80/3)²) = 100/3 mm.
    // Bending: L = √((0.1 + 0.44/3)² + (0.1/3)²) m; M = 6·g·L.
    const [, box] = toolLoadsOf(cell, payload);
    expect(box!.carrying).toBe("box");
    expect(box!.massKg).toBe(6);
    expectClose(box!.cogMm, [20, 80 / 3, 440 / 3], 1e-12, "cog");
    expectRelClose(box!.loadDiagram.lxyMm, 100 / 3, 1e-12, "Lxy");
    const L = Math.hypot(0.1 + 0.44 / 3, 0.1 / 3);
    const j5 = box!.ratings[1]!;
    expectRelClose(j5.momentNm, 6 * g * L, 1e-12, "j5 moment");
    expectRelClose(j5.leverMm, L * 1000, 1e-12, "j5 lever");
    // Inertia: m·L² + the largest eigenvalue of the combined tensor (mathjs eigs, independent library).
    const I = box!.inertiaAboutCogKgM2;
    const eig = (
      math.eigs([
        [I.xx, I.xy, I.xz],
        [I.xy, I.yy, I.yz],
        [I.xz, I.yz, I.zz],
      ]).values as number[]
    ).map(Number);
    expectRelClose(j5.inertiaKgM2, 6 * L * L + Math.max(...eig), 1e-12, "j5 inertia");
    // Roll: I_zz + m·Lxy² (e = 0).
    const j6 = box!.ratings[2]!;
    expectRelClose(j6.inertiaKgM2, I.zz + 6 * (0.1 / 3) ** 2, 1e-12, "j6 inertia");
  });

  it("a load beyond a rating and beyond the rated payload: not ok, the limiting joint named", () => {
    // A 12 kg point mass 150 mm beyond the flange on an arm rated 10 kg: j5 lever 0.25 m, M = 12·g·0.25 = 29.42 N·m
    // against 20 N·m → share 1.471; j6 on the axis carries no moment.
    const heavy = testArm({ momentNm: { j5: 20, j6: 10 } });
    const [load] = toolLoadsOf({ tool: { bodies: [{ name: "w", massKg: 12, cogMm: [0, 0, 150] }] }, parts: [] }, heavy);
    expect(load!.withinRatedPayload).toBe(false);
    const j5 = load!.ratings.find((r) => r.joint === "j5")!;
    expectRelClose(j5.momentNm, 12 * g * 0.25, 1e-12, "j5 moment");
    expect(j5.ok).toBe(false);
    expect(load!.limiting).toBe("j5");
    const j6 = load!.ratings.find((r) => r.joint === "j6")!;
    expect(j6.momentNm).toBe(0);
    expect(j6.ok).toBe(true);
  });

  it("no wrist rating: every load within the wrist, limiting null", () => {
    const unrated = testArm({});
    const loads = toolLoadsOf(cell, unrated);
    expect(loads.map((l) => [l.carrying, l.limiting, l.ratings.length])).toEqual([
      [null, null, 0],
      ["box", null, 0],
    ]);
  });

  it("a point mass on the flange axis at the end of the load diagram's curve uses exactly the bending rating", () => {
    // loadDiagram's closed form: for mass m the curve meets the Lz axis where the tightest bending rating is used up,
    // Lz_end = √(r² − e²) − d with r = min(M/(m·g), √(J/m)). A point mass m at (0, 0, Lz_end) must then show
    // share 1 on that rating: moment m·g·L = M (or inertia m·L² = J).
    const input = testArm({ momentNm: { j5: 30, j6: 12 }, inertiaKgM2: { j5: 0.9 } }, 8);
    for (const massKg of [2, 5, 8]) {
      const diagram = loadDiagram(input, { massesKg: [massKg], extentMm: 5000 });
      const curve = diagram.curves[0]!;
      const [lxyEnd, lzEnd] = curve.pointsMm[curve.pointsMm.length - 1]!;
      expect(lxyEnd).toBe(0);
      const [load] = toolLoadsOf({ tool: { bodies: [{ name: "p", massKg, cogMm: [0, 0, lzEnd] }] }, parts: [] }, input);
      const j5 = load!.ratings.find((r) => r.joint === "j5")!;
      expectRelClose(j5.share!, 1, 1e-9, `share at m = ${massKg}`);
      // And the moment is the load diagram's M = m·g·L with L = d + Lz on the axis.
      expectRelClose(j5.momentNm, massKg * g * (0.1 + lzEnd / 1000), 1e-12, "moment on the axis");
    }
  });
});

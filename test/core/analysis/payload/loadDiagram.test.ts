/**
 * Tests of src/core/analysis/payload/loadDiagram.ts (loadDiagram, payloadWarnings, loadMomentNm, maxLeverM).
 * Outside references:
 * - CHECKS C15 (M = m g L; L_max = M_rated / (m g); J = m L² for a point mass).
 * - Conventions of the load diagram (levers from the wrist centre; Lz from the flange face): common practice, no
 *   source.
 */
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../../src/catalog/load";
import { STANDARD_GRAVITY_M_PER_S2 } from "../../../../src/core";
import {
  loadDiagram,
  loadMomentNm,
  maxLeverM,
  PAYLOAD_STATEMENT,
  payloadInputOf,
  payloadWarnings,
  type WristRating,
} from "../../../../src/core/analysis/payload";
import { expectClose } from "../../../helpers/expectClose";
import { hasNonFinite, testPayload } from "../../../helpers/statics";

const G = STANDARD_GRAVITY_M_PER_S2;

describe("loadMomentNm and maxLeverM", () => {
  it("loadMomentNm(5 kg, 0.1 m) = 4.903325 N·m and maxLeverM(10 N·m, 8 kg) = 0.1274645 m (CHECKS C15)", () => {
    expectClose(loadMomentNm(5, 0.1), 4.903325, 1e-12);
    // CHECKS gives L_max to 7 digits: tolerance half a unit of the last digit.
    expectClose(maxLeverM(10, 8), 0.1274645, 5e-8);
  });
});

describe("loadDiagram", () => {
  const roll = (momentNm: number, inertiaKgM2 = NaN): WristRating => ({
    driven: 5,
    joint: "J6",
    momentNm,
    inertiaKgM2,
    lever: { kind: "roll", pivotBehindFlangeM: 0, pivotOffAxisM: 0, basis: "flange-axis" },
  });
  const bend = (momentNm: number, dM: number, inertiaKgM2 = NaN): WristRating => ({
    driven: 4,
    joint: "J5",
    momentNm,
    inertiaKgM2,
    lever: { kind: "bend", pivotBehindFlangeM: dM, pivotOffAxisM: 0, basis: "wrist-centre" },
  });

  it("loadDiagram(roll rating 10 N·m): the 8 kg curve meets the Lxy axis at L_max = 127.4645 mm (CHECKS C15)", () => {
    const d = loadDiagram(testPayload(10, [], [roll(10)]), { massesKg: [8] });
    const curve = d.curves[0]!;
    expect(curve.massKg).toBe(8);
    expectClose(curve.pointsMm[0]![0], 127.4645, 5e-5);
    expect(curve.pointsMm[0]![1]).toBe(0);
    // A roll rating does not depend on Lz: the curve runs straight up and leaves the table.
    expect(curve.openEnded).toBe(true);
    for (const [lxy] of curve.pointsMm) expectClose(lxy, (1000 * 10) / (8 * G), 1e-9);
  });

  it("loadDiagram(bend rating, wrist centre d = 50 mm behind the flange): every vertex of the 8 kg curve has m g L = M", () => {
    // Lever from the wrist centre: L = √((d + Lz)² + Lxy²) (common practice, no source). M = 10 N·m, m = 8 kg:
    // L = 0.1274645 m (CHECKS C15), so the curve is a circle of that radius about (0, −d), ending at Lz = L − d.
    const d = loadDiagram(testPayload(10, [], [bend(10, 0.05)]), { massesKg: [8] });
    const pts = d.curves[0]!.pointsMm;
    expect(pts.length).toBeGreaterThan(10);
    for (const [lxyMm, lzMm] of pts)
      expectClose(loadMomentNm(8, Math.hypot(lxyMm / 1000, 0.05 + lzMm / 1000)), 10, 1e-9);
    expectClose(pts[pts.length - 1]!, [0, 1000 * (10 / (8 * G) - 0.05)], 1e-9);
    expect(d.curves[0]!.openEnded).toBe(false);
  });

  it("loadDiagram grid cells equal min(rated, M/(g L), J/L²) by hand, with the limiting joint", () => {
    // J5: M = 10 N·m, J = 0.2 kg·m², d = 0.1 m; J6: M = 6 N·m. Rated 12 kg. Cell (Lxy, Lz) = (50, 100) mm:
    // J5 L = √(0.2² + 0.05²) = 0.20616 m → M: 4.946 kg, J: 4.706 kg; J6 L = 0.05 m → 12.24 kg → 4.706 kg (J5).
    const d = loadDiagram(testPayload(12, [], [bend(10, 0.1, 0.2), roll(6)]), { stepMm: 50, extentMm: 300 });
    const grid = d.grid!;
    expect(grid.lxyMm).toEqual([0, 50, 100, 150, 200, 250, 300]);
    const at = (ix: number, iz: number) => grid.allowedKg[ix + iz * grid.lxyMm.length]!;
    const lever5 = Math.hypot(0.2, 0.05);
    expectClose(at(1, 2), Math.min(10 / (G * lever5), 0.2 / lever5 ** 2), 1e-12);
    expect(d.joints[grid.limitingIndex[1 + 2 * 7]!]!.joint).toBe("J5");
    // (0, 0): J5 lever 0.1 m → min(10.197, 20) kg; J6 lever 0 → unlimited.
    expectClose(at(0, 0), 10 / (G * 0.1), 1e-12);
    expectClose(d.wristAllowsAtZeroOffsetKg!, 10 / (G * 0.1), 1e-12);
    // (300, 0): J6 lever 0.3 → 2.039 kg; J5 lever √(0.1² + 0.3²) = 0.316 → M: 3.224, J: 2.0 kg → J5 inertia, 2.0 kg.
    expectClose(at(6, 0), Math.min(6 / (G * 0.3), 10 / (G * Math.hypot(0.1, 0.3)), 0.2 / (0.1 ** 2 + 0.3 ** 2)), 1e-12);
    for (const v of grid.allowedKg) expect(v).toBeLessThanOrEqual(12);
  });

  it("loadDiagram without wrist ratings has basis as-rated and no invented figures", () => {
    const d = loadDiagram(testPayload(7));
    expect(d.basis).toBe("as-rated");
    expect(d.grid).toBeNull();
    expect(d.curves).toEqual([]);
    expect(d.statement).toBe(PAYLOAD_STATEMENT);
  });
});

describe("payloadWarnings", () => {
  it("payloadWarnings flags a rated payload beyond what the wrist moment allows at zero offset (M / (g d))", () => {
    // d = 0.1 m, M = 10 N·m → 10.197 kg at the flange centre (CHECKS C15 formula).
    const wrist = [
      {
        driven: 4,
        joint: "J5",
        momentNm: 10,
        inertiaKgM2: NaN,
        lever: { kind: "bend", pivotBehindFlangeM: 0.1, pivotOffAxisM: 0, basis: "wrist-centre" },
      } as const,
    ];
    const w = payloadWarnings(testPayload(12, [], wrist));
    expect(w).toHaveLength(1);
    expect(w[0]!.code).toBe("rated-payload-beyond-wrist-moment");
    expect(w[0]!.joint).toBe("J5");
    expectClose(w[0]!.allowedKg, 10 / (G * 0.1), 1e-12);
    expect(payloadWarnings(testPayload(10, [], wrist))).toEqual([]);
  });
});

const ARMS_DIR = process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../../arms", import.meta.url));
const { arms } = await loadArms([ARMS_DIR]);

describe("loadDiagram on every demo arm", () => {
  it.each(arms.map((a) => [a.id, a] as const))(
    "loadDiagram(%s): allowed mass within [0, rated], not increasing with the offset",
    (_, arm) => {
      const input = payloadInputOf(arm.spec, arm.chain);
      const d = loadDiagram(input);
      expect(hasNonFinite(d)).toBe(false);
      if (!d.grid) {
        expect(d.basis).toBe("as-rated");
        return;
      }
      const nx = d.grid.lxyMm.length;
      d.grid.allowedKg.forEach((v, i) => {
        expect(v).toBeGreaterThanOrEqual(0);
        expect(v).toBeLessThanOrEqual(arm.spec.ratedPayloadKg);
        // Levers grow with Lxy and Lz (d ≥ 0 on every demo arm), so the allowed mass cannot grow.
        if (i % nx > 0) expect(v).toBeLessThanOrEqual(d.grid!.allowedKg[i - 1]! * (1 + 1e-12));
        if (i >= nx) expect(v).toBeLessThanOrEqual(d.grid!.allowedKg[i - nx]! * (1 + 1e-12));
      });
    },
  );
});

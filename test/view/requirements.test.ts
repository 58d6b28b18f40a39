/**
 * The requirements panel's pass/fail rules (src/view/requirements.ts) on small invented arms whose answers are
 * worked out here independently: payload rows read by hand, rectangle-in-region decided by a closed form (interval
 * overlap with a square and its square hole), speed minima by brute force over every map node of the band, and the
 * block compaction of the maps (src/view/compareData.ts compactSpeedMap) against the same brute force.
 */
import { describe, expect, it } from "vitest";
import type { PolygonData } from "../../src/charts/geometry";
import { compactSpeedMap, type ComparePayloadSeries } from "../../src/view/compareData";
import {
  checkPayload,
  checkReach,
  checkRequirements,
  checkSpeed,
  clipSegment,
  insideEvenOdd,
  NO_REQUIREMENTS,
  parseRequirements,
  requirementPairs,
  type Requirements,
  type RequirementsArm,
} from "../../src/view/requirements";
import { mulberry32 } from "../helpers/prng";

// A square region 0–1000 mm with a square hole 400–600 mm (an envelope with a void, as some arms have).
const square = (a: number, b: number) =>
  [
    [a, a],
    [b, a],
    [b, b],
    [a, b],
    [a, a],
  ] as [number, number][];
const FLANGE: PolygonData[] = [{ outer: square(0, 1000), holes: [square(400, 600)] }];

// Payload rows every 100 mm from 100 to 700 mm; the 700 mm row is out of reach. Values invented for the test.
const PAYLOAD: ComparePayloadSeries[] = [
  {
    mounting: "floor",
    offsetMm: 0,
    reachMm: [100, 200, 300, 400, 500, 600, 700],
    payloadKg: [10, 10, 9, 8, 7.5, 6, null],
    limit: ["rated payload", "rated payload", "J2", "J2", "J3", "J3", null],
  },
  {
    mounting: "floor",
    offsetMm: 100,
    reachMm: [100, 200, 300, 400, 500, 600, 700],
    payloadKg: [10, 9.5, 8.5, 7.8, 7.6, 5.5, null],
    limit: ["rated payload", "J5", "J2", "J2", "J3", "J3", null],
  },
  {
    mounting: "ceiling",
    offsetMm: 0,
    reachMm: [100, 200, 300],
    payloadKg: [4, 4, 4],
    limit: ["rated payload", "rated payload", "rated payload"],
  },
];

// A 10 × 10 node speed map (10 mm spacing from r = 0, z = 0): v = 1000 + 100·ix − 50·iy mm/s; nodes with
// ix ≥ 8 and iy ≥ 8 unreached (null).
const NX = 10,
  NY = 10,
  STEP = 10;
const speedAt = (ix: number, iy: number) => (ix >= 8 && iy >= 8 ? null : 1000 + 100 * ix - 50 * iy);
const guaranteed: (number | null)[] = [];
for (let iy = 0; iy < NY; iy++) for (let ix = 0; ix < NX; ix++) guaranteed.push(speedAt(ix, iy));
const MAP_JSON = {
  orientation: "down" as const,
  grid: { nx: NX, ny: NY, rMinMm: 0, zMinMm: 0, stepMm: STEP },
  maxGuaranteedMmPerS: 1900,
  maxToolSpeedMmPerS: 3000,
  shareAtLeast: { "0.5": 1, "1": 0.5, "2": 0 },
  guaranteedMmPerS: guaranteed,
};
const MAP = compactSpeedMap(MAP_JSON as unknown as Parameters<typeof compactSpeedMap>[0], 50);

const ARM: RequirementsArm = { mountings: ["floor", "ceiling"], flange: FLANGE, payload: PAYLOAD, maps: [MAP] };

const req = (over: Partial<Requirements>): Requirements => ({ ...NO_REQUIREMENTS, ...over });

describe("payload", () => {
  it("takes the lowest row of the band and its bracketing rows (worked by hand)", () => {
    // Band 250–450 mm at offset 0: rows 200, 300, 400, 500 count (200 ≤ 250, 500 ≥ 450): min(10, 9, 8, 7.5) = 7.5 kg at 500 mm.
    const v = checkPayload(ARM, req({ payloadKg: 8, reachMm: [250, 450] }))!;
    expect(v.status).toBe("fail");
    expect(v.reason).toContain("holds 7.5\u00a0kg at 500\u00a0mm");
    expect(v.reason).toContain("needs 8\u00a0kg");
    // Band exactly on rows 200–400: rows 200, 300, 400 only: min = 8 kg, so 8 kg passes.
    expect(checkPayload(ARM, req({ payloadKg: 8, reachMm: [200, 400] }))!.status).toBe("pass");
  });

  it("between tabled CG offsets takes the lower of the two columns (worked by hand)", () => {
    // Offset 50 mm, band 400–500: offset 0 → min(8, 7.5) = 7.5; offset 100 → min(7.8, 7.6) = 7.6; lower = 7.5 kg.
    const v = checkPayload(ARM, req({ payloadKg: 7.5, cgOffsetMm: 50, reachMm: [400, 500] }))!;
    expect(v.status).toBe("pass");
    expect(v.reason).toContain("7.5\u00a0kg");
    // Offset 100 exactly: 7.6 kg; 7.7 fails there.
    expect(checkPayload(ARM, req({ payloadKg: 7.7, cgOffsetMm: 100, reachMm: [400, 500] }))!.reason).toContain(
      "holds 7.6\u00a0kg at 500\u00a0mm",
    );
    // Beyond the largest tabled offset: not decided.
    expect(checkPayload(ARM, req({ payloadKg: 1, cgOffsetMm: 150, reachMm: [400, 500] }))!.status).toBe("undecided");
  });

  it("fails a band reaching an out-of-reach row or leaving the table; uses the chosen mounting's rows", () => {
    expect(checkPayload(ARM, req({ payloadKg: 1, reachMm: [550, 650] }))!.reason).toContain("out of reach at 700");
    expect(checkPayload(ARM, req({ payloadKg: 1, reachMm: [50, 300] }))!.status).toBe("fail");
    expect(checkPayload(ARM, req({ payloadKg: 5, reachMm: [100, 300], mounting: "ceiling" }))!.reason).toContain(
      "holds 4\u00a0kg",
    );
  });

  it("is never above linear interpolation between rows and offsets (brute force over 400 random cases)", () => {
    // Independent: the payload at any (reach, offset) in the table's span by bilinear interpolation of the rows,
    // sampled densely over the band; the rule must not promise more than its minimum (conservative).
    const rand = mulberry32(7);
    const rows = (o: number) => PAYLOAD.find((s) => s.mounting === "floor" && s.offsetMm === o)!;
    const interp = (r: number, o: number) => {
      const at = (s: ComparePayloadSeries) => {
        const i = Math.min(4, Math.floor((r - 100) / 100));
        const t = (r - s.reachMm[i]!) / 100;
        return s.payloadKg[i]! * (1 - t) + s.payloadKg[i + 1]! * t;
      };
      return at(rows(0)) * (1 - o / 100) + at(rows(100)) * (o / 100);
    };
    for (let k = 0; k < 400; k++) {
      const a = 100 + rand() * 500,
        b = a + rand() * (600 - a),
        o = rand() * 100;
      let brute = Infinity;
      for (let j = 0; j <= 200; j++) brute = Math.min(brute, interp(a + ((b - a) * j) / 200, o));
      const need = Math.floor(brute * 1000) / 1000 + 0.001;
      // Asking a little more than the interpolated minimum must fail.
      expect(checkPayload(ARM, req({ payloadKg: need, cgOffsetMm: o, reachMm: [a, b] }))!.status).toBe("fail");
    }
  });
});

describe("reach", () => {
  it("helpers: even–odd inside and Liang–Barsky clipping (worked by hand)", () => {
    expect(insideEvenOdd(FLANGE, 100, 100)).toBe(true);
    expect(insideEvenOdd(FLANGE, 500, 500)).toBe(false); // in the hole
    expect(insideEvenOdd(FLANGE, 1100, 500)).toBe(false);
    // Segment (−100, 50) → (100, 50) clipped to [0, 50] × [0, 100]: (0, 50) → (50, 50).
    expect(clipSegment([-100, 50], [100, 50], 0, 50, 0, 100)).toEqual([
      [0, 50],
      [50, 50],
    ]);
    expect(clipSegment([-100, 150], [100, 150], 0, 50, 0, 100)).toBeNull();
  });

  it("matches the closed form on 500 random rectangles", () => {
    // Closed form for this region: [x0, x1] × [y0, y1] is covered iff it lies in [0, 1000]² and does not overlap the
    // open hole (400, 600)². Corners at 25 + 50k keep clear of every edge (no touching cases).
    const rand = mulberry32(11);
    const pick = () => 25 + 50 * Math.floor(rand() * 22) - 50;
    let passes = 0;
    for (let k = 0; k < 500; k++) {
      const [x0, x1] = [pick(), pick()].sort((p, q) => p - q) as [number, number];
      const [y0, y1] = [pick(), pick()].sort((p, q) => p - q) as [number, number];
      const inSquare = x0 >= 0 && x1 <= 1000 && y0 >= 0 && y1 <= 1000;
      const overlapsHole = x0 < 600 && x1 > 400 && y0 < 600 && y1 > 400;
      const expected = inSquare && !overlapsHole ? "pass" : "fail";
      if (expected === "pass") passes++;
      expect(checkReach(ARM, req({ reachMm: [x0, x1], heightMm: [y0, y1] }))!.status, `${x0}–${x1} × ${y0}–${y1}`).toBe(
        expected,
      );
    }
    expect(passes).toBeGreaterThan(20);
  });

  it("names a point it cannot reach", () => {
    const v = checkReach(ARM, req({ reachMm: [900, 1100], heightMm: [100, 200] }))!;
    expect(v.status).toBe("fail");
    expect(v.reason).toContain("does not reach 1,100\u00a0mm from axis 1 at 100\u00a0mm height");
  });
});

describe("speed", () => {
  it("block minima are the minima of the reached nodes in each block (brute force)", () => {
    expect(MAP.blocks.blockMm).toBe(50);
    expect(MAP.blocks.nx).toBe(2);
    for (let by = 0; by < 2; by++) {
      for (let bx = 0; bx < 2; bx++) {
        let brute: number | null = null;
        for (let iy = by * 5; iy < by * 5 + 5; iy++)
          for (let ix = bx * 5; ix < bx * 5 + 5; ix++) {
            const v = speedAt(ix, iy);
            if (v !== null) brute = brute === null ? v : Math.min(brute, v);
          }
        expect(MAP.blocks.minMmPerS[bx + by * 2]).toBe(brute);
      }
    }
    // Row 9 is reached at columns 0–7 only.
    expect(MAP.reachedRuns[9]).toEqual([[0, 7]]);
  });

  it("a band aligned with a block gives the exact minimum over its nodes (brute force)", () => {
    // Band r 0–40, z 0–40: nodes ix, iy = 0…4, one block. Minimum of 1000 + 100·ix − 50·iy: ix = 0, iy = 4 → 800 mm/s.
    let brute = Infinity;
    for (let iy = 0; iy <= 4; iy++) for (let ix = 0; ix <= 4; ix++) brute = Math.min(brute, speedAt(ix, iy)!);
    expect(brute).toBe(800);
    expect(checkSpeed(ARM, req({ minSpeedMPerS: 0.8, reachMm: [0, 40], heightMm: [0, 40] }), "floor")!.status).toBe(
      "pass",
    );
    const v = checkSpeed(ARM, req({ minSpeedMPerS: 0.81, reachMm: [0, 40], heightMm: [0, 40] }), "floor")!;
    expect(v.status).toBe("fail");
    expect(v.reason).toContain("falls to 0.8\u00a0m/s");
  });

  it("is never above the brute-force minimum over the band's nodes (200 random bands)", () => {
    const rand = mulberry32(5);
    for (let k = 0; k < 200; k++) {
      const a = rand() * 70,
        b = a + rand() * (70 - a),
        c = rand() * 70,
        d = c + rand() * (70 - c);
      let brute = Infinity;
      for (let iy = 0; iy < NY; iy++)
        for (let ix = 0; ix < NX; ix++) {
          if (ix * STEP >= a && ix * STEP <= b && iy * STEP >= c && iy * STEP <= d)
            brute = Math.min(brute, speedAt(ix, iy)!);
        }
      if (!Number.isFinite(brute)) continue; // the band falls between nodes: nearest-node rule, not compared here
      const v = checkSpeed(
        ARM,
        req({ minSpeedMPerS: (brute + 1) / 1000, reachMm: [a, b], heightMm: [c, d] }),
        "floor",
      )!;
      expect(v.status).toBe("fail");
    }
  });

  it("fails where a node of the band is not reached; undecided for another mounting or orientation", () => {
    expect(
      checkSpeed(ARM, req({ minSpeedMPerS: 0.1, reachMm: [60, 90], heightMm: [60, 90] }), "floor")!.reason,
    ).toContain("cannot reach 80\u00a0mm from axis 1 at 80\u00a0mm height");
    expect(
      checkSpeed(ARM, req({ minSpeedMPerS: 0.1, reachMm: [0, 10], heightMm: [0, 10], mounting: "ceiling" }), "floor")!
        .status,
    ).toBe("undecided");
    expect(
      checkSpeed(ARM, req({ minSpeedMPerS: 0.1, reachMm: [0, 10], heightMm: [0, 10], tool: "outward" }), "floor")!
        .status,
    ).toBe("undecided");
  });
});

describe("all requirements and the address", () => {
  it("lists the asked requirements in order", () => {
    const all = checkRequirements(
      ARM,
      req({ mounting: "wall", payloadKg: 1, reachMm: [100, 200], heightMm: [100, 200], minSpeedMPerS: 0.5 }),
    );
    expect(all.map((v) => v.key)).toEqual(["mounting", "payload", "reach", "speed"]);
    expect(all[0]!.status).toBe("fail");
    expect(checkRequirements(ARM, NO_REQUIREMENTS)).toEqual([]);
  });

  it("round-trips through the query string and reports bad fields", () => {
    const r = req({
      payloadKg: 7.5,
      cgOffsetMm: 100,
      reachMm: [300, 1250],
      heightMm: [-200, 800],
      minSpeedMPerS: 0.5,
      tool: "outward",
      mounting: "ceiling",
    });
    const qs = new URLSearchParams(requirementPairs(r)).toString();
    const p = new URLSearchParams(qs);
    const back = parseRequirements((k) => p.get(k));
    expect(back.errors).toEqual([]);
    expect(back.requirements).toEqual(r);
    const bad = parseRequirements(
      (k) => (({ "need-kg": "-3", "need-reach": "900,100", "need-tool": "up" }) as Record<string, string>)[k] ?? null,
    );
    expect(bad.errors).toHaveLength(3);
    expect(bad.requirements.payloadKg).toBeNull();
    expect(bad.requirements.reachMm).toBeNull();
  });
});

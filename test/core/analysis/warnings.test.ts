/**
 * Analysis warnings as codes and numbers. The thresholds are common practice, no source (2 % on reach; 0.005–2 mm
 * repeatability); the deviation is (stated / computed − 1)·100, worked by hand below.
 */
import { describe, expect, it } from "vitest";
import { reachWarning, repeatabilityWarning } from "../../../src/core/analysis/warnings";

describe("reachWarning", () => {
  it("stays quiet within 2 % and speaks beyond it, with the deviation worked by hand", () => {
    expect(reachWarning(1020, 1000, "wrist centre")).toBeNull(); // exactly +2.0 %: not more than 2 %
    expect(reachWarning(980, 1000, "flange")).toBeNull();
    // 1030 / 1000 − 1 = +3.0 %
    expect(reachWarning(1030, 1000, "wrist centre")).toEqual({
      code: "stated-reach-mismatch",
      statedMm: 1030,
      computedMm: 1000,
      basis: "wrist centre",
      deviationPercent: 3,
      unitsSuspect: false,
    });
    // 1400 / 1450.4 − 1 = −3.475 % → −3.5 % at one decimal; computed reach shown to the mm
    expect(reachWarning(1400, 1450.4, "flange")).toMatchObject({ deviationPercent: -3.5, computedMm: 1450 });
  });

  it("suspects the units when the stated value is about 1000× or 1/1000× the computed one", () => {
    expect(reachWarning(1.45, 1450, "flange")?.unitsSuspect).toBe(true); // metres typed where mm belong
    expect(reachWarning(1450000, 1450, "flange")?.unitsSuspect).toBe(true);
    expect(reachWarning(1600, 1450, "flange")?.unitsSuspect).toBe(false);
  });

  it("says nothing when there is no computed reach", () => {
    expect(reachWarning(1000, 0, "flange")).toBeNull();
  });
});

describe("repeatabilityWarning", () => {
  it("flags values outside 0.005–2 mm only", () => {
    expect(repeatabilityWarning(0.005)).toBeNull();
    expect(repeatabilityWarning(2)).toBeNull();
    expect(repeatabilityWarning(0.004)).toEqual({
      code: "repeatability-implausible",
      repeatabilityMm: 0.004,
      minMm: 0.005,
      maxMm: 2,
    });
    expect(repeatabilityWarning(20)?.code).toBe("repeatability-implausible");
  });
});

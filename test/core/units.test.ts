/**
 * Unit conversions (src/core/units.ts) against their definitions: 1 rad = 180/π deg (ISO 80000-3), 1 mm = 10⁻³ m
 * (SI prefix milli), standard gravity g₀ = 9.80665 m/s² exactly (3rd CGPM 1901, BIPM SI Brochure).
 */
import { describe, expect, it } from "vitest";
import { STANDARD_GRAVITY_M_PER_S2, degToRad, mToMm, mmToM, radToDeg } from "../../src/core/units";
import { expectClose, expectRelClose } from "../helpers/expectClose";

describe("angles", () => {
  it("maps the closed-form angles", () => {
    // definition: π rad = 180°
    expectClose(degToRad(180), Math.PI, 1e-15, "180°");
    expectClose(degToRad(90), Math.PI / 2, 1e-15, "90°");
    expectClose(degToRad(-45), -Math.PI / 4, 1e-15, "−45°");
    expectClose(degToRad(360), 2 * Math.PI, 1e-15, "360°");
    expect(degToRad(0)).toBe(0);
    expectClose(radToDeg(Math.PI), 180, 1e-12, "π rad");
    expectClose(radToDeg(Math.PI / 3), 60, 1e-12, "π/3 rad");
    expectClose(radToDeg(1), 57.29577951308232, 1e-12, "1 rad = 180/π ° (57.2957795130823…°)");
  });

  it("sin and cos of converted angles match exact values", () => {
    // closed forms: sin 30° = 1/2, cos 60° = 1/2, tan 45° = 1
    expectClose(Math.sin(degToRad(30)), 0.5, 1e-15, "sin 30°");
    expectClose(Math.cos(degToRad(60)), 0.5, 1e-15, "cos 60°");
    expectClose(Math.tan(degToRad(45)), 1, 1e-15, "tan 45°");
  });

  it("round-trips and is linear", () => {
    for (const d of [-720, -181.5, -1e-9, 0.25, 33, 359.999, 1e6]) {
      expectRelClose(radToDeg(degToRad(d)), d, 1e-15, `round trip ${d}°`);
      // linearity: f(a + b) = f(a) + f(b)
      expectClose(degToRad(d + 10), degToRad(d) + degToRad(10), 1e-9 * Math.max(1, Math.abs(d)), `linear ${d}`);
    }
  });
});

describe("lengths", () => {
  it("uses the SI prefix milli = 10⁻³", () => {
    expect(mmToM(1500)).toBe(1.5);
    expect(mmToM(1)).toBe(0.001);
    expect(mToMm(0.25)).toBe(250);
    expect(mToMm(-2)).toBe(-2000);
    expectClose(mToMm(mmToM(123.456)), 123.456, 1e-12, "round trip");
  });
});

describe("standard gravity", () => {
  it("is the defined value 9.80665 m/s² (3rd CGPM 1901)", () => {
    expect(STANDARD_GRAVITY_M_PER_S2).toBe(9.80665);
  });
});

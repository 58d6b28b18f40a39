/**
 * revolvedVolume against Pappus's centroid theorem worked by hand: a region of area A whose centroid lies at radius
 * ρ̄ from the axis sweeps V = A · θ · ρ̄ when turned by θ. For a rectangle ρ ∈ [R1, R2] of height H this is
 * V = θ/2 · (R2² − R1²) · H (the annular sector of a hollow cylinder, the textbook volume of a cylindrical shell).
 * Side views are built row by row in a RowCover (each row stands for a band of height dy).
 */
import { describe, expect, it } from "vitest";
import type { PolarProfile } from "../../../../src/core/analysis/envelope/polarSweep";
import { revolvedVolume } from "../../../../src/core/analysis/envelope/revolvedVolume";
import { RowCover } from "../../../../src/core/analysis/envelope/rowCover";
import { expectRelClose } from "../../../helpers/expectClose";

const DY_MM = 10;
const ROWS = 12;
const H_MM = ROWS * DY_MM;

/** Side view: the same intervals [s, e] (signed radius, mm) in every one of ROWS rows. */
function sideOf(intervals: [number, number][]): RowCover {
  const cover = new RowCover(0, DY_MM);
  for (let j = 0; j < ROWS; j++) for (const [s, e] of intervals) cover.add(j, s, e);
  return cover;
}

/** A profile with no rows: every radius falls beyond it, so only the joint 1 range counts. */
const NO_PROFILE: PolarProfile = { drhoMm: 10, arcs: [] };

/** Pappus for a rectangle ρ ∈ [r1, r2] × height h turned by θ (hand-worked: A · θ · ρ̄ = (r2−r1)h · θ · (r1+r2)/2). */
const pappus = (r1: number, r2: number, h: number, theta: number) => (r2 - r1) * h * theta * ((r1 + r2) / 2);

describe("revolvedVolume, full turn of joint 1", () => {
  it("a front rectangle gives the hollow cylinder π (R2² − R1²) H", () => {
    const v = revolvedVolume(sideOf([[200, 500]]), NO_PROFILE, -Math.PI, Math.PI);
    // hollow cylinder volume, closed form π(R2² − R1²)H; Pappus gives the same: A · 2π · ρ̄
    expectRelClose(v, Math.PI * (500 ** 2 - 200 ** 2) * H_MM, 1e-12, "hollow cylinder");
    expectRelClose(v, pappus(200, 500, H_MM, 2 * Math.PI), 1e-12, "Pappus");
  });

  it("a rectangle across the axis counts its folded overlap once: a solid cylinder of the larger radius", () => {
    // [−300, 500] folds onto ρ ∈ [0, 500] (front) ∪ [0, 300] (back): solid cylinder π R² H, R = 500
    const v = revolvedVolume(sideOf([[-300, 500]]), NO_PROFILE, 0, 2 * Math.PI);
    expectRelClose(v, Math.PI * 500 ** 2 * H_MM, 1e-12, "solid cylinder");
  });

  it("disjoint front and back bands give the sum of two hollow cylinders", () => {
    const side = sideOf([
      [-500, -400],
      [100, 200],
    ]);
    const v = revolvedVolume(side, NO_PROFILE, -Math.PI, Math.PI);
    // folded: ρ ∈ [100, 200] and ρ ∈ [400, 500]; each a hollow cylinder π(R2² − R1²)H
    const expected = Math.PI * (200 ** 2 - 100 ** 2) * H_MM + Math.PI * (500 ** 2 - 400 ** 2) * H_MM;
    expectRelClose(v, expected, 1e-12, "two shells");
  });

  it("is zero for an empty side view", () => {
    // nothing to revolve: V = 0 exactly
    expect(revolvedVolume(new RowCover(0, DY_MM), NO_PROFILE, -Math.PI, Math.PI)).toBe(0);
  });
});

describe("revolvedVolume, partial range of joint 1 (Pappus with angle θ)", () => {
  it("a front rectangle turned by θ = 90° gives a quarter shell", () => {
    const theta = Math.PI / 2;
    const v = revolvedVolume(sideOf([[200, 500]]), NO_PROFILE, -theta / 2, theta / 2);
    // Pappus: A · θ · ρ̄ = θ/2 (R2² − R1²) H
    expectRelClose(v, pappus(200, 500, H_MM, theta), 1e-12, "quarter shell");
    expectRelClose(v, (Math.PI * (500 ** 2 - 200 ** 2) * H_MM) / 4, 1e-12, "quarter of the hollow cylinder");
  });

  it("a back rectangle turned by θ = 60° gives the same sector volume as its mirror", () => {
    const theta = Math.PI / 3;
    const v = revolvedVolume(sideOf([[-500, -200]]), NO_PROFILE, 0, theta);
    // Pappus with θ; the back half-plane sweeps the same angle
    expectRelClose(v, pappus(200, 500, H_MM, theta), 1e-12, "back sector");
  });

  it("front and back at the same radii: two disjoint sectors for θ ≤ π, the full shell once they overlap", () => {
    const side = sideOf([
      [-500, -200],
      [200, 500],
    ]);
    const small = Math.PI / 2;
    // sectors [0, θ] and [π, π + θ] are disjoint for θ ≤ π: total angle 2θ
    expectRelClose(revolvedVolume(side, NO_PROFILE, 0, small), pappus(200, 500, H_MM, 2 * small), 1e-12, "2θ");
    const large = (3 * Math.PI) / 2;
    // [0, 3π/2] ∪ [π, 5π/2] covers the whole circle: total angle 2π
    expectRelClose(revolvedVolume(side, NO_PROFILE, 0, large), pappus(200, 500, H_MM, 2 * Math.PI), 1e-12, "2π cap");
  });

  it("a front azimuth arc of width w in the profile widens the swept angle to w + θ", () => {
    const theta = Math.PI / 4,
      w = Math.PI / 6,
      drho = 10;
    // rows k = 0 … 29 cover ρ ∈ [0, 300); every row holds the arc [−w/2, w/2] (start, length)
    const arcs = Array.from({ length: 30 }, () => Float64Array.of(-w / 2, w));
    const profile: PolarProfile = { drhoMm: drho, arcs };
    const v = revolvedVolume(sideOf([[200, 500]]), profile, 0, theta);
    // hand-worked: ρ ∈ [200, 300] inside the profile sweeps w + θ; ρ ∈ [300, 500] beyond it sweeps θ alone
    const expected = pappus(200, 300, H_MM, w + theta) + pappus(300, 500, H_MM, theta);
    expectRelClose(v, expected, 1e-12, "profile arc plus range");
  });
});

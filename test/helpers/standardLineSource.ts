/** A synthetic source for the standard-line choice: an annulus band about a vertical axis 1 (or a gantry box). */
import type { StandardLineSource } from "../../src/core";

const STEP = 10;

export function bandSource(
  rInMm: number,
  rOutMm: number,
  zLoMm: number,
  zHiMm: number,
  layout: "revolute-base" | "prismatic-base" = "revolute-base",
): StandardLineSource {
  const rMinMm = -20,
    zMinMm = zLoMm - 50;
  const nx = Math.ceil((rOutMm + 100 - rMinMm) / STEP) + 1,
    ny = Math.ceil((zHiMm + 50 - zMinMm) / STEP) + 1;
  const guaranteed: (number | null)[] = [];
  for (let iy = 0; iy < ny; iy++) {
    for (let ix = 0; ix < nx; ix++) {
      const r = rMinMm + ix * STEP,
        z = zMinMm + iy * STEP;
      guaranteed.push(Math.abs(r) >= rInMm && Math.abs(r) <= rOutMm && z >= zLoMm && z <= zHiMm ? 1000 : null);
    }
  }
  return {
    downMap: {
      grid: { nx, ny, rMinMm, zMinMm, stepMm: STEP },
      reachableCells: guaranteed.filter((v) => v !== null).length,
      guaranteedMmPerS: guaranteed,
    },
    flangeMaxMm: rOutMm,
    layout,
    axis1:
      layout === "revolute-base"
        ? { pointMm: [0, 0, 0], direction: [0, 0, 1], forward: [1, 0, 0], sweepRad: [-Math.PI, Math.PI] }
        : null,
    flangeTopMm: [
      [
        [0, 0],
        [2000, 0],
        [2000, 1000],
        [0, 1000],
        [0, 0],
      ],
    ],
  };
}

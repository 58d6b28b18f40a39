/**
 * Bench case for the cell studies' move timing: the per-call cost of timeOptimal (time-optimal timing of a linear
 * move) on a 6-joint path of 200 stages, with and without a reused scratch, and of jointMoveTime. The path is
 * synthetic (smooth invented joint curves along 0.8 m of tool travel, a 1 m/s tool cap): the cost depends on the
 * number of stages and joints, not on the geometry.
 */
import { createTimeOptimalScratch, jointMoveTime, timeOptimal, type TimeOptimalInput } from "../../src/core";
import { median } from "./stats";

/** A smooth invented 6-joint path: qⱼ(s) = Aⱼ·sin(ωⱼ·s + φⱼ) + Bⱼ·s over s ∈ [0, 0.8] m. */
export function syntheticSixJointPath(stages: number): TimeOptimalInput {
  const amp = [0.6, 0.4, 0.5, 1.2, 0.9, 1.5],
    omega = [2.1, 3.3, 2.7, 4.2, 5.1, 3.9],
    phase = [0.1, 0.7, 1.3, 0.4, 2.2, 1.0],
    slope = [0.5, -0.3, 0.8, 0.2, -0.6, 1.1];
  const s = Float64Array.from({ length: stages }, (_, i) => (0.8 * i) / (stages - 1));
  const q = new Float64Array(stages * 6);
  for (let i = 0; i < stages; i++)
    for (let j = 0; j < 6; j++) q[i * 6 + j] = amp[j]! * Math.sin(omega[j]! * s[i]! + phase[j]!) + slope[j]! * s[i]!;
  return {
    s,
    q,
    maxSpeedSi: [2.5, 2.5, 3, 5, 5, 7],
    maxAccelSi: [10, 10, 12, NaN, 25, NaN],
    toolSpeedCap: { capMPerS: 1, toolSpeedPerUnitS: new Float64Array(stages).fill(1) },
  };
}

export interface CellTimingBench {
  readonly timeOptimalUs: number;
  readonly timeOptimalScratchUs: number;
  readonly jointMoveUs: number;
  readonly timeS: number;
}

/** Medians over `reps` runs of the mean per-call time (µs) over `calls` calls each. */
export function benchCellTiming(reps: number, calls = 500, stages = 200): CellTimingBench {
  const input = syntheticSixJointPath(stages);
  const scratch = createTimeOptimalScratch();
  let sink = 0;
  const perCallUs = (f: () => number) => {
    for (let k = 0; k < calls; k++) sink += f(); // warm-up
    return median(
      Array.from({ length: reps }, () => {
        const t0 = performance.now();
        for (let k = 0; k < calls; k++) sink += f();
        return ((performance.now() - t0) * 1000) / calls;
      }),
    );
  };
  const timeOptimalUs = perCallUs(() => timeOptimal(input).timeS);
  const timeOptimalScratchUs = perCallUs(() => timeOptimal(input, scratch).timeS);
  const d = [0.8, 0.5, 1.2, 2.0, 1.1, 3.0];
  const jointMoveUs = perCallUs(() => jointMoveTime(d, input.maxSpeedSi, input.maxAccelSi, 0.8).timeS);
  return { timeOptimalUs, timeOptimalScratchUs, jointMoveUs, timeS: sink === 0 ? 0 : timeOptimal(input).timeS };
}

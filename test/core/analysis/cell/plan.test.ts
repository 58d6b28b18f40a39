/**
 * Tests of src/core/analysis/cell/plan.ts (one solution per step, loop feasible and fastest).
 *
 * Reference: exhaustive enumeration of every assignment of solutions to steps (the definition of the best loop:
 * fewest infeasible moves, then least time, the loop closing on its start), written here independently of the
 * dynamic programme; small random instances from a seeded generator. Bellman, Dynamic Programming, 1957, for why
 * the stage-wise programme must agree with enumeration [from memory].
 */
import { describe, expect, it } from "vitest";
import { planLoop, type PlanStep } from "../../../../src/core/analysis/cell/plan";
import { mulberry32 } from "../../../helpers/prng";

const same = (a: Float64Array, b: Float64Array) => Math.abs(a[0]! - b[0]!) < 1e-9;

/** A random instance: targets with 0–3 one-joint "solutions", steps joint or linear. */
function instance(seed: number) {
  const rnd = mulberry32(seed);
  const targets = 2 + Math.floor(rnd() * 2);
  const solutions: Float64Array[][] = [];
  for (let t = 0; t < targets; t++) {
    const count = rnd() < 0.1 ? 0 : 1 + Math.floor(rnd() * 3);
    solutions.push(Array.from({ length: count }, (_, k) => Float64Array.of(t * 10 + k)));
  }
  const n = 2 + Math.floor(rnd() * 3);
  const steps: PlanStep[] = Array.from({ length: n }, (_, i) => ({
    motion: rnd() < 0.4 ? "linear" : "joint",
    target: i === 0 ? 0 : Math.floor(rnd() * targets),
  }));
  // Joint move time: |a − b| / 7 + 0.1; linear move from a: arrives at solution ((a + i) mod count) or fails.
  const linearOutcome = new Map<string, number>();
  for (let i = 0; i < n; i++)
    for (const sol of solutions)
      for (const a of sol) linearOutcome.set(`${i}:${a[0]}`, rnd() < 0.25 ? -1 : Math.floor(rnd() * 3));
  const jointTime = (a: Float64Array, b: Float64Array) => Math.abs(a[0]! - b[0]!) / 7 + 0.1;
  const linear = (i: number, a: Float64Array): Float64Array | null => {
    const out = linearOutcome.get(`${i}:${a[0]}`)!;
    const sol = solutions[steps[i]!.target]!;
    if (out < 0 || !sol.length) return null;
    return sol[out % sol.length]!;
  };
  const linearTime = (i: number, a: Float64Array) => 0.2 + 0.01 * i + 0.001 * a[0]!;
  return { solutions, steps, jointTime, linear, linearTime };
}

/** Exhaustive best: every assignment of states (a solution or the placeholder) per step. */
function bruteForce(inst: ReturnType<typeof instance>) {
  const { solutions, steps, jointTime, linear, linearTime } = inst;
  const n = steps.length;
  const choices = steps.map((s) => (solutions[s.target]!.length ? solutions[s.target]! : [null]));
  let best = { bad: Infinity, time: Infinity };
  const pick: (Float64Array | null)[] = new Array(n);
  const visit = (i: number) => {
    if (i === n) {
      let bad = 0,
        time = 0,
        valid = true;
      for (let k = 0; k < n; k++) {
        const a = pick[(k - 1 + n) % n]!,
          b = pick[k]!;
        if (!a || !b) {
          bad++;
          continue;
        }
        if (steps[k]!.motion === "joint") time += jointTime(a, b);
        else {
          const arrive = linear(k, a);
          // A line that can be followed ends where it arrives; only a line that cannot be followed is a failure.
          if (!arrive) bad++;
          else if (same(arrive, b)) time += linearTime(k, a);
          else valid = false;
        }
      }
      if (valid && (bad < best.bad || (bad === best.bad && time < best.time - 1e-12))) best = { bad, time };
      return;
    }
    for (const c of choices[i]!) {
      pick[i] = c;
      visit(i + 1);
    }
  };
  visit(0);
  return best;
}

describe("planLoop", () => {
  it("agrees with exhaustive enumeration on 300 random loops (infeasible count, then time)", () => {
    let withFailures = 0;
    for (let seed = 1; seed <= 300; seed++) {
      const inst = instance(seed);
      const plan = planLoop(inst.steps, inst.solutions, {
        jointMove: (_i, a, b) => ({ timeS: inst.jointTime(a, b), detail: null }),
        linearMove: (i, a) => {
          const end = inst.linear(i, a);
          return end
            ? { timeS: inst.linearTime(i, a), qEnd: end, detail: null }
            : { timeS: null, qEnd: null, detail: null };
        },
        same,
      });
      const ref = bruteForce(inst);
      expect(plan.infeasible).toBe(ref.bad);
      expect(plan.timeS).toBeCloseTo(ref.time, 9);
      if (ref.bad > 0) withFailures++;
      // The loop closes: each move starts where the previous one ended.
      const n = plan.moves.length;
      for (let k = 0; k < n; k++) {
        const prev = plan.moves[(k - 1 + n) % n]!.to,
          cur = plan.moves[k]!.from;
        expect(prev === cur || (prev !== null && cur !== null && same(prev, cur))).toBe(true);
      }
    }
    // The random instances exercise both kinds of loop.
    expect(withFailures).toBeGreaterThan(10);
    expect(withFailures).toBeLessThan(290);
  });

  it("a linear move that arrives at a new state (a redundant arm) is kept as a state of its own", () => {
    // Two targets with one solution each; the linear move back to target 0 arrives at 0.5 (not a listed solution),
    // then the joint move must start there. Expected by hand: joint 0.5 → 10 takes |10 − 0.5|, linear 0.3 s.
    const solutions = [[Float64Array.of(0)], [Float64Array.of(10)]];
    const plan = planLoop(
      [
        { motion: "joint", target: 1 },
        { motion: "linear", target: 0 },
      ],
      solutions,
      {
        jointMove: (_i, a, b) => ({ timeS: Math.abs(b[0]! - a[0]!), detail: null }),
        linearMove: (_i, a) => ({ timeS: 0.3, qEnd: Float64Array.of(a[0]! === 10 ? 0.5 : NaN), detail: null }),
        same,
      },
    );
    expect(plan.infeasible).toBe(0);
    expect(plan.moves[1]!.to![0]).toBe(0.5);
    expect(plan.moves[0]!.from![0]).toBe(0.5);
    expect(plan.timeS).toBeCloseTo(9.5 + 0.3, 12);
  });
});

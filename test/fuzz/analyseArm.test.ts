/**
 * Property tests of the whole per-arm analysis on random valid arm files (fast-check): the file passes the real
 * validation, the analysis finishes within its own work budgets or refuses the chain with a clear "not supported
 * because" error, and the output keeps the properties checked in properties.ts (no NaN or Infinity; reach and
 * heights bound every pose sampled by forward kinematics; guaranteed line speed ≤ maximum tool speed per map cell
 * and at random poses, both checked by brute force; payload at reach ≤ rated payload).
 * Deterministic: ARMDEX_FUZZ_SEED (fixed default) and ARMDEX_FUZZ_RUNS (small default) choose the draw; the long run
 * is test/fuzz/longRun.ts. Speed is not asserted; the time limit below only ends a run that would never end.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { armArbitrary } from "./armArbitrary";
import { checkArm, DEFAULT_CHECK } from "./properties";

const SEED = Number(process.env.ARMDEX_FUZZ_SEED ?? 20260317);
const RUNS = Number(process.env.ARMDEX_FUZZ_RUNS ?? 10);
/** Side-view containment of every sampled pose: on by default since the envelope fixes; ARMDEX_FUZZ_ENVELOPE=0 turns it off. */
const ENVELOPE = process.env.ARMDEX_FUZZ_ENVELOPE !== "0";
/** Ends a run (shrinking included) that goes on far longer than any arm should take: a hang guard, not a speed check. */
const HANG_GUARD_MS = 600_000;

describe("analyseArm on random valid arm files", () => {
  it(`validates, analyses and keeps every property (${RUNS} arms)`, { timeout: HANG_GUARD_MS + 60_000 }, () => {
    fc.assert(
      fc.property(armArbitrary, (arm) => {
        const result = checkArm(arm, { ...DEFAULT_CHECK, envelopeContainment: ENVELOPE });
        expect(result.violations).toEqual([]);
        expect(["analysed", "unsupported"]).toContain(result.outcome);
      }),
      { seed: SEED, numRuns: RUNS, interruptAfterTimeLimit: HANG_GUARD_MS, markInterruptAsFailure: true },
    );
  });
});

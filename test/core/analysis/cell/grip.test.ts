/**
 * Tests of src/core/analysis/cell/grip.ts (gripWalk). Reference: the rules of the module notes, applied by hand to
 * each loop below; and the equivalent definition "walk the loop twice from empty hands, keep the second pass"
 * (an independent brute-force walk written here).
 */
import { describe, expect, it } from "vitest";
import { gripWalk } from "../../../../src/core/analysis/cell/grip";
import type { CycleStepSpec } from "../../../../src/core/analysis/cell/types";
import { mulberry32 } from "../../../helpers/prng";

const step = (to: string, extra: Partial<CycleStepSpec> = {}): CycleStepSpec => ({ to, motion: "joint", ...extra });

describe("gripWalk", () => {
  it("pick then place: carried on the moves between grip and release; no problem", () => {
    // Hand: the last action is the release at step 3, so the loop starts with empty hands; grip at 1, release at 3.
    const w = gripWalk([step("above"), step("pick", { grip: "box" }), step("above"), step("place", { release: true })]);
    expect(w.carryingOnMove).toEqual([null, null, "box", "box"]);
    expect(w.carryingAfter).toEqual([null, "box", "box", null]);
    expect(w.problems).toEqual([]);
  });

  it("the loop wraps round: a part gripped at the end is carried into the first steps", () => {
    // Hand: the last action is the grip at step 2, so steps 0 and 1 start carrying "blank"; released at step 1.
    const w = gripWalk([step("load"), step("press", { release: true }), step("pick", { grip: "blank" })]);
    expect(w.carryingOnMove).toEqual(["blank", "blank", null]);
    expect(w.problems).toEqual([]);
  });

  it("a release with nothing carried and a grip with full hands are problems at their step", () => {
    // Hand: no grip anywhere, so the release at step 0 has empty hands.
    expect(gripWalk([step("a", { release: true }), step("b")]).problems).toEqual([
      { step: 0, kind: "release-empty", part: null, carried: null, grippedAt: null },
    ]);
    // Hand: one grip and no release: the loop comes back to step 0 still holding the box gripped at step 0.
    expect(gripWalk([step("a", { grip: "box" }), step("b")]).problems).toEqual([
      { step: 0, kind: "grip-while-carrying", part: "box", carried: "box", grippedAt: 0 },
    ]);
    // Release and grip on one step: release first, so a swap is fine.
    expect(
      gripWalk([step("a", { grip: "x" }), step("b", { release: true, grip: "y" }), step("c", { release: true })])
        .problems,
    ).toEqual([]);
  });

  it("equals walking the loop twice from empty hands (random loops)", () => {
    const rand = mulberry32(7);
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + Math.floor(rand() * 6);
      const cycle = Array.from({ length: n }, (_, i) => {
        const r = rand();
        return step(
          `t${i}`,
          r < 0.3
            ? { grip: rand() < 0.5 ? "p" : "q" }
            : r < 0.55
              ? { release: true }
              : r < 0.65
                ? { release: true, grip: "p" }
                : {},
        );
      });
      // Brute force: two passes from empty hands; record the second.
      let held: string | null = null;
      const onMove: (string | null)[] = [];
      const problems: [number, string][] = [];
      for (let pass = 0; pass < 2; pass++) {
        cycle.forEach((s, i) => {
          if (pass === 1) onMove.push(held);
          if (s.release === true) {
            if (held === null && pass === 1) problems.push([i, "release-empty"]);
            held = null;
          }
          if (s.grip !== undefined) {
            if (held !== null && pass === 1) problems.push([i, "grip-while-carrying"]);
            held = s.grip;
          }
        });
      }
      const w = gripWalk(cycle);
      expect(w.carryingOnMove, `trial ${trial}`).toEqual(onMove);
      expect(w.problems.map((p) => [p.step, p.kind])).toEqual(problems);
    }
  });
});

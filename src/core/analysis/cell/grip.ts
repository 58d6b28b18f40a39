/**
 * What the tool carries on each move of a cell's loop (pure).
 *
 * Rules. On arrival at a step's target the arm first releases (`release: true` sets the carried part down), then
 * grips (`grip` picks that part up), so one step may set one part down and take another. The loop repeats: the arm
 * starts at the last step's target carrying what it carries at the end of the loop. That state is fixed by the last
 * step that grips or releases (its release leaves the hands empty, its grip leaves that part held); a loop without
 * any grip or release carries nothing. One pass from that state then finds every step that releases with empty hands
 * or grips while holding a part: walking the loop twice from empty hands gives the same answer, since the state after
 * the first grip or release no longer depends on where the walk began.
 */
import type { CycleStepSpec } from "./types";

export interface GripProblem {
  /** Index of the step in the cycle. */
  readonly step: number;
  /** "release-empty": `release: true` with nothing carried; "grip-while-carrying": `grip` while a part is held. */
  readonly kind: "release-empty" | "grip-while-carrying";
  /** The part the step grips (grip-while-carrying) or null. */
  readonly part: string | null;
  /** The part carried on arrival (null when the hands are empty). */
  readonly carried: string | null;
  /** The step that gripped the carried part (null when nothing is carried). */
  readonly grippedAt: number | null;
}

export interface GripWalk {
  /** carryingOnMove[i]: the part carried while moving to step i's target (before its release and grip). */
  readonly carryingOnMove: readonly (string | null)[];
  /** carryingAfter[i]: the part carried after step i's release and grip (during its dwell and the next move). */
  readonly carryingAfter: readonly (string | null)[];
  readonly problems: readonly GripProblem[];
}

/**
 * Walks the loop once from the state it wraps round with, recording what is carried on each move and every step
 * that releases nothing or grips with full hands. A step that grips with full hands takes the new part (the old one
 * is dropped), so the walk goes on and reports later steps too.
 * @example gripWalk([{ to: "a", motion: "joint", grip: "box" }, { to: "b", motion: "linear", release: true }])
 *   // { carryingOnMove: [null, "box"], carryingAfter: ["box", null], problems: [] }
 */
export function gripWalk(cycle: readonly CycleStepSpec[]): GripWalk {
  let start: { part: string | null; at: number | null } = { part: null, at: null };
  for (let i = cycle.length - 1; i >= 0; i--) {
    const s = cycle[i]!;
    if (s.grip !== undefined) {
      start = { part: s.grip, at: i };
      break;
    }
    if (s.release === true) break;
  }
  let held = start;
  const carryingOnMove: (string | null)[] = [];
  const carryingAfter: (string | null)[] = [];
  const problems: GripProblem[] = [];
  cycle.forEach((s, i) => {
    carryingOnMove.push(held.part);
    if (s.release === true) {
      if (held.part === null)
        problems.push({ step: i, kind: "release-empty", part: null, carried: null, grippedAt: null });
      held = { part: null, at: null };
    }
    if (s.grip !== undefined) {
      if (held.part !== null)
        problems.push({ step: i, kind: "grip-while-carrying", part: s.grip, carried: held.part, grippedAt: held.at });
      held = { part: s.grip, at: i };
    }
    carryingAfter.push(held.part);
  });
  return { carryingOnMove, carryingAfter, problems };
}

/**
 * Choosing one inverse-kinematics solution per step of a cell's loop so that the whole loop is feasible and fastest.
 *
 * The loop: step i moves from the arm's state after step i − 1 to a solution of step i's target; the arm starts at
 * the last step's target, in the state it ends the loop in (a loop that closes). States after step i:
 * - a joint step: every solution of its target (a joint move reaches any of them; straight in joint space, it stays
 *   inside the ranges);
 * - a linear step: every solution of its target plus the arrival of each followed move that matches none of them
 *   (arms with more than six joints arrive somewhere on the self-motion set).
 * Edges: a joint move from a to b, timed by the caller; a linear move from a to where following the line from a
 *   arrives, timed by the caller, or, when the line cannot be followed from a, an infeasible edge to every solution
 *   (so the rest of the loop is still planned and reported).
 * Cost, compared in order: the number of infeasible moves, then the number of visits at a solution the caller marks
 * as poor (`statePenalty`: a joint closer to its range end than the cell requires), then the total time. Dynamic programming over the steps
 * for each start state (the loop closes on it), then the best start; ties keep the earlier state (the solutions
 * nearest the zero pose come first).
 * A target without solutions has one placeholder state (null); every move into or out of it is infeasible.
 * @see Bellman, Dynamic Programming, Princeton 1957 (shortest paths by stages) [from memory]
 */

export interface PlanStep {
  readonly motion: "joint" | "linear";
  /** Index of the step's target in `solutions`. */
  readonly target: number;
}

/** A timed edge: time (s) or null when infeasible. */
export interface EdgeTime<Detail> {
  readonly timeS: number | null;
  readonly detail: Detail;
}

export interface LinearEdge<Detail> extends EdgeTime<Detail> {
  /** Joints on arrival (null when infeasible). */
  readonly qEnd: Float64Array | null;
}

export interface PlanCallbacks<J, L> {
  /** Joint move of step `step` from a to b (both solutions). */
  jointMove(step: number, a: Float64Array, b: Float64Array): EdgeTime<J>;
  /** Linear move of step `step` from a. */
  linearMove(step: number, a: Float64Array): LinearEdge<L>;
  /** Whether two joint vectors are the same solution. */
  same(a: Float64Array, b: Float64Array): boolean;
  /** 1 for a solution to avoid at step `step` when there is a choice (default: none), else 0. */
  statePenalty?(step: number, q: Float64Array): number;
}

export interface PlannedMove<J, L> {
  readonly step: number;
  /** Joints before and after (null at a target without solutions). */
  readonly from: Float64Array | null;
  readonly to: Float64Array | null;
  readonly timeS: number | null;
  readonly feasible: boolean;
  /** The callback's detail (undefined for a move into or out of a target without solutions). */
  readonly joint?: J | undefined;
  readonly linear?: L | undefined;
}

export interface Plan<J, L> {
  readonly moves: PlannedMove<J, L>[];
  readonly infeasible: number;
  /** Visits at solutions marked by statePenalty. */
  readonly penalised: number;
  readonly timeS: number;
}

interface Edge<J, L> {
  readonly from: number;
  readonly to: number;
  readonly bad: number;
  readonly soft: number;
  readonly timeS: number;
  readonly move: PlannedMove<J, L>;
}

/**
 * The best loop (see the module notes).
 * @param steps the loop's steps, at least one
 * @param solutions per target, its solutions (may be empty)
 */
export function planLoop<J, L>(
  steps: readonly PlanStep[],
  solutions: readonly (readonly Float64Array[])[],
  cb: PlanCallbacks<J, L>,
): Plan<J, L> {
  const n = steps.length;
  if (n === 0) throw new RangeError("invalid cycle: no steps");
  const lastTarget = solutions[steps[n - 1]!.target]!;
  let starts: (Float64Array | null)[] = lastTarget.length ? [...lastTarget] : [null];
  let graph = buildGraph(steps, solutions, starts, cb);
  // Redundant arms may arrive at new states at the last step: take them as starts too (one more round).
  if (graph.states[n - 1]!.length > starts.length) {
    starts = graph.states[n - 1]!;
    graph = buildGraph(steps, solutions, starts, cb);
  }
  let best: Plan<J, L> | null = null;
  for (let x = 0; x < starts.length; x++) {
    const plan = loopFrom(graph, starts, x, n, cb.same);
    if (
      plan &&
      (!best ||
        plan.infeasible < best.infeasible ||
        (plan.infeasible === best.infeasible && plan.timeS < best.timeS - 1e-12))
    )
      best = plan;
  }
  if (!best) throw new Error("no loop found");
  return best;
}

/** Lexicographic order of (infeasible, penalised, time). */
function better(b1: number, p1: number, t1: number, b2: number, p2: number, t2: number): boolean {
  return b1 < b2 || (b1 === b2 && (p1 < p2 || (p1 === p2 && t1 < t2 - 1e-12)));
}

interface Graph<J, L> {
  /** states[i]: states after step i (starts are the states "after step −1"). */
  readonly states: (Float64Array | null)[][];
  /** edges[i]: edges of step i, from states[i − 1] (starts for i = 0) to states[i]. */
  readonly edges: Edge<J, L>[][];
}

function buildGraph<J, L>(
  steps: readonly PlanStep[],
  solutions: readonly (readonly Float64Array[])[],
  starts: (Float64Array | null)[],
  cb: PlanCallbacks<J, L>,
): Graph<J, L> {
  const states: (Float64Array | null)[][] = [];
  const edges: Edge<J, L>[][] = [];
  const penalty = (i: number, q: Float64Array) => (cb.statePenalty ? cb.statePenalty(i, q) : 0);
  let before = starts;
  steps.forEach((step, i) => {
    const sol = solutions[step.target]!;
    const after: (Float64Array | null)[] = sol.length ? [...sol] : [null];
    const list: Edge<J, L>[] = [];
    const infeasibleToAll = (from: number, a: Float64Array | null, linear?: L) => {
      after.forEach((b, to) =>
        list.push({
          from,
          to,
          bad: 1,
          soft: b ? penalty(i, b) : 0,
          timeS: 0,
          move: { step: i, from: a, to: b, timeS: null, feasible: false, linear },
        }),
      );
    };
    before.forEach((a, from) => {
      if (!a || !sol.length) return infeasibleToAll(from, a);
      if (step.motion === "joint") {
        after.forEach((b, to) => {
          const e = cb.jointMove(i, a, b!);
          const ok = e.timeS !== null;
          list.push({
            from,
            to,
            bad: ok ? 0 : 1,
            soft: penalty(i, b!),
            timeS: e.timeS ?? 0,
            move: { step: i, from: a, to: b, timeS: e.timeS, feasible: ok, joint: e.detail },
          });
        });
        return;
      }
      const e = cb.linearMove(i, a);
      if (e.timeS === null || !e.qEnd) return infeasibleToAll(from, a, e.detail);
      let to = after.findIndex((b) => b !== null && cb.same(b, e.qEnd!));
      if (to < 0) {
        to = after.length;
        after.push(e.qEnd);
      }
      list.push({
        from,
        to,
        bad: 0,
        soft: penalty(i, after[to]!),
        timeS: e.timeS,
        move: { step: i, from: a, to: after[to]!, timeS: e.timeS, feasible: true, linear: e.detail },
      });
    });
    states.push(after);
    edges.push(list);
    before = after;
  });
  return { states, edges };
}

/** The best loop that starts and ends in start state x, or null when none closes. */
function loopFrom<J, L>(
  g: Graph<J, L>,
  starts: (Float64Array | null)[],
  x: number,
  n: number,
  same: (a: Float64Array, b: Float64Array) => boolean,
): Plan<J, L> | null {
  let bad = [0],
    soft = [0],
    time = [0];
  let index = [x]; // state indices of the current layer, aligned with bad/time (layer −1: just x)
  const back: Map<number, Edge<J, L>>[] = [];
  let layer = new Map<number, number>([[x, 0]]);
  for (let i = 0; i < n; i++) {
    const nextBad = new Map<number, number>(),
      nextSoft = new Map<number, number>(),
      nextTime = new Map<number, number>(),
      choice = new Map<number, Edge<J, L>>();
    for (const e of g.edges[i]!) {
      const k = layer.get(e.from);
      if (k === undefined) continue;
      const b = bad[k]! + e.bad,
        p = soft[k]! + e.soft,
        t = time[k]! + e.timeS;
      const held = nextBad.get(e.to);
      if (held === undefined || better(b, p, t, held, nextSoft.get(e.to)!, nextTime.get(e.to)!)) {
        nextBad.set(e.to, b);
        nextSoft.set(e.to, p);
        nextTime.set(e.to, t);
        choice.set(e.to, e);
      }
    }
    back.push(choice);
    index = [...nextBad.keys()];
    bad = index.map((s) => nextBad.get(s)!);
    soft = index.map((s) => nextSoft.get(s)!);
    time = index.map((s) => nextTime.get(s)!);
    layer = new Map(index.map((s, k) => [s, k]));
  }
  // Close the loop: the state after the last step must be the start state.
  const startQ = starts[x]!;
  const last = g.states[n - 1]!;
  let end = -1;
  for (const s of index) {
    const q = last[s]!;
    if (q === startQ || (q !== null && startQ !== null && same(q, startQ))) end = s;
  }
  if (end < 0) return null;
  const moves: PlannedMove<J, L>[] = new Array(n);
  let s = end;
  for (let i = n - 1; i >= 0; i--) {
    const e = back[i]!.get(s)!;
    moves[i] = e.move;
    s = e.from;
  }
  const k = layer.get(end)!;
  return { moves, infeasible: bad[k]!, penalised: soft[k]!, timeS: time[k]! };
}

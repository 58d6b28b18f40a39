/**
 * Cell study: will each candidate arm do this cell, and in what cycle time? For each arm: the tool load against its
 * ratings, every solution of every target, one solution per step chosen so that the loop is feasible and fastest
 * (plan.ts), move times (jointMove.ts, timeOptimal.ts), margins at the targets and a verdict with its reasons in
 * numbers. The result's key names are the contract of `armdex cell`: add keys freely, do not rename.
 *
 * Figures are kinematic: no payload dynamics, no blending of corners, no controller; the cycle time is a lower
 * bound of what the arm will do (CELLS.md §1, common practice, no source).
 */
import type { Chain } from "../../kinematics/chain";
import type { PayloadSpec } from "../payload";
import { cellSetup, type CellSetup } from "./setup";
import { createReachContext, revoluteMarginRad, sameSolution, solveTarget, type TargetReach } from "./reach";
import {
  createFollowContext,
  firstRangeViolation,
  followLinear,
  linePositionM,
  type FollowResult,
  type LinearMove,
} from "./pathFollow";
import { planLoop, type Plan } from "./plan";
import { timeJointMove, timeLinearMove, type JointMoveDetail, type LinearMoveDetail } from "./moveTiming";
import { targetMargins, type TargetMargins } from "./margins";
import { cellToolLoads, type ToolLoadJson } from "./load";
import type { CellSpec } from "./types";
import { mToMm, radToDeg } from "../../units";
import { transformPointInto } from "../../math/mat4";

/** One candidate arm as the study needs it (the catalog fills it from a validated arm file). */
export interface CellArm {
  readonly id: string;
  readonly chain: Chain;
  readonly facts: PayloadSpec;
}

export type MoveProblemKind = "out-of-reach" | "singularity" | "joint-limit" | "branch-change";

export interface CellMoveJson {
  /** Position of the step in the cycle, from 1. */
  readonly step: number;
  readonly from: string;
  readonly to: string;
  readonly motion: "joint" | "linear";
  readonly timeS: number | null;
  readonly dwellS: number;
  /** What sets the move's time ("J2 speed", "J3 acceleration", "tool speed 500 mm/s"), null when infeasible. */
  readonly limitedBy: string | null;
  readonly feasible: boolean;
  readonly problem: null | {
    readonly kind: MoveProblemKind;
    /** Tool point where it appears, cell frame, mm. */
    readonly positionMm: [number, number, number];
    /** The joint concerned (joint-limit), else absent. */
    readonly joint?: string | undefined;
  };
  /** Part carried during the move. */
  readonly carrying: string | null;
  /** Joints at the end of the move, deg or mm (null when infeasible or the target is out of reach). */
  readonly jointsDeg: number[] | null;
  /** Linear moves: the largest tool-point speed (mm/s) and the smallest inverse condition met; else null. */
  readonly peakToolSpeedMmPerS: number | null;
  readonly minInverseCondition: number | null;
}

export interface CellTargetJson extends TargetMargins {
  readonly name: string;
  readonly reachable: boolean;
  readonly solutions: number;
  /** Why the target is out of reach, in words, or null. */
  readonly reason: string | null;
}

export interface CellArmJson {
  readonly arm: string;
  readonly verdict: "pass" | "fail";
  readonly reasons: string[];
  /** 1 for the fastest passing arm; null for a failing one. */
  readonly rank: number | null;
  readonly placement: { readonly positionMm: number[]; readonly rpyDeg: number[]; readonly mounting: string };
  readonly toolLoad: ToolLoadJson[];
  readonly targets: CellTargetJson[];
  readonly moves: CellMoveJson[];
  readonly cycleTimeS: number | null;
  /** Driven joints whose acceleration is not in the arm file (assumed: full speed in 0.25 s). */
  readonly accelerationAssumed: string[];
  /** The smallest joint margin over the targets, deg (revolute joints), or null. */
  readonly tightestMarginDeg: number | null;
}

export interface CellStudyJson {
  readonly cell: string;
  readonly arms: CellArmJson[];
}

/** Runs the study for every candidate given (in the order of the result: passing arms by cycle time, then the rest). */
export function cellStudy(cell: CellSpec, arms: readonly CellArm[]): CellStudyJson {
  const results = arms.map((arm) => studyArm(cell, arm));
  const passing = results.filter((r) => r.verdict === "pass").sort((a, b) => a.cycleTimeS! - b.cycleTimeS!);
  const failing = results.filter((r) => r.verdict === "fail");
  return { cell: cell.id, arms: [...passing.map((r, k) => ({ ...r, rank: k + 1 })), ...failing] };
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));

/** Joint margin below which a solution is avoided when the cell states no minimum, deg. */
export const DEFAULT_AVOID_MARGIN_DEG = 1;

// Solver set-ups per chain, kept while the chain lives: a study recomputed in the browser editor, or at each position
// of a placement map, does not build them again. They hold work buffers only; results do not depend on them.
function perChain<T>(create: (chain: Chain) => T): (chain: Chain) => T {
  const made = new WeakMap<Chain, T>();
  return (chain) => {
    let value = made.get(chain);
    if (value === undefined) {
      value = create(chain);
      made.set(chain, value);
    }
    return value;
  };
}

const reachContextOf = perChain(createReachContext);
const followContextOf = perChain(createFollowContext);

function drivenName(chain: Chain, i: number): string {
  return chain.jointNames[chain.drivenJoint[i]!]!;
}

/** Joint values for display: deg (revolute), mm (prismatic), to 0.01. */
function jointsForDisplay(chain: Chain, q: ArrayLike<number>): number[] {
  return Array.from({ length: chain.drivenCount }, (_, i) =>
    round(chain.isPrismatic[chain.drivenJoint[i]!] ? mToMm(q[i]!) : radToDeg(q[i]!), 2),
  );
}

function reasonText(r: TargetReach, chain: Chain): string | null {
  const why = r.reason;
  if (!why) return null;
  if (why.kind === "orientation")
    return `tool orientation: this arm keeps its tool axis along (${why.requiredAxis.map((v) => round(v, 3)).join(", ")}) of its base; the target tilts it by ${round(why.tiltDeg, 1)}°`;
  if (why.kind === "joint-limits") {
    const prismatic = chain.isPrismatic[chain.drivenJoint[why.joint]!] === 1;
    return `only outside the joint ranges (${drivenName(chain, why.joint)} would need ${round(why.valueDeg, 1)} ${prismatic ? "mm" : "°"})`;
  }
  return "out of reach";
}

function studyArm(cell: CellSpec, arm: CellArm): Omit<CellArmJson, "rank"> & { rank: null } {
  const chain = arm.chain;
  const setup = cellSetup(cell, arm.id);
  const reasons: string[] = [];
  if (!arm.facts.mountings.includes(setup.mounting))
    reasons.push(`placement implies ${setup.mounting} mounting; the arm file lists ${arm.facts.mountings.join(", ")}`);
  const toolLoad = cellToolLoads(cell, chain, arm.facts);
  for (const t of toolLoad) reasons.push(...t.problems);
  const reachCtx = reachContextOf(chain);
  const reach = setup.targets.map((t) => solveTarget(reachCtx, t.baseFromFlange));
  reach.forEach((r, k) => {
    if (!r.solutions.length) reasons.push(`${setup.targets[k]!.name}: ${reasonText(r, chain)}`);
  });
  const plan = planCycle(cell, setup, chain, reach);
  const moves = movesJson(cell, setup, chain, plan);
  moves.forEach((mv) => {
    const n = setup.stepTarget.length;
    const ends = [setup.stepTarget[(mv.step - 2 + n) % n]!, setup.stepTarget[mv.step - 1]!];
    if (!mv.feasible && mv.problem && ends.every((k) => reach[k]!.solutions.length))
      reasons.push(
        `move ${mv.step} (${mv.from} → ${mv.to}, ${mv.motion}): ${mv.problem.kind}${mv.problem.joint ? ` of ${mv.problem.joint}` : ""} at (${mv.problem.positionMm.join(", ")}) mm`,
      );
  });
  const allFeasible = moves.every((m) => m.feasible);
  const cycleTimeS = allFeasible
    ? round(
        moves.reduce((s, m) => s + m.timeS! + m.dwellS, 0),
        3,
      )
    : null;
  const maxCycleS = cell.requirements?.maxCycleS;
  if (cycleTimeS !== null && maxCycleS !== undefined && cycleTimeS > maxCycleS)
    reasons.push(`cycle ${cycleTimeS.toFixed(2)} s > ${maxCycleS} s`);
  const targets = targetsJson(cell, setup, chain, arm.facts, reach, plan, reasons);
  const margins = targets.map((t) => t.jointMarginDeg).filter((v): v is number => v !== null);
  const accelerationAssumed = Array.from({ length: chain.drivenCount }, (_, i) => i)
    .filter((i) => !Number.isFinite(chain.maxAccelSi[i]!))
    .map((i) => drivenName(chain, i));
  return {
    arm: arm.id,
    verdict: reasons.length ? "fail" : "pass",
    reasons,
    rank: null,
    placement: {
      positionMm: [...setup.placement.positionMm],
      rpyDeg: [...setup.placement.rpyDeg],
      mounting: setup.mounting,
    },
    toolLoad: toolLoad.map((t) => t.json),
    targets,
    moves,
    cycleTimeS,
    accelerationAssumed,
    tightestMarginDeg: margins.length ? Math.min(...margins) : null,
  };
}

type CellPlan = Plan<JointMoveDetail, LinearMoveDetail | FollowFailure>;

interface FollowFailure {
  readonly kind: MoveProblemKind;
  readonly positionM: [number, number, number];
  readonly joint: number;
}

/** Plans the loop: joint moves timed directly, linear moves followed (once per start modulo whole turns) and timed. */
function planCycle(cell: CellSpec, setup: CellSetup, chain: Chain, reach: readonly TargetReach[]): CellPlan {
  const m = chain.drivenCount;
  const followCtx = followContextOf(chain);
  const cache = new Map<
    string,
    { move: LinearMove; follow: FollowResult; canonical: Float64Array; timing: LinearMoveDetail | null }
  >();
  const steps = cell.cycle.map((s, i) => ({ motion: s.motion, target: setup.stepTarget[i]! }));
  // Solutions closer to a range end than the cell requires (1° when it requires nothing) are avoided when the loop
  // has a choice; the verdict still reports a margin below the requirement.
  const avoidBelowRad = ((cell.requirements?.minJointMarginDeg ?? DEFAULT_AVOID_MARGIN_DEG) * Math.PI) / 180;
  const prevTarget = (i: number) => setup.stepTarget[(i - 1 + steps.length) % steps.length]!;
  return planLoop(
    steps,
    reach.map((r) => r.solutions),
    {
      jointMove: (i, a, b) => {
        const d = timeJointMove(chain, a, b, (cell.cycle[i]!.speedPercent ?? 100) / 100);
        return { timeS: d.timeS, detail: d };
      },
      linearMove: (i, a) => {
        const canonical = Float64Array.from(a);
        for (let j = 0; j < m; j++)
          if (!chain.isPrismatic[chain.drivenJoint[j]!])
            canonical[j] = a[j]! - 2 * Math.PI * Math.round(a[j]! / (2 * Math.PI));
        const key = `${i}:${Array.from(canonical, (v) => v.toFixed(6)).join(",")}`;
        let entry = cache.get(key);
        if (!entry) {
          const move = {
            fromTcp: setup.targets[prevTarget(i)]!.baseFromTcp,
            toTcp: setup.targets[steps[i]!.target]!.baseFromTcp,
            tcpInFlange: setup.flangeFromTcp,
          };
          const follow = followLinear(followCtx, move, canonical);
          const cap = cell.cycle[i]!.speedMmPerS;
          const timing = follow.problem
            ? null
            : timeLinearMove(chain, follow, cap === undefined ? Infinity : cap / 1000);
          entry = { move, follow, canonical, timing };
          cache.set(key, entry);
        }
        const offset = a.map((v, j) => v - entry.canonical[j]!);
        const f = entry.follow;
        const violation = firstRangeViolation(chain, f, offset);
        const failAt = (kind: MoveProblemKind, fraction: number, joint: number) => {
          const positionM = linePositionM(entry.move, fraction);
          return { timeS: null, qEnd: null, detail: { kind, positionM, joint } as LinearMoveDetail | FollowFailure };
        };
        if (violation) {
          const span = f.s[f.stages - 1]!;
          return failAt("joint-limit", span > 0 ? f.s[violation.stage]! / span : 0, violation.joint);
        }
        if (f.problem) return failAt(f.problem.kind, f.problem.fraction, f.problem.joint);
        // The timing finds the path blocked (no speed left at some stage): in practice a singular pose.
        if (!entry.timing || entry.timing.timeS === null)
          return failAt("singularity", entry.timing?.blockedAtFraction ?? 0, -1);
        const qEnd = f.qEnd!.map((v, j) => v + offset[j]!);
        return { timeS: entry.timing.timeS, qEnd, detail: entry.timing as LinearMoveDetail | FollowFailure };
      },
      same: (a, b) => sameSolution(a, b, m),
      statePenalty: (_i, q) => (revoluteMarginRad(chain, q) < avoidBelowRad ? 1 : 0),
    },
  );
}

function isFailure(d: unknown): d is FollowFailure {
  return typeof d === "object" && d !== null && "positionM" in d;
}

function movesJson(cell: CellSpec, setup: CellSetup, chain: Chain, plan: CellPlan): CellMoveJson[] {
  const n = cell.cycle.length;
  const cellPoint = (pBase: readonly number[]): [number, number, number] => {
    const out = new Float64Array(3);
    transformPointInto(out, 0, setup.cellFromBase, pBase[0]!, pBase[1]!, pBase[2]!);
    return [round(mToMm(out[0]!), 1), round(mToMm(out[1]!), 1), round(mToMm(out[2]!), 1)];
  };
  return plan.moves.map((mv, i) => {
    const step = cell.cycle[i]!;
    const fromTarget = setup.targets[setup.stepTarget[(i - 1 + n) % n]!]!,
      toTarget = setup.targets[setup.stepTarget[i]!]!;
    let problem: CellMoveJson["problem"] = null;
    if (!mv.feasible) {
      const d = mv.linear;
      if (isFailure(d))
        problem = {
          kind: d.kind,
          positionMm: cellPoint(d.positionM),
          ...(d.joint >= 0 ? { joint: drivenName(chain, d.joint) } : {}),
        };
      else {
        const unreachable = mv.to === null ? toTarget : fromTarget;
        const p = unreachable.cellFromTcp;
        problem = {
          kind: "out-of-reach",
          positionMm: [p[3]!, p[7]!, p[11]!].map((v) => round(mToMm(v), 1)) as [number, number, number],
        };
      }
    }
    const linear = mv.feasible && step.motion === "linear" ? (mv.linear as LinearMoveDetail | undefined) : undefined;
    const limitedBy = mv.feasible
      ? ((step.motion === "joint" ? mv.joint?.limitedBy : linear?.limitedBy) ?? null)
      : null;
    return {
      step: i + 1,
      from: fromTarget.name,
      to: toTarget.name,
      motion: step.motion,
      timeS: mv.timeS === null ? null : round(mv.timeS, 3),
      dwellS: step.dwellS ?? 0,
      limitedBy,
      feasible: mv.feasible,
      problem,
      carrying: setup.carriedDuring[i]!,
      jointsDeg: mv.feasible && mv.to ? jointsForDisplay(chain, mv.to) : null,
      peakToolSpeedMmPerS: linear?.peakToolSpeedMmPerS ?? null,
      minInverseCondition: linear ? round(linear.minInverseCondition, 4) : null,
    };
  });
}

function targetsJson(
  cell: CellSpec,
  setup: CellSetup,
  chain: Chain,
  facts: PayloadSpec,
  reach: readonly TargetReach[],
  plan: CellPlan,
  reasons: string[],
): CellTargetJson[] {
  return setup.targets.map((t, k) => {
    const r = reach[k]!;
    const first = setup.stepTarget.indexOf(k);
    const q = first >= 0 ? plan.moves[first]!.to : null;
    const carried = first >= 0 ? [setup.carriedDuring[first]!, setup.carriedAfter[first]!] : [null];
    const margins = targetMargins(cell, setup, chain, facts, q, carried);
    const minMargin = cell.requirements?.minJointMarginDeg;
    if (margins.jointMarginDeg !== null && minMargin !== undefined && margins.jointMarginDeg < minMargin)
      reasons.push(
        `${t.name}: joint margin ${margins.jointMarginDeg.toFixed(1)}° < ${minMargin}° (${margins.tightestJoint})`,
      );
    for (const h of margins.holding)
      if (!h.ok) reasons.push(`${t.name}: ${h.joint} holding torque ${h.torqueNm} N·m > rated ${h.ratedNm} N·m`);
    return {
      name: t.name,
      reachable: r.solutions.length > 0,
      solutions: r.solutions.length,
      reason: reasonText(r, chain),
      ...margins,
    };
  });
}

/**
 * State of the payload-at-reach search of one mounting (pure): the grid over the searched joints, the reach and
 * wrist solution at every node, each row's worst posture so far, and the steps every stage shares (evaluate a
 * posture against the joint ratings, record it as a row's worst). The stages are in crossings.ts and refine.ts; the
 * rows and the report in rows.ts; atReach.ts runs them in order.
 */
import type { Chain } from "../../kinematics/chain";
import {
  gravityInBase,
  holdingTorqueInto,
  pointHoldingTorqueInto,
  type BodySet,
  type Mounting,
} from "../../kinematics/statics";
import { mmToM } from "../../units";
import type { PayloadAtReachOptions } from "./atReachTypes";
import { dot3, holdValue, norm3 } from "./chainGeometry";
import type { PayloadInput } from "./input";
import { planFor, searchRange, type ChainFacts, type SearchPlan } from "./searchPlan";
import { ToolSolver } from "./toolSolver";

/** Everything about the arm and the options that the mountings share. */
export interface SearchContext {
  readonly chain: Chain;
  readonly input: PayloadInput;
  readonly o: PayloadAtReachOptions;
  readonly bodies: BodySet;
  readonly facts: ChainFacts;
  readonly anyRating: boolean;
}

export /** The posture search of one mounting: grid, crossings, refinement and the rows. */
class MountingSearch {
  readonly chain: Chain;
  readonly plan: SearchPlan;
  readonly solver: ToolSolver;
  readonly gVec: [number, number, number];
  readonly gDir: [number, number, number];
  readonly notes: string[] = [];
  // Grid over the searched joints.
  readonly D: number;
  readonly lo: number[] = [];
  readonly hi: number[] = [];
  readonly count: number[] = [];
  readonly strides: number[] = [];
  /** A searched revolute joint whose window is a full turn: its grid wraps (the last node repeats the first). */
  readonly periodic: boolean[] = [];
  readonly total: number;
  readonly idx: Int32Array;
  readonly nw: number;
  nodeReach = new Float64Array(0);
  nodeWrist = new Float64Array(0);
  nodeAllowed = new Float64Array(0);
  minReach = Infinity;
  maxReach = -Infinity;
  // Rows.
  readonly stepM: number;
  readonly nOff: number;
  readonly offsetsM: number[];
  kFirst = 0;
  nRows = 0;
  best = new Float64Array(0);
  bestLimit = new Int32Array(0);
  bestOwn = new Uint8Array(0);
  bestQ = new Float64Array(0);
  bestHeight = new Float64Array(0);
  bestDim = new Int8Array(0);
  // Last evaluation, per offset.
  readonly lastAllowed: Float64Array;
  readonly lastLimit: Int32Array;
  readonly lastOwn: Uint8Array;
  readonly maxUnit: Float64Array;
  readonly unitFloor: number;
  postures = 0;
  // Work buffers.
  readonly qa: Float64Array;
  readonly qb: Float64Array;
  readonly qStar: Float64Array;
  readonly lastWrist: Float64Array;

  constructor(
    readonly ctx: SearchContext,
    readonly mounting: Mounting,
  ) {
    const chain = (this.chain = ctx.chain),
      o = ctx.o,
      m = chain.drivenCount;
    this.gVec = gravityInBase(mounting, o.angledTiltDeg, o.gravityMPerS2);
    const gNorm = norm3(this.gVec);
    this.gDir = [this.gVec[0] / gNorm, this.gVec[1] / gNorm, this.gVec[2] / gNorm];
    this.plan = planFor(chain, ctx.facts, this.gDir);
    const tool = this.plan.mode === "fixed-by-structure" ? ctx.facts.structureFixedAxis! : this.gDir;
    this.solver = new ToolSolver(chain, this.plan, tool);
    if (this.plan.mode === "fixed-by-structure" && dot3(tool, this.gDir) < 1 - 1e-9)
      this.notes.push(
        "the flange axis is fixed by the arm's structure and does not point along gravity in this mounting",
      );
    if (this.plan.mode === "follows-posture")
      this.notes.push("the arm has no wrist joints to orient the tool: the flange axis follows the posture");

    // Grid: nodes spread by range (prismatic ranges counted per characteristic length).
    const D = (this.D = this.plan.searched.length);
    const weights = this.plan.searched.map((j) => {
      const [a, b] = searchRange(chain, j);
      this.lo.push(a);
      this.hi.push(b);
      this.periodic.push(!chain.isPrismatic[chain.drivenJoint[j]!] && b - a >= 2 * Math.PI - 1e-12);
      return Math.max(
        (b - a) / (chain.isPrismatic[chain.drivenJoint[j]!] ? Math.max(chain.characteristicLengthM, 1e-3) : 1),
        1e-9,
      );
    });
    const budget = o.searchNodesByDims[Math.min(D, o.searchNodesByDims.length - 1)]!;
    const k = D > 0 ? Math.pow(budget / weights.reduce((p, w) => p * w, 1), 1 / D) : 0;
    for (let d = 0; d < D; d++) this.count.push(Math.max(3, Math.round(weights[d]! * k) + 1));
    let total = 1;
    for (let d = D - 1; d >= 0; d--) {
      this.strides[d] = total;
      total *= this.count[d]!;
    }
    this.total = total;
    this.idx = new Int32Array(D);
    this.nw = this.plan.orienting.length;

    this.stepM = mmToM(o.reachStepMm);
    this.nOff = o.offsetsMm.length;
    this.offsetsM = o.offsetsMm.map(mmToM);
    this.lastAllowed = new Float64Array(this.nOff);
    this.lastLimit = new Int32Array(this.nOff);
    this.lastOwn = new Uint8Array(this.nOff);
    this.maxUnit = new Float64Array(m);
    // Payload torque per kg below this is rounding (a load hanging on the joint's axis): 1e-9 · g · arm size.
    this.unitFloor = 1e-9 * o.gravityMPerS2 * Math.max(1, chain.characteristicLengthM);
    this.qa = new Float64Array(m);
    this.qb = new Float64Array(m);
    this.qStar = new Float64Array(m);
    this.lastWrist = Float64Array.from(this.plan.orienting, (j) => holdValue(chain, j));
  }

  /**
   * Rows from the reach range the node sweep found; allocates the per-row bests when some joint is rated. False when
   * the search stops here (no posture reaches with the tool along gravity, or no rated joint).
   */
  startRows(): boolean {
    if (!Number.isFinite(this.minReach)) {
      this.notes.push("no posture found with the tool along gravity within the joint limits");
      return false;
    }
    this.kFirst = Math.ceil(this.minReach / this.stepM - 1e-9);
    this.nRows = Math.max(0, Math.floor(this.maxReach / this.stepM + 1e-9) - this.kFirst + 1);
    if (!this.ctx.anyRating) return false;
    const slots = this.nRows * this.nOff,
      m = this.chain.drivenCount;
    this.best = new Float64Array(slots).fill(Infinity);
    this.bestLimit = new Int32Array(slots).fill(-2);
    this.bestOwn = new Uint8Array(slots);
    this.bestQ = new Float64Array(slots * m);
    this.bestHeight = new Float64Array(slots);
    this.bestDim = new Int8Array(slots);
    return true;
  }

  /** Sets the searched joints of solver.q (and idx) to grid node `node`. */
  setNode(node: number): void {
    let rem = node;
    for (let d = 0; d < this.D; d++) {
      const i = Math.floor(rem / this.strides[d]!);
      this.idx[d] = i;
      rem -= i * this.strides[d]!;
      this.solver.q[this.plan.searched[d]!] = this.gridValue(d, i);
    }
  }

  gridValue(d: number, i: number): number {
    return this.lo[d]! + ((this.hi[d]! - this.lo[d]!) * i) / (this.count[d]! - 1);
  }

  /** Node posture (searched joints, held joints, wrist as stored) into `out`. */
  nodePosture(out: Float64Array, node: number): void {
    this.setNode(node);
    for (let c = 0; c < this.nw; c++) this.solver.q[this.plan.orienting[c]!] = this.nodeWrist[node * this.nw + c]!;
    out.set(this.solver.q);
  }

  /** Reach at every node (NaN where the tool cannot point along gravity within the limits); with `screen`, also the
   * allowed payload at every node. */
  sweepNodes(screen: boolean): void {
    const chain = this.chain,
      q = this.solver.q,
      nw = this.nw,
      plan = this.plan;
    for (let j = 0; j < chain.drivenCount; j++) q[j] = holdValue(chain, j);
    for (const hj of plan.held) q[hj.j] = hj.value;
    this.nodeReach = new Float64Array(this.total);
    this.nodeWrist = new Float64Array(this.total * nw);
    if (screen) this.nodeAllowed = new Float64Array(this.total * this.nOff).fill(NaN);
    const solveAlways = screen || plan.wcpFlangeDistanceM === null;
    for (let node = 0; node < this.total; node++) {
      this.setNode(node);
      // Warm start of the wrist from the neighbour that precedes this node along the innermost moved axis.
      if (nw > 0 && solveAlways && node > 0) {
        let prev = node - 1;
        for (let d = this.D - 1; d >= 0; d--) {
          if (this.idx[d]! > 0) {
            prev = node - this.strides[d]!;
            break;
          }
        }
        for (let c = 0; c < nw; c++) q[plan.orienting[c]!] = this.nodeWrist[prev * nw + c]!;
      }
      let r = this.solver.reach();
      if (screen && r === r && plan.wcpFlangeDistanceM !== null && !this.solver.solveTool()) r = NaN;
      this.nodeReach[node] = r;
      for (let c = 0; c < nw; c++) this.nodeWrist[node * nw + c] = q[plan.orienting[c]!]!;
      if (r !== r) continue;
      if (r < this.minReach) this.minReach = r;
      if (r > this.maxReach) this.maxReach = r;
      if (screen) {
        this.evaluate();
        for (let oi = 0; oi < this.nOff; oi++) this.nodeAllowed[node * this.nOff + oi] = this.lastAllowed[oi]!;
      }
    }
  }

  /** Uncapped allowed payload per offset at the solved posture in the scratch (lastAllowed, lastLimit, lastOwn). */
  evaluate(): void {
    const chain = this.chain,
      s = this.solver.s,
      m = chain.drivenCount,
      tauL = this.solver.tauLinks,
      u = this.solver.tauUnit;
    holdingTorqueInto(tauL, chain, s, this.ctx.bodies, this.gVec, this.solver.h);
    const zx = s.flange[2]!,
      zy = s.flange[6]!,
      zz = s.flange[10]!;
    for (let oi = 0; oi < this.nOff; oi++) {
      const off = this.offsetsM[oi]!;
      pointHoldingTorqueInto(
        u,
        chain,
        s,
        s.flange[3]! + off * zx,
        s.flange[7]! + off * zy,
        s.flange[11]! + off * zz,
        1,
        this.gVec,
        this.solver.h,
      );
      for (let j = 0; j < m; j++) if (Math.abs(u[j]!) > this.maxUnit[j]!) this.maxUnit[j] = Math.abs(u[j]!);
      let allowed = Infinity,
        limit = -1,
        own = 0;
      for (let j = 0; j < m; j++) {
        const T = chain.ratedEffortSi[j]!;
        if (!(T > 0)) continue;
        const a = tauL[j]!,
          uj = u[j]!;
        if (Math.abs(a) > T) {
          // The arm cannot hold its own weight here.
          allowed = 0;
          limit = j;
          own = 1;
          break;
        }
        let cap = Infinity;
        if (uj > this.unitFloor) cap = (T - a) / uj;
        else if (uj < -this.unitFloor) cap = (T + a) / -uj;
        if (cap < allowed) {
          allowed = cap;
          limit = j;
        }
      }
      this.lastAllowed[oi] = allowed;
      this.lastLimit[oi] = limit;
      this.lastOwn[oi] = own;
    }
    this.postures++;
  }

  /** Keeps the last evaluation as the worst of row `row` where it is. */
  record(row: number, dim: number): void {
    const m = this.chain.drivenCount;
    for (let oi = 0; oi < this.nOff; oi++) {
      const slot = row * this.nOff + oi,
        allowed = this.lastAllowed[oi]!;
      if (allowed < this.best[slot]! || this.bestLimit[slot] === -2) {
        this.best[slot] = allowed;
        this.bestLimit[slot] = this.lastLimit[oi]!;
        this.bestOwn[slot] = this.lastOwn[oi]!;
        this.bestQ.set(this.solver.q, slot * m);
        for (let d = 0; d < this.D; d++) {
          if (!this.periodic[d]) continue;
          const at = slot * m + this.plan.searched[d]!,
            v = this.bestQ[at]!,
            lo = this.lo[d]!;
          this.bestQ[at] = v - 2 * Math.PI * Math.floor((v - lo) / (2 * Math.PI));
        }
        this.bestHeight[slot] = this.solver.s.flange[11]!;
        this.bestDim[slot] = dim;
      }
    }
  }

  /** After `crossing`: solves the wrist where the spherical shortcut left it unsolved. */
  finishCrossing(warm: Float64Array): boolean {
    if (this.plan.wcpFlangeDistanceM === null) return true;
    for (let c = 0; c < this.nw; c++) this.solver.q[this.plan.orienting[c]!] = warm[c]!;
    if (!this.solver.solveTool()) return false;
    for (let c = 0; c < this.nw; c++) this.lastWrist[c] = this.solver.q[this.plan.orienting[c]!]!;
    return true;
  }

  /** Into the search window of searched joint d; a periodic joint is left as is (it may pass the seam). */
  clampTo(d: number, v: number): number {
    return this.periodic[d] ? v : Math.min(this.hi[d]!, Math.max(this.lo[d]!, v));
  }

  gridStep(d: number): number {
    return (this.hi[d]! - this.lo[d]!) / (this.count[d]! - 1);
  }
}

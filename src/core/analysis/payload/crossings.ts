/**
 * Crossing stage of the payload-at-reach search (pure): postures on each row's reach found along the grid edges
 * whose end nodes lie on either side of it (Illinois method), evaluated and recorded as the row's worst.
 */
import { mmToM } from "../../units";
import type { MountingSearch } from "./searchState";
import { crossing } from "./toolSolver";

/** Grid edges solved exactly per row and offset when three or more joints are searched (the lowest screened). */
const SEEDS_PER_ROW = 4;

/** One or two searched joints: every grid edge that crosses a row's reach gives a posture on it. */
export function edgeCrossings(ms: MountingSearch): void {
  const D = ms.D,
    stepM = ms.stepM,
    tolM = mmToM(ms.ctx.o.reachToleranceMm),
    kLast = ms.kFirst + ms.nRows - 1;
  const idxA = new Int32Array(D);
  for (let node = 0; node < ms.total; node++) {
    const ra = ms.nodeReach[node]!;
    if (ra !== ra) continue;
    ms.setNode(node);
    idxA.set(ms.idx);
    for (let d = 0; d < D; d++) {
      if (idxA[d]! + 1 >= ms.count[d]!) continue;
      const nb = node + ms.strides[d]!,
        rb = ms.nodeReach[nb]!;
      if (rb !== rb) continue;
      const k0 = Math.max(ms.kFirst, Math.ceil(Math.min(ra, rb) / stepM - 1e-12));
      const k1 = Math.min(kLast, Math.floor(Math.max(ra, rb) / stepM + 1e-12));
      if (k1 < k0) continue;
      ms.nodePosture(ms.qa, node);
      ms.nodePosture(ms.qb, nb);
      for (let kk = k0; kk <= k1; kk++) {
        const target = kk * stepM;
        if (!crossing(ms.solver, ms.qa, ms.qb, ra - target, rb - target, target, tolM, ms.nw, ms.plan.orienting))
          continue;
        if (!ms.finishCrossing(ms.lastWrist)) continue;
        ms.evaluate();
        ms.record(kk - ms.kFirst, d);
      }
    }
  }
}

/**
 * Three or more searched joints: every grid edge that crosses a row's reach is screened with the allowed payload
 * interpolated between its two nodes at the crossing; the SEEDS_PER_ROW lowest edges of each row (and offset) are
 * solved exactly (Illinois) and evaluated.
 */
export function seededCrossings(ms: MountingSearch): void {
  const nOff = ms.nOff,
    slots = ms.nRows * nOff,
    K = SEEDS_PER_ROW,
    D = ms.D,
    stepM = ms.stepM;
  const tolM = mmToM(ms.ctx.o.reachToleranceMm),
    kLast = ms.kFirst + ms.nRows - 1;
  const seedEdge = new Int32Array(slots * K).fill(-1),
    seedVal = new Float64Array(slots * K).fill(Infinity);
  for (let node = 0; node < ms.total; node++) {
    const ra = ms.nodeReach[node]!;
    if (ra !== ra) continue;
    ms.setNode(node);
    for (let d = 0; d < D; d++) {
      if (ms.idx[d]! + 1 >= ms.count[d]!) continue;
      const nb = node + ms.strides[d]!,
        rb = ms.nodeReach[nb]!;
      if (rb !== rb || ra === rb) continue;
      const k0 = Math.max(ms.kFirst, Math.ceil(Math.min(ra, rb) / stepM - 1e-12));
      const k1 = Math.min(kLast, Math.floor(Math.max(ra, rb) / stepM + 1e-12));
      for (let kk = k0; kk <= k1; kk++) {
        const t = (kk * stepM - ra) / (rb - ra),
          row = kk - ms.kFirst;
        for (let oi = 0; oi < nOff; oi++) {
          const va = ms.nodeAllowed[node * nOff + oi]!,
            vb = ms.nodeAllowed[nb * nOff + oi]!;
          const v = Number.isFinite(va) && Number.isFinite(vb) ? va + t * (vb - va) : Math.min(va, vb);
          const base = (row * nOff + oi) * K;
          if (!(v < seedVal[base + K - 1]!)) continue;
          let at = K - 1;
          while (at > 0 && v < seedVal[base + at - 1]!) {
            seedVal[base + at] = seedVal[base + at - 1]!;
            seedEdge[base + at] = seedEdge[base + at - 1]!;
            at--;
          }
          seedVal[base + at] = v;
          seedEdge[base + at] = node * D + d;
        }
      }
    }
  }
  const wrist = new Float64Array(Math.max(1, ms.nw));
  for (let slot = 0; slot < slots; slot++) {
    const row = Math.floor(slot / nOff),
      target = (ms.kFirst + row) * stepM;
    for (let sd = 0; sd < K; sd++) {
      const edge = seedEdge[slot * K + sd]!;
      if (edge < 0) continue;
      // The same edge may seed several offsets of a row: solve it once (the evaluation records every offset).
      let seen = false;
      for (let other = Math.floor(slot / nOff) * nOff; other < slot && !seen; other++) {
        for (let t = 0; t < K; t++) if (seedEdge[other * K + t] === edge) seen = true;
      }
      if (seen) continue;
      const node = Math.floor(edge / D),
        d = edge % D,
        nb = node + ms.strides[d]!;
      ms.nodePosture(ms.qa, node);
      ms.nodePosture(ms.qb, nb);
      for (let c = 0; c < ms.nw; c++) wrist[c] = ms.nodeWrist[node * ms.nw + c]!;
      if (
        !crossing(
          ms.solver,
          ms.qa,
          ms.qb,
          ms.nodeReach[node]! - target,
          ms.nodeReach[nb]! - target,
          target,
          tolM,
          ms.nw,
          ms.plan.orienting,
        )
      )
        continue;
      if (!ms.finishCrossing(wrist)) continue;
      ms.evaluate();
      ms.record(row, d);
    }
  }
}

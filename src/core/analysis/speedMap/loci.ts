/**
 * Singularity loci on a side-view grid: zero crossings of det J followed along continuous IK solution sheets,
 * traced by marching squares into polylines (mm) and labelled by the kind of the nearest singular pose.
 * @see Lorensen & Cline 1987 (marching cubes; squares in 2-D) [from memory]
 */
import type { SheetData, SingularityLocus } from "./types";
import type { SingularityKind } from "../../measures/singularity";

type Pt = [number, number];

/** Joins segments that share endpoints into polylines. */
function joinSegments(segments: [Pt, Pt][]): Pt[][] {
  const key = (p: Pt) => `${p[0].toFixed(3)},${p[1].toFixed(3)}`;
  const ends = new Map<string, number[]>();
  segments.forEach((s, i) => {
    for (const p of s) {
      const k = key(p);
      const list = ends.get(k);
      if (list) list.push(i);
      else ends.set(k, [i]);
    }
  });
  const used = new Uint8Array(segments.length);
  const lines: Pt[][] = [];
  const extend = (line: Pt[], atEnd: boolean) => {
    for (;;) {
      const tip = atEnd ? line[line.length - 1]! : line[0]!;
      const next = (ends.get(key(tip)) ?? []).find((i) => !used[i]);
      if (next === undefined) return;
      used[next] = 1;
      const [a, b] = segments[next]!;
      const other = key(a) === key(tip) ? b : a;
      if (atEnd) line.push(other);
      else line.unshift(other);
    }
  };
  segments.forEach((s, i) => {
    if (used[i]) return;
    used[i] = 1;
    const line: Pt[] = [s[0], s[1]];
    extend(line, true);
    extend(line, false);
    lines.push(line);
  });
  return lines;
}

/** Traces det J = 0 within each sheet; groups the polylines by kind. */
export function traceSingularityLoci(d: SheetData): SingularityLocus[] {
  const { grid, slots: K, count, sheet, det, joints, jointsAt, m } = d;
  const { nx, ny, stepMm } = grid;
  const byKind = new Map<Exclude<SingularityKind, "none">, [Pt, Pt][]>();
  const corner = [0, 0, 0, 0];
  const slotAt = [0, 0, 0, 0];
  const cellOf = [0, 0, 0, 0];
  for (let iy = 0; iy + 1 < ny; iy++) {
    for (let ix = 0; ix + 1 < nx; ix++) {
      const c00 = ix + iy * nx;
      cellOf[0] = c00;
      cellOf[1] = c00 + 1;
      cellOf[2] = c00 + 1 + nx;
      cellOf[3] = c00 + nx;
      for (let k0 = 0; k0 < count[c00]!; k0++) {
        const root = sheet[c00 * K + k0]!;
        const v0 = det[c00 * K + k0]!;
        if (!Number.isFinite(v0)) continue;
        corner[0] = v0;
        slotAt[0] = k0;
        let complete = true;
        const q0 = jointsAt[c00 * K + k0]! * m;
        for (let c = 1; c < 4; c++) {
          const cell = cellOf[c]!;
          // The solution of the same sheet nearest to corner 0 in joint space, if within maxCornerJump.
          let found = -1,
            bestJump = d.maxCornerJump;
          for (let k = 0; k < count[cell]!; k++) {
            if (sheet[cell * K + k] !== root) continue;
            const qk = jointsAt[cell * K + k]! * m;
            let jump = 0;
            for (let i = 0; i < m && jump <= bestJump; i++)
              jump = Math.max(jump, Math.abs(joints[qk + i]! - joints[q0 + i]!));
            if (jump <= bestJump) {
              bestJump = jump;
              found = k;
            }
          }
          if (found < 0 || !Number.isFinite(det[cell * K + found]!)) {
            complete = false;
            break;
          }
          corner[c] = det[cell * K + found]!;
          slotAt[c] = found;
        }
        if (!complete) continue;
        let mask = 0,
          negative = 0;
        for (let c = 0; c < 4; c++) {
          if (corner[c]! > 0) mask |= 1 << c;
          else if (corner[c]! < 0) negative++;
        }
        // A crossing needs both signs strictly: a sheet that only touches det J = 0 at a node (a singular pose at a
        // joint limit, e.g. q5 = ±180°, exactly on the grid) does not cross it.
        if (mask === 0 || mask === 15 || negative === 0) continue;
        // Edge crossings: edges 0 (00–10), 1 (10–11), 2 (11–01), 3 (01–00); corners in r/z of the grid.
        const r0 = grid.rMinMm + ix * stepMm,
          z0 = grid.zMinMm + iy * stepMm;
        const pos: Pt[] = [
          [r0, z0],
          [r0 + stepMm, z0],
          [r0 + stepMm, z0 + stepMm],
          [r0, z0 + stepMm],
        ];
        const crossing = (e: number): Pt => {
          const a = e,
            b = (e + 1) % 4;
          const va = corner[a]!,
            vb = corner[b]!;
          const t = va / (va - vb);
          return [pos[a]![0] + t * (pos[b]![0] - pos[a]![0]), pos[a]![1] + t * (pos[b]![1] - pos[a]![1])];
        };
        const edges: number[] = [];
        for (let e = 0; e < 4; e++) {
          const a = corner[e]! > 0,
            b = corner[(e + 1) % 4]! > 0;
          if (a !== b) edges.push(e);
        }
        const pairs: [number, number][] = [];
        if (edges.length === 2) pairs.push([edges[0]!, edges[1]!]);
        else if (edges.length === 4) {
          // Saddle: decide by the centre value.
          const centre = (corner[0]! + corner[1]! + corner[2]! + corner[3]!) / 4;
          const zeroPositive = corner[0]! > 0;
          if (centre > 0 === zeroPositive) pairs.push([0, 1], [2, 3]);
          else pairs.push([3, 0], [1, 2]);
        }
        // Label from the four corners (the labeller may use the one nearest to singular).
        let near = 0;
        for (let c = 1; c < 4; c++) if (Math.abs(corner[c]!) < Math.abs(corner[near]!)) near = c;
        const kind = d.kindAt(cellOf, slotAt, near);
        let list = byKind.get(kind);
        if (!list) byKind.set(kind, (list = []));
        for (const [ea, eb] of pairs) list.push([crossing(ea), crossing(eb)]);
      }
    }
  }
  const order: Exclude<SingularityKind, "none">[] = ["wrist", "shoulder", "elbow", "other"];
  return order.filter((k) => byKind.has(k)).map((kind) => ({ kind, polylinesMm: joinSegments(byKind.get(kind)!) }));
}

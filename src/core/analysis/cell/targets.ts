/**
 * Cell targets (pure): every target of a cell file as an absolute tool-point pose in the cell frame. A relative
 * target (`relativeTo` + `offsetMm`) sits at its base target's position plus the offset, the offset in the cell frame,
 * with the base's orientation; chains of relative targets are followed to their absolute root.
 */
import type { TargetSpec, Vec3 } from "./types";

/** A target as an absolute pose in the cell frame (mm, deg; rpy as R = Rz(yaw)·Ry(pitch)·Rx(roll)). */
export interface ResolvedTarget {
  readonly name: string;
  readonly positionMm: Vec3;
  readonly rpyDeg: Vec3;
  /** The target it is an offset of (null for an absolute target). */
  readonly relativeTo: string | null;
  /** The absolute target at the end of the relativeTo chain (its own name for an absolute target). */
  readonly root: string;
}

/**
 * Resolves every target to an absolute pose, in the order given: p = p_base + offset (cell frame), rpy = rpy_base.
 * @throws RangeError naming the target for a duplicate name, an unknown `relativeTo` or a relativeTo loop (the
 *   catalog reports these with file and JSON path before a study runs)
 * @example resolveTargets([{ name: "pick", positionMm: [1600, 300, 300], rpyDeg: [180, 0, 0] },
 *   { name: "pick-above", relativeTo: "pick", offsetMm: [0, 0, 200] }])
 *   // [pick at (1600, 300, 300), pick-above at (1600, 300, 500) with rpy (180, 0, 0), root "pick"]
 */
export function resolveTargets(targets: readonly TargetSpec[]): ResolvedTarget[] {
  const byName = new Map<string, TargetSpec>();
  for (const t of targets) {
    if (byName.has(t.name)) throw new RangeError(`duplicate target name: ${t.name}`);
    byName.set(t.name, t);
  }
  const done = new Map<string, ResolvedTarget>();
  const resolve = (name: string, path: readonly string[]): ResolvedTarget => {
    const hit = done.get(name);
    if (hit) return hit;
    if (path.includes(name))
      throw new RangeError(
        `target ${path[0]}: relativeTo loop ${[...path.slice(path.indexOf(name)), name].join(" → ")}`,
      );
    const t = byName.get(name);
    if (!t) throw new RangeError(`target ${path[path.length - 1]}: unknown relativeTo target ${name}`);
    let out: ResolvedTarget;
    if ("relativeTo" in t) {
      const base = resolve(t.relativeTo, [...path, name]);
      const [bx, by, bz] = base.positionMm;
      const [ox, oy, oz] = t.offsetMm;
      out = {
        name,
        positionMm: [bx + ox, by + oy, bz + oz],
        rpyDeg: base.rpyDeg,
        relativeTo: t.relativeTo,
        root: base.root,
      };
    } else {
      out = { name, positionMm: t.positionMm, rpyDeg: t.rpyDeg, relativeTo: null, root: name };
    }
    done.set(name, out);
    return out;
  };
  return targets.map((t) => resolve(t.name, []));
}

/**
 * Mountings and the direction of gravity in the arm's base frame. Geometry is always shown in the base frame;
 * only gravity (payload) and the meaning of "tool down" follow the mounting.
 * - floor:   base z up; gravity −z.
 * - ceiling: base turned 180° about x; gravity +z.
 * - wall:    base z horizontal, out of the wall; gravity −x (base x points up the wall).
 * - angled:  base tilted 45° about y; gravity (sin 45°, 0, −cos 45°) … stated as an assumption, since the real
 *            angle depends on the installation (common practice, no source).
 */
export type Mounting = "floor" | "ceiling" | "wall" | "angled";

export const ANGLED_MOUNT_TILT_DEG = 45;

/** Unit vector of gravity in the base frame. */
export function gravityDirectionInBase(mounting: Mounting): [number, number, number] {
  switch (mounting) {
    case "floor":
      return [0, 0, -1];
    case "ceiling":
      return [0, 0, 1];
    case "wall":
      return [-1, 0, 0];
    case "angled": {
      const t = (ANGLED_MOUNT_TILT_DEG * Math.PI) / 180;
      return [Math.sin(t), 0, -Math.cos(t)];
    }
  }
}

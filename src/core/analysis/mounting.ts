/**
 * Mountings and the direction of gravity in the arm's base frame. Geometry is always shown in the base frame;
 * only gravity (payload) and the meaning of "tool down" follow the mounting. The base is tilted about its y axis:
 * floor 0°, wall 90° (gravity along base +x), ceiling 180° (gravity along base +z), angled 45° by default (an
 * assumption: the real angle depends on the installation; common practice, no source).
 */
import { gravityInBase, type Mounting } from "./payload";

export type { Mounting };

/** Unit vector of gravity in the base frame. */
export function gravityDirectionInBase(mounting: Mounting): [number, number, number] {
  const g = gravityInBase(mounting, 45, 1);
  return [g[0], g[1], g[2]];
}

/** The capability map as the analysis JSON publishes it (armAnalysis.ts CapabilityJson). */
import type { Chain } from "../../kinematics/chain";
import { areaShareAtLeast, capabilityMap } from "./capability";
import {
  DEFAULT_CAPABILITY,
  type CapabilityEnvelope,
  type CapabilityMap,
  type CapabilityOptions,
  type CapabilityReason,
} from "./types";

/** The published capability map: plain JSON, shares rounded to 1e-4 (a count over ≤ 5000 directions survives). */
export interface CapabilityJson {
  /** Grid spacing, mm; nodes at whole multiples of it. */
  readonly gridMm: number;
  /** Node distances from axis 1, mm. */
  readonly rMm: readonly number[];
  /** Node heights along axis 1, mm. */
  readonly zMm: readonly number[];
  /** Tool directions tried per node (Fibonacci lattice over the sphere). */
  readonly directions: number;
  /** Row-major (rows follow zMm, columns rMm): share of the directions reached; null outside the flange envelope. */
  readonly share: readonly (number | null)[];
  /** Share of the envelope's nodes (its side-view area) where at least half of the directions are reached. */
  readonly areaShareAtLeastHalf: number | null;
  /** Mean share over the envelope's nodes. */
  readonly meanShare: number | null;
  readonly method: CapabilityMap["method"];
  readonly rollBasis: CapabilityMap["rollBasis"];
  readonly rollsTried: number;
}

/** Overrides of the capability options an analysis may carry (coarser maps for property tests). */
export type CapabilityOverrides = Partial<
  Pick<CapabilityOptions, "gridMm" | "directions" | "numericSamples" | "numericTries">
>;

const round4 = (x: number | null) => (x === null ? null : Math.round(x * 1e4) / 1e4 + 0);

/** Runs the capability map and writes its JSON, or the reason there is none. */
export function capabilityJson(
  chain: Chain,
  layout: string,
  flange: CapabilityEnvelope,
  seed: number,
  overrides: CapabilityOverrides = {},
): { capability: CapabilityJson | null; capabilityReason: CapabilityReason | null } {
  const result = capabilityMap(chain, layout, flange, { ...DEFAULT_CAPABILITY, seed, ...overrides });
  if (!result.ok) return { capability: null, capabilityReason: result.reason };
  const map = result.map;
  let inside = 0,
    sum = 0;
  const share: (number | null)[] = [];
  for (const v of map.share) {
    if (Number.isNaN(v)) share.push(null);
    else {
      share.push(round4(v));
      inside++;
      sum += v;
    }
  }
  return {
    capability: {
      gridMm: map.gridMm,
      rMm: map.rMm,
      zMm: map.zMm,
      directions: map.directions,
      share,
      areaShareAtLeastHalf: round4(areaShareAtLeast(map.share, 0.5)),
      meanShare: inside > 0 ? round4(sum / inside) : null,
      method: map.method,
      rollBasis: map.rollBasis,
      rollsTried: map.rollsTried,
    },
    capabilityReason: null,
  };
}

/**
 * Class names the charts write, and the fixed value bands of the colour maps. Colours, line styles and patterns live
 * in src/styles/charts.css (the CSP forbids style attributes): a chart names classes, the stylesheet paints them.
 * Every distinction reads in greyscale too: light-to-dark ramps, and line styles as well as hue.
 */

/**
 * Bands of the guaranteed straight-line speed, m/s: lower edges. Fixed for every arm so two arm sheets can be read
 * side by side; 0.5, 1 and 2 m/s are edges because the share figures use them. Class `speed-band-<i>`.
 */
export const SPEED_BANDS_M_PER_S: readonly number[] = [0, 0.25, 0.5, 0.75, 1, 1.25, 1.5, 2];

/** Class of speed band i (0 = slowest, lightest). */
export function speedBandClass(i: number): string {
  return `speed-band-${i}`;
}

/**
 * Bands of the capability share (share of tool directions reached, 0–1): lower edges in tenths, fixed for every arm;
 * 0.5 is an edge because the headline figure counts the cells at or above it. Class `capability-band-<i>`.
 */
export const CAPABILITY_BANDS: readonly number[] = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];

/** Class of capability band i (0 = fewest directions, lightest). */
export function capabilityBandClass(i: number): string {
  return `capability-band-${i}`;
}

/** Inverse condition below which a pose is drawn as close to a singularity (condition number above 50). */
export const NEAR_SINGULAR_INVERSE_CONDITION = 0.02;

/** Singularity kinds and their line classes; order is the legend order. */
export const LOCUS_KINDS = ["wrist", "shoulder", "elbow", "other"] as const;
export type LocusKind = (typeof LOCUS_KINDS)[number];

export const LOCUS_LABEL: Readonly<Record<LocusKind, string>> = {
  wrist: "wrist (axes 4 and 6 in line)",
  shoulder: "shoulder (wrist centre or flange over axis 1)",
  elbow: "elbow (upper arm and forearm in line)",
  other: "other",
};

export function locusClass(kind: LocusKind): string {
  return `locus locus-${kind}`;
}

/** Line series (payload curves, load-diagram curves): up to six distinct line styles with distinct hues. */
export const SERIES_COUNT = 6;

export function seriesClass(i: number): string {
  return `series series-${((i % SERIES_COUNT) + SERIES_COUNT) % SERIES_COUNT}`;
}

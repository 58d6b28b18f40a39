/**
 * The side-by-side page's tables and choices, DOM-free: which arms the address names, the spec table and the speed
 * table with the best value of each row marked, and what "best" means per row (no mark where it is not meaningful).
 */
import { STANDARD_CYCLE_MOVES } from "../core";
import type { CompareArmSummary } from "./compareData";
import { conditionsText, formatFootprint, NOT_DECLARED } from "./datasheetFormat";
import { formatNumber, formatQuantity, NOT_STATED } from "./format";

export const MIN_COMPARE_ARMS = 2;
export const MAX_COMPARE_ARMS = 6;

export type ParsedArmIds =
  | { readonly ok: true; readonly ids: readonly string[] }
  | { readonly ok: false; readonly message: string; readonly ids: readonly string[] };

/**
 * The arm ids of `?arms=a,b,c`: known ids in the address's order, duplicates dropped; 2 to 6 of them.
 * @example parseArmIds("a,b", ["a", "b", "c"]) // { ok: true, ids: ["a", "b"] }
 */
export function parseArmIds(text: string | null, validIds: readonly string[]): ParsedArmIds {
  const asked = (text ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter((s) => s !== "");
  const ids = [...new Set(asked)];
  const unknown = ids.filter((id) => !validIds.includes(id));
  const known = ids.filter((id) => validIds.includes(id));
  const valid = `Valid ids: ${validIds.join(", ")}.`;
  const problems: string[] = [];
  if (unknown.length > 0) problems.push(`No arm has the id ${unknown.map((u) => `"${u}"`).join(", ")}.`);
  if (ids.length < MIN_COMPARE_ARMS)
    problems.push(
      `Choose at least ${MIN_COMPARE_ARMS} arms (the address names ${ids.length === 0 ? "none" : ids.length}): ?arms=<id>,<id>.`,
    );
  if (ids.length > MAX_COMPARE_ARMS)
    problems.push(`Choose at most ${MAX_COMPARE_ARMS} arms (the address names ${ids.length}).`);
  return problems.length > 0
    ? { ok: false, message: `${problems.join(" ")} ${valid}`, ids: known }
    : { ok: true, ids: known };
}

export type Better = "higher" | "lower";

export interface CompareCell {
  readonly text: string;
  /** The value compared for "best"; null when there is none. */
  readonly value: number | null;
  readonly best: boolean;
}

export interface CompareRow {
  readonly key: string;
  readonly label: string;
  /** What best means in this row ("higher payload"); null: no row is marked. */
  readonly bestMeans: string | null;
  readonly cells: readonly CompareCell[];
}

/**
 * Marks the best of `values` by `better`: every arm that ties the best value; none when fewer than two arms have a
 * value or all values are equal (nothing to choose).
 */
export function bestFlags(values: readonly (number | null)[], better: Better | null): boolean[] {
  const present = values.filter((v): v is number => v !== null && Number.isFinite(v));
  if (better === null || present.length < 2) return values.map(() => false);
  const best = better === "higher" ? Math.max(...present) : Math.min(...present);
  if (present.every((v) => v === best)) return values.map(() => false);
  return values.map((v) => v !== null && v === best);
}

function row(
  key: string,
  label: string,
  better: Better | null,
  bestMeans: string | null,
  values: readonly (number | null)[],
  text: (v: number | null, i: number) => string,
): CompareRow {
  const flags = bestFlags(values, better);
  return {
    key,
    label,
    bestMeans: better ? bestMeans : null,
    cells: values.map((v, i) => ({ text: text(v, i), value: v, best: flags[i]! })),
  };
}

const q =
  (unit: string, digits = 0) =>
  (v: number | null) =>
    v === null ? NOT_STATED : formatQuantity(v, unit, digits);

/** The declared and computed figures, one column per arm. */
export function specRows(arms: readonly CompareArmSummary[]): CompareRow[] {
  const d = arms.map((a) => a.declared);
  const sameCurrency = new Set(d.map((x) => x.currency).filter((c) => c !== null)).size === 1;
  return [
    row(
      "maker",
      "Maker",
      null,
      null,
      arms.map(() => null),
      (_, i) => arms[i]!.maker,
    ),
    row(
      "class",
      "Class",
      null,
      null,
      arms.map(() => null),
      (_, i) => arms[i]!.class,
    ),
    row(
      "axes",
      "Driven axes",
      null,
      null,
      arms.map((a) => a.drivenAxes),
      (v) => formatNumber(v ?? 0),
    ),
    row(
      "payload",
      "Rated payload",
      "higher",
      "highest rated payload",
      d.map((x) => x.ratedPayloadKg),
      q("kg", 2),
    ),
    row(
      "reach",
      "Stated reach",
      null,
      null,
      d.map((x) => x.reachMm),
      q("mm"),
    ),
    row(
      "computed-reach",
      "Computed reach",
      null,
      null,
      arms.map((a) => a.reach.computedMm),
      (v, i) =>
        v === null
          ? NOT_STATED
          : `${formatQuantity(v, "mm")} (${arms[i]!.reach.basis.startsWith("wrist") ? "WCP" : "flange"})`,
    ),
    row(
      "height",
      "Height range",
      null,
      null,
      arms.map(() => null),
      (_, i) => {
        const r = arms[i]!.reach;
        return r.minHeightMm === null || r.maxHeightMm === null
          ? NOT_STATED
          : `${formatNumber(r.minHeightMm)} to ${formatQuantity(r.maxHeightMm, "mm")}`;
      },
    ),
    row(
      "repeatability",
      "Repeatability (declared, ISO 9283 RP)",
      "lower",
      "lowest (tightest) repeatability figure",
      d.map((x) => x.repeatabilityMm),
      (v, i) => {
        if (v === null) return NOT_STATED;
        // The conditions it was measured at, where the file's ISO 9283 table declares the same value.
        const rp = d[i]!.poseRepeatability;
        return `±${formatQuantity(v, "mm", 3)}${rp && rp.valueMm === v ? ` (${conditionsText(rp)})` : ""}`;
      },
    ),
    row(
      "mass",
      "Arm mass",
      "lower",
      "lightest arm",
      d.map((x) => x.massKg),
      q("kg", 1),
    ),
    row(
      "footprint",
      "Base footprint (declared, width × depth)",
      "lower",
      "smallest base footprint (area)",
      d.map((x) => (x.footprintMm ? x.footprintMm[0] * x.footprintMm[1] : null)),
      (_, i) => {
        const fp = d[i]!.footprintMm;
        return fp ? formatFootprint(fp) : NOT_DECLARED;
      },
    ),
    row(
      "protection",
      "Protection",
      null,
      null,
      arms.map(() => null),
      (_, i) => d[i]!.protection ?? NOT_STATED,
    ),
    row(
      "mountings",
      "Mountings",
      null,
      null,
      arms.map(() => null),
      (_, i) => d[i]!.mountings.join(", "),
    ),
    row(
      "price",
      "List price",
      sameCurrency ? "lower" : null,
      "lowest list price (one currency)",
      d.map((x) => x.listPrice),
      (v, i) => (v === null ? NOT_STATED : `${formatNumber(v)} ${d[i]!.currency ?? ""}`.trim()),
    ),
  ];
}

const mPerS = (v: number | null) => (v === null ? "not computed" : formatQuantity(v / 1000, "m/s", 2));
const share = (v: number | null) => (v === null ? "no map" : `${formatNumber(v * 100, 1)} %`);

/**
 * Speed figures: maximum tool speed, shares of the side view at ≥ 0.5, 1, 2 m/s per orientation, the share of the side
 * view reached from at least half of the tool directions (capability map), standard cycle.
 */
export function speedRows(arms: readonly CompareArmSummary[]): CompareRow[] {
  const rows: CompareRow[] = [
    row(
      "max-tool-speed",
      "Maximum tool speed (any pose, all joints at their limits)",
      "higher",
      "highest maximum tool speed",
      arms.map((a) => a.speed.maxToolSpeedMmPerS),
      mPerS,
    ),
  ];
  for (const orientation of ["down", "outward"] as const) {
    const maps = arms.map((a) => a.speed.maps.find((m) => m.orientation === orientation) ?? null);
    if (maps.every((m) => m === null)) continue;
    const words = orientation === "down" ? "tool down" : "tool outward";
    rows.push(
      row(
        `max-guaranteed-${orientation}`,
        `Highest guaranteed line speed, ${words}`,
        "higher",
        "highest",
        maps.map((m) => m?.maxGuaranteedMmPerS ?? null),
        mPerS,
      ),
    );
    for (const key of ["0.5", "1", "2"]) {
      rows.push(
        row(
          `share-${key}-${orientation}`,
          `Share of the side view with guaranteed ≥ ${key} m/s, ${words}`,
          "higher",
          "largest share",
          maps.map((m) => (m ? (m.shareAtLeast[key] ?? null) : null)),
          share,
        ),
      );
    }
  }
  rows.push(
    row(
      "directions-half",
      "Share of the side view reached from ≥ half of all tool directions (roll free)",
      "higher",
      "largest share",
      arms.map((a) => a.capability?.areaShareAtLeastHalf ?? null),
      share,
    ),
  );
  rows.push(
    row(
      "cycle",
      `Standard cycle (${STANDARD_CYCLE_MOVES.upMm}/${STANDARD_CYCLE_MOVES.acrossMm}/${STANDARD_CYCLE_MOVES.upMm} mm, lower bound)`,
      "lower",
      "shortest cycle time",
      arms.map((a) => a.cycle.standardCycleS),
      (v, i) => (v === null ? (arms[i]!.cycle.reason ? "not computed" : NOT_STATED) : formatQuantity(v, "s", 2)),
    ),
  );
  return rows;
}

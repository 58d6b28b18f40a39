/**
 * Pinned revisions on the site: the arm sheet's "Revisions" section (date, commit, fingerprint, source revision,
 * the fields that changed with old and new values, the key figures that moved), the "Cite this sheet" block, the
 * banner of a pinned page `/arms/<id>/rev/<fingerprint>/`, and `data/arms/<id>/revisions.json`. Pure: the revision
 * data comes from src/catalog/revisions.ts.
 */
import type { Arm } from "../catalog";
import type { JsonChange } from "../catalog/jsonDiff";
import type { ArmRevision, ArmRevisionData, RevisionHistoryState } from "../catalog/revisions";
import type { RevisionFigures } from "../catalog/revisionFigures";
import { formatShare, formatSpeedMPerS } from "./armAnalysisModel";
import { formatQuantity } from "./format";
import { absoluteUrl, armPath, siteHref } from "./links";

/** Site path of a pinned revision. */
export function revisionPath(id: string, fingerprint: string): string {
  return `${armPath(id)}rev/${encodeURIComponent(fingerprint)}/`;
}

/** Why a sheet has no revision history, in words. */
export const HISTORY_TEXT: Readonly<Record<Exclude<RevisionHistoryState, "available">, string>> = {
  disabled: "Revisions are unavailable: this site was built with the revision history turned off.",
  "no-git": "Revisions are unavailable: the site was built where git is not installed.",
  "not-a-repository": "Revisions are unavailable: the site was built from arm files outside a git repository.",
  "shallow-clone": "Revisions are unavailable: the site was built from a shallow clone, whose history is cut off.",
  "never-committed": "Revisions are unavailable: this arm file has not been committed yet.",
  "not-prepared": "Revisions are unavailable: the site was built without reading the arm files\u2019 history first.",
};

/**
 * A JSON value in a change list: numbers and strings as JSON writes them, arrays and objects compactly (cut at
 * 120 characters), and "(absent)" for a field one side does not have.
 * @example formatChangeValue(190) // "190"
 * @example formatChangeValue([-170, 170]) // "[-170,170]"
 * @example formatChangeValue(null) // "(absent)"
 */
export function formatChangeValue(value: unknown): string {
  if (value === null || value === undefined) return "(absent)";
  const text = JSON.stringify(value);
  return text.length > 120 ? `${text.slice(0, 117)}...` : text;
}

/** "joints[1].maxSpeedDegPerS: 190 → 180"; the whole file when the path is empty. */
export function changeText(c: JsonChange): string {
  return `${c.path || "(whole file)"}: ${formatChangeValue(c.from)} \u2192 ${formatChangeValue(c.to)}`;
}

export interface FigureChange {
  readonly key: string;
  readonly label: string;
  readonly from: string;
  readonly to: string;
}

const FIGURES: readonly { key: string; label: string; text: (f: RevisionFigures) => string }[] = [
  {
    key: "reach",
    label: "Computed reach",
    text: (f) =>
      f.computedReachMm === null
        ? "not computed"
        : `${formatQuantity(f.computedReachMm, "mm")} (${f.reachBasis === "wcp" ? "WCP" : "flange"})`,
  },
  {
    key: "max-tool-speed",
    label: "Maximum tool speed",
    text: (f) => (f.maxToolSpeedMmPerS === null ? "not computed" : formatSpeedMPerS(f.maxToolSpeedMmPerS)),
  },
  {
    key: "share-1",
    label: "Guaranteed line speed \u2265 1 m/s, tool down",
    text: (f) => (f.shareAtLeast1MPerSDown === null ? "not computed" : formatShare(f.shareAtLeast1MPerSDown)),
  },
  {
    key: "cycle",
    label: "Standard cycle estimate",
    text: (f) => (f.standardCycleS === null ? "not computed" : formatQuantity(f.standardCycleS, "s", 2)),
  },
  {
    key: "payload-full-reach",
    label: "Payload at full reach",
    text: (f) =>
      f.payloadFullReach === null
        ? "not computed"
        : `${formatQuantity(f.payloadFullReach.payloadKg, "kg", 2)} at ${formatQuantity(f.payloadFullReach.reachMm, "mm")}`,
  },
];

/**
 * The key figures that moved from one revision to the next, as the sheet shows them: a figure moved when its
 * displayed value changed (a change below the display's rounding is not news). Empty when either side has none.
 */
export function figureChanges(before: RevisionFigures | null, after: RevisionFigures | null): FigureChange[] {
  if (!before || !after) return [];
  return FIGURES.map((f) => ({ key: f.key, label: f.label, from: f.text(before), to: f.text(after) })).filter(
    (c) => c.from !== c.to,
  );
}

/** "2026-03-02" from git's "2026-03-02T10:15:00+01:00"; "not committed" for the working tree's version. */
export function revisionDateText(r: Pick<ArmRevision, "date">): string {
  return r.date === null ? "not committed" : r.date.slice(0, 10);
}

export interface RevisionRowModel {
  readonly fingerprint: string;
  readonly href: string;
  readonly current: boolean;
  readonly dateText: string;
  /** First 12 hex digits of the commit, or "not committed". */
  readonly commitText: string;
  readonly commit: string | null;
  /** "revision 2.1 of 2025-11-02" of the source document; "not readable" for a file without a readable source. */
  readonly sourceText: string;
  readonly valid: boolean;
  /** Field changes from the revision before ("path: old → new"); empty for the oldest. */
  readonly changes: readonly string[];
  readonly figureChanges: readonly FigureChange[];
  /** Whether this is the oldest revision known (nothing to compare with). */
  readonly oldest: boolean;
}

export interface RevisionsSectionModel {
  readonly available: boolean;
  /** Why there is no history; null when there is. */
  readonly unavailableText: string | null;
  readonly intro: string;
  readonly rows: readonly RevisionRowModel[];
}

function sourceText(r: ArmRevision): string {
  return r.source && r.source.revision
    ? `revision ${r.source.revision} of ${r.source.date || "no date"}`
    : "not readable";
}

/** The Revisions section of the current sheet, newest first. */
export function revisionsSectionModel(data: ArmRevisionData, baseUrl: string): RevisionsSectionModel {
  const list = data.revisions;
  const rows = list.map((r, i): RevisionRowModel => ({
    fingerprint: r.fingerprint,
    href: siteHref(baseUrl, revisionPath(data.id, r.fingerprint)),
    current: i === 0,
    dateText: revisionDateText(r),
    commitText: r.commit === null ? "not committed" : r.commit.slice(0, 12),
    commit: r.commit,
    sourceText: sourceText(r),
    valid: r.valid,
    changes: r.changed.map(changeText),
    figureChanges: figureChanges(list[i + 1]?.figures ?? null, r.figures),
    oldest: i === list.length - 1,
  }));
  const available = data.history === "available";
  return {
    available,
    unavailableText: available ? null : HISTORY_TEXT[data.history],
    intro:
      "Each version of the arm file has a page of its own, at an address that keeps showing that version\u2019s " +
      "figures and specifications after the file changes: link that page in a quote. Newest first; each lists the " +
      "fields changed from the version below it and the key figures that moved.",
    rows,
  };
}

export interface CiteModel {
  readonly fingerprint: string;
  readonly href: string;
  /** Absolute address when the site address is configured; else null (the href is site-relative). */
  readonly url: string | null;
  readonly dateText: string;
  readonly sourceText: string;
  /** The citation as one line of text, for the copy button. */
  readonly citation: string;
}

/**
 * "Cite this sheet": the pinned address of a revision of this arm, its fingerprint, date and source.
 * @param revision the revision cited (the current one on the current sheet)
 */
export function citeModel(
  arm: Pick<Arm, "id" | "spec">,
  revision: ArmRevision,
  options: { readonly baseUrl: string; readonly site?: URL | string | undefined },
): CiteModel {
  const href = siteHref(options.baseUrl, revisionPath(arm.id, revision.fingerprint));
  const url = absoluteUrl(options.site, href);
  const s = revision.source;
  const source = s ? `${s.document}, revision ${s.revision}, ${s.date}` : "source not readable";
  const dateText = revisionDateText(revision);
  return {
    fingerprint: revision.fingerprint,
    href,
    url,
    dateText,
    sourceText: source,
    citation:
      `${arm.spec.maker} ${arm.spec.model}, Armdex arm sheet, spec fingerprint ${revision.fingerprint} ` +
      `(${dateText}), from ${source}. ${url ?? href}`,
  };
}

export interface PinnedBannerModel {
  readonly heading: string;
  readonly lines: readonly string[];
  /** A newer revision exists. */
  readonly superseded: boolean;
  readonly currentHref: string;
}

/**
 * The banner of a pinned page. Its words depend only on this revision and on whether a newer one exists, so the
 * page stays the same, byte for byte, through later builds once it is superseded.
 */
export function pinnedBannerModel(
  id: string,
  revision: ArmRevision,
  superseded: boolean,
  baseUrl: string,
): PinnedBannerModel {
  const when =
    revision.commit === null
      ? "a version of the arm file not committed when the site was built"
      : `the arm file as committed on ${revisionDateText(revision)} (commit ${revision.commit.slice(0, 12)})`;
  return {
    heading: `Pinned revision ${revision.fingerprint}`,
    lines: [
      `This page shows ${when}. Its figures and specifications are those of this revision and do not follow later changes to the file.`,
      revision.valid
        ? superseded
          ? "A newer revision of this arm file exists: the current sheet shows the latest figures and what changed."
          : "This is the current revision; the current sheet shows the same figures, with charts and downloads."
        : "This revision no longer validates against the current arm format, so no figures are computed for it. Its problems are listed below.",
    ],
    superseded,
    currentHref: siteHref(baseUrl, armPath(id)),
  };
}

/** `data/arms/<id>/revisions.json`: the revisions newest first, in the shape. */
export function revisionsJson(data: ArmRevisionData): {
  fingerprint: string;
  commit: string | null;
  date: string | null;
  sourceRevision: string | null;
  changed: JsonChange[];
}[] {
  return data.revisions.map((r) => ({
    fingerprint: r.fingerprint,
    commit: r.commit,
    date: r.date,
    sourceRevision: r.source?.revision || null,
    changed: r.changed.map((c) => ({ path: c.path, from: c.from, to: c.to })),
  }));
}

/** Each fingerprint once (a file that returned to earlier content), the oldest occurrence, newest first. */
export function pinnedRevisions(data: ArmRevisionData): ArmRevision[] {
  const seen = new Set<string>();
  const out: ArmRevision[] = [];
  for (const r of [...data.revisions].reverse()) {
    if (seen.has(r.fingerprint)) continue;
    seen.add(r.fingerprint);
    out.push(r);
  }
  return out.reverse();
}

/**
 * Pinned revisions of the arm files: every committed version of `arms/<id>.json` (history.ts) and the working-tree
 * version, each validated as it was, with what changed from the one before and its key figures.
 *
 * `armdex prepare` collects them (collectRevisions), has the valid ones analysed with the current arms (one worker
 * pool, the analysis cache keyed by content, so a rebuild analyses nothing it has seen) and writes one file per arm,
 * `<cache>/revisions/<id>.json` (writeRevisionData), which the pages read (readRevisionData): the arm sheet's
 * revisions section and citation block, `/arms/<id>/rev/<fingerprint>/` and `data/arms/<id>/revisions.json`.
 *
 * A revision is identified by its spec fingerprint, the first 12 hex digits of the spec hash (the sha256 of the
 * file's canonical JSON), so two commits that differ only in layout are one revision (the older one names it).
 * A version that no longer validates is kept, marked invalid, with its issues: its page says so, the build goes on.
 */
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { basename, dirname, join } from "node:path";
import { cacheDir } from "./analysis";
import { writeFileAtomic } from "./files";
import { readFolderHistory, type FileVersion, type HistoryUnavailableReason } from "./history";
import { formatIssue } from "./issues";
import { diffJson, type JsonChange } from "./jsonDiff";
import { loadArmBytes, specHashOf, type Arm } from "./load";
import { cachedRevisionFigures, type RevisionFigures } from "./revisionFigures";
import { validateArm } from "./validate";

/** Hex digits of the spec hash in a revision's address and on the page. */
export const REVISION_FINGERPRINT_DIGITS = 12;

/** Format of the revision data file; a file of another format is not read (the sheet says "not prepared"). */
export const REVISION_DATA_FORMAT = 1;

export interface ArmRevision {
  /** First 12 hex digits of specHash: the revision's address `/arms/<id>/rev/<fingerprint>/`. */
  readonly fingerprint: string;
  readonly specHash: string;
  /** The commit that first held this content; null for a version not committed (the working tree's). */
  readonly commit: string | null;
  /** That commit's committer date (ISO 8601); null when not committed. */
  readonly date: string | null;
  /** The arm file's `source` at this revision (null where the file did not give it readably). */
  readonly source: { readonly document: string; readonly revision: string; readonly date: string } | null;
  /** Whether this version validates against the current arm format. */
  readonly valid: boolean;
  /** Its validation errors, formatted ("error: arms/x.json@1a2b…: path: message"); empty when valid. */
  readonly issues: readonly string[];
  /** Fields changed from the revision before (older); empty for the oldest. */
  readonly changed: readonly JsonChange[];
  /** The file's JSON value at this revision; null when it was not JSON. */
  readonly data: unknown;
  /** Key figures of its analysis; null for an invalid revision (or before `armdex prepare` filled them). */
  readonly figures: RevisionFigures | null;
}

export type RevisionHistoryState = "available" | HistoryUnavailableReason | "never-committed" | "not-prepared";

export interface ArmRevisionData {
  readonly format: typeof REVISION_DATA_FORMAT;
  readonly id: string;
  readonly file: string;
  /** Spec hash of the arm file the build reads now: the data belongs to that version only. */
  readonly currentSpecHash: string;
  /** "available", or why the history could not be read. */
  readonly history: RevisionHistoryState;
  /** Newest first; the first is always the current version. */
  readonly revisions: readonly ArmRevision[];
}

interface Version {
  readonly commit: string | null;
  readonly date: string | null;
  readonly specHash: string;
  readonly data: unknown;
  readonly arm: Arm | null;
  readonly issues: readonly string[];
}

const shortHash = (h: string) => h.slice(0, REVISION_FINGERPRINT_DIGITS);

function sourceOf(data: unknown): ArmRevision["source"] {
  const s = (data as { source?: Record<string, unknown> } | null)?.source;
  if (!s || typeof s !== "object") return null;
  const text = (v: unknown) => (typeof v === "string" ? v : "");
  return { document: text(s.document), revision: text(s.revision), date: text(s.date) };
}

/** One committed version, read and validated as the catalog reads a file. */
async function committedVersion(arm: Arm, v: FileVersion): Promise<Version> {
  const file = `${arm.file}@${shortHash(v.commit)}`;
  const loaded = await loadArmBytes(v.bytes, file, arm.id, dirname(arm.file));
  const specHash =
    loaded.arm?.specHash ??
    (loaded.data !== undefined ? specHashOf(loaded.data) : createHash("sha256").update(v.bytes).digest("hex"));
  return {
    commit: v.commit,
    date: v.date,
    specHash,
    data: loaded.data ?? null,
    arm: loaded.arm ? { ...loaded.arm, file: arm.file } : null,
    issues: loaded.arm ? [] : loaded.issues.filter((i) => i.severity === "error").map(formatIssue),
  };
}

export interface CollectedRevisions {
  /** The data file's content, figures still null. */
  readonly data: ArmRevisionData;
  /** The valid revisions as arms (the current one is the catalog's own), for the analyses and figures. */
  readonly arms: ReadonlyMap<string, Arm>;
}

/**
 * The revisions of one arm from its committed versions (newest first, as history.ts gives them) and the current
 * file. `history` says why there are none when they could not be read.
 */
export async function armRevisions(
  arm: Arm,
  currentData: unknown,
  committed: readonly FileVersion[] | null,
  history: RevisionHistoryState,
): Promise<CollectedRevisions> {
  const versions: Version[] = [];
  for (const v of [...(committed ?? [])].reverse()) {
    const read = await committedVersion(arm, v);
    // The same content as the version before (a change of layout only): one revision, named by the older commit.
    if (versions.at(-1)?.specHash !== read.specHash) versions.push(read);
  }
  if (versions.at(-1)?.specHash !== arm.specHash)
    versions.push({ commit: null, date: null, specHash: arm.specHash, data: currentData, arm, issues: [] });
  else versions[versions.length - 1] = { ...versions.at(-1)!, arm };
  const arms = new Map<string, Arm>();
  const revisions = versions.map((v, i): ArmRevision => {
    if (v.arm) arms.set(v.specHash, v.arm);
    const before = versions[i - 1];
    return {
      fingerprint: shortHash(v.specHash),
      specHash: v.specHash,
      commit: v.commit,
      date: v.date,
      source: sourceOf(v.data),
      valid: v.arm !== null,
      issues: v.issues,
      changed: before === undefined ? [] : diffJson(before.data, v.data),
      data: v.data,
      figures: null,
    };
  });
  const state: RevisionHistoryState =
    history === "available" && (committed ?? []).length === 0 ? "never-committed" : history;
  return {
    data: {
      format: REVISION_DATA_FORMAT,
      id: arm.id,
      file: arm.file,
      currentSpecHash: arm.specHash,
      history: state,
      revisions: revisions.reverse(),
    },
    arms,
  };
}

/**
 * The revisions of every arm of a catalog: one history read per folder. `readData` gives a file's current JSON
 * value (the catalog has validated it; its spec is that value as parsed).
 */
export async function collectRevisions(
  arms: readonly Arm[],
  readData: (arm: Arm) => Promise<unknown> = async (arm) =>
    JSON.parse((await readFile(arm.file, "utf8")).replace(/^\uFEFF/, "")),
): Promise<CollectedRevisions[]> {
  const byDir = new Map<string, Arm[]>();
  for (const arm of arms) byDir.set(dirname(arm.file), [...(byDir.get(dirname(arm.file)) ?? []), arm]);
  const out: CollectedRevisions[] = [];
  for (const [dir, own] of byDir) {
    const history = await readFolderHistory(
      dir,
      own.map((a) => basename(a.file)),
    );
    for (const arm of own) {
      const committed = history.status === "ok" ? (history.versions.get(basename(arm.file)) ?? []) : null;
      const state = history.status === "ok" ? "available" : history.reason;
      out.push(await armRevisions(arm, await readData(arm), committed, state));
    }
  }
  return out;
}

export function revisionDataPath(id: string): string {
  return join(cacheDir(), "revisions", `${id}.json`);
}

/** Fills each valid revision's key figures (from the cache, else from its analysis) and writes the arm's data file. */
export async function writeRevisionData(collected: CollectedRevisions): Promise<ArmRevisionData> {
  const revisions: ArmRevision[] = [];
  for (const r of collected.data.revisions) {
    const arm = collected.arms.get(r.specHash);
    revisions.push({ ...r, figures: arm ? await cachedRevisionFigures(arm) : null });
  }
  const data: ArmRevisionData = { ...collected.data, revisions };
  await writeFileAtomic(revisionDataPath(data.id), JSON.stringify(data));
  return data;
}

/** The current version alone, for a build whose data file is missing or belongs to another version of the file. */
function notPrepared(arm: Arm): ArmRevisionData {
  return {
    format: REVISION_DATA_FORMAT,
    id: arm.id,
    file: arm.file,
    currentSpecHash: arm.specHash,
    history: "not-prepared",
    revisions: [
      {
        fingerprint: shortHash(arm.specHash),
        specHash: arm.specHash,
        commit: null,
        date: null,
        source: { document: arm.spec.source.document, revision: arm.spec.source.revision, date: arm.spec.source.date },
        valid: true,
        issues: [],
        changed: [],
        data: arm.spec,
        figures: null,
      },
    ],
  };
}

const memo = new Map<string, Promise<ArmRevisionData>>();

/**
 * The revision data `armdex prepare` wrote for this arm, read once per process; the current version alone ("not
 * prepared") when there is none, or it was written for another version of the file.
 */
export function readRevisionData(arm: Arm): Promise<ArmRevisionData> {
  const key = `${arm.id}\u0000${arm.specHash}`;
  let p = memo.get(key);
  if (!p) {
    p = readFile(revisionDataPath(arm.id), "utf8").then(
      (text) => {
        const d = JSON.parse(text) as ArmRevisionData;
        const ok =
          d.format === REVISION_DATA_FORMAT &&
          d.id === arm.id &&
          d.file === arm.file &&
          d.currentSpecHash === arm.specHash &&
          Array.isArray(d.revisions) &&
          d.revisions[0]?.specHash === arm.specHash;
        return ok ? d : notPrepared(arm);
      },
      () => notPrepared(arm),
    );
    memo.set(key, p);
  }
  return p;
}

/**
 * A valid revision as an arm of the catalog (its spec and chain as they were, the current file's path), for its
 * analysis and its page; null for a revision that does not validate.
 */
export function revisionArm(arm: Arm, revision: ArmRevision): Arm | null {
  if (!revision.valid) return null;
  const r = validateArm(revision.data, arm.file, arm.id);
  return r.ok
    ? { id: arm.id, file: arm.file, spec: r.spec, chain: r.chain, specHash: revision.specHash, warnings: [] }
    : null;
}

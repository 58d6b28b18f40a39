/**
 * The committed versions of the arm files of one folder, read from the git repository the folder lies in, with the
 * `git` command (no library): one `git log` for the whole folder, then one `git cat-file --batch` for every version's
 * bytes, so a catalog of hundreds of files costs two processes, not one per file.
 *
 * History follows the first parent (the line of the branch being built, merges as one step) and keeps the commits
 * that changed a file (`--diff-filter=d`: a commit that deleted it is not a version). Dates are committer dates
 * (ISO 8601, as git writes them), so a build of the same checkout reads the same history: nothing here depends on
 * the clock or on file times.
 *
 * Unavailable (and said so, never an error): no `git` on the machine, a folder outside any repository, a shallow
 * clone (its history is cut off), or ARMDEX_REVISIONS=off. A file never committed has no versions.
 */
import { spawn } from "node:child_process";

export interface FileVersion {
  /** Full commit hash. */
  readonly commit: string;
  /** Committer date, ISO 8601 with offset (git's %cI). */
  readonly date: string;
  readonly bytes: Buffer;
}

export type HistoryUnavailableReason = "disabled" | "no-git" | "not-a-repository" | "shallow-clone";

export type FolderHistory =
  | {
      readonly status: "ok";
      /** Committed versions per file name (e.g. "corvell-tern-12.json"), newest first; absent: never committed. */
      readonly versions: ReadonlyMap<string, readonly FileVersion[]>;
    }
  | { readonly status: "unavailable"; readonly reason: HistoryUnavailableReason };

interface RunResult {
  readonly code: number | null;
  readonly stdout: Buffer;
  readonly stderr: string;
  /** The spawn error's code (ENOENT when git is not installed). */
  readonly spawnError: string | null;
}

/** Runs git in `cwd` with `args`, feeding `input`; never throws. */
function git(cwd: string, args: readonly string[], input?: string): Promise<RunResult> {
  return new Promise((done) => {
    const child = spawn("git", ["-c", "core.quotePath=false", ...args], {
      cwd,
      env: { ...process.env, GIT_TERMINAL_PROMPT: "0", LC_ALL: "C" },
      stdio: ["pipe", "pipe", "pipe"],
    });
    const out: Buffer[] = [];
    let err = "";
    child.stdout.on("data", (c: Buffer) => out.push(c));
    child.stderr.on("data", (c: Buffer) => (err += c.toString()));
    child.on("error", (e: NodeJS.ErrnoException) =>
      done({ code: null, stdout: Buffer.alloc(0), stderr: err, spawnError: e.code ?? String(e) }),
    );
    child.on("close", (code) => done({ code, stdout: Buffer.concat(out), stderr: err, spawnError: null }));
    child.stdin.on("error", () => undefined);
    child.stdin.end(input ?? "");
  });
}

/** Whether history can be read in `dir`: null when it can, else why not. */
async function historyProblem(dir: string): Promise<HistoryUnavailableReason | null> {
  if (/^(0|off|false|no)$/i.test(process.env.ARMDEX_REVISIONS ?? "")) return "disabled";
  const r = await git(dir, ["rev-parse", "--is-inside-work-tree", "--is-shallow-repository"]);
  if (r.spawnError !== null) return "no-git";
  const lines = r.stdout.toString().trim().split("\n");
  if (r.code !== 0 || lines[0] !== "true") return "not-a-repository";
  return lines[1] === "true" ? "shallow-clone" : null;
}

/**
 * `git log` of the folder: per commit (newest first) the names of the folder's own files it changed.
 * Names in subfolders are left out (the catalog reads only the folder itself).
 */
export function parseLog(text: string): { commit: string; date: string; names: string[] }[] {
  const out: { commit: string; date: string; names: string[] }[] = [];
  for (const chunk of text.split("\u0001")) {
    const lines = chunk.split("\n").filter((l) => l !== "");
    const head = /^([0-9a-f]{40,64}) (\S+)$/.exec(lines[0] ?? "");
    if (!head) continue;
    out.push({ commit: head[1]!, date: head[2]!, names: lines.slice(1).filter((n) => !n.includes("/")) });
  }
  return out;
}

/**
 * Splits the output of `git cat-file --batch` into one entry per request, in order: the object's bytes, or null
 * where git answered "missing".
 */
export function parseBatch(out: Buffer, count: number): (Buffer | null)[] {
  const result: (Buffer | null)[] = [];
  let at = 0;
  for (let k = 0; k < count; k++) {
    const eol = out.indexOf(10, at);
    if (eol < 0) throw new Error("git cat-file: truncated output");
    const header = out.subarray(at, eol).toString();
    const m = /^\S+ (\w+) (\d+)$/.exec(header);
    if (!m) {
      // "<name> missing" or "<name> ambiguous"
      result.push(null);
      at = eol + 1;
      continue;
    }
    const size = Number(m[2]);
    result.push(out.subarray(eol + 1, eol + 1 + size));
    at = eol + 1 + size + 1;
  }
  return result;
}

/**
 * The committed versions of the files `names` (plain file names) of folder `dir`. Never throws: a git failure
 * after the checks reads as "not a repository".
 */
export async function readFolderHistory(dir: string, names: readonly string[]): Promise<FolderHistory> {
  const problem = await historyProblem(dir);
  if (problem) return { status: "unavailable", reason: problem };
  const log = await git(dir, [
    "log",
    "--first-parent",
    "--diff-merges=first-parent",
    "--no-renames",
    "--diff-filter=d",
    "--relative",
    "--name-only",
    "--format=%x01%H %cI",
    "--",
    ".",
  ]);
  // A repository with no commit yet: every file is "never committed".
  if (log.code !== 0 && /does not have any commits|bad default revision/.test(log.stderr))
    return { status: "ok", versions: new Map() };
  if (log.code !== 0) return { status: "unavailable", reason: "not-a-repository" };
  const wanted = new Set(names);
  const requests: { name: string; commit: string; date: string }[] = [];
  for (const entry of parseLog(log.stdout.toString()))
    for (const name of entry.names)
      if (wanted.has(name)) requests.push({ name, commit: entry.commit, date: entry.date });
  const versions = new Map<string, FileVersion[]>();
  if (requests.length === 0) return { status: "ok", versions };
  const batch = await git(dir, ["cat-file", "--batch"], requests.map((r) => `${r.commit}:./${r.name}\n`).join(""));
  if (batch.code !== 0) return { status: "unavailable", reason: "not-a-repository" };
  const blobs = parseBatch(batch.stdout, requests.length);
  requests.forEach((r, k) => {
    const bytes = blobs[k];
    if (!bytes) return;
    const list = versions.get(r.name) ?? [];
    list.push({ commit: r.commit, date: r.date, bytes });
    versions.set(r.name, list);
  });
  return { status: "ok", versions };
}

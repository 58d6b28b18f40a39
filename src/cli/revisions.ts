/**
 * The revision step of `armdex prepare`: reads the arm files' history (src/catalog/history.ts, with `git`), has the
 * earlier valid revisions analysed in the same worker pool as the current arms, then writes each arm's revision
 * data for the pages (src/catalog/revisions.ts). Prints one summary line, and a note when history is unavailable.
 */
import type { Arm } from "../catalog";
import { collectRevisions, writeRevisionData } from "../catalog/revisions";

const REASON: Readonly<Record<string, string>> = {
  disabled: "ARMDEX_REVISIONS is off",
  "no-git": "git is not installed",
  "not-a-repository": "the arm folder is not in a git repository",
  "shallow-clone": "the repository is a shallow clone",
};

/**
 * Collects the revisions of `arms`, runs `analyse(older)` (the analyses of the current arms and of the older valid
 * revisions), then writes the revision data. Returns analyse's exit code.
 */
export async function prepareRevisions(
  arms: readonly Arm[],
  analyse: (older: Arm[]) => Promise<number>,
): Promise<number> {
  const t0 = performance.now();
  const collected = await collectRevisions(arms);
  const current = new Set(arms.map((a) => a.specHash));
  const older = new Map<string, Arm>();
  for (const c of collected) for (const [hash, arm] of c.arms) if (!current.has(hash)) older.set(hash, arm);
  const code = await analyse([...older.values()]);
  if (code !== 0) return code;
  let revisions = 0,
    invalid = 0,
    withHistory = 0;
  const unavailable = new Set<string>();
  for (const c of collected) {
    const data = await writeRevisionData(c);
    revisions += data.revisions.length;
    invalid += data.revisions.filter((r) => !r.valid).length;
    if (data.history === "available") withHistory++;
    else if (REASON[data.history]) unavailable.add(REASON[data.history]!);
  }
  process.stdout.write(
    `revisions: ${revisions} revision${revisions === 1 ? "" : "s"} of ${arms.length} arm${arms.length === 1 ? "" : "s"} (${withHistory} with history, ` +
      `${older.size} earlier revision${older.size === 1 ? "" : "s"} analysed or cached, ${invalid} no longer valid), ` +
      `in ${((performance.now() - t0) / 1000).toFixed(1)} s\n`,
  );
  for (const reason of unavailable) process.stdout.write(`note: revisions unavailable: ${reason}\n`);
  return 0;
}

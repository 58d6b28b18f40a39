/** File helpers shared by the catalog, the cache and the command line. Node-only. */
import { threadId } from "node:worker_threads";
import { mkdir, rename, rm, writeFile } from "node:fs/promises";
import { dirname } from "node:path";

/** Writes `text` to `path` atomically: a temporary file in the same folder, then one rename. */
export async function writeFileAtomic(path: string, text: string): Promise<void> {
  await mkdir(dirname(path), { recursive: true });
  const tmp = `${path}.${process.pid}.${threadId}.${Math.floor(performance.now() * 1000)}.tmp`;
  try {
    await writeFile(tmp, text);
    await rename(tmp, path);
  } catch (e) {
    await rm(tmp, { force: true });
    throw e;
  }
}

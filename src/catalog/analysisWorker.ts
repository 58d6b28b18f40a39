/** Worker thread: analyses one arm file per message and writes the cache entry. */
import { parentPort } from "node:worker_threads";
import { analyseArm } from "../core/analysis/analyseArm";
import { loadArmFile } from "./load";
import { armFacts, writeCachedAnalysis } from "./analysis";

parentPort?.on("message", async (msg: { file: string }) => {
  const t0 = performance.now();
  try {
    const { arm, issues } = await loadArmFile(msg.file);
    if (!arm) throw new Error(issues.map((i) => `${i.path}: ${i.message}`).join("; "));
    const analysis = analyseArm(arm.chain, armFacts(arm));
    await writeCachedAnalysis(arm, analysis);
    parentPort?.postMessage({ ok: true, ms: performance.now() - t0 });
  } catch (e) {
    parentPort?.postMessage({
      ok: false,
      ms: performance.now() - t0,
      error: e instanceof Error ? e.message : String(e),
    });
  }
});

/**
 * Worker thread: analyses one arm per message and writes its cache entry. The message carries the arm as the main
 * thread validated it (spec, compiled chain, spec hash: plain data and typed arrays, copied by structured clone), so
 * a worker never reads or validates an arm file again.
 */
import { parentPort } from "node:worker_threads";
import { analyseArm } from "../core";
import type { Arm } from "./load";
import { armFacts, writeCachedAnalysis } from "./analysis";

parentPort?.on("message", async (msg: { arm: Arm }) => {
  const t0 = performance.now();
  try {
    const analysis = analyseArm(msg.arm.chain, armFacts(msg.arm));
    await writeCachedAnalysis(msg.arm, analysis);
    parentPort?.postMessage({ ok: true, ms: performance.now() - t0 });
  } catch (e) {
    parentPort?.postMessage({
      ok: false,
      ms: performance.now() - t0,
      error: e instanceof Error ? e.message : String(e),
    });
  }
});

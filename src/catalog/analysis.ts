/**
 * Analyses of catalog arms, cached on disk by content: the key is the arm's spec hash, the analysis version and
 * the options, so an unchanged arm is never analysed twice and a changed algorithm never reuses old results.
 * Entries are written atomically (temporary file + rename): an interrupted build leaves no half-written entry.
 */
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import { fileURLToPath } from "node:url";
import { join, resolve } from "node:path";
import { Worker } from "node:worker_threads";
import { availableParallelism } from "node:os";
import { ANALYSIS_VERSION, DEFAULT_ANALYSIS, analyseArm, type AnalysisOptions, type ArmAnalysis, type ArmFacts } from "../core/analysis/analyseArm";
import type { Arm } from "./load";

export function cacheDir(): string {
  return resolve(process.env.ARMDEX_CACHE_DIR ?? "node_modules/.cache/armdex-analyses");
}

export function armFacts(arm: Arm): ArmFacts {
  const s = arm.spec;
  return {
    id: arm.id,
    specHash: arm.specHash,
    reachMm: s.reachMm,
    repeatabilityMm: s.repeatabilityMm,
    ratedPayloadKg: s.ratedPayloadKg,
    mountings: s.mountings,
    wrist: s.wrist,
    links: s.links,
  };
}

let coreHash: string | null = null;

/**
 * sha256 over the sources of the computation core (src/core), so a changed algorithm never reuses a cached result
 * even when ANALYSIS_VERSION was not bumped.
 */
export function coreFingerprint(): string {
  if (coreHash) return coreHash;
  // Next to this module when run from source (CLI, tests); the project's src/core when bundled (the site build).
  const beside = fileURLToPath(new URL("../core/", import.meta.url));
  const root = existsSync(join(beside, "index.ts")) ? beside : resolve("src/core");
  const files = readdirSync(root, { recursive: true, encoding: "utf8" }).filter((f) => f.endsWith(".ts")).sort();
  const h = createHash("sha256");
  for (const f of files) h.update(`${f}\n`).update(readFileSync(join(root, f)));
  coreHash = h.digest("hex");
  return coreHash;
}

export function analysisKey(arm: Pick<Arm, "specHash">, options: AnalysisOptions = DEFAULT_ANALYSIS): string {
  return createHash("sha256").update(`${arm.specHash}\n${ANALYSIS_VERSION}\n${coreFingerprint()}\n${JSON.stringify(options)}`).digest("hex").slice(0, 32);
}

export async function readCachedAnalysis(arm: Arm, options: AnalysisOptions = DEFAULT_ANALYSIS): Promise<ArmAnalysis | null> {
  try {
    const text = await readFile(join(cacheDir(), `${analysisKey(arm, options)}.json`), "utf8");
    const data = JSON.parse(text) as ArmAnalysis;
    return data.specHash === arm.specHash && data.analysisVersion === ANALYSIS_VERSION ? data : null;
  } catch {
    return null;
  }
}

export async function writeCachedAnalysis(arm: Arm, analysis: ArmAnalysis, options: AnalysisOptions = DEFAULT_ANALYSIS): Promise<void> {
  const dir = cacheDir();
  await mkdir(dir, { recursive: true });
  const path = join(dir, `${analysisKey(arm, options)}.json`);
  const tmp = `${path}.${process.pid}.${Math.floor(performance.now() * 1000)}.tmp`;
  await writeFile(tmp, JSON.stringify(analysis));
  await rename(tmp, path);
}

/** The analysis of one arm: from the cache, or computed here (and cached). */
export async function getAnalysis(arm: Arm, options: AnalysisOptions = DEFAULT_ANALYSIS): Promise<ArmAnalysis> {
  const cached = await readCachedAnalysis(arm, options);
  if (cached) return cached;
  const analysis = analyseArm(arm.chain, armFacts(arm), options);
  await writeCachedAnalysis(arm, analysis, options);
  return JSON.parse(JSON.stringify(analysis)) as ArmAnalysis;
}

export interface AnalyseAllReport {
  readonly analysed: readonly { readonly id: string; readonly ms: number }[];
  readonly cached: readonly string[];
}

/**
 * Makes sure every arm has a cache entry, analysing the missing ones in parallel worker threads
 * (one per core, at most `workers`).
 */
export async function analyseCatalog(arms: readonly Arm[], options: { workers?: number; log?: (line: string) => void } = {}): Promise<AnalyseAllReport> {
  const missing: Arm[] = [];
  const cached: string[] = [];
  for (const arm of arms) {
    if (await readCachedAnalysis(arm)) cached.push(arm.id);
    else missing.push(arm);
  }
  const analysed: { id: string; ms: number }[] = [];
  const count = Math.max(1, Math.min(options.workers ?? availableParallelism(), missing.length));
  let next = 0;
  const runWorker = async () => {
    if (next >= missing.length) return;
    const worker = new Worker(new URL("./analysisWorker.mjs", import.meta.url));
    try {
      while (next < missing.length) {
        const arm = missing[next++]!;
        const result = await new Promise<{ ok: boolean; ms: number; error?: string }>((resolveDone, reject) => {
          const onMessage = (m: { ok: boolean; ms: number; error?: string }) => {
            worker.off("error", onError);
            resolveDone(m);
          };
          const onError = (e: Error) => {
            worker.off("message", onMessage);
            reject(e);
          };
          worker.once("message", onMessage);
          worker.once("error", onError);
          worker.postMessage({ file: resolve(arm.file) });
        });
        if (!result.ok) throw new Error(`analysis of ${arm.id} (${arm.file}) failed: ${result.error}`);
        analysed.push({ id: arm.id, ms: result.ms });
        options.log?.(`analysed ${arm.id} in ${(result.ms / 1000).toFixed(2)} s`);
      }
    } finally {
      await worker.terminate();
    }
  };
  await Promise.all(Array.from({ length: count }, runWorker));
  return { analysed, cached };
}

/**
 * The analysis output contract read back through validation: every demo arm's fresh analysis passes the schema
 * (the schema is typed as the core's ArmAnalysis, so the compiler checks the other direction), and a cache entry
 * that breaks the contract is recomputed instead of reaching a page.
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Arm } from "../../src/catalog";
import {
  analysisKey,
  getAnalysis,
  getAnalysisSummary,
  readCachedAnalysis,
  readCachedSummary,
  summariseAnalysis,
  writeCachedAnalysis,
} from "../../src/catalog/analysis";
import { analysisSummarySchema, armAnalysisSchema } from "../../src/catalog/analysisSchema";
import type { ArmAnalysis } from "../../src/core";
import { demoArmWithAnalysis } from "../helpers/demoAnalysis";

const previous = process.env.ARMDEX_CACHE_DIR;
const dir = mkdtempSync(join(tmpdir(), "armdex-schema-test-"));
let arm: Arm;
let analysis: ArmAnalysis;

beforeAll(async () => {
  process.env.ARMDEX_CACHE_DIR = dir;
  ({ arm, analysis } = await demoArmWithAnalysis());
});
afterAll(() => {
  if (previous === undefined) delete process.env.ARMDEX_CACHE_DIR;
  else process.env.ARMDEX_CACHE_DIR = previous;
  rmSync(dir, { recursive: true, force: true });
});

/** A deep copy with one change made by `edit`. */
function changed(edit: (a: Record<string, any>) => void): unknown {
  const copy = JSON.parse(JSON.stringify(analysis)) as Record<string, any>;
  edit(copy);
  return copy;
}

describe("the analysis schema", () => {
  it("accepts the analyses of demo arms of several classes (SCARA, offset-wrist 6R, 7R, palletizer)", async () => {
    for (const file of [
      "arms/yarrowfield-sable-600.json",
      "arms/brandmoor-lyra-c12.json",
      "arms/brandmoor-lyra-r7.json",
      "arms/yarrowfield-pl-180.json",
    ]) {
      const { analysis: a } = await demoArmWithAnalysis(file);
      const parsed = armAnalysisSchema.safeParse(a);
      expect(parsed.success, `${file}: ${parsed.success ? "" : JSON.stringify(parsed.error.issues.slice(0, 3))}`).toBe(
        true,
      );
      expect(analysisSummarySchema.safeParse(JSON.parse(JSON.stringify(summariseAnalysis(a)))).success).toBe(true);
      // A map exactly when there is no reason: the SCARA and the palletizer keep their tool axis vertical.
      expect(a.capability === null, file).toBe(file.includes("sable") || file.includes("pl-180"));
      expect(a.capabilityReason, file).toBe(a.capability === null ? "tool-axis-cannot-turn" : null);
    }
  }, 120_000);

  it("rejects what breaks the contract, naming the path", () => {
    const cases: [string, unknown, (string | number)[]][] = [
      [
        "a map value as text",
        changed((a) => (a.speed.maps[0].guaranteedMmPerS[0] = "12")),
        ["speed", "maps", 0, "guaranteedMmPerS"],
      ],
      ["a missing figure", changed((a) => delete a.reach.flangeMaxMm), ["reach", "flangeMaxMm"]],
      ["a key the contract does not have", changed((a) => (a.reach.reachM = 1.2)), ["reach"]],
      ["a warning as free text", changed((a) => a.warnings.push({ code: "x", message: "y" })), ["warnings", 0, "code"]],
      [
        "an unknown locus kind",
        changed((a) => a.singularities.loci.push({ kind: "knee", orientation: "down", polylinesMm: [] })),
        ["singularities", "loci", 0, "kind"],
      ],
      [
        "a capability map whose shares do not cover its nodes",
        changed(
          (a) =>
            (a.capability = {
              gridMm: 50,
              rMm: [0, 50],
              zMm: [0],
              directions: 128,
              share: [0.5],
              areaShareAtLeastHalf: 1,
              meanShare: 0.5,
              method: "closed-form",
              rollBasis: "last-joint",
              rollsTried: 1,
            }),
        ),
        ["capability", "share"],
      ],
      ["an unknown capability reason", changed((a) => (a.capabilityReason = "too-small")), ["capabilityReason"]],
      [
        "a NaN smuggled in a map",
        changed((a) => (a.speed.maps[0].maxMmPerS = [1, Number.NaN])),
        ["speed", "maps", 0, "maxMmPerS"],
      ],
    ];
    for (const [what, data, path] of cases) {
      const parsed = armAnalysisSchema.safeParse(data);
      expect(parsed.success, what).toBe(false);
      if (!parsed.success)
        expect(
          parsed.error.issues.map((i) => i.path),
          what,
        ).toContainEqual(path);
    }
  });
});

describe("reading the cache through the schema", () => {
  it("recomputes an entry that breaks the contract instead of handing it to a page", async () => {
    await writeCachedAnalysis(arm, analysis);
    const path = join(dir, `${analysisKey(arm)}.json`);
    expect(await readCachedAnalysis(arm)).toEqual(analysis);
    // Right id, hash and version, wrong shape: a cast would have passed it on.
    writeFileSync(path, JSON.stringify(changed((a) => (a.speed.maps[0].branch = "all"))));
    expect(await readCachedAnalysis(arm)).toBeNull();
    expect(await getAnalysis(arm)).toEqual(analysis);
    expect(await readCachedAnalysis(arm)).toEqual(analysis);
  });

  it("ignores a summary that breaks the contract", async () => {
    await writeCachedAnalysis(arm, analysis);
    const path = join(dir, `${analysisKey(arm)}.summary.json`);
    writeFileSync(path, JSON.stringify({ ...summariseAnalysis(analysis), cycle: { standardCycleS: "fast" } }));
    expect(await readCachedSummary(arm)).toBeNull();
    // Made again from the cached analysis, as the projection of it.
    expect(await getAnalysisSummary(arm)).toEqual(JSON.parse(JSON.stringify(summariseAnalysis(analysis))));
  });
});

/**
 * The on-disk caches beside the analyses: the analysis summary (src/catalog/analysis.ts) and values derived from an
 * analysis by the site's code (src/catalog/derived.ts). Keys change with everything a value depends on, unreadable
 * or foreign entries are ignored and written again, entries are written in one rename, and pages made from a summary
 * equal pages made from the full analysis. Each test has a cache folder of its own (ARMDEX_CACHE_DIR).
 */
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { afterEach, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Arm } from "../../src/catalog";
import {
  analysisKey,
  getAnalysisSummary,
  readCachedSummary,
  sourceFingerprint,
  summariseAnalysis,
  writeCachedAnalysis,
  writeFileAtomic,
} from "../../src/catalog/analysis";
import { cachedDerived, derivedKey, derivedPath } from "../../src/catalog/derived";
import type { ArmAnalysis } from "../../src/core/analysis/analyseArm";
import { catalogSummaryRow } from "../../src/view/catalogData";
import { catalogPageModel } from "../../src/view/catalogPageModel";
import { lineCheckCompareModel } from "../../src/view/lineCheckSection";
import { demoArmWithAnalysis } from "../helpers/demoAnalysis";

let dir: string;
const previous = process.env.ARMDEX_CACHE_DIR;

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), "armdex-cache-test-"));
  process.env.ARMDEX_CACHE_DIR = dir;
});

afterEach(() => {
  if (previous === undefined) delete process.env.ARMDEX_CACHE_DIR;
  else process.env.ARMDEX_CACHE_DIR = previous;
  rmSync(dir, { recursive: true, force: true });
});

/** What the derived cache needs of an arm: its spec hash (through the analysis key) and its file. */
const fakeArm = { specHash: "a".repeat(64), file: "arms/invented-arm.json" };

/** Every file under `root` (not folders), relative, sorted. */
function filesUnder(root: string): string[] {
  return readdirSync(root, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => relative(root, join(e.parentPath, e.name)))
    .sort();
}

describe("derivedKey", () => {
  const base = derivedKey(fakeArm, "arm-sheet", { baseUrl: "/", site: undefined }, { codeFingerprint: "code-1" });

  it("is the same for the same arm, kind, inputs and code, whatever the order of the inputs", () => {
    expect(derivedKey(fakeArm, "arm-sheet", { site: undefined, baseUrl: "/" }, { codeFingerprint: "code-1" })).toBe(
      base,
    );
    expect(base).toMatch(/^[0-9a-f]{32}$/);
  });

  it("changes when the chart and view code changes", () => {
    expect(derivedKey(fakeArm, "arm-sheet", { baseUrl: "/", site: undefined }, { codeFingerprint: "code-2" })).not.toBe(
      base,
    );
  });

  it("changes when the analysis changes (another spec hash, hence another analysis key)", () => {
    const other = { ...fakeArm, specHash: "b".repeat(64) };
    expect(analysisKey(other)).not.toBe(analysisKey(fakeArm));
    expect(derivedKey(other, "arm-sheet", { baseUrl: "/", site: undefined }, { codeFingerprint: "code-1" })).not.toBe(
      base,
    );
  });

  it("changes with the inputs, the kind and the arm file's path", () => {
    expect(
      derivedKey(fakeArm, "arm-sheet", { baseUrl: "/tools/armdex/", site: undefined }, { codeFingerprint: "code-1" }),
    ).not.toBe(base);
    expect(
      derivedKey(fakeArm, "payload-csv", { baseUrl: "/", site: undefined }, { codeFingerprint: "code-1" }),
    ).not.toBe(base);
    expect(
      derivedKey(
        { ...fakeArm, file: "other/invented-arm.json" },
        "arm-sheet",
        { baseUrl: "/", site: undefined },
        { codeFingerprint: "code-1" },
      ),
    ).not.toBe(base);
  });

  it("rejects a kind that is not a lowercase slug (it becomes part of a file name)", () => {
    expect(() => derivedKey(fakeArm, "../x", {}, { codeFingerprint: "c" })).toThrow(RangeError);
  });

  it("follows the real sources by default: a fingerprint over src/catalog, src/view and src/charts", () => {
    const code = sourceFingerprint(["catalog", "view", "charts"]);
    expect(code).toMatch(/^[0-9a-f]{64}$/);
    expect(code).not.toBe(sourceFingerprint(["catalog", "view"]));
    expect(derivedKey(fakeArm, "arm-sheet", {})).toBe(derivedKey(fakeArm, "arm-sheet", {}, { codeFingerprint: code }));
  });
});

describe("cachedDerived", () => {
  const counting = <T>(value: T) => {
    const calls = { n: 0 };
    return { calls, derive: () => (calls.n++, value) };
  };

  it("derives once, then reads the entry; other code derives again", async () => {
    const { calls, derive } = counting({ svg: "<svg/>", sizes: [1, 2.5, null] });
    const first = await cachedDerived(fakeArm, "arm-sheet", { baseUrl: "/" }, derive, { codeFingerprint: "code-1" });
    const second = await cachedDerived(fakeArm, "arm-sheet", { baseUrl: "/" }, derive, { codeFingerprint: "code-1" });
    expect(calls.n).toBe(1);
    expect(second).toEqual({ svg: "<svg/>", sizes: [1, 2.5, null] });
    expect(second).toEqual(first);
    await cachedDerived(fakeArm, "arm-sheet", { baseUrl: "/" }, derive, { codeFingerprint: "code-2" });
    expect(calls.n).toBe(2);
  });

  it("gives a fresh value back through JSON, as a cached one comes (a first build and a rebuild render the same)", async () => {
    const value = { text: "a", gone: undefined, nested: { n: -0 } };
    const fresh = await cachedDerived(fakeArm, "arm-sheet", {}, () => value, { codeFingerprint: "code-1" });
    expect(fresh).toEqual(JSON.parse(JSON.stringify(value)));
    expect(Object.keys(fresh)).toEqual(["text", "nested"]);
  });

  it("does not cache a value JSON cannot carry exactly (NaN, typed arrays): it derives it every time", async () => {
    const values: unknown[] = [
      { x: Number.NaN },
      { x: Number.POSITIVE_INFINITY },
      { x: new Float64Array([1, 2]) },
      { x: [1, undefined] },
    ];
    for (const [i, value] of values.entries()) {
      const { calls, derive } = counting(value);
      expect(await cachedDerived(fakeArm, "arm-sheet", {}, derive, { codeFingerprint: `code-${i}` })).toBe(value);
      await cachedDerived(fakeArm, "arm-sheet", {}, derive, { codeFingerprint: `code-${i}` });
      expect(calls.n).toBe(2);
    }
    expect(filesUnder(dir)).toEqual([]);
  });

  it("ignores a corrupt or foreign entry and writes it again", async () => {
    const key = derivedKey(fakeArm, "payload-csv", {}, { codeFingerprint: "code-1" });
    const path = derivedPath("payload-csv", key);
    mkdirSync(join(dir, "derived"), { recursive: true });
    const bad = [
      '{"key":"' + key + '","value":"trunc',
      "",
      "null",
      "[1,2]",
      JSON.stringify({ key: "another-key", value: "stale" }),
      JSON.stringify({ key }),
    ];
    for (const text of bad) {
      writeFileSync(path, text);
      const { calls, derive } = counting("reach,payload\n");
      expect(await cachedDerived(fakeArm, "payload-csv", {}, derive, { codeFingerprint: "code-1" })).toBe(
        "reach,payload\n",
      );
      expect(calls.n).toBe(1);
      expect(JSON.parse(readFileSync(path, "utf8"))).toEqual({ key, value: "reach,payload\n" });
    }
  });

  it("leaves only the entry behind (written through a temporary file and one rename)", async () => {
    await cachedDerived(fakeArm, "arm-sheet", {}, () => ({ a: 1 }), { codeFingerprint: "code-1" });
    const key = derivedKey(fakeArm, "arm-sheet", {}, { codeFingerprint: "code-1" });
    expect(filesUnder(dir)).toEqual([`derived/arm-sheet-${key}.json`]);
  });
});

describe("writeFileAtomic", () => {
  it("replaces the file whole and leaves no temporary file", async () => {
    const path = join(dir, "sub", "entry.json");
    await writeFileAtomic(path, "first");
    await writeFileAtomic(path, "second");
    expect(readFileSync(path, "utf8")).toBe("second");
    expect(filesUnder(dir)).toEqual(["sub/entry.json"]);
  });

  it("on a failed rename leaves what was there and removes its temporary file", async () => {
    // The target is a folder with a file in it: the rename fails after the temporary file was written.
    const path = join(dir, "entry.json");
    mkdirSync(path);
    writeFileSync(join(path, "inside.json"), "kept");
    await expect(writeFileAtomic(path, "new")).rejects.toThrow();
    expect(readFileSync(join(path, "inside.json"), "utf8")).toBe("kept");
    expect(filesUnder(dir)).toEqual(["entry.json/inside.json"]);
  });
});

describe("analysis summaries", () => {
  let arm: Arm;
  let analysis: ArmAnalysis;

  beforeAll(async () => {
    // The SCARA of the demo catalog: the quickest to analyse.
    ({ arm, analysis } = await demoArmWithAnalysis());
  });

  it("are written beside the analysis and read back as the projection of it", async () => {
    await writeCachedAnalysis(arm, analysis);
    const key = analysisKey(arm);
    expect(filesUnder(dir)).toEqual([`${key}.json`, `${key}.summary.json`]);
    const summary = await readCachedSummary(arm);
    expect(summary).toEqual(JSON.parse(JSON.stringify(summariseAnalysis(analysis))));
    // Every value is the analysis' own.
    expect(summary!.reach).toEqual(analysis.reach);
    expect(summary!.speed.maps.map((m) => m.guaranteedMmPerS)).toEqual(
      analysis.speed.maps.map((m) => m.guaranteedMmPerS),
    );
    expect(summary!.cycle.standardCycleS).toBe(analysis.cycle.standardCycleS);
    // and it is much smaller than the analysis
    expect(readFileSync(join(dir, `${key}.summary.json`)).length).toBeLessThan(
      readFileSync(join(dir, `${key}.json`)).length,
    );
  });

  it("a corrupt or foreign summary is ignored and made again from the cached analysis", async () => {
    await writeCachedAnalysis(arm, analysis);
    const path = join(dir, `${analysisKey(arm)}.summary.json`);
    for (const text of [
      '{"id":',
      JSON.stringify({ ...summariseAnalysis(analysis), specHash: "0".repeat(64) }),
      JSON.stringify({ ...summariseAnalysis(analysis), analysisVersion: "0" }),
    ]) {
      writeFileSync(path, text);
      expect(await readCachedSummary(arm)).toBeNull();
      expect(await getAnalysisSummary(arm)).toEqual(JSON.parse(JSON.stringify(summariseAnalysis(analysis))));
      expect(await readCachedSummary(arm)).not.toBeNull();
    }
  });

  it("give the same catalog table, data/catalog.json row and side-by-side defaults as the full analysis", () => {
    const summary = JSON.parse(JSON.stringify(summariseAnalysis(analysis))) as ReturnType<typeof summariseAnalysis>;
    expect(catalogPageModel([arm], { baseUrl: "/" }, new Map([[arm.id, summary]]))).toEqual(
      catalogPageModel([arm], { baseUrl: "/" }, new Map([[arm.id, analysis]])),
    );
    expect(catalogSummaryRow(arm, summary)).toEqual(catalogSummaryRow(arm, analysis));
    expect(lineCheckCompareModel([{ arm, analysis: summary }], "/")).toEqual(
      lineCheckCompareModel([{ arm, analysis }], "/"),
    );
  });
});

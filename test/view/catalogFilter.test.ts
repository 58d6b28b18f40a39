/**
 * The catalog page's state, DOM-free (src/view/catalogFilter.ts): the address round trip, dropping of bad values,
 * the filters against a brute-force restatement of each rule over seeded random rows, and the sort order checked by
 * its defining properties (every adjacent pair in order, missing values last, ties in catalog order) rather than by a
 * stored answer. Rows are invented; no arm data is used as a check value.
 */
import { describe, expect, it } from "vitest";
import {
  CATALOG_QUERY_KEYS,
  catalogQueryPairs,
  compareHref,
  EMPTY_CATALOG_STATE,
  NO_FILTER,
  nextSort,
  parseCatalogQuery,
  parseDecimal,
  pickProblem,
  rowPasses,
  shownText,
  sortRows,
  urlWithCatalogState,
  visibleIds,
  type CatalogChoices,
  type CatalogFilter,
  type CatalogRowData,
  type CatalogState,
} from "../../src/view/catalogFilter";
import { mulberry32, uniform } from "../helpers/prng";

const CLASSES = ["articulated", "collaborative", "scara", "palletizer", "gantry"];
const MOUNTINGS = ["floor", "ceiling", "wall", "angled"];
const MAKERS = ["Ostrel", "ostrel", "Pimbury", "Quarrow", "Abney", "Zell 10", "Zell 9"];
const CODES = ["IP20", "IP54", "IP65", "IP66", "IP67", "IPX7"];
const MIN_CODES = ["IP20", "IP54", "IP65", "IPX7"];
/**
 * Which arm code meets which minimum, written out by hand from IEC 60529 (each given numeral met; water 1–6 and
 * 7–8 are separate ladders, so IP67 alone does not meet IP65) [from memory: IEC 60529, second numeral].
 */
const MEETS: Readonly<Record<string, readonly string[]>> = {
  IP20: ["IP20"],
  IP54: ["IP20", "IP54"],
  IP65: ["IP20", "IP54", "IP65"],
  IP66: ["IP20", "IP54", "IP65"],
  IP67: ["IP20", "IPX7"],
  IPX7: ["IPX7"],
};

function randomRows(seed: number, n: number): CatalogRowData[] {
  const rand = mulberry32(seed);
  const maybe = (v: number) => (rand() < 0.15 ? null : v);
  return Array.from({ length: n }, (_, i) => {
    const lo = uniform(rand, -800, 200);
    const payloadKg = Math.round(uniform(rand, 1, 300));
    const reach = maybe(Math.round(uniform(rand, 300, 3200)));
    const priceCurrency = rand() < 0.5 ? "EUR" : "USD";
    return {
      id: `arm-${String(i).padStart(2, "0")}`,
      class: CLASSES[Math.floor(rand() * CLASSES.length)]!,
      mountings: MOUNTINGS.filter(() => rand() < 0.5),
      payloadKg,
      computedReachMm: reach,
      minHeightMm: rand() < 0.1 ? null : lo,
      maxHeightMm: lo + uniform(rand, 200, 2500),
      lineSpeedMPerS: maybe(uniform(rand, 0, 4)),
      footprintMm:
        rand() < 0.3 ? null : ([Math.round(uniform(rand, 150, 1200)), Math.round(uniform(rand, 150, 1200))] as const),
      protection: CODES[Math.floor(rand() * CODES.length)]!,
      repeatabilityMm: rand() < 0.1 ? null : Math.round(uniform(rand, 0.01, 0.2) * 1000) / 1000,
      sort: {
        maker: MAKERS[Math.floor(rand() * MAKERS.length)]!,
        payload: payloadKg,
        // Few distinct values, so ties occur.
        axes: [4, 5, 6][Math.floor(rand() * 3)]!,
        reach: rand() < 0.3 ? null : reach,
        price: rand() < 0.3 ? null : Math.round(uniform(rand, 10_000, 200_000)),
      },
      sortGroup: { price: priceCurrency },
    };
  });
}

const rows = randomRows(20260117, 60);
const choices: CatalogChoices = {
  classes: CLASSES,
  mountings: MOUNTINGS,
  sortKeys: ["maker", "payload", "axes", "reach", "price"],
  armIds: rows.map((r) => r.id),
};

describe("parseDecimal", () => {
  it("takes plain decimals only", () => {
    expect(parseDecimal("12")).toBe(12);
    expect(parseDecimal(" 1.5 ")).toBe(1.5);
    expect(parseDecimal("-40")).toBe(-40);
    expect(parseDecimal(".5")).toBe(0.5);
    for (const bad of ["", " ", "abc", "1e3", "0x10", "Infinity", "NaN", "12 kg", "1,5", "--1", null, undefined]) {
      expect(parseDecimal(bad), String(bad)).toBeNull();
    }
  });
});

describe("parseCatalogQuery and urlWithCatalogState", () => {
  const full: CatalogState = {
    filter: {
      class: "scara",
      mounting: "ceiling",
      minPayloadKg: 7.5,
      minReachMm: 1200,
      heightFromMm: -300,
      heightToMm: 900,
      minLineSpeedMPerS: 1.25,
      maxFootprintWidthMm: 600,
      maxFootprintDepthMm: 450,
      minProtection: "IP54",
      maxRepeatabilityMm: 0.05,
    },
    sort: { key: "payload", dir: "desc" },
    pick: ["arm-03", "arm-00", "arm-10"],
  };

  it("reads back every field it wrote, through a full URL", () => {
    const href = urlWithCatalogState("https://h.test/tools/armdex/?keep=1#top", full);
    const url = new URL(href);
    expect(url.pathname).toBe("/tools/armdex/");
    expect(url.hash).toBe("#top");
    expect(url.searchParams.get("keep")).toBe("1");
    expect(url.search).toContain("pick=arm-03,arm-00,arm-10");
    expect(parseCatalogQuery(url.search, choices)).toEqual(full);
  });

  it("uses our own plain key names", () => {
    const keys = catalogQueryPairs(full).map(([k]) => k);
    expect(keys).toEqual([
      "class",
      "mounting",
      "minPayloadKg",
      "minReachMm",
      "heightFromMm",
      "heightToMm",
      "minLineSpeedMPerS",
      "maxFootprintWidthMm",
      "maxFootprintDepthMm",
      "minProtection",
      "maxRepeatabilityMm",
      "sort",
      "dir",
      "pick",
    ]);
    expect(Object.values(CATALOG_QUERY_KEYS).sort()).toEqual([...keys].sort());
  });

  it("writes nothing for the empty state and drops its own keys from an older address", () => {
    expect(catalogQueryPairs(EMPTY_CATALOG_STATE)).toEqual([]);
    expect(urlWithCatalogState("https://h.test/?class=scara&sort=maker&dir=asc&x=2", EMPTY_CATALOG_STATE)).toBe(
      "https://h.test/?x=2",
    );
  });

  it("ignores every malformed or unknown value instead of failing", () => {
    const state = parseCatalogQuery(
      "?class=spaceship&mounting=roof&minPayloadKg=-3&minReachMm=abc&heightFromMm=1e9&heightToMm=&minLineSpeedMPerS=Infinity&sort=colour&dir=sideways&pick=nope,arm-01,arm-01,,<b>",
      choices,
    );
    expect(state).toEqual({ filter: NO_FILTER, sort: null, pick: ["arm-01"] });
    expect(parseCatalogQuery("?sort=maker&dir=sideways", choices).sort).toEqual({ key: "maker", dir: "asc" });
    expect(parseCatalogQuery("?%E0%A4%A=1&class=%", choices)).toEqual(EMPTY_CATALOG_STATE);
  });
});

describe("rowPasses", () => {
  const rand = mulberry32(77);
  const filters: CatalogFilter[] = Array.from({ length: 300 }, () => ({
    class: rand() < 0.3 ? CLASSES[Math.floor(rand() * CLASSES.length)]! : null,
    mounting: rand() < 0.3 ? MOUNTINGS[Math.floor(rand() * MOUNTINGS.length)]! : null,
    minPayloadKg: rand() < 0.3 ? uniform(rand, 0, 300) : null,
    minReachMm: rand() < 0.3 ? uniform(rand, 0, 3000) : null,
    heightFromMm: rand() < 0.3 ? uniform(rand, -900, 1500) : null,
    heightToMm: rand() < 0.3 ? uniform(rand, -900, 1500) : null,
    minLineSpeedMPerS: rand() < 0.3 ? uniform(rand, 0, 4) : null,
    maxFootprintWidthMm: rand() < 0.2 ? uniform(rand, 100, 1300) : null,
    maxFootprintDepthMm: rand() < 0.2 ? uniform(rand, 100, 1300) : null,
    minProtection: rand() < 0.2 ? MIN_CODES[Math.floor(rand() * MIN_CODES.length)]! : null,
    maxRepeatabilityMm: rand() < 0.2 ? uniform(rand, 0, 0.2) : null,
  }));

  /** Each rule restated on its own: the arm must show every height between the two ends (or the one end given). */
  function expected(r: CatalogRowData, f: CatalogFilter): boolean {
    const ends = [f.heightFromMm, f.heightToMm].filter((v): v is number => v !== null);
    const heightsOk = ends.every(
      (h) => r.minHeightMm !== null && r.maxHeightMm !== null && h >= r.minHeightMm && h <= r.maxHeightMm,
    );
    // The footprint fits as it stands or turned by 90°: try both orientations of the rectangle.
    const fp = r.footprintMm ?? null;
    const fits = (w: number, d: number) =>
      w <= (f.maxFootprintWidthMm ?? Infinity) && d <= (f.maxFootprintDepthMm ?? Infinity);
    const footprintOk =
      (f.maxFootprintWidthMm === null && f.maxFootprintDepthMm === null) ||
      (fp !== null && (fits(fp[0], fp[1]) || fits(fp[1], fp[0])));
    return (
      footprintOk &&
      (f.minProtection === null || (MEETS[r.protection ?? ""] ?? []).includes(f.minProtection)) &&
      (f.maxRepeatabilityMm === null || (r.repeatabilityMm ?? Infinity) <= f.maxRepeatabilityMm) &&
      (f.class === null || f.class === r.class) &&
      (f.mounting === null || r.mountings.some((m) => m === f.mounting)) &&
      (f.minPayloadKg === null || r.payloadKg >= f.minPayloadKg) &&
      (f.minReachMm === null || (r.computedReachMm ?? -Infinity) >= f.minReachMm) &&
      (f.minLineSpeedMPerS === null || (r.lineSpeedMPerS ?? -Infinity) >= f.minLineSpeedMPerS) &&
      heightsOk
    );
  }

  it("agrees with each rule restated, over 300 random filters × 60 random rows", () => {
    let passed = 0,
      failed = 0;
    for (const f of filters) {
      for (const r of rows) {
        const got = rowPasses(r, f);
        expect(got, `${r.id} under ${JSON.stringify(f)}`).toBe(expected(r, f));
        if (got) passed++;
        else failed++;
      }
    }
    // Both outcomes occur often enough for the comparison to mean something.
    expect(passed).toBeGreaterThan(1000);
    expect(failed).toBeGreaterThan(1000);
  });

  it("passes everything with no filter and lets an unknown figure fail a filter on it", () => {
    expect(rows.every((r) => rowPasses(r, NO_FILTER))).toBe(true);
    const unknownReach = rows.find((r) => r.computedReachMm === null)!;
    expect(rowPasses(unknownReach, { ...NO_FILTER, minReachMm: 0 })).toBe(false);
    const r = { ...rows[0]!, minHeightMm: 0, maxHeightMm: 1000 };
    expect(rowPasses(r, { ...NO_FILTER, heightFromMm: 0, heightToMm: 1000 })).toBe(true);
    expect(rowPasses(r, { ...NO_FILTER, heightFromMm: 1000, heightToMm: 0 })).toBe(true); // ends in either order
    expect(rowPasses(r, { ...NO_FILTER, heightFromMm: -1, heightToMm: 500 })).toBe(false);
  });
});

describe("sortRows", () => {
  const collator = new Intl.Collator("en", { sensitivity: "base", numeric: true });
  const index = new Map(rows.map((r, i) => [r.id, i]));

  it.each([
    ["payload", "asc"],
    ["payload", "desc"],
    ["axes", "asc"],
    ["axes", "desc"],
    ["reach", "asc"],
    ["reach", "desc"],
    ["maker", "asc"],
    ["maker", "desc"],
    ["price", "asc"],
    ["price", "desc"],
  ] as const)("by %s %s: a permutation, pairs in order, missing last, ties in catalog order", (key, dir) => {
    const sorted = sortRows(rows, { key, dir });
    expect(sorted.map((r) => r.id).sort()).toEqual(rows.map((r) => r.id).sort());
    const sign = dir === "asc" ? 1 : -1;
    let seenMissing = false;
    for (let i = 0; i + 1 < sorted.length; i++) {
      const a = sorted[i]!,
        b = sorted[i + 1]!;
      const va = a.sort[key],
        vb = b.sort[key];
      if (va === null || va === undefined) seenMissing = true;
      if (seenMissing) {
        expect(vb ?? null, `only missing values after the first missing one (${key})`).toBeNull();
        expect(index.get(a.id)!).toBeLessThan(index.get(b.id)!);
        continue;
      }
      if (vb === null || vb === undefined) continue;
      // Price: currency first (ascending in both directions), amounts within one currency.
      const ga = a.sortGroup?.[key] ?? "",
        gb = b.sortGroup?.[key] ?? "";
      if (ga !== gb) {
        expect(ga < gb).toBe(true);
        continue;
      }
      const d = typeof va === "number" && typeof vb === "number" ? va - vb : collator.compare(String(va), String(vb));
      expect(sign * d, `${String(va)} before ${String(vb)}`).toBeLessThanOrEqual(0);
      if (d === 0) expect(index.get(a.id)!).toBeLessThan(index.get(b.id)!);
    }
  });

  it("sorts numbers as numbers and text without regard to case, digits as numbers", () => {
    const mk = (id: string, maker: string, payload: number): CatalogRowData => ({
      ...rows[0]!,
      id,
      sort: { maker, payload },
    });
    const r = [mk("a", "Zell 10", 9), mk("b", "zell 9", 10), mk("c", "abney", 100)];
    expect(sortRows(r, { key: "payload", dir: "asc" }).map((x) => x.id)).toEqual(["a", "b", "c"]); // 9 < 10 < 100, not "10" < "100" < "9"
    expect(sortRows(r, { key: "maker", dir: "asc" }).map((x) => x.id)).toEqual(["c", "b", "a"]); // abney, Zell 9, Zell 10
  });

  it("without a sort keeps the catalog order; visibleIds is sort then filter", () => {
    expect(sortRows(rows, null)).toEqual(rows);
    const state: CatalogState = {
      filter: { ...NO_FILTER, class: "scara" },
      sort: { key: "payload", dir: "desc" },
      pick: [],
    };
    const ids = visibleIds(rows, state);
    expect(ids).toEqual(
      sortRows(rows, state.sort)
        .filter((r) => r.class === "scara")
        .map((r) => r.id),
    );
    expect(ids.length).toBeGreaterThan(0);
  });
});

describe("controls", () => {
  it("nextSort: a new column ascending, the same column flips", () => {
    expect(nextSort(null, "maker")).toEqual({ key: "maker", dir: "asc" });
    expect(nextSort({ key: "maker", dir: "asc" }, "maker")).toEqual({ key: "maker", dir: "desc" });
    expect(nextSort({ key: "maker", dir: "desc" }, "maker")).toEqual({ key: "maker", dir: "asc" });
    expect(nextSort({ key: "maker", dir: "desc" }, "payload")).toEqual({ key: "payload", dir: "asc" });
  });

  it("pickProblem: side by side takes 2 to 6 arms, with a reason otherwise", () => {
    const ids = (n: number) => Array.from({ length: n }, (_, i) => `arm-${i}`);
    expect(pickProblem(ids(0))).toMatch(/^Tick 2 to 6 arms/);
    expect(pickProblem(ids(1))).toMatch(/^Tick at least one more arm/);
    for (const n of [2, 3, 6]) expect(pickProblem(ids(n))).toBeNull();
    expect(pickProblem(ids(7))).toBe("Untick 1 arm: side by side takes at most 6.");
    expect(pickProblem(ids(9))).toBe("Untick 3 arms: side by side takes at most 6.");
  });

  it("compareHref stays inside the base path and keeps the ticked order", () => {
    expect(compareHref("/tools/armdex/", ["b", "a", "c"])).toBe("/tools/armdex/compare/?arms=b,a,c");
    expect(compareHref("/", ["x-1", "y-2"])).toBe("/compare/?arms=x-1,y-2");
  });

  it("shownText", () => {
    expect(shownText(3, 9)).toBe("3 of 9 arms shown");
    expect(shownText(0, 1)).toBe("0 of 1 arm shown");
  });
});
